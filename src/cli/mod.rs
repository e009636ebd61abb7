//! The command line: one file per verb; each parses its arguments, calls the library
//! and prints. Errors print as one `error: …` line and map to exit codes (0 ok, 1 a
//! requested check failed or an internal error, 2 bad input or I/O).

mod apply;
mod audition;
mod design_args;
mod export;
mod inspect;
mod plot;
mod signal;

use clap::{Parser, Subcommand};

/// The listening caution shown under `apply` and `audition` in `--help`.
const LISTENING_CAUTION: &str = "Caution: start playback quietly. Resonant, high-gain or \
unstable quantized filters can produce full-scale tones; protect your hearing and your speakers.";
use std::ffi::OsString;

/// Port analog filters and tone stages to DSP firmware.
#[derive(Debug, Parser)]
#[command(name = "tonewright", version, about, long_about = None)]
struct Cli {
    #[command(subcommand)]
    verb: Verb,
}

#[derive(Debug, Subcommand)]
enum Verb {
    /// Run a design over WAV recordings in the target's arithmetic (and f64).
    Apply(apply::Args),
    /// Write an audition folder: input, float, target and residual runs, figures, page.
    Audition(audition::Args),
    /// Write C or Rust firmware: coefficient tables, kernel, golden vectors.
    Export(export::Args),
    /// Report the analog model, the digital sections and how they differ.
    Inspect(inspect::Args),
    /// Draw SVG figures: magnitude, phase, delay, stage by stage, z plane, errors.
    Plot(plot::Args),
    /// Write a test signal (sine, sweep, noise, impulse, multi-tone, mains hum) as WAV.
    Signal(signal::Args),
}

/// Runs the tool on command-line arguments and returns the process exit code.
pub fn run(args: impl IntoIterator<Item = OsString>) -> i32 {
    let args: Vec<OsString> = args.into_iter().collect();
    let cli = match Cli::try_parse_from(&args) {
        Ok(cli) => cli,
        Err(e) => {
            let _ = e.print();
            return e.exit_code();
        }
    };
    let result = match cli.verb {
        Verb::Apply(a) => apply::run(a),
        Verb::Audition(a) => audition::run(a),
        Verb::Export(a) => export::run(a, command_line(&args)),
        Verb::Inspect(a) => inspect::run(a),
        Verb::Plot(a) => plot::run(a),
        Verb::Signal(a) => signal::run(a),
    };
    match result {
        Ok(()) => 0,
        Err(e) => {
            eprintln!("error: {e}");
            e.exit_code()
        }
    }
}

/// The command as typed, program name first as `tonewright` (so generated headers do
/// not depend on where the binary lives); arguments with spaces or quotes are quoted.
fn command_line(args: &[OsString]) -> String {
    let quote = |a: &OsString| {
        let s = a.to_string_lossy();
        if s.is_empty() || s.contains(|c: char| c.is_whitespace() || c == '\'' || c == '"') {
            format!("'{}'", s.replace('\'', "'\\''"))
        } else {
            s.into_owned()
        }
    };
    std::iter::once("tonewright".to_string())
        .chain(args.iter().skip(1).map(quote))
        .collect::<Vec<_>>()
        .join(" ")
}
