//! `tonewright export DESIGN --lang c|rust [-o DIR] [--template FILE]... [--vectors N]
//! [--knobs] [--rate HZ] [--knob NAME=POS]... [--force]`

use super::design_args::DesignArgs;
use crate::error::Result;
use crate::export::{self, ExportOptions, Lang};
use crate::pipeline::{choose_rate, port};
use std::path::PathBuf;

/// Arguments of `export`.
#[derive(Debug, clap::Args)]
pub struct Args {
    #[command(flatten)]
    design: DesignArgs,
    /// Language of the generated source.
    #[arg(long, value_enum)]
    lang: Lang,
    /// Folder for the generated files (must exist).
    #[arg(short = 'o', long = "output", default_value = ".")]
    output: PathBuf,
    /// A template replacing the built-in one of the same file name (repeatable).
    #[arg(long = "template", value_name = "FILE")]
    templates: Vec<PathBuf>,
    /// Write golden test vectors of N frames and a check program.
    #[arg(long, value_name = "N")]
    vectors: Option<usize>,
    /// Write coefficient tables over every knob's travel, with interpolation advice.
    #[arg(long)]
    knobs: bool,
    /// Export even when the stored poles reach the unit circle.
    #[arg(long)]
    force: bool,
}

/// Runs `export`; `command` is the command line for the generated headers.
pub fn run(args: Args, command: String) -> Result<()> {
    let design = args.design.load()?;
    let rate = choose_rate(args.design.rate, &design, None)?;
    let port = port(design, &args.design.knob_settings, rate)?;
    let options = ExportOptions {
        lang: args.lang,
        templates: args.templates.clone(),
        vectors: args.vectors,
        knob_tables: args.knobs,
        force: args.force,
        command,
    };
    let out = export::export(&port, &options)?;
    let mut inputs: Vec<&std::path::Path> = vec![args.design.design.as_path()];
    inputs.extend(args.templates.iter().map(PathBuf::as_path));
    let written = export::write(&out, &args.output, &inputs)?;
    for w in &out.warnings {
        eprintln!("warning: {w}");
    }
    for line in &out.advice {
        println!("{line}");
    }
    for path in written {
        println!("wrote {}", path.display());
    }
    Ok(())
}
