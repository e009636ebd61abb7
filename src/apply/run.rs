//! One file through the engines, streaming.

use super::rejection::stop_frequency;
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

/// Frames per block: large enough to amortise the hand-over between the two cores
/// (8192 spent a tenth of the time switching threads), small enough for the second-level
/// cache (512 KiB of stereo f64).
pub const BLOCK_FRAMES: usize = 32768;

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
    let stop = stop_frequency(&effective);
    // Measure the rejection after the slowest pole has settled (e^−7 ≈ 1e−3).
    let radius = max_pole_radius(&effective.sections);
    let settle = ((7.0 / (1.0 - radius).max(1e-9)).ceil() as u64).min(frames / 4);
    let meter_len = (frames - settle) as usize;
    let mut tone_in = stop.map(|s| ToneMeter::new(f64::from(spec.rate), s.hz, meter_len));
    let mut tone_out = tone_in.clone();
    let mut levels_in = LevelMeter::new(spec.channels, spec.sample);
    let mut levels_out = LevelMeter::new(spec.channels, out_spec.sample);
    let (mut signal_power, mut error_power) = (0.0f64, 0.0f64);

    let mut block = Vec::with_capacity(BLOCK_FRAMES * channels);
    let mut reference = Vec::with_capacity(BLOCK_FRAMES * channels);
    let mut done = 0u64;
    while reader.read_block(&mut block, BLOCK_FRAMES)? > 0 {
        let skip = settle.saturating_sub(done) as usize;
        let channel0 =
            |b: &[f64]| b.iter().step_by(channels).skip(skip).copied().collect::<Vec<_>>();
        let mut meter_input = |x: &[f64]| {
            levels_in.add(x);
            if let Some(t) = &mut tone_in {
                t.add(channel0(x));
            }
        };
        // The target's run, its meters and its file.
        let mut target_side = |block: &mut Vec<f64>| -> Result<()> {
            main.process(block)?;
            levels_out.add(block);
            if let Some(t) = &mut tone_out {
                t.add(channel0(block));
            }
            main_out.write_block(block)
        };
        match &mut float {
            Some(f) => {
                // The target on one core; the input's meters, the f64 reference and its
                // file on the other.
                reference.clear();
                reference.extend_from_slice(&block);
                let (done_main, done_float) = rayon::join(
                    || target_side(&mut block),
                    || -> Result<f64> {
                        meter_input(&reference);
                        f.process(&mut reference)?;
                        if let Some(w) = &mut float_out {
                            w.write_block(&reference)?;
                        }
                        Ok(reference.iter().map(|x| x * x).sum::<f64>())
                    },
                );
                done_main?;
                signal_power += done_float?;
                for (x, r) in block.iter_mut().zip(&reference) {
                    let e = *x - r;
                    error_power += e * e;
                    *x = e * residual_gain;
                }
                if let Some(w) = &mut residual_out {
                    w.write_block(&block)?;
                }
            }
            None => {
                meter_input(&block);
                target_side(&mut block)?;
            }
        }
        done += (block.len() / channels) as u64;
        progress(done);
    }
    let stats = main_out.finish()?;
    if let Some(w) = float_out {
        w.finish()?;
    }
    if let Some(w) = residual_out {
        w.finish()?;
    }
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
        frames: done,
        input_levels: levels_in.levels(),
        output_levels: levels_out.levels(),
        clipped: stats.overs,
        overflows: main.overflows(),
        snr_vs_float_db: compare.then(|| 10.0 * (signal_power / error_power).log10()),
        rejection,
        seconds,
        realtime_factor: audio_seconds / seconds.max(1e-9),
        warnings,
    })
}
