//! Throughput of the block engines: 8 sections, mono, 2^20 samples per iteration,
//! reported as section-samples per second. Run: `cargo bench --bench engines`.

use divan::counter::ItemsCount;
use divan::Bencher;
use std::f64::consts::PI;
use tonewright::quantize::{quantize, FixedFormat, Structure};
use tonewright::sections::{Cascade, Sos};
use tonewright::simulate::{Engine, FixedEngine, FloatEngine, SampleScale};

const SECTIONS: usize = 8;
const FRAMES: usize = 1 << 20;

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

/// Seeded noise at a quarter of full scale.
fn input() -> Vec<f64> {
    let mut s = 0x5eed_u64;
    (0..FRAMES)
        .map(|_| {
            s = s.wrapping_mul(6364136223846793005).wrapping_add(1442695040888963407);
            ((s >> 11) as f64 / (1u64 << 53) as f64 - 0.5) * 0.5
        })
        .collect()
}

fn run<E: Engine>(bencher: Bencher, mut engine: E, x: Vec<E::Sample>)
where
    E::Sample: Send + Sync,
{
    bencher
        .counter(ItemsCount::new(FRAMES * SECTIONS))
        .with_inputs(|| x.clone())
        .bench_local_refs(|buf| engine.process(buf).expect("whole frames"));
}

fn fixed(format: FixedFormat) -> (FixedEngine, Vec<i32>) {
    let q = quantize(&cascade(), &format, Structure::Df1).expect("valid format");
    let scale = SampleScale::new(format.data_bits).expect("valid width");
    let x = input().iter().map(|&v| scale.to_int(v)).collect();
    (FixedEngine::new(&q, 1).expect("valid cascade"), x)
}

#[divan::bench(sample_count = 15, sample_size = 1)]
fn f64_df2t(bencher: Bencher) {
    let e = FloatEngine::<f64>::new(&cascade(), Structure::Df2t, 1).expect("one channel");
    run(bencher, e, input());
}

#[divan::bench(sample_count = 15, sample_size = 1)]
fn f32_df2t(bencher: Bencher) {
    let e = FloatEngine::<f32>::new(&cascade(), Structure::Df2t, 1).expect("one channel");
    run(bencher, e, input().iter().map(|&v| v as f32).collect());
}

#[divan::bench(sample_count = 15, sample_size = 1)]
fn q15_df1_acc32(bencher: Bencher) {
    let (e, x) = fixed(FixedFormat::q15());
    run(bencher, e, x);
}

#[divan::bench(sample_count = 15, sample_size = 1)]
fn q31_df1_acc64(bencher: Bencher) {
    let (e, x) = fixed(FixedFormat::q31());
    run(bencher, e, x);
}
