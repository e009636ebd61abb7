//! Throughput of the block engines beside reference engines, one run, same input:
//! 8 sections, 1, 2 and 8 interleaved channels, 2^21 samples per iteration, reported
//! as items/s where one item is one section-sample.
//!
//! Run: `cargo bench --bench engines` (see benches/README.md for the scipy figures).
//! - `tonewright_*`: [`FloatEngine`] (df2t) and [`FixedEngine`] (q15 and q31, df1).
//! - `biquad_*`: the `biquad` crate's `DirectForm2Transposed`, one filter per section
//!   and channel, frames in order.
//! - `plain_*`: the plain per-sample loops of tests/common/engines.rs (the engines'
//!   original kernels; the fixed one evaluates the documented arithmetic in i128).

use biquad::{Biquad, Coefficients, DirectForm2Transposed};
use divan::counter::ItemsCount;
use divan::Bencher;
use std::f64::consts::PI;
use tonewright::quantize::{quantize, FixedCascade, FixedFormat, Structure};
use tonewright::sections::{Cascade, Sos};
use tonewright::simulate::{Engine, FixedEngine, FloatEngine, FloatSample, SampleScale};

#[path = "../tests/common/engines.rs"]
mod reference;

const SECTIONS: usize = 8;
const SAMPLES: usize = 1 << 21;
const CHANNELS: [usize; 3] = [1, 2, 8];

fn main() {
    divan::main();
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

/// Times `f` filtering a fresh copy of `x` in place.
fn time<S: Clone + Send + Sync>(bencher: Bencher, x: Vec<S>, mut f: impl FnMut(&mut Vec<S>)) {
    bencher
        .counter(ItemsCount::new(x.len() * SECTIONS))
        .with_inputs(|| x.clone())
        .bench_local_refs(|buf| f(buf));
}

fn float_engine<T: FloatSample + Send + Sync>(bencher: Bencher, channels: usize) {
    let mut e = FloatEngine::<T>::new(&cascade(), Structure::Df2t, channels).expect("channels");
    time(bencher, input::<T>(channels), |buf| e.process(buf).expect("whole frames"));
}

fn fixed(format: FixedFormat) -> FixedCascade {
    quantize(&cascade(), &format, Structure::Df1).expect("valid format")
}

fn fixed_input(format: FixedFormat, channels: usize) -> Vec<i32> {
    let scale = SampleScale::new(format.data_bits).expect("valid width");
    input::<f64>(channels).iter().map(|&v| scale.to_int(v)).collect()
}

fn fixed_engine(bencher: Bencher, format: FixedFormat, channels: usize) {
    let mut e = FixedEngine::new(&fixed(format), channels).expect("valid cascade");
    time(bencher, fixed_input(format, channels), |buf| e.process(buf).expect("whole frames"));
}

fn biquad<T: FloatSample + Send + Sync>(
    bencher: Bencher,
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
    time(bencher, input::<T>(channels), |buf| {
        for frame in buf.chunks_exact_mut(channels) {
            for (v, chain) in frame.iter_mut().zip(filters.iter_mut()) {
                *v = chain.iter_mut().fold(*v, |x, f| f.run(x));
            }
        }
    });
}

#[divan::bench(args = CHANNELS, sample_count = 15, sample_size = 1)]
fn tonewright_f64_df2t(bencher: Bencher, channels: usize) {
    float_engine::<f64>(bencher, channels);
}

#[divan::bench(args = CHANNELS, sample_count = 15, sample_size = 1)]
fn tonewright_f32_df2t(bencher: Bencher, channels: usize) {
    float_engine::<f32>(bencher, channels);
}

#[divan::bench(args = CHANNELS, sample_count = 15, sample_size = 1)]
fn tonewright_q15_df1_acc32(bencher: Bencher, channels: usize) {
    fixed_engine(bencher, FixedFormat::q15(), channels);
}

#[divan::bench(args = CHANNELS, sample_count = 15, sample_size = 1)]
fn tonewright_q31_df1_acc64(bencher: Bencher, channels: usize) {
    fixed_engine(bencher, FixedFormat::q31(), channels);
}

#[divan::bench(args = CHANNELS, sample_count = 15, sample_size = 1)]
fn biquad_df2t_f64(bencher: Bencher, channels: usize) {
    biquad(bencher, channels, DirectForm2Transposed::<f64>::new);
}

#[divan::bench(args = CHANNELS, sample_count = 15, sample_size = 1)]
fn biquad_df2t_f32(bencher: Bencher, channels: usize) {
    biquad(bencher, channels, DirectForm2Transposed::<f32>::new);
}

#[divan::bench(args = CHANNELS, sample_count = 15, sample_size = 1)]
fn plain_f64_df2t(bencher: Bencher, channels: usize) {
    let c = cascade();
    time(bencher, input::<f64>(channels), |buf| {
        reference::float_cascade(&c, Structure::Df2t, channels, buf)
    });
}

#[divan::bench(args = [1], sample_count = 5, sample_size = 1)]
fn plain_q15_df1_acc32(bencher: Bencher, channels: usize) {
    let (format, f) = (FixedFormat::q15(), fixed(FixedFormat::q15()));
    time(bencher, fixed_input(format, channels), |buf| {
        reference::fixed_cascade(&f, channels, buf);
    });
}
