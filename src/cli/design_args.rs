//! The arguments every verb that reads a design shares.

use crate::design::{self, Design};
use crate::error::Result;
use crate::quantize::NumberFormat;
use std::path::PathBuf;

/// DESIGN, `--rate`, `--knob` and `--number`.
#[derive(Debug, clap::Args)]
pub struct DesignArgs {
    /// The design file (TOML).
    pub design: PathBuf,
    /// Sample rate in Hz to discretize at (default: the design's `[target] rate`, else
    /// an input file's). A negative value reaches the range check, which names it.
    #[arg(long, allow_negative_numbers = true)]
    pub rate: Option<f64>,
    /// Knob position, NAME=POS with POS from 0 to 1 (repeatable).
    #[arg(long = "knob", value_name = "NAME=POS")]
    pub knob_settings: Vec<String>,
    /// Number format, overriding the design's `[target]`: f64, f32, q15, q23 or q31.
    #[arg(long)]
    pub number: Option<String>,
}

impl DesignArgs {
    /// Loads the design, with `--number` replacing its target's number format.
    ///
    /// # Errors
    /// An unreadable or invalid design, or an unknown `--number`.
    pub fn load(&self) -> Result<Design> {
        let mut d = design::load(&self.design)?;
        if let Some(n) = &self.number {
            d.target.number = NumberFormat::parse("--number", n)?;
        }
        Ok(d)
    }
}
