//! tonewright ports analog filters and tone stages to DSP firmware.
//!
//! The pipeline runs one way: [`design::load`] reads a TOML design file into a
//! validated `Design`; [`analog::model`] solves it into exact s-domain factors
//! (circuits by nodal analysis, loading included); [`discretize::bilinear`] maps them
//! to z with prewarping; [`sections::build`] pairs poles and zeros into a float64
//! [`sections::Cascade`] with Lp-norm gain scaling; [`quantize`] turns it into the
//! integers a target stores and says what that did; [`simulate`] runs float and
//! bit-exact fixed-point engines over sample blocks; [`apply`] runs them over WAV
//! files; [`audio`], [`analysis`], [`report`], [`plot`], [`export`] and [`audition`]
//! turn the results into WAV files, reports, figures, firmware and a listening page.
//! [`pipeline::port`] runs the front half in one call.

#![warn(missing_docs)]

pub mod analog;
pub mod analysis;
pub mod apply;
pub mod atomic_file;
pub mod audio;
pub mod audition;
pub mod cli;
pub mod design;
pub mod discretize;
pub mod error;
pub mod export;
mod isa;
mod markup;
mod offset_rounding;
pub mod pipeline;
pub mod plot;
pub mod quantize;
pub mod report;
pub mod sections;
pub mod simulate;

pub use error::{Error, Result};
