//! One file through the engines, streaming.

use super::blocks::{self, Stages};
use super::rejection::{stop_frequency, MIN_TONE_PERIODS};
use super::report::{FileReport, Rejection};
use crate::audio::metrics::{amp_to_db, LevelMeter, ToneMeter};
use crate::audio::{SampleFormat, WavReader, WavSpec, WavWriter};
use crate::design::Design;
use crate::error::{Error, Result};
use crate::pipeline::{choose_rate, port, realize, Realized};
use crate::quantize::{NumberFormat, Structure};
use crate::report::inspect::number_name;
use crate::sections::max_pole_radius;
use crate::sections::norms::linf_norm;
use crate::simulate::Runner;
use std::path::{Path, PathBuf};
use std::time::Instant;

/// How to run a design over a file.
#[derive(Debug, Clone)]
pub struct ApplyOptions {
    /// Knob settings `NAME=POS`.
    pub knobs: Vec<String>,
    /// Sample rate to discretize at, overriding the design and the file.
    pub rate: Option<f64>,
    /// The arithmetic of the main output.
    pub number: NumberFormat,
    /// Output sample format; `None` keeps the input's.
    pub bits: Option<SampleFormat>,
    /// TPDF dither when the output word is shorter than the processing word.
    pub dither: bool,
    /// Dither seed.
    pub seed: u64,
    /// Run a quantized design even when its poles reach |z| >= 1.
    pub force: bool,
    /// Also run f64 and report the output's SNR against it (implied by a float or
    /// residual output).
    pub compare: bool,
}

/// Where the results go.
#[derive(Debug, Clone)]
pub struct Outputs {
    /// The target-arithmetic output.
    pub main: PathBuf,
    /// The f64 run, when compared.
    pub float: Option<PathBuf>,
    /// The main-minus-f64 difference times `residual_gain_db`, as 32-bit float.
    pub residual: Option<PathBuf>,
    /// Gain applied to the residual so quantization noise can be heard, dB.
    pub residual_gain_db: f64,
}

/// Opens every input's header and checks that a batch is consistent.
///
/// # Errors
/// An unreadable or malformed file, or channel counts that differ.
pub fn check_batch(inputs: &[PathBuf]) -> Result<Vec<WavSpec>> {
    let specs =
        inputs.iter().map(|p| WavReader::open(p).map(|r| r.spec())).collect::<Result<Vec<_>>>()?;
    if let Some(first) = specs.first() {
        for (spec, path) in specs.iter().zip(inputs) {
            if spec.channels != first.channels {
                return Err(Error::input(format!(
                    "{}: {} channels, but {} has {}: a batch must share one channel count",
                    path.display(),
                    spec.channels,
                    inputs[0].display(),
                    first.channels
                )));
            }
        }
    }
    Ok(specs)
}

/// Runs `design` over `input`, writing `outputs`; `progress` is told the frames done.
///
/// # Errors
/// Unreadable or malformed input, an unwritable output (or one equal to an input), a
/// design the file's rate cannot hold, or a quantized design with poles on or outside
/// the unit circle (unless forced). No output is left behind on error.
pub fn apply_file(
    design: &Design,
    input: &Path,
    outputs: &Outputs,
    opts: &ApplyOptions,
    progress: &(dyn Fn(u64) + Sync),
) -> Result<FileReport> {
    let started = Instant::now();
    let mut reader = WavReader::open(input)?;
    let spec = reader.spec();
    let channels = usize::from(spec.channels);
    let rate = choose_rate(opts.rate, design, Some(f64::from(spec.rate))).map_err(|e| {
        match e {
            // The rate is the file's own: say which file.
            Error::Input(m) if opts.rate.is_none() && design.target.rate.is_none() => {
                Error::input(format!("{}: {m}", input.display()))
            }
            other => other,
        }
    })?;
    let mut warnings = Vec::new();
    if rate != f64::from(spec.rate) {
        warnings.push(format!(
            "design discretized at {rate} Hz but {} is {} Hz: every frequency is off by a factor {:.4}",
            input.display(),
            spec.rate,
            f64::from(spec.rate) / rate
        ));
    }
    let port = port(design.clone(), &opts.knobs, rate)?;
    let structure = design.target.structure;
    let realized = realize(&port.cascade, opts.number, structure)?;
    if let Realized::Fixed(f) = &realized {
        if !f.is_stable() && !opts.force {
            return Err(Error::input(format!(
                "{}: the quantized design has a pole on or outside the unit circle and would \
                 run away; see `tonewright inspect`, or pass --force to run it anyway",
                design.file
            )));
        }
    }
    let effective = realized.effective(rate)?;
    let peak = linf_norm(&effective.sections);
    if peak > 1.0 {
        warnings.push(format!(
            "the design's peak gain is {:+.1} dB: a loud input can clip; start playback quietly",
            amp_to_db(peak)
        ));
    }

    let mut main = Runner::new(&realized, structure, channels)?;
    let compare = opts.compare || outputs.float.is_some() || outputs.residual.is_some();
    // The f64 reference runs in df2t whatever the target's structure: in f64 the two
    // structures differ by rounding near 1e-16, and df2t has the faster kernel.
    let mut float = if compare {
        Some(Runner::new(
            &realize(&port.cascade, NumberFormat::F64, Structure::Df2t)?,
            Structure::Df2t,
            channels,
        )?)
    } else {
        None
    };
    let out_spec = WavSpec { sample: opts.bits.unwrap_or(spec.sample), ..spec };
    let protect = [input];
    let writer = |path: &Path, spec: WavSpec, word_bits: u32, seed: u64| -> Result<WavWriter> {
        let w = WavWriter::create(path, spec, &protect)?;
        match spec.sample {
            SampleFormat::Int { bits } if opts.dither && u32::from(bits) < word_bits => {
                w.with_tpdf_dither(seed)
            }
            _ => Ok(w),
        }
    };
    let mut main_out = writer(&outputs.main, out_spec, main.word_bits(), opts.seed)?;
    let mut float_out = match (&outputs.float, &float) {
        (Some(p), Some(f)) => Some(writer(p, out_spec, f.word_bits(), opts.seed ^ 0x9e37_79b9)?),
        _ => None,
    };
    let residual_spec = WavSpec { sample: SampleFormat::Float { bits: 32 }, ..spec };
    let mut residual_out = match &outputs.residual {
        Some(p) => Some(writer(p, residual_spec, 24, 0)?),
        None => None,
    };
    let residual_gain = 10f64.powf(outputs.residual_gain_db / 20.0);

    let frames = reader.frames();
    // Measure the rejection after the slowest pole has settled (e^−7 ≈ 1e−3).
    let radius = max_pole_radius(&effective.sections);
    let settle = ((7.0 / (1.0 - radius).max(1e-9)).ceil() as u64).min(frames / 4);
    let meter_len = (frames - settle) as usize;
    let stop = stop_frequency(&effective).filter(|s| {
        let periods = meter_len as f64 * s.hz / f64::from(spec.rate);
        let enough = periods >= MIN_TONE_PERIODS;
        if !enough {
            warnings.push(format!(
                "{}: too short to measure the rejection at {:.2} Hz ({periods:.1} periods after \
                 the filter settles, {MIN_TONE_PERIODS} needed)",
                input.display(),
                s.hz
            ));
        }
        enough
    });
    let mut tone_in = stop.map(|s| ToneMeter::new(f64::from(spec.rate), s.hz, meter_len));
    let mut tone_out = tone_in.clone();
    let mut levels_in = LevelMeter::new(spec.channels, spec.sample);
    let mut levels_out = LevelMeter::new(spec.channels, out_spec.sample);

    let totals = blocks::run(
        Stages {
            reader: &mut reader,
            channels,
            target: &mut main,
            reference: float.as_mut(),
            levels_in: &mut levels_in,
            levels_out: &mut levels_out,
            tone_in: tone_in.as_mut(),
            tone_out: tone_out.as_mut(),
            settle,
            target_out: &mut main_out,
            reference_out: float_out.as_mut(),
            residual_out: residual_out.as_mut(),
            residual_gain,
        },
        progress,
    )?;
    // Each output is synced to disk before it is renamed: the three wait side by side.
    let (main_done, (float_done, residual_done)) = rayon::join(
        || main_out.finish(),
        || rayon::join(|| float_out.map(WavWriter::finish), || residual_out.map(WavWriter::finish)),
    );
    let stats = main_done?;
    float_done.transpose()?;
    residual_done.transpose()?;
    if stats.overs > 0 {
        warnings.push(format!("{} output samples clipped at full scale", stats.overs));
    }
    if main.overflows() > 0 {
        warnings.push(format!(
            "{} internal overflow events in the fixed-point kernel",
            main.overflows()
        ));
    }
    let rejection = match (stop, &tone_in, &tone_out) {
        (Some(s), Some(i), Some(o)) if i.amplitude() > 1e-5 => Some(Rejection {
            hz: s.hz,
            predicted_db: s.predicted_db.is_finite().then_some(s.predicted_db),
            measured_db: amp_to_db(i.amplitude()) - amp_to_db(o.amplitude()),
        }),
        _ => None,
    };
    let seconds = started.elapsed().as_secs_f64();
    let audio_seconds = frames as f64 / f64::from(spec.rate);
    Ok(FileReport {
        input: input.display().to_string(),
        output: outputs.main.display().to_string(),
        file_rate: spec.rate,
        design_rate: rate,
        target: format!("{} {}", number_name(opts.number), structure),
        frames: totals.frames,
        input_levels: levels_in.levels(),
        output_levels: levels_out.levels(),
        clipped: stats.overs,
        overflows: main.overflows(),
        snr_vs_float_db: compare.then(|| 10.0 * (totals.signal_power / totals.error_power).log10()),
        rejection,
        seconds,
        realtime_factor: audio_seconds / seconds.max(1e-9),
        warnings,
    })
}
