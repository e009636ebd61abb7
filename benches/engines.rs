//! Throughput of the block engines beside reference engines, one run, same input:
//! 8 sections, 1, 2 and 8 interleaved channels, 2^21 samples per iteration, reported
//! as elements/s where one element is one section-sample. Ids are
//! `engines/<name>/<channels>`.
//!
//! Run: `cargo bench --bench engines`, then `python3 benches/medians.py engines` for
//! the medians (see benches/README.md for the scipy figures).
//! - `tonewright_*`: [`FloatEngine`] (df2t) and [`FixedEngine`] (q15 and q31, df1).
//! - `biquad_*`: the `biquad` crate's `DirectForm2Transposed`, one filter per section
//!   and channel, frames in order.
//! - `plain_*`: the plain per-sample loops of tests/common/engines.rs (the engines'
//!   original kernels; the fixed one evaluates the documented arithmetic in i128).

use biquad::{Biquad, Coefficients, DirectForm2Transposed};
use criterion::measurement::WallTime;
use criterion::{
    criterion_group, criterion_main, BatchSize, BenchmarkGroup, BenchmarkId, Criterion,
    SamplingMode, Throughput,
};
use std::f64::consts::PI;
use std::time::Duration;
use tonewright::quantize::{quantize, FixedCascade, FixedFormat, Structure};
use tonewright::sections::{Cascade, Sos};
use tonewright::simulate::{Engine, FixedEngine, FloatEngine, FloatSample, SampleScale};

#[path = "../tests/common/engines.rs"]
mod reference;

const SECTIONS: usize = 8;
const SAMPLES: usize = 1 << 21;
const CHANNELS: [usize; 3] = [1, 2, 8];

type Group<'a> = BenchmarkGroup<'a, WallTime>;

criterion_group!(benches, engines);
criterion_main!(benches);

/// Every engine on every channel count, 15 samples each. An iteration takes 5 to 40 ms,
/// so a sample averages a few iterations.
fn engines(c: &mut Criterion) {
    let mut g = c.benchmark_group("engines");
    g.sampling_mode(SamplingMode::Flat)
        .sample_size(15)
        .warm_up_time(Duration::from_secs(1))
        .measurement_time(Duration::from_secs(2));
    for channels in CHANNELS {
        float_engine::<f64>(&mut g, "tonewright_f64_df2t", channels);
        float_engine::<f32>(&mut g, "tonewright_f32_df2t", channels);
        fixed_engine(&mut g, "tonewright_q15_df1_acc32", FixedFormat::q15(), channels);
        fixed_engine(&mut g, "tonewright_q31_df1_acc64", FixedFormat::q31(), channels);
        biquad(&mut g, "biquad_df2t_f64", channels, DirectForm2Transposed::<f64>::new);
        biquad(&mut g, "biquad_df2t_f32", channels, DirectForm2Transposed::<f32>::new);
        plain_float(&mut g, "plain_f64_df2t", channels);
    }
    // The literal i128 arithmetic takes about 250 ms an iteration: mono only, and
    // criterion's fewest samples, of two or three iterations each.
    g.sample_size(10).measurement_time(Duration::from_secs(6));
    plain_fixed(&mut g, "plain_q15_df1_acc32", FixedFormat::q15(), 1);
    g.finish();
}

/// Eight resonant sections from 60 Hz to 12 kHz, each scaled to unity peak gain.
fn cascade() -> Cascade {
    let rate = 48000.0;
    let sections = (0..SECTIONS)
        .map(|k| {
            let f0 = 60.0 * 1.9f64.powi(k as i32);
            let (r, th) = (0.995 - 0.01 * k as f64, 2.0 * PI * f0 / rate);
            let a = [-2.0 * r * th.cos(), r * r];
            let g = 0.5 * (1.0 - r) * (1.0 + r);
            Sos { b: [g, 0.0, -g], a }
        })
        .collect();
    Cascade { rate, sections }
}

/// Seeded noise at a quarter of full scale (whole frames of `channels`).
fn input<T: FloatSample>(channels: usize) -> Vec<T> {
    let mut s = 0x5eed_u64;
    (0..SAMPLES / channels * channels)
        .map(|_| {
            s = s.wrapping_mul(6364136223846793005).wrapping_add(1442695040888963407);
            T::from_f64(((s >> 11) as f64 / (1u64 << 53) as f64 - 0.5) * 0.5)
        })
        .collect()
}

/// Times `f` filtering a fresh copy of `x` in place as `name`/`channels`; making the
/// copy is not timed.
fn time<S: Clone>(
    g: &mut Group,
    name: &str,
    channels: usize,
    x: Vec<S>,
    mut f: impl FnMut(&mut Vec<S>),
) {
    g.throughput(Throughput::Elements((x.len() * SECTIONS) as u64));
    g.bench_function(BenchmarkId::new(name, channels), |b| {
        b.iter_batched_ref(|| x.clone(), |buf| f(buf), BatchSize::PerIteration)
    });
}

fn float_engine<T: FloatSample>(g: &mut Group, name: &str, channels: usize) {
    let mut e = FloatEngine::<T>::new(&cascade(), Structure::Df2t, channels).expect("channels");
    time(g, name, channels, input::<T>(channels), |buf| e.process(buf).expect("whole frames"));
}

fn fixed(format: FixedFormat) -> FixedCascade {
    quantize(&cascade(), &format, Structure::Df1).expect("valid format")
}

fn fixed_input(format: FixedFormat, channels: usize) -> Vec<i32> {
    let scale = SampleScale::new(format.data_bits).expect("valid width");
    input::<f64>(channels).iter().map(|&v| scale.to_int(v)).collect()
}

fn fixed_engine(g: &mut Group, name: &str, format: FixedFormat, channels: usize) {
    let mut e = FixedEngine::new(&fixed(format), channels).expect("valid cascade");
    time(g, name, channels, fixed_input(format, channels), |buf| {
        e.process(buf).expect("whole frames")
    });
}

fn plain_float(g: &mut Group, name: &str, channels: usize) {
    let c = cascade();
    time(g, name, channels, input::<f64>(channels), |buf| {
        reference::float_cascade(&c, Structure::Df2t, channels, buf)
    });
}

fn plain_fixed(g: &mut Group, name: &str, format: FixedFormat, channels: usize) {
    let f = fixed(format);
    time(g, name, channels, fixed_input(format, channels), |buf| {
        reference::fixed_cascade(&f, channels, buf);
    });
}

fn biquad<T: FloatSample>(
    g: &mut Group,
    name: &str,
    channels: usize,
    new: fn(Coefficients<T>) -> DirectForm2Transposed<T>,
) where
    DirectForm2Transposed<T>: Biquad<T>,
{
    let coefficients = |s: &Sos| Coefficients {
        b0: T::from_f64(s.b[0]),
        b1: T::from_f64(s.b[1]),
        b2: T::from_f64(s.b[2]),
        a1: T::from_f64(s.a[0]),
        a2: T::from_f64(s.a[1]),
    };
    let c = cascade();
    let mut filters: Vec<Vec<DirectForm2Transposed<T>>> =
        (0..channels).map(|_| c.sections.iter().map(|s| new(coefficients(s))).collect()).collect();
    time(g, name, channels, input::<T>(channels), |buf| {
        for frame in buf.chunks_exact_mut(channels) {
            for (v, chain) in frame.iter_mut().zip(filters.iter_mut()) {
                *v = chain.iter_mut().fold(*v, |x, f| f.run(x));
            }
        }
    });
}
