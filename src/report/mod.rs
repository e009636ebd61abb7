//! Reports a firmware developer reads: text for the terminal, JSON for scripts.
//!
//! In: a [`crate::pipeline::Port`]. Out: serialisable report structs whose JSON keys
//! follow the contract in design-file.md (`rate`, `knobs`, `analog`, `sections`,
//! `fixed`, `warnings`; more keys may be added) and a plain-text rendering.

pub mod fixed;
mod format;
pub mod inspect;

pub use format::{fmt_db, fmt_hz};
