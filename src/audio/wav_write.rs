//! Streaming WAV writer on top of [`AtomicFile`].
//!
//! Header choice: integer files of one or two channels get the plain WAVE_FORMAT_PCM
//! header (tag 1, 16-byte `fmt `), float files of one or two channels tag 3 with a
//! `fact` chunk, and anything with more channels WAVE_FORMAT_EXTENSIBLE with the usual
//! speaker mask. Microsoft recommends EXTENSIBLE also for more than 16 bits, but a
//! tag-1 header is valid for any width and Python's `wave` module (3.11) reads only
//! tag 1, so 24- and 32-bit mono and stereo files stay readable there.

use super::dither::TpdfDither;
use super::wav_format::{
    channel_mask, int_step, Codec, SampleFormat, WavSpec, SUBFORMAT_GUID_TAIL, TAG_EXTENSIBLE,
    TAG_FLOAT, TAG_PCM,
};
use crate::atomic_file::AtomicFile;
use crate::error::{Error, Result};
use crate::offset_rounding::{integer_of, OFFSET};
use serde::Serialize;
use std::io::{Seek, SeekFrom, Write};
use std::path::Path;

/// What writing a file did.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize)]
pub struct WriteStats {
    /// Frames written.
    pub frames: u64,
    /// Samples beyond full scale: clipped to the extreme code in integer outputs,
    /// stored unchanged (and counted) in float outputs.
    pub overs: u64,
}

/// Writes interleaved `f64` frames to a WAV file that appears only when finished.
#[derive(Debug)]
pub struct WavWriter {
    file: AtomicFile,
    spec: WavSpec,
    codec: Codec,
    dither: Option<TpdfDither>,
    /// The dither values of the block being encoded.
    dither_values: Vec<f64>,
    fact_at: Option<u64>,
    data_size_at: u64,
    header_bytes: u64,
    data_bytes: u64,
    overs: u64,
    /// Encoded samples not yet handed to the file, written once they reach
    /// [`WRITE_BYTES`].
    pending: Vec<u8>,
}

/// Bytes per write call, at least. The per-call cost of the kernel is large: on this
/// project's machine 11.5 MB of 16 KiB writes to a new file took 6.2 ms, of 256 KiB
/// writes 3.0 ms, and larger writes no less.
const WRITE_BYTES: usize = 256 * 1024;

impl WavWriter {
    /// Starts a WAV file at `path` with the header for `spec`, refusing to overwrite any
    /// of `inputs_to_protect`.
    ///
    /// # Errors
    /// [`Error::Input`] for zero channels or rate, an unsupported sample format, or a
    /// path that is one of the inputs; [`Error::Io`] naming the path when the file
    /// cannot be created or written.
    pub fn create(path: &Path, spec: WavSpec, inputs_to_protect: &[&Path]) -> Result<WavWriter> {
        let bad = |what: String| Error::input(format!("{}: {what}", path.display()));
        if spec.channels == 0 {
            return Err(bad("cannot write a wav file with zero channels".into()));
        }
        if spec.rate == 0 {
            return Err(bad("cannot write a wav file with a sample rate of 0 Hz".into()));
        }
        let codec = Codec::of(spec.sample).ok_or_else(|| {
            bad(format!(
                "cannot write {:?} samples (supported: 8/16/24/32-bit int, 32/64-bit float)",
                spec.sample
            ))
        })?;
        if spec.block_align() > usize::from(u16::MAX) {
            return Err(bad(format!(
                "{} channels of {} bytes exceed the 65535-byte frame limit of wav",
                spec.channels,
                spec.sample.bytes()
            )));
        }
        let (header, fact_at, data_size_at) = header(spec);
        let mut file = AtomicFile::create(path, inputs_to_protect)?;
        file.write_all(&header).map_err(|e| Error::io(path, e))?;
        Ok(WavWriter {
            file,
            spec,
            codec,
            dither: None,
            dither_values: Vec::new(),
            fact_at,
            data_size_at,
            header_bytes: header.len() as u64,
            data_bytes: 0,
            overs: 0,
            pending: Vec::with_capacity(WRITE_BYTES),
        })
    }

    /// Adds seeded TPDF dither of ±1 LSB before rounding to the integer output word.
    ///
    /// # Errors
    /// [`Error::Input`] for a float output, which is not dithered.
    pub fn with_tpdf_dither(mut self, seed: u64) -> Result<WavWriter> {
        if let SampleFormat::Float { bits } = self.spec.sample {
            return Err(self.input_error(format!(
                "tpdf dither applies to integer outputs, not {bits}-bit float"
            )));
        }
        self.dither = Some(TpdfDither::new(seed));
        Ok(self)
    }

    /// Quantises and appends interleaved frames (a whole number of frames).
    ///
    /// Integer outputs round to the nearest code (ties to even), after the dither if
    /// one was asked for, and clip to the extreme codes; float outputs store the value
    /// (64-bit exactly, 32-bit rounded to nearest). A refused block changes nothing,
    /// the dither sequence included.
    ///
    /// # Errors
    /// [`Error::Input`] for a block that is not whole frames, a NaN sample, or a file
    /// that would pass the 4 GiB size limit of RIFF; [`Error::Io`] on a write failure.
    pub fn write_block(&mut self, samples: &[f64]) -> Result<()> {
        let channels = usize::from(self.spec.channels);
        if !samples.len().is_multiple_of(channels) {
            return Err(self.input_error(format!(
                "block of {} samples is not a whole number of {channels}-channel frames",
                samples.len()
            )));
        }
        let new_bytes = samples.len() * self.spec.sample.bytes();
        // The RIFF size field counts everything after its own 8 bytes, pad byte included.
        if self.header_bytes - 8 + self.data_bytes + new_bytes as u64 + 1 > u64::from(u32::MAX) {
            return Err(self.input_error("output exceeds the 4 GiB size limit of wav files".into()));
        }
        let start = self.pending.len();
        self.pending.resize(start + new_bytes, 0);
        let out = &mut self.pending[start..];
        // The generator moves on only once the block is kept.
        let mut dither = self.dither.clone();
        let dither_values = match &mut dither {
            Some(d) => {
                self.dither_values.resize(samples.len(), 0.0);
                d.fill(&mut self.dither_values);
                Some(&self.dither_values[..])
            }
            None => None,
        };
        // One loop per codec (and per dither choice): no per-sample branching on format.
        let overs = match self.codec {
            Codec::U8 => encode::<1, 8>(samples, out, dither_values),
            Codec::I16 => encode::<2, 16>(samples, out, dither_values),
            Codec::I24 => encode::<3, 24>(samples, out, dither_values),
            Codec::I32 => encode::<4, 32>(samples, out, dither_values),
            Codec::F32 => {
                for (b, &x) in out.chunks_exact_mut(4).zip(samples) {
                    b.copy_from_slice(&(x as f32).to_le_bytes());
                }
                count_overs(samples)
            }
            Codec::F64 => {
                for (b, &x) in out.chunks_exact_mut(8).zip(samples) {
                    b.copy_from_slice(&x.to_le_bytes());
                }
                count_overs(samples)
            }
        };
        // Every codec counts a NaN as an over, so only a block with overs needs the
        // search, which then runs before anything of the block is kept.
        if overs > 0 {
            if let Some(i) = samples.iter().position(|x| x.is_nan()) {
                self.pending.truncate(start);
                let frame =
                    self.data_bytes / self.spec.block_align() as u64 + (i / channels) as u64;
                return Err(self.input_error(format!(
                    "sample is not a number (nan) at frame {frame}, channel {}",
                    i % channels
                )));
            }
        }
        self.dither = dither;
        self.overs += overs;
        self.data_bytes += new_bytes as u64;
        if self.pending.len() >= WRITE_BYTES {
            self.write_pending()?;
        }
        Ok(())
    }

    /// Hands the encoded samples to the file.
    fn write_pending(&mut self) -> Result<()> {
        let written = self.file.write_all(&self.pending);
        self.pending.clear();
        written.map_err(|e| Error::io(self.file.target(), e))
    }

    /// An input error naming the target.
    fn input_error(&self, what: String) -> Error {
        Error::input(format!("{}: {what}", self.file.target().display()))
    }

    /// Writes the pad byte and the final sizes, then renames the file into place.
    ///
    /// # Errors
    /// [`Error::Io`] naming the path when writing or renaming fails; the target is
    /// then left as it was.
    pub fn finish(mut self) -> Result<WriteStats> {
        let target = self.file.target().to_path_buf();
        self.write_pending()?;
        let io = |e: std::io::Error| Error::io(&target, e);
        if self.data_bytes % 2 == 1 {
            self.file.write_all(&[0]).map_err(io)?;
        }
        let riff_size = self.header_bytes - 8 + self.data_bytes + self.data_bytes % 2;
        let frames = self.data_bytes / self.spec.block_align() as u64;
        // All three fit in u32: write_block keeps the RIFF size below 2^32.
        let mut patch = |at: u64, value: u64| -> Result<()> {
            self.file.seek(SeekFrom::Start(at)).map_err(io)?;
            self.file.write_all(&(value as u32).to_le_bytes()).map_err(io)
        };
        patch(4, riff_size)?;
        if let Some(at) = self.fact_at {
            patch(at, frames)?;
        }
        patch(self.data_size_at, self.data_bytes)?;
        self.file.commit()?;
        Ok(WriteStats { frames, overs: self.overs })
    }
}

/// Float samples beyond full scale, NaN included.
fn count_overs(samples: &[f64]) -> u64 {
    samples.iter().map(|x| u64::from(x.abs() > 1.0 || x.is_nan())).sum()
}

/// Encodes `samples` as `BITS`-bit integer codes of `BYTES` little-endian bytes
/// (8-bit: unsigned, offset 128): each is scaled by 2^(BITS−1), dithered by the
/// `dither` values in LSB (none: 0), rounded to the nearest code (ties to even) and
/// clipped to the extreme codes. Returns the number of clips, NaN samples included
/// (their bytes are meaningless).
fn encode<const BYTES: usize, const BITS: u32>(
    samples: &[f64],
    out: &mut [u8],
    dither: Option<&[f64]>,
) -> u64 {
    match dither {
        Some(d) => encode_dithered::<BYTES, BITS>(samples, out, d.iter().copied()),
        None => encode_dithered::<BYTES, BITS>(samples, out, std::iter::repeat(0.0)),
    }
}

/// [`encode`] with the dither values, in LSB, of `dither`.
#[inline(always)]
fn encode_dithered<const BYTES: usize, const BITS: u32>(
    samples: &[f64],
    out: &mut [u8],
    dither: impl Iterator<Item = f64>,
) -> u64 {
    let scale = 1.0 / int_step(BITS as u16);
    // Rounded by the offset (see `offset_rounding`). Clipping the sum to the offset
    // extreme codes (exact) clips the code. Rounding is monotone: a larger |v| still
    // lands beyond an extreme code and is clipped and counted.
    let (lo, hi) = (OFFSET - scale, OFFSET + scale - 1.0);
    let mut clipped = 0;
    for ((b, &x), d) in out.chunks_exact_mut(BYTES).zip(samples).zip(dither) {
        let sum = x * scale + d + OFFSET;
        // A NaN sum stays NaN through the clamp and differs from itself: a clip.
        let c = sum.clamp(lo, hi);
        clipped += u64::from(c != sum);
        let code = integer_of(c);
        if BYTES == 1 {
            b[0] = code as u8 ^ 0x80;
        } else {
            b.copy_from_slice(&code.to_le_bytes()[..BYTES]);
        }
    }
    clipped
}

/// The header bytes for `spec` with zero sizes, the offset of the `fact` sample count
/// (if any) and of the data size (references 1 and 2 of the module).
fn header(spec: WavSpec) -> (Vec<u8>, Option<u64>, u64) {
    let bits = (spec.sample.bytes() * 8) as u16;
    let format_tag = match spec.sample {
        SampleFormat::Int { .. } => TAG_PCM,
        SampleFormat::Float { .. } => TAG_FLOAT,
    };
    let tag = if spec.channels <= 2 { format_tag } else { TAG_EXTENSIBLE };
    let block_align = spec.block_align() as u16;
    let mut fmt = Vec::with_capacity(40);
    fmt.extend_from_slice(&tag.to_le_bytes());
    fmt.extend_from_slice(&spec.channels.to_le_bytes());
    fmt.extend_from_slice(&spec.rate.to_le_bytes());
    fmt.extend_from_slice(&(spec.rate.saturating_mul(u32::from(block_align))).to_le_bytes());
    fmt.extend_from_slice(&block_align.to_le_bytes());
    fmt.extend_from_slice(&bits.to_le_bytes());
    match tag {
        TAG_FLOAT => fmt.extend_from_slice(&0u16.to_le_bytes()),
        TAG_EXTENSIBLE => {
            fmt.extend_from_slice(&22u16.to_le_bytes());
            fmt.extend_from_slice(&bits.to_le_bytes());
            fmt.extend_from_slice(&channel_mask(spec.channels).to_le_bytes());
            fmt.extend_from_slice(&format_tag.to_le_bytes());
            fmt.extend_from_slice(&SUBFORMAT_GUID_TAIL);
        }
        _ => {}
    }
    let mut out = Vec::with_capacity(80);
    out.extend_from_slice(b"RIFF\0\0\0\0WAVEfmt ");
    out.extend_from_slice(&(fmt.len() as u32).to_le_bytes());
    out.extend_from_slice(&fmt);
    // Every format but plain PCM carries a fact chunk with the frame count.
    let fact_at = (tag != TAG_PCM).then(|| {
        out.extend_from_slice(b"fact\x04\0\0\0");
        let at = out.len() as u64;
        out.extend_from_slice(&[0; 4]);
        at
    });
    out.extend_from_slice(b"data");
    let data_size_at = out.len() as u64;
    out.extend_from_slice(&[0; 4]);
    (out, fact_at, data_size_at)
}
