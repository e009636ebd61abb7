//! The exact analog model H(s) of a design.
//!
//! In: a validated [`crate::design::Design`] with knob positions. Out: an
//! [`AnalogModel`]: the real first- and second-order factors of H(s) in stage order,
//! each stage's own factors for reporting, and the whole design as an [`AnalogZpk`].
//! s is in rad/s throughout. Buffered stages and filter families keep their known
//! factors; only circuits and sums of paths are rooted.

pub mod circuit;
pub mod factorize;
pub mod families;
mod model;
pub mod parametric;
pub mod poly;
pub mod roots;
pub mod section;
mod validate;
pub mod zpk;

pub use section::AnalogSection;
pub use zpk::AnalogZpk;

pub use model::{model, AnalogModel, StageModel, SUM_CANCEL_TOLERANCE};
