//! `tonewright inspect DESIGN [--rate HZ] [--knob NAME=POS]... [--json]`

use crate::error::{Error, Result};
use crate::pipeline::{choose_rate, port};
use crate::quantize::NumberFormat;
use crate::report::inspect;
use std::path::PathBuf;

/// Arguments of `inspect`.
#[derive(Debug, clap::Args)]
pub struct Args {
    /// The design file (TOML).
    design: PathBuf,
    /// Sample rate in Hz (overrides the design's `[target] rate`).
    #[arg(long)]
    rate: Option<f64>,
    /// Knob position, NAME=POS with POS from 0 to 1 (repeatable).
    #[arg(long = "knob", value_name = "NAME=POS")]
    knobs: Vec<String>,
    /// Number format, overriding the design's: f64, f32, q15, q23 or q31.
    #[arg(long)]
    number: Option<String>,
    /// Band for the float-versus-quantized comparison, LO:HI in Hz.
    #[arg(long, value_name = "LO:HI")]
    band: Option<String>,
    /// Also measure the response through the float64 and target engines (stepped sines).
    #[arg(long)]
    measure: bool,
    /// Print JSON instead of text.
    #[arg(long)]
    json: bool,
}

/// Parses `--band LO:HI`.
///
/// # Errors
/// Anything but two positive numbers with LO < HI.
pub fn parse_band(text: &str) -> Result<(f64, f64)> {
    let bad = || Error::input(format!("--band {text}: expected LO:HI in Hz, like 20:20000"));
    let (lo, hi) = text.split_once(':').ok_or_else(bad)?;
    let lo: f64 = lo.trim().parse().map_err(|_| bad())?;
    let hi: f64 = hi.trim().parse().map_err(|_| bad())?;
    if lo > 0.0 && hi > lo && hi.is_finite() {
        Ok((lo, hi))
    } else {
        Err(bad())
    }
}

/// The design's number format, or `--number` when given.
///
/// # Errors
/// An unknown format name.
pub fn number_override(design: &crate::design::Design, text: Option<&str>) -> Result<NumberFormat> {
    match text {
        Some(t) => NumberFormat::parse("--number", t),
        None => Ok(design.target.number),
    }
}

/// Runs `inspect`.
pub fn run(args: Args) -> Result<()> {
    let design = crate::design::load(&args.design)?;
    let rate = choose_rate(args.rate, &design, None)?;
    let number = number_override(&design, args.number.as_deref())?;
    let band = args.band.as_deref().map(parse_band).transpose()?;
    let port = port(design, &args.knobs, rate)?;
    let mut report = inspect::build(&port, number, band)?;
    if args.measure {
        report.measured = Some(inspect::measured(&port, number)?);
    }
    if args.json {
        let text =
            serde_json::to_string_pretty(&report).map_err(|e| Error::Internal(e.to_string()))?;
        println!("{text}");
        for w in &report.warnings {
            eprintln!("warning: {w}");
        }
    } else {
        print!("{}", report.to_text());
    }
    Ok(())
}
