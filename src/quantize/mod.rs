//! Quantization: number formats, float sections to stored integers, and what that did.
//!
//! In: a float64 [`crate::sections::Cascade`] (H_k(z) = (b0 + b1 z⁻¹ + b2 z⁻²) /
//! (1 + a1 z⁻¹ + a2 z⁻²), a0 = 1), a [`FixedFormat`] and a [`Structure`]. Out: a
//! [`FixedCascade`] whose effective coefficients are integer · 2^shift / 2^coef_frac,
//! and, from [`analyze`], a [`QuantReport`]: pole and zero movement, response error,
//! rounding noise, headroom, zero-input limit cycles and a verdict with suggestions.
//! Samples are fractions of full scale: the data word of `data_bits` bits holds
//! integers in [−2^(data_bits−1), 2^(data_bits−1) − 1], one LSB = 2^−(data_bits−1).
//! This module does not scale sections (that is [`crate::sections`]' job); it runs
//! the bit-exact engines of [`crate::simulate`] for the limit-cycle search.
//!
//! # References
//! 1. A. V. Oppenheim, R. W. Schafer, "Discrete-Time Signal Processing", 3rd ed., 2010,
//!    chapter 6 (coefficient quantization, rounding noise of variance Δ²/12 through the
//!    noise transfer function, zero-input limit cycles).
//! 2. L. B. Jackson, "On the interaction of roundoff noise and dynamic range in digital
//!    filters", Bell System Technical Journal 49(2), 1970 (L1, L2, L∞ norms of the
//!    transfer to each node).

mod coefs;
mod format;
mod headroom;
mod limit_cycle;
mod noise;
mod report;
mod verdict;

pub use coefs::{quantize, round_to_f32, FixedCascade, FixedSos};
pub use format::{FixedFormat, NumberFormat, Overflow, Rounding, Structure, ACC_BITS_ALLOWED};
pub use headroom::{headroom, HeadroomReport, NodeGain};
pub use limit_cycle::{
    find_limit_cycle, LimitCycle, LimitCycleSearch, LIMIT_CYCLE_SEEDS, MAX_PERIOD,
    MIN_LIMIT_CYCLE_SEEDS,
};
pub use noise::{rounding_noise, NoiseReport};
pub use report::{analyze, default_band, Deviation, QuantReport, SectionReport};
pub use verdict::{limits, Assessment, Verdict};
