//! Block engines: float and bit-exact fixed-point cascades over interleaved frames.
//!
//! In: a [`crate::sections::Cascade`] (float engines) or a
//! [`crate::quantize::FixedCascade`] (fixed engines), a channel count fixed at
//! construction. Out: the same buffer, filtered in place. Buffers are interleaved
//! frames (`[l0, r0, l1, r1, …]`); each channel has its own state, so channels never
//! mix and cutting a signal into blocks of any size gives the same output. Float
//! samples are fractions of full scale; fixed samples are `i32` integers of
//! `data_bits` width (see [`SampleScale`]). Conventions: H_k(z) =
//! (b0 + b1 z⁻¹ + b2 z⁻²) / (1 + a1 z⁻¹ + a2 z⁻²), a0 = 1. The exact integer
//! arithmetic of the fixed kernels is written out in [`FixedEngine`]'s documentation.
//! Engines do not allocate while processing and never panic on sample values.
//!
//! # References
//! 1. A. V. Oppenheim, R. W. Schafer, "Discrete-Time Signal Processing", 3rd ed., 2010,
//!    section 6.3 (direct form I and transposed direct form II structures).

mod convert;
mod fixed;
mod float;

mod runner;

pub use convert::SampleScale;
pub use fixed::FixedEngine;
pub use float::{FloatEngine, FloatSample};
pub use runner::Runner;

use crate::error::{Error, Result};
use crate::isa::Isa;

/// One block interface shared by every engine.
pub trait Engine {
    /// The sample type the engine reads and writes.
    type Sample: Copy;

    /// Number of interleaved channels, fixed at construction.
    fn channels(&self) -> usize;

    /// Filters whole interleaved frames in place, continuing from the current state.
    ///
    /// # Errors
    /// A buffer whose length is not a multiple of [`Engine::channels`].
    fn process(&mut self, frames: &mut [Self::Sample]) -> Result<()>;

    /// Clears every channel's state (and the fixed engines' overflow count).
    fn reset(&mut self);
}

/// Checks a channel count given to a constructor.
fn check_channels(channels: usize) -> Result<()> {
    if channels == 0 {
        return Err(Error::input("channels: 0 must be at least 1"));
    }
    Ok(())
}

/// Checks that a buffer holds whole frames.
fn check_frames(len: usize, channels: usize) -> Result<()> {
    if !len.is_multiple_of(channels) {
        return Err(Error::input(format!(
            "block of {len} samples is not a whole number of {channels}-channel frames"
        )));
    }
    Ok(())
}
