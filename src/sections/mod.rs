//! Digital second-order sections.
//!
//! Convention, drawn once for the whole crate:
//!
//! ```text
//!          b0 + b1·z⁻¹ + b2·z⁻²
//! H_k(z) = ---------------------      (a0 = 1)
//!           1 + a1·z⁻¹ + a2·z⁻²
//! ```
//!
//! A [`Cascade`] is the product of its sections, overall gain included. A first-order
//! section has b2 = a2 = 0.

mod sos;

pub use sos::{Cascade, Sos};
