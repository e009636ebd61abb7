//! Design files: TOML in, a validated [`Design`] out.
//!
//! In: a file in the format of `design-file.md` (see the README's reference). Out: a
//! [`Design`] with units parsed (engineering notation), every value carrying its
//! `file:line` and key, knob and path references checked. Knob positions are applied
//! later ([`knobs::KnobPositions`]), and checks that need the sample rate (frequencies
//! below Nyquist) happen when the analog model is discretized.
//!
//! # References
//! 1. TOML v1.0.0 specification, <https://toml.io/en/v1.0.0>.

mod check;
pub mod knobs;
mod load;
pub mod reader;
mod schema;
mod target;
pub mod units;

pub use knobs::KnobPositions;
pub use load::{load, parse};
pub use schema::*;
