//! Digital second-order sections: pairing, ordering and gain scaling.
//!
//! In: a [`crate::discretize::DigitalZpk`]. Out: a float64 [`Cascade`].
//! Convention, drawn once for the whole crate:
//!
//! ```text
//!          b0 + b1·z⁻¹ + b2·z⁻²
//! H_k(z) = ---------------------      (a0 = 1)
//!           1 + a1·z⁻¹ + a2·z⁻²
//! ```
//!
//! A [`Cascade`] is the product of its sections, overall gain included. A first-order
//! section has b2 = a2 = 0. A design with no poles becomes one gain section.
//!
//! # References
//! 1. L. B. Jackson, "On the interaction of roundoff noise and dynamic range in digital
//!    filters", Bell System Technical Journal 49(2), 1970.

pub mod norms;
mod pairing;
pub mod roots;
mod scaling;
mod sos;

pub use roots::{max_pole_radius, poles, zeros, Root};
pub use sos::{Cascade, Sos};

use crate::design::Scaling;
use crate::discretize::DigitalZpk;

/// Pairs, orders and scales a digital zpk into a cascade of sections.
///
/// ```
/// use num_complex::Complex64;
/// use tonewright::design::Scaling;
/// use tonewright::discretize::DigitalZpk;
/// use tonewright::sections::build;
/// // One real pole at 0.5, one zero at −1, gain 0.25: DC gain 0.25·2/0.5 = 1.
/// let zpk = DigitalZpk { zeros: vec![Complex64::new(-1.0, 0.0)], poles: vec![Complex64::new(0.5, 0.0)], gain: 0.25, rate: 48000.0 };
/// let c = build(&zpk, Scaling::None);
/// assert!((c.response_at_hz(0.0).norm() - 1.0).abs() < 1e-15);
/// ```
pub fn build(zpk: &DigitalZpk, scaling: Scaling) -> Cascade {
    let mut sections = pairing::pair(&zpk.zeros, &zpk.poles);
    if sections.is_empty() {
        sections.push(Sos { b: [1.0, 0.0, 0.0], a: [0.0, 0.0] });
    }
    scaling::scale(&mut sections, zpk.gain, scaling);
    Cascade { rate: zpk.rate, sections }
}
