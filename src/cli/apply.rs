//! `tonewright apply DESIGN INPUT... -o OUTPUT [options]`

use super::design_args::DesignArgs;
use super::signal::parse_bits;
use crate::apply::{apply_file, check_batch, ApplyOptions, FileReport, Outputs};
use crate::error::{Error, Result};
use indicatif::{MultiProgress, ProgressBar, ProgressStyle};
use rayon::prelude::*;
use std::path::{Path, PathBuf};

/// Arguments of `apply`.
#[derive(Debug, clap::Args)]
#[command(after_help = super::LISTENING_CAUTION)]
pub struct Args {
    #[command(flatten)]
    design: DesignArgs,
    /// WAV files to process (with several, OUTPUT is a folder).
    #[arg(required = true)]
    inputs: Vec<PathBuf>,
    /// Output WAV file, or folder for several inputs.
    #[arg(short = 'o', long = "output")]
    output: PathBuf,
    /// Output sample format: 8, 16, 24, 32, f32 or f64 (default: the input's).
    #[arg(long)]
    bits: Option<String>,
    /// Also run f64 and report the output's SNR against it.
    #[arg(long)]
    compare: bool,
    /// Write the f64 run here (a folder for several inputs); implies --compare.
    #[arg(long, value_name = "FILE")]
    float_out: Option<PathBuf>,
    /// Write (output − f64 run) × --residual-gain here as 32-bit float; implies --compare.
    #[arg(long, value_name = "FILE")]
    residual: Option<PathBuf>,
    /// Gain of the residual file, dB.
    #[arg(long, default_value_t = 40.0, allow_negative_numbers = true)]
    residual_gain: f64,
    /// No TPDF dither when the output word is shorter than the processing word.
    #[arg(long)]
    no_dither: bool,
    /// Dither seed.
    #[arg(long, default_value_t = 1)]
    seed: u64,
    /// Run a quantized design even when it is unstable.
    #[arg(long)]
    force: bool,
    /// Print the report as JSON.
    #[arg(long)]
    json: bool,
}

/// Where file `input` of a batch writes: `dir/NAME` when `batch`, else `path` itself.
fn place(path: &Path, input: &Path, batch: bool) -> Result<PathBuf> {
    if !batch {
        return Ok(path.to_path_buf());
    }
    let name = input
        .file_name()
        .ok_or_else(|| Error::input(format!("{}: not a file", input.display())))?;
    Ok(path.join(name))
}

/// Runs `apply`.
pub fn run(args: Args) -> Result<()> {
    let design = args.design.load()?;
    let number = design.target.number;
    let bits = args.bits.as_deref().map(parse_bits).transpose()?;
    // 200 dB lifts a 32-bit LSB (2^-31, -187 dBFS) to full scale; more only overflows.
    if !(args.residual_gain.is_finite() && args.residual_gain.abs() <= 200.0) {
        return Err(Error::input(format!(
            "--residual-gain {}: must be a number of dB from -200 to 200",
            args.residual_gain
        )));
    }
    let batch = args.inputs.len() > 1;
    check_batch(&args.inputs)?;
    if batch {
        let mut names: Vec<_> = args.inputs.iter().filter_map(|p| p.file_name()).collect();
        names.sort();
        if let Some(w) = names.windows(2).find(|w| w[0] == w[1]) {
            return Err(Error::input(format!(
                "two inputs are named {}: their outputs would collide in {}",
                w[0].to_string_lossy(),
                args.output.display()
            )));
        }
        for dir in [Some(&args.output), args.float_out.as_ref(), args.residual.as_ref()]
            .into_iter()
            .flatten()
        {
            std::fs::create_dir_all(dir).map_err(|e| Error::io(dir, e))?;
        }
    }
    let opts = ApplyOptions {
        knobs: args.design.knob_settings.clone(),
        rate: args.design.rate,
        number,
        bits,
        dither: !args.no_dither,
        seed: args.seed,
        force: args.force,
        compare: args.compare,
    };
    let bars = MultiProgress::new();
    let style = ProgressStyle::with_template("{prefix} {bar:30} {percent}% {eta}")
        .map_err(|e| Error::Internal(e.to_string()))?;
    let results: Vec<Result<FileReport>> = args
        .inputs
        .par_iter()
        .map(|input| {
            let outputs = Outputs {
                main: place(&args.output, input, batch)?,
                float: args.float_out.as_deref().map(|p| place(p, input, batch)).transpose()?,
                residual: args.residual.as_deref().map(|p| place(p, input, batch)).transpose()?,
                residual_gain_db: args.residual_gain,
            };
            let total = crate::audio::WavReader::open(input)?.frames();
            let bar = bars.add(ProgressBar::new(total).with_style(style.clone()));
            bar.set_prefix(input.display().to_string());
            let report =
                apply_file(&design, input, &outputs, &opts, &|done| bar.set_position(done));
            bar.finish_and_clear();
            report
        })
        .collect();
    let mut reports = Vec::new();
    let mut errors = Vec::new();
    for (input, result) in args.inputs.iter().zip(results) {
        match result {
            Ok(r) => reports.push(r),
            Err(e) if batch => errors.push(naming(input, e)),
            Err(e) => errors.push(e),
        }
    }
    if args.json {
        let text =
            serde_json::to_string_pretty(&reports).map_err(|e| Error::Internal(e.to_string()))?;
        println!("{text}");
    } else {
        for r in &reports {
            print!("{}", r.to_text());
        }
    }
    // One line per failed file, in input order: the last is printed by the caller.
    let last = errors.pop();
    for e in errors {
        eprintln!("error: {e}");
    }
    last.map_or(Ok(()), Err)
}

/// `e`, with the input's name in front unless its message already names it.
fn naming(input: &Path, e: Error) -> Error {
    let name = input.display().to_string();
    match e {
        Error::Input(m) if !m.contains(&name) => Error::Input(format!("{name}: {m}")),
        Error::Numeric(m) if !m.contains(&name) => Error::Numeric(format!("{name}: {m}")),
        other => other,
    }
}
