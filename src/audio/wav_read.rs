//! Streaming WAV reader: header checked against the file, data decoded in bulk blocks.
//!
//! The header parser is our own rather than hound's: hound cannot read 64-bit float,
//! stops at an odd-sized chunk before `data` (it does not skip the pad byte), and
//! trusts header sizes. Reading whole blocks with one `read_exact` and decoding them
//! with `chunks_exact` is also several times faster than per-sample iteration.

use super::wav_format::{
    tag_name, Codec, SampleFormat, WavSpec, SUBFORMAT_GUID_TAIL, TAG_EXTENSIBLE, TAG_FLOAT, TAG_PCM,
};
use crate::error::{Error, Result};
use std::fs::File;
use std::io::{ErrorKind, Read, Seek, SeekFrom};
use std::path::{Path, PathBuf};

/// Reads the frames of one WAV file block by block.
#[derive(Debug)]
pub struct WavReader {
    path: PathBuf,
    file: File,
    spec: WavSpec,
    codec: Codec,
    frames: u64,
    frames_left: u64,
    bytes: Vec<u8>,
}

impl WavReader {
    /// Opens `path`, parses its header and checks the data chunk against the file length.
    ///
    /// # Errors
    /// [`Error::Io`] when the file cannot be opened or read; [`Error::Input`] with one
    /// line naming the file and the defect for anything that is not a complete WAV file
    /// in a supported format: empty or truncated file, wrong magic, missing `fmt ` or
    /// `data` chunk, a chunk that declares more bytes than the file has, an encoding
    /// other than integer PCM or IEEE float (µ-law, A-law, ADPCM… named with their
    /// format tag), zero channels or rate, an unsupported width, a block align that
    /// does not match channels × width, or a data chunk that is not whole frames.
    pub fn open(path: impl AsRef<Path>) -> Result<WavReader> {
        let path = path.as_ref();
        let mut file = File::open(path).map_err(|e| Error::io(path, e))?;
        let len = file.metadata().map_err(|e| Error::io(path, e))?.len();
        let header = parse_header(&mut file, len).map_err(|e| match e {
            HeaderError::Io(e) => Error::io(path, e),
            HeaderError::Invalid(message) => Error::input(format!("{}: {message}", path.display())),
        })?;
        let frames = header.data_bytes / header.spec.block_align() as u64;
        Ok(WavReader {
            path: path.to_path_buf(),
            file,
            spec: header.spec,
            codec: header.codec,
            frames,
            frames_left: frames,
            bytes: Vec::new(),
        })
    }

    /// Channels, rate and sample format of the file.
    pub fn spec(&self) -> WavSpec {
        self.spec
    }

    /// The number of frames in the data chunk, all of which the file holds.
    pub fn frames(&self) -> u64 {
        self.frames
    }

    /// Replaces the contents of `out` with up to `max_frames` interleaved frames
    /// normalised to ±1.0 and returns how many frames it read (0 at the end).
    ///
    /// # Errors
    /// [`Error::Io`] naming the file on a read failure, including a file that shrank
    /// since it was opened.
    pub fn read_block(&mut self, out: &mut Vec<f64>, max_frames: usize) -> Result<usize> {
        out.clear();
        let frames = self.frames_left.min(max_frames as u64);
        if frames == 0 {
            return Ok(0);
        }
        // frames ≤ data bytes / block align, and the data bytes were checked to exist.
        let frames = frames as usize;
        self.bytes.resize(frames * self.spec.block_align(), 0);
        self.file.read_exact(&mut self.bytes).map_err(|e| {
            if e.kind() == ErrorKind::UnexpectedEof {
                Error::io(&self.path, "data chunk ended early: the file shrank while reading")
            } else {
                Error::io(&self.path, e)
            }
        })?;
        decode(self.codec, &self.bytes, out);
        self.frames_left -= frames as u64;
        Ok(frames)
    }
}

/// Appends the samples encoded in `bytes` to `out`, scaled so integer code k of a
/// B-bit format becomes k / 2^(B−1) (a power-of-two scale: exact in f64).
fn decode(codec: Codec, bytes: &[u8], out: &mut Vec<f64>) {
    const S8: f64 = 1.0 / 128.0;
    const S16: f64 = 1.0 / 32768.0;
    const S24: f64 = 1.0 / 8_388_608.0;
    const S32: f64 = 1.0 / 2_147_483_648.0;
    match codec {
        Codec::U8 => out.extend(bytes.iter().map(|&b| (f64::from(b) - 128.0) * S8)),
        Codec::I16 => out.extend(
            bytes.chunks_exact(2).map(|b| f64::from(i16::from_le_bytes([b[0], b[1]])) * S16),
        ),
        // The three bytes go to the top of an i32; the arithmetic shift sign-extends.
        Codec::I24 => out.extend(
            bytes
                .chunks_exact(3)
                .map(|b| f64::from(i32::from_le_bytes([0, b[0], b[1], b[2]]) >> 8) * S24),
        ),
        Codec::I32 => out.extend(
            bytes
                .chunks_exact(4)
                .map(|b| f64::from(i32::from_le_bytes([b[0], b[1], b[2], b[3]])) * S32),
        ),
        Codec::F32 => out.extend(
            bytes.chunks_exact(4).map(|b| f64::from(f32::from_le_bytes([b[0], b[1], b[2], b[3]]))),
        ),
        Codec::F64 => out.extend(
            bytes
                .chunks_exact(8)
                .map(|b| f64::from_le_bytes([b[0], b[1], b[2], b[3], b[4], b[5], b[6], b[7]])),
        ),
    }
}

/// What the header says, checked; the file is positioned at the first data byte.
struct Header {
    spec: WavSpec,
    codec: Codec,
    data_bytes: u64,
}

enum HeaderError {
    Io(std::io::Error),
    Invalid(String),
}

impl From<std::io::Error> for HeaderError {
    fn from(e: std::io::Error) -> Self {
        HeaderError::Io(e)
    }
}

fn invalid<T>(message: String) -> std::result::Result<T, HeaderError> {
    Err(HeaderError::Invalid(message))
}

fn u16_at(b: &[u8], i: usize) -> u16 {
    u16::from_le_bytes([b[i], b[i + 1]])
}

fn u32_at(b: &[u8], i: usize) -> u32 {
    u32::from_le_bytes([b[i], b[i + 1], b[i + 2], b[i + 3]])
}

/// Walks the RIFF chunks up to `data` (reference 1 of the module). Sizes from the
/// header are compared with `len`, the real file length, before anything is read or
/// skipped; nothing is allocated from them.
fn parse_header(file: &mut File, len: u64) -> std::result::Result<Header, HeaderError> {
    if len == 0 {
        return invalid("empty file (0 bytes)".into());
    }
    if len < 12 {
        return invalid(format!(
            "truncated header: file has {len} bytes, a riff/wave header needs 12"
        ));
    }
    let mut riff = [0u8; 12];
    file.read_exact(&mut riff)?;
    match &riff[0..4] {
        b"RIFF" => {}
        b"RIFX" => return invalid("big-endian riff (rifx) files are not supported".into()),
        b"RF64" | b"BW64" => {
            return invalid("rf64/bw64 files (64-bit sizes) are not supported".into())
        }
        other => {
            return invalid(format!(
                "not a wav file: starts with \"{}\", expected \"RIFF\"",
                other.escape_ascii()
            ))
        }
    }
    if &riff[8..12] != b"WAVE" {
        return invalid(format!(
            "not a wav file: riff form type is \"{}\", expected \"WAVE\"",
            riff[8..12].escape_ascii()
        ));
    }
    // The RIFF size field is not checked: streaming writers often leave it wrong, and
    // every chunk size is checked against the real file length instead.
    let mut pos: u64 = 12;
    let mut format: Option<(WavSpec, Codec)> = None;
    loop {
        let left = len - pos;
        if left == 0 {
            let missing = if format.is_none() { "fmt" } else { "data" };
            return invalid(format!("missing {missing} chunk"));
        }
        if left < 8 {
            return invalid(format!(
                "truncated chunk header at byte {pos}: {left} bytes left, a chunk header needs 8"
            ));
        }
        let mut head = [0u8; 8];
        file.read_exact(&mut head)?;
        pos += 8;
        let id = &head[0..4];
        let size = u64::from(u32_at(&head, 4));
        let available = len - pos;
        if id == b"data" {
            let Some((spec, codec)) = format else {
                return invalid("data chunk comes before any fmt chunk".into());
            };
            if size > available {
                return invalid(format!(
                    "truncated data chunk: header declares {size} bytes, file has {available}"
                ));
            }
            let frame = spec.block_align() as u64;
            if size % frame != 0 {
                return invalid(format!(
                    "data chunk of {size} bytes is not a whole number of {frame}-byte frames"
                ));
            }
            return Ok(Header { spec, codec, data_bytes: size });
        }
        if size > available {
            return invalid(format!(
                "truncated \"{}\" chunk at byte {}: header declares {size} bytes, file has {available}",
                id.escape_ascii(),
                pos - 8
            ));
        }
        if id == b"fmt " {
            if format.is_some() {
                return invalid("second fmt chunk".into());
            }
            if size < 16 {
                return invalid(format!("fmt chunk too short: {size} bytes, need at least 16"));
            }
            // Only the first 40 bytes (the extensible layout) mean anything to us.
            let mut fmt = [0u8; 40];
            let take = size.min(40) as usize;
            file.read_exact(&mut fmt[..take])?;
            format = Some(parse_fmt(&fmt[..take])?);
            file.seek(SeekFrom::Current((size - take as u64) as i64))?;
        } else {
            file.seek(SeekFrom::Current(size as i64))?;
        }
        pos += size;
        // Odd-sized chunks are followed by a pad byte (reference 1); a missing final
        // pad byte at the very end of the file is tolerated.
        if size % 2 == 1 && pos < len {
            file.seek(SeekFrom::Current(1))?;
            pos += 1;
        }
    }
}

/// Checks a `fmt ` chunk body (16 to 40 bytes) and says what the data holds.
fn parse_fmt(fmt: &[u8]) -> std::result::Result<(WavSpec, Codec), HeaderError> {
    let mut tag = u16_at(fmt, 0);
    let channels = u16_at(fmt, 2);
    let rate = u32_at(fmt, 4);
    let block_align = u16_at(fmt, 12);
    let bits = u16_at(fmt, 14);
    if tag == TAG_EXTENSIBLE {
        if fmt.len() < 40 {
            return invalid(format!(
                "extensible fmt chunk too short: {} bytes, need 40",
                fmt.len()
            ));
        }
        let extension = u16_at(fmt, 16);
        if extension < 22 {
            return invalid(format!(
                "extensible fmt chunk declares {extension} extension bytes, need 22"
            ));
        }
        let valid_bits = u16_at(fmt, 18);
        // Samples narrower than their container are left-justified (reference 2), so
        // scaling by the container width is still exact; only more bits than the
        // container holds is nonsense.
        if valid_bits > bits {
            return invalid(format!(
                "extensible fmt chunk declares {valid_bits} valid bits in a {bits}-bit container"
            ));
        }
        let guid = &fmt[24..40];
        if guid[2..] != SUBFORMAT_GUID_TAIL {
            let hex: String = guid.iter().map(|b| format!("{b:02x}")).collect();
            return invalid(format!("unknown extensible subformat guid {hex}"));
        }
        tag = u16_at(guid, 0);
    }
    let sample = match tag {
        TAG_PCM => SampleFormat::Int { bits },
        TAG_FLOAT => SampleFormat::Float { bits },
        other => {
            return invalid(format!(
                "unsupported encoding: {} (format tag {other})",
                tag_name(other)
            ))
        }
    };
    if channels == 0 {
        return invalid("zero channels in fmt chunk".into());
    }
    if rate == 0 {
        return invalid("sample rate of 0 Hz in fmt chunk".into());
    }
    let Some(codec) = Codec::of(sample) else {
        let (kind, supported) = match sample {
            SampleFormat::Int { .. } => ("integer", "8, 16, 24, 32"),
            SampleFormat::Float { .. } => ("float", "32, 64"),
        };
        return invalid(format!(
            "unsupported sample width: {bits}-bit {kind} (supported: {supported})"
        ));
    };
    let spec = WavSpec { channels, rate, sample };
    if usize::from(block_align) != spec.block_align() {
        return invalid(format!(
            "block align mismatch: fmt chunk says {block_align} bytes per frame, \
             {channels} channels of {} bytes need {}",
            sample.bytes(),
            spec.block_align()
        ));
    }
    Ok((spec, codec))
}
