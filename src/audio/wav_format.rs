//! What a WAV file holds, and the constants of the RIFF/WAVE format shared by reader
//! and writer.

use serde::Serialize;

/// How one sample is stored.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize)]
pub enum SampleFormat {
    /// Two's complement integers (8-bit: unsigned with offset 128) of 8, 16, 24 or 32 bits.
    Int {
        /// Container width in bits.
        bits: u16,
    },
    /// IEEE 754 binary floating point of 32 or 64 bits.
    Float {
        /// Width in bits.
        bits: u16,
    },
}

impl SampleFormat {
    /// Bytes one sample occupies.
    pub fn bytes(self) -> usize {
        match self {
            SampleFormat::Int { bits } | SampleFormat::Float { bits } => usize::from(bits / 8),
        }
    }

    /// The largest positive sample value that is stored without clipping: 1 − 2^(1−B)
    /// for B-bit integers, 1.0 for floats (which can hold more, but 1.0 is full scale).
    pub fn positive_full_scale(self) -> f64 {
        match self {
            SampleFormat::Int { bits } => 1.0 - int_step(bits),
            SampleFormat::Float { .. } => 1.0,
        }
    }
}

/// The value of one integer step (one LSB) of a `bits`-wide integer: 2^(1−bits).
pub(crate) fn int_step(bits: u16) -> f64 {
    (2.0f64).powi(1 - i32::from(bits))
}

/// Channel count, sample rate and sample format of a WAV file.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize)]
pub struct WavSpec {
    /// Interleaved channels per frame, at least 1.
    pub channels: u16,
    /// Frames per second, at least 1.
    pub rate: u32,
    /// How each sample is stored.
    pub sample: SampleFormat,
}

impl WavSpec {
    /// Bytes one frame occupies (the `fmt ` chunk's block align).
    pub fn block_align(&self) -> usize {
        usize::from(self.channels) * self.sample.bytes()
    }
}

/// WAVE_FORMAT_PCM (reference 1 of the module).
pub(crate) const TAG_PCM: u16 = 0x0001;
/// WAVE_FORMAT_IEEE_FLOAT.
pub(crate) const TAG_FLOAT: u16 = 0x0003;
/// WAVE_FORMAT_EXTENSIBLE (reference 2 of the module).
pub(crate) const TAG_EXTENSIBLE: u16 = 0xFFFE;

/// Bytes 2..16 of every KSDATAFORMAT_SUBTYPE_* GUID derived from a format tag
/// (`xxxxxxxx-0000-0010-8000-00aa00389b71`, stored little-endian); bytes 0..2 hold the tag.
pub(crate) const SUBFORMAT_GUID_TAIL: [u8; 14] =
    [0x00, 0x00, 0x00, 0x00, 0x10, 0x00, 0x80, 0x00, 0x00, 0xAA, 0x00, 0x38, 0x9B, 0x71];

/// A readable name for a format tag, for error messages.
pub(crate) fn tag_name(tag: u16) -> &'static str {
    // Tag values from the Microsoft mmreg.h registry (from memory, common practice).
    match tag {
        0x0000 => "unknown format",
        0x0002 => "microsoft adpcm",
        0x0006 => "a-law",
        0x0007 => "µ-law",
        0x0011 => "ima adpcm",
        0x0031 => "gsm 6.10",
        0x0050 => "mpeg",
        0x0055 => "mpeg layer 3",
        0x0092 => "dolby ac-3 spdif",
        0x0161..=0x0163 => "windows media audio",
        0x2000 => "ac-3",
        0xF1AC => "flac",
        _ => "unrecognised encoding",
    }
}

/// The speaker mask written for a channel count: the usual layouts for 1 to 8
/// channels (KSAUDIO_SPEAKER_MONO … _7POINT1_SURROUND in ksmedia.h, from memory),
/// 0 ("no particular assignment", reference 2 of the module) otherwise.
pub(crate) fn channel_mask(channels: u16) -> u32 {
    match channels {
        1 => 0x4,   // front centre
        2 => 0x3,   // front left, front right
        3 => 0x7,   // + front centre
        4 => 0x33,  // front left/right, back left/right
        5 => 0x37,  // + front centre
        6 => 0x3F,  // 5.1: + low frequency
        7 => 0x13F, // 6.1: + back centre
        8 => 0x63F, // 7.1: 5.1 + side left/right
        _ => 0,
    }
}

/// The sample encodings reader and writer handle, chosen once from a checked
/// [`SampleFormat`] so the per-block loops match exhaustively.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub(crate) enum Codec {
    U8,
    I16,
    I24,
    I32,
    F32,
    F64,
}

impl Codec {
    /// The codec for a format, `None` for a width neither side supports.
    pub(crate) fn of(sample: SampleFormat) -> Option<Codec> {
        match sample {
            SampleFormat::Int { bits: 8 } => Some(Codec::U8),
            SampleFormat::Int { bits: 16 } => Some(Codec::I16),
            SampleFormat::Int { bits: 24 } => Some(Codec::I24),
            SampleFormat::Int { bits: 32 } => Some(Codec::I32),
            SampleFormat::Float { bits: 32 } => Some(Codec::F32),
            SampleFormat::Float { bits: 64 } => Some(Codec::F64),
            _ => None,
        }
    }
}
