//! `tonewright audition DESIGN INPUT.wav -o DIR`: a folder with the input, the float,
//! target and residual runs, the figures and an index.html that switches between them.

use super::design_args::DesignArgs;
use super::plot::write_figures;
use crate::apply::{apply_file, ApplyOptions, FileReport, Outputs};
use crate::atomic_file::AtomicFile;
use crate::audition::{write_page, AuditionPage, Track};
use crate::error::{Error, Result};
use crate::pipeline::{choose_rate, port};
use crate::plot::design::figures;
use crate::report::fmt_db;
use crate::report::inspect::{self, number_name};
use std::io::Write;
use std::path::PathBuf;

/// Arguments of `audition`.
#[derive(Debug, clap::Args)]
#[command(after_help = super::LISTENING_CAUTION)]
pub struct Args {
    #[command(flatten)]
    design: DesignArgs,
    /// The recording to audition (WAV).
    input: PathBuf,
    /// Folder to write (created if missing).
    #[arg(short = 'o', long = "output")]
    output: PathBuf,
    /// Gain of the residual track, dB.
    #[arg(long, default_value_t = 40.0, allow_negative_numbers = true)]
    residual_gain: f64,
    /// Run a quantized design even when it is unstable.
    #[arg(long)]
    force: bool,
}

/// Runs `audition`.
pub fn run(args: Args) -> Result<()> {
    let design = args.design.load()?;
    let number = design.target.number;
    let dir = &args.output;
    std::fs::create_dir_all(dir).map_err(|e| Error::io(dir, e))?;
    let protect = [args.input.as_path(), args.design.design.as_path()];

    let input_copy = dir.join("input.wav");
    let bytes = std::fs::read(&args.input).map_err(|e| Error::io(&args.input, e))?;
    let outputs = Outputs {
        main: dir.join("target.wav"),
        float: Some(dir.join("float64.wav")),
        residual: Some(dir.join("residual.wav")),
        residual_gain_db: args.residual_gain,
    };
    let opts = ApplyOptions {
        knobs: args.design.knob_settings.clone(),
        rate: args.design.rate,
        number,
        bits: None,
        dither: true,
        seed: 1,
        force: args.force,
        compare: true,
    };
    let report = apply_file(&design, &args.input, &outputs, &opts, &|_| {})?;
    let mut copy = AtomicFile::create(&input_copy, &protect)?;
    copy.write_all(&bytes).map_err(|e| Error::io(&input_copy, e))?;
    copy.commit()?;

    let rate = choose_rate(args.design.rate, &design, Some(f64::from(report.file_rate)))?;
    let port = port(design, &args.design.knob_settings, rate)?;
    let figs = figures(&port, number, None)?;
    write_figures(dir, &figs, &protect)?;
    let summary = inspect::build(&port, number, None)?;
    let page = page(&report, &summary, &figs, &number_name(number), args.residual_gain);
    write_page(dir, &page)?;
    print!("{}", report.to_text());
    println!("wrote {}", dir.join(crate::audition::PAGE_FILE).display());
    Ok(())
}

fn page(
    report: &FileReport,
    summary: &inspect::InspectReport,
    figs: &[(String, String)],
    target: &str,
    residual_gain: f64,
) -> AuditionPage {
    let seconds = report.frames as f64 / f64::from(report.file_rate);
    let rms = |levels: &[crate::audio::metrics::ChannelLevels]| {
        levels.iter().map(|l| l.rms_dbfs).fold(f64::NEG_INFINITY, f64::max)
    };
    // Filtered versions play at the input's loudness so the switch compares tone, not level.
    let match_input = (rms(&report.input_levels) - rms(&report.output_levels)).clamp(-60.0, 60.0);
    let track = |label: &str, file: &str, offset: f64| Track {
        label: label.into(),
        file_name: file.into(),
        level_offset_db: offset,
        duration_s: seconds,
    };
    let mut summary_lines = vec![
        format!("design: {} ({})", summary.name, summary.file),
        format!("rate {} Hz, target {}", summary.rate, summary.target),
        format!(
            "peak gain {} at {:.1} Hz",
            fmt_db(summary.response.peak[1]),
            summary.response.peak[0]
        ),
    ];
    if let Some(f) = &summary.fixed {
        summary_lines.push(format!("fixed-point verdict: {:?}", f.analysis.assessment.verdict));
    }
    summary_lines.extend(summary.warnings.iter().map(|w| format!("warning: {w}")));
    let mut metrics = vec![
        ("frames".to_string(), report.frames.to_string()),
        ("clipped samples".into(), report.clipped.to_string()),
        ("kernel overflows".into(), report.overflows.to_string()),
        ("level match applied".into(), fmt_db(match_input)),
    ];
    if let Some(snr) = report.snr_vs_float_db {
        metrics.push((format!("{target} vs float64 SNR"), format!("{snr:.1} dB")));
    }
    if let Some(r) = &report.rejection {
        metrics.push((
            format!("rejection at {:.1} Hz", r.hz),
            format!("{:.1} dB measured", r.measured_db),
        ));
    }
    AuditionPage {
        title: format!("{} · audition", summary.name),
        summary_lines,
        metrics,
        figures: figs.iter().map(|(name, _)| name.clone()).collect(),
        tracks: vec![
            track("input", "input.wav", 0.0),
            track("float64", "float64.wav", match_input),
            track(target, "target.wav", match_input),
            track(&format!("residual (+{residual_gain:.0} dB)"), "residual.wav", 0.0),
        ],
    }
}
