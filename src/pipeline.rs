//! The front half every verb shares: design → analog model → digital zpk → cascade.
//!
//! A [`Port`] is plain data: the choices and results of each stage, so `inspect`
//! prints it and tests assert on it without running any DSP.

use crate::analog::{self, AnalogModel};
use crate::design::{Design, KnobPositions};
use crate::discretize::{self, Discretized};
use crate::error::{Error, Result};
use crate::quantize::{quantize, round_to_f32, FixedCascade, NumberFormat, Structure};
use crate::sections::{self, Cascade};

/// A design carried through to float sections at one rate and knob setting.
#[derive(Debug, Clone)]
pub struct Port {
    /// The validated design.
    pub design: Design,
    /// Knob positions used.
    pub knobs: KnobPositions,
    /// Sample rate, Hz.
    pub rate: f64,
    /// Exact analog model.
    pub analog: AnalogModel,
    /// Bilinear transform result.
    pub digital: Discretized,
    /// Float64 sections.
    pub cascade: Cascade,
}

/// Where the sample rate comes from, strongest first: the command line, the design's
/// `[target] rate`, then a fallback such as an input file's rate.
///
/// # Errors
/// No rate anywhere, or a rate outside 1 kHz to 1.536 MHz.
pub fn choose_rate(cli: Option<f64>, design: &Design, fallback: Option<f64>) -> Result<f64> {
    let rate = cli.or(design.target.rate).or(fallback).ok_or_else(|| {
        Error::input(format!(
            "{}: no sample rate: set `rate` in [target] or pass --rate HZ",
            design.file
        ))
    })?;
    if !(1000.0..=1_536_000.0).contains(&rate) || !rate.is_finite() {
        return Err(Error::input(format!("rate {rate} Hz must be from 1000 to 1536000 Hz")));
    }
    Ok(rate)
}

/// Runs a design through the analog model, the bilinear transform and section building.
///
/// # Errors
/// Anything the stages refuse (see [`analog::model`], [`discretize::bilinear`]).
pub fn port(design: Design, knob_settings: &[String], rate: f64) -> Result<Port> {
    let knobs = KnobPositions::resolve(&design, knob_settings)?;
    let analog = analog::model(&design, &knobs, rate)?;
    let digital = discretize::bilinear(&analog.sections(), rate, design.target.prewarp).map_err(
        |e| match e {
            Error::Input(m) => design.target.place.error(m),
            other => other,
        },
    )?;
    let cascade = sections::build(&digital.zpk, design.target.scaling);
    Ok(Port { design, knobs, rate, analog, digital, cascade })
}

impl Port {
    /// Every warning of every stage, analog and digital.
    pub fn warnings(&self) -> Vec<String> {
        let mut w = self.analog.warnings();
        w.extend(self.digital.warnings.iter().cloned());
        w
    }
}

/// A cascade as the target's arithmetic holds it.
#[derive(Debug, Clone, PartialEq)]
pub enum Realized {
    /// Float64: the cascade as designed.
    F64(Cascade),
    /// Float32: every coefficient rounded to f32.
    F32(Cascade),
    /// Fixed point: the stored integers.
    Fixed(FixedCascade),
}

impl Realized {
    /// The effective float coefficients of what the target stores.
    ///
    /// # Errors
    /// A fixed cascade that fails its own validation (an internal inconsistency).
    pub fn effective(&self, rate: f64) -> Result<Cascade> {
        match self {
            Realized::F64(c) | Realized::F32(c) => Ok(c.clone()),
            Realized::Fixed(f) => f.to_cascade(rate),
        }
    }
}

/// Puts a cascade into a number format and structure.
///
/// # Errors
/// A fixed format that cannot hold the coefficients.
pub fn realize(cascade: &Cascade, number: NumberFormat, structure: Structure) -> Result<Realized> {
    Ok(match number {
        NumberFormat::F64 => Realized::F64(cascade.clone()),
        NumberFormat::F32 => Realized::F32(round_to_f32(cascade)),
        NumberFormat::Fixed(format) => Realized::Fixed(quantize(cascade, &format, structure)?),
    })
}
