//! Running a design over WAV recordings, for listening and measuring.
//!
//! In: a design, knob settings, WAV files. Out: filtered WAV files (the target's
//! arithmetic, optionally also f64 and the fixed-minus-float residual) and a
//! [`FileReport`] per file. Files stream in blocks of [`BLOCK_FRAMES`] frames, so memory
//! stays flat with file length; every channel has its own filter state. The design is
//! discretized at the file's rate unless the command line or the design pins one
//! (a mismatch is reported). Outputs appear only when complete (see
//! [`crate::atomic_file`]); inputs are never written.
//!
//! # References
//! 1. S. P. Lipshitz, R. A. Wannamaker, J. Vanderkooy, "Quantization and dither: a
//!    theoretical survey", JAES 40(5), 1992 (TPDF dither when narrowing the output).
//! 2. G. Goertzel, "An algorithm for the evaluation of finite trigonometric series",
//!    American Mathematical Monthly 65(1), 1958 (the rejection measurement).

mod blocks;
mod rejection;
mod report;
mod run;

pub use blocks::BLOCK_FRAMES;
pub use rejection::{stop_frequency, StopBand, BAND_REJECT_DB};
pub use report::{FileReport, Rejection};
pub use run::{apply_file, check_batch, ApplyOptions, Outputs};
