//! tonewright ports analog filters and tone stages to DSP firmware.
//!
//! The pipeline runs one way: [`design::load`] reads a TOML design file into a
//! validated `Design`; [`analog::model`] solves it into exact s-domain factors
//! (circuits by nodal analysis, loading included); [`discretize::bilinear`] maps them
//! to z with prewarping; [`sections::build`] pairs poles and zeros into a float64
//! [`sections::Cascade`] with Lp-norm gain scaling; [`quantize`] turns it into the
//! integers a target stores and says what that did; [`simulate`] runs float and
//! bit-exact fixed-point engines over sample blocks; [`audio`], [`analysis`], [`plot`],
//! `export` and [`audition`] turn the results into WAV files, reports, figures,
//! firmware and a listening page.

#![warn(missing_docs)]

pub mod analog;
pub mod atomic_file;
pub mod audio;
pub mod audition;
pub mod discretize;
pub mod error;
mod markup;
pub mod plot;
pub mod sections;

pub use error::{Error, Result};
