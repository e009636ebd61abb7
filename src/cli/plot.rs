//! `tonewright plot DESIGN -o DIR [--knob NAME=POS]... [--sweep KNOB]`

use super::design_args::DesignArgs;
use crate::error::{Error, Result};
use crate::pipeline::{choose_rate, port};
use crate::plot::{design::figures, write_svg};
use std::path::{Path, PathBuf};

/// Arguments of `plot`.
#[derive(Debug, clap::Args)]
pub struct Args {
    #[command(flatten)]
    design: DesignArgs,
    /// Folder for the SVG figures (created if missing).
    #[arg(short = 'o', long = "output")]
    output: PathBuf,
    /// Also draw the magnitude over this knob's travel.
    #[arg(long, value_name = "KNOB")]
    sweep: Option<String>,
}

/// Writes figures into `dir`, never over `protect`; returns the paths written.
///
/// # Errors
/// An uncreatable folder or an unwritable file.
pub fn write_figures(
    dir: &Path,
    figs: &[(String, String)],
    protect: &[&Path],
) -> Result<Vec<PathBuf>> {
    std::fs::create_dir_all(dir).map_err(|e| Error::io(dir, e))?;
    figs.iter()
        .map(|(name, svg)| {
            let path = dir.join(name);
            write_svg(&path, svg, protect)?;
            Ok(path)
        })
        .collect()
}

/// Runs `plot`.
pub fn run(args: Args) -> Result<()> {
    let design = args.design.load()?;
    let rate = choose_rate(args.design.rate, &design, None)?;
    let number = design.target.number;
    let port = port(design, &args.design.knob_settings, rate)?;
    let figs = figures(&port, number, args.sweep.as_deref())?;
    for path in write_figures(&args.output, &figs, &[&args.design.design])? {
        println!("wrote {}", path.display());
    }
    Ok(())
}
