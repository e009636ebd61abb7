//! Audio in and out: WAV files (streaming), test signals, dither and level metrics.
//!
//! In: WAV files of any common RIFF/WAVE flavour, or signal parameters. Out: interleaved
//! `f64` sample blocks, WAV files written through [`crate::atomic_file::AtomicFile`],
//! and levels.
//!
//! Conventions shared by every part:
//! - Samples are interleaved frames of `f64` (frame 0 channel 0, frame 0 channel 1, …).
//! - Full scale is ±1.0. Integer code k of a B-bit file is exactly k / 2^(B−1), so
//!   16-bit −32768 reads −1.0 and +32767 reads 32767/32768; 8-bit files store
//!   k + 128 unsigned. Every integer code is exact in `f64`, so reading and writing
//!   back is bit-exact.
//! - dBFS is 20·log10 of an amplitude relative to 1.0. A peak level is the largest
//!   |sample|; an RMS level is 20·log10(rms), so a full-scale sine reads 0 dBFS peak and
//!   −3.01 dBFS RMS (AES17 adds 3.01 dB to RMS readings; we do not).
//!
//! Not here: sample-rate conversion, channel remixing, compressed encodings (µ-law,
//! A-law, ADPCM, MPEG), which are refused by name.
//!
//! # References
//! 1. IBM, Microsoft, "Multimedia Programming Interface and Data Specifications 1.0",
//!    1991: RIFF chunks, the WAVE form, `fmt ` and `data` chunks, WAVE_FORMAT_PCM.
//! 2. Microsoft, "Multiple Channel Audio Data and WAVE Files" (WAVE_FORMAT_EXTENSIBLE,
//!    KSDATAFORMAT_SUBTYPE_PCM / _IEEE_FLOAT, dwChannelMask), 2007.
//! 3. AES17-2015, "AES standard method for digital audio engineering – Measurement of
//!    digital audio equipment": the full-scale sine as the dBFS reference.

pub mod dither;
pub mod metrics;
pub mod signal;
mod wav_format;
mod wav_read;
mod wav_write;

pub use wav_format::{SampleFormat, WavSpec};
pub use wav_read::WavReader;
pub use wav_write::{WavWriter, WriteStats};
