//! End-to-end throughput: read a WAV file, run it through 8 sections in f64 and in q15
//! (df1, 32-bit accumulator) side by side on two threads, write both results as 16-bit WAV files;
//! timed against the same reads and writes with no filtering.
//!
//! ```text
//! cargo run --release --example end_to_end -- /tmp/tonewright-e2e-10min.wav
//! ```
//!
//! A missing input is first made: 10 minutes of seeded stereo noise at −12 dBFS,
//! 48 kHz, 16-bit. Outputs go beside the input (`.f64.wav`, `.q15.wav`). The cascade
//! is the one of benches/engines.rs: 8 resonant sections from 60 Hz to 12 kHz.

use std::f64::consts::PI;
use std::path::{Path, PathBuf};
use std::time::Instant;
use tonewright::audio::dither::SplitMix64;
use tonewright::audio::{SampleFormat, WavReader, WavSpec, WavWriter};
use tonewright::quantize::{quantize, FixedFormat, Structure};
use tonewright::sections::{Cascade, Sos};
use tonewright::simulate::{Engine, FixedEngine, FloatEngine, SampleScale};
use tonewright::Result;

const BLOCK_FRAMES: usize = 16384;

fn cascade() -> Cascade {
    let rate = 48000.0;
    let sections = (0..8)
        .map(|k| {
            let f0 = 60.0 * 1.9f64.powi(k);
            let (r, th) = (0.995 - 0.01 * f64::from(k), 2.0 * PI * f0 / rate);
            let g = 0.5 * (1.0 - r) * (1.0 + r);
            Sos { b: [g, 0.0, -g], a: [-2.0 * r * th.cos(), r * r] }
        })
        .collect();
    Cascade { rate, sections }
}

/// Writes 10 minutes of stereo noise to `path`.
fn make_input(path: &Path) -> Result<()> {
    let spec = WavSpec { channels: 2, rate: 48_000, sample: SampleFormat::Int { bits: 16 } };
    let mut w = WavWriter::create(path, spec, &[])?;
    let mut rng = SplitMix64::new(10);
    let mut block = vec![0.0; 2 * BLOCK_FRAMES];
    for _ in 0..(600 * 48_000 / BLOCK_FRAMES + 1) {
        block.iter_mut().for_each(|v| *v = 0.25 * (2.0 * rng.next_f64() - 1.0));
        w.write_block(&block)?;
    }
    w.finish()?;
    Ok(())
}

/// Reads `input` and writes the two outputs; filters them when `filter` is true.
/// Returns the seconds taken and the frames read.
fn run(input: &Path, outputs: [&PathBuf; 2], filter: bool) -> Result<(f64, u64)> {
    let t = Instant::now();
    let mut r = WavReader::open(input)?;
    let spec = WavSpec { sample: SampleFormat::Int { bits: 16 }, ..r.spec() };
    let channels = usize::from(spec.channels);
    let c = cascade();
    let mut float = FloatEngine::<f64>::new(&c, Structure::Df2t, channels)?;
    let fixed = quantize(&c, &FixedFormat::q15(), Structure::Df1)?;
    let mut q15 = FixedEngine::new(&fixed, channels)?;
    let scale = SampleScale::new(16)?;
    let mut wf = WavWriter::create(outputs[0], spec, &[input])?;
    let mut wq = WavWriter::create(outputs[1], spec, &[input])?;
    let (mut x, mut y, mut ints) = (Vec::new(), Vec::new(), Vec::new());
    while r.read_block(&mut x, BLOCK_FRAMES)? > 0 {
        y.clone_from(&x);
        ints.clear();
        ints.extend(x.iter().map(|&v| scale.to_int(v)));
        if filter {
            // The two engines are independent: one core each (rayon).
            let (a, b) = rayon::join(|| float.process(&mut y), || q15.process(&mut ints));
            a?;
            b?;
        }
        y.iter_mut().for_each(|v| *v = v.clamp(-1.0, 1.0));
        wf.write_block(&y)?;
        x.clear();
        x.extend(ints.iter().map(|&v| scale.to_f64(v)));
        wq.write_block(&x)?;
    }
    wf.finish()?;
    wq.finish()?;
    Ok((t.elapsed().as_secs_f64(), r.frames()))
}

fn main() -> Result<()> {
    let input = std::env::args()
        .nth(1)
        .map(PathBuf::from)
        .unwrap_or_else(|| std::env::temp_dir().join("tonewright-e2e-10min.wav"));
    if !input.exists() {
        make_input(&input)?;
    }
    let outputs = [input.with_extension("f64.wav"), input.with_extension("q15.wav")];
    let best = |filter: bool| -> Result<(f64, u64)> {
        let mut best = (f64::INFINITY, 0);
        for _ in 0..3 {
            let (s, frames) = run(&input, [&outputs[0], &outputs[1]], filter)?;
            best = (best.0.min(s), frames);
        }
        Ok(best)
    };
    let (copy, frames) = best(false)?;
    let (filtered, _) = best(true)?;
    let load = std::fs::read_to_string("/proc/loadavg").unwrap_or_default();
    println!("{} frames; best of 3; load average {}", frames, load.trim());
    println!("read + write f64 and q15 outputs, no filtering: {copy:.3} s");
    println!("read + 8 sections f64 and q15 + write:          {filtered:.3} s");
    println!("ratio {:.2}", filtered / copy);
    Ok(())
}
