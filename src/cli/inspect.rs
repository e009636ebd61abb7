//! `tonewright inspect DESIGN [--rate HZ] [--knob NAME=POS]... [--json]`

use crate::error::{Error, Result};
use crate::pipeline::{choose_rate, port};
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
    /// Print JSON instead of text.
    #[arg(long)]
    json: bool,
}

/// Runs `inspect`.
pub fn run(args: Args) -> Result<()> {
    let design = crate::design::load(&args.design)?;
    let rate = choose_rate(args.rate, &design, None)?;
    let port = port(design, &args.knobs, rate)?;
    let report = inspect::build(&port);
    if args.json {
        let text =
            serde_json::to_string_pretty(&report).map_err(|e| Error::Internal(e.to_string()))?;
        println!("{text}");
    } else {
        for w in &report.warnings {
            eprintln!("warning: {w}");
        }
        print!("{}", report.to_text());
    }
    Ok(())
}
