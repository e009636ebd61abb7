//! `tonewright inspect DESIGN [--rate HZ] [--knob NAME=POS]... [--json]`

use super::design_args::DesignArgs;
use crate::error::{Error, Result};
use crate::pipeline::{choose_rate, port};
use crate::report::inspect;

/// Arguments of `inspect`.
#[derive(Debug, clap::Args)]
pub struct Args {
    #[command(flatten)]
    design: DesignArgs,
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

/// Runs `inspect`.
pub fn run(args: Args) -> Result<()> {
    let design = args.design.load()?;
    let rate = choose_rate(args.design.rate, &design, None)?;
    let number = design.target.number;
    let band = args.band.as_deref().map(parse_band).transpose()?;
    let port = port(design, &args.design.knob_settings, rate)?;
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
