//! `tonewright signal KIND -o FILE [--rate] [--seconds] [--level DBFS] [--bits]
//! [--channels] [--seed] …`: test signals as WAV files.

use crate::audio::signal::{self, Mains, SignalSpec};
use crate::audio::{WavReader, WavSpec, WavWriter};
use crate::error::{Error, Result};
use std::path::PathBuf;

/// The signals `signal` makes.
#[derive(Debug, Clone, Copy, clap::ValueEnum)]
pub enum Kind {
    /// A sine at --freq.
    Sine,
    /// An exponential sweep from --from to --to.
    Sweep,
    /// Gaussian white noise (level is RMS).
    White,
    /// Pink noise, −3 dB/octave (level is RMS).
    Pink,
    /// One full-level sample, then silence.
    Impulse,
    /// Equal tones at --freqs.
    Multitone,
    /// Mains hum with 8 harmonics at --mains Hz; with --under FILE, mixed under it.
    Hum,
}

/// Arguments of `signal`.
#[derive(Debug, clap::Args)]
pub struct Args {
    /// Which signal.
    #[arg(value_enum)]
    kind: Kind,
    /// Output WAV file.
    #[arg(short = 'o', long = "output")]
    output: PathBuf,
    /// Sample rate in Hz (with --under: the file's rate).
    #[arg(long, default_value_t = 48000)]
    rate: u32,
    /// Duration in seconds (with --under: the file's length).
    #[arg(long, default_value_t = 5.0)]
    seconds: f64,
    /// Level in dBFS: peak for tones, sweeps, impulses and hum; RMS for noise.
    #[arg(long, default_value_t = -6.0, allow_negative_numbers = true)]
    level: f64,
    /// Output sample format: 8, 16, 24, 32 (integer PCM), f32 or f64.
    #[arg(long, default_value = "16")]
    bits: String,
    /// Channels.
    #[arg(long, default_value_t = 1)]
    channels: u16,
    /// Seed for noise and dither, so runs are reproducible.
    #[arg(long, default_value_t = 1)]
    seed: u64,
    /// Sine frequency, Hz.
    #[arg(long, default_value_t = 1000.0)]
    freq: f64,
    /// Sweep start, Hz.
    #[arg(long, default_value_t = 20.0)]
    from: f64,
    /// Sweep end, Hz.
    #[arg(long, default_value_t = 20000.0)]
    to: f64,
    /// Multi-tone frequencies, Hz, comma-separated.
    #[arg(long, value_delimiter = ',', default_values_t = vec![100.0, 1000.0, 10000.0])]
    freqs: Vec<f64>,
    /// Mains frequency for hum: 50 or 60.
    #[arg(long, default_value_t = 50)]
    mains: u32,
    /// Mix the hum under this WAV file instead of writing hum alone.
    #[arg(long)]
    under: Option<PathBuf>,
    /// Write the file without TPDF dither.
    #[arg(long)]
    no_dither: bool,
}

/// Parses `--bits` into a sample format.
///
/// # Errors
/// Anything but 8, 16, 24, 32, f32, f64.
pub fn parse_bits(text: &str) -> Result<crate::audio::SampleFormat> {
    use crate::audio::SampleFormat;
    Ok(match text {
        "8" => SampleFormat::Int { bits: 8 },
        "16" => SampleFormat::Int { bits: 16 },
        "24" => SampleFormat::Int { bits: 24 },
        "32" => SampleFormat::Int { bits: 32 },
        "f32" => SampleFormat::Float { bits: 32 },
        "f64" => SampleFormat::Float { bits: 64 },
        other => {
            return Err(Error::input(format!("--bits {other}: expected 8, 16, 24, 32, f32 or f64")))
        }
    })
}

/// Runs `signal`.
pub fn run(args: Args) -> Result<()> {
    let sample = parse_bits(&args.bits)?;
    let mains = match args.mains {
        50 => Mains::Hz50,
        60 => Mains::Hz60,
        other => return Err(Error::input(format!("--mains {other}: expected 50 or 60"))),
    };
    let (samples, rate, channels, inputs) = match (&args.under, args.kind) {
        (Some(under), Kind::Hum) => {
            let mut reader = WavReader::open(under)?;
            let spec = reader.spec();
            let mut all = Vec::new();
            let mut block = Vec::new();
            while reader.read_block(&mut block, 65536)? > 0 {
                if all.len() + block.len() > signal::MAX_SAMPLES {
                    return Err(Error::input(format!(
                        "{}: more than {} samples is too long to mix hum under",
                        under.display(),
                        signal::MAX_SAMPLES
                    )));
                }
                all.extend_from_slice(&block);
            }
            signal::mix_hum(&mut all, spec.channels, spec.rate, mains, args.level)?;
            (all, spec.rate, spec.channels, vec![under.clone()])
        }
        (Some(_), _) => return Err(Error::input("--under goes with the `hum` signal only")),
        (None, kind) => {
            let spec = SignalSpec {
                rate: args.rate,
                channels: args.channels,
                seconds: args.seconds,
                level_dbfs: args.level,
            };
            let s = match kind {
                Kind::Sine => signal::sine(&spec, args.freq)?,
                Kind::Sweep => signal::log_sweep(&spec, args.from, args.to)?,
                Kind::White => signal::white_noise(&spec, args.seed)?,
                Kind::Pink => signal::pink_noise(&spec, args.seed)?,
                Kind::Impulse => signal::impulse(&spec)?,
                Kind::Multitone => signal::multitone(&spec, &args.freqs)?,
                Kind::Hum => {
                    let mut silence = vec![0.0; spec.frames()? * usize::from(spec.channels)];
                    signal::mix_hum(&mut silence, spec.channels, spec.rate, mains, args.level)?;
                    silence
                }
            };
            (s, args.rate, args.channels, Vec::new())
        }
    };
    let protect: Vec<&std::path::Path> = inputs.iter().map(|p| p.as_path()).collect();
    let spec = WavSpec { channels, rate, sample };
    let mut writer = WavWriter::create(&args.output, spec, &protect)?;
    if !args.no_dither && matches!(sample, crate::audio::SampleFormat::Int { .. }) {
        writer = writer.with_tpdf_dither(args.seed)?;
    }
    writer.write_block(&samples)?;
    let stats = writer.finish()?;
    if stats.overs > 0 {
        eprintln!("warning: {} samples clipped at full scale", stats.overs);
    }
    println!(
        "wrote {} ({} frames, {} Hz, {} channel(s))",
        args.output.display(),
        stats.frames,
        rate,
        channels
    );
    Ok(())
}
