//! WAV throughput beside hound, one run: 16-bit stereo, 60 s at 48 kHz (5.76 M
//! samples) per iteration, in items/s where one item is one sample. Reading: our
//! bulk decoder against hound's per-sample iterator; writing: our block writer
//! (f64 in, rounded and clipped) against hound's per-sample `write_sample` and its
//! faster `get_i16_writer`. Files go to the system temporary folder.
//!
//! Run: `cargo bench --bench wav`.

use divan::counter::ItemsCount;
use divan::Bencher;
use std::path::PathBuf;
use tonewright::audio::dither::SplitMix64;
use tonewright::audio::{SampleFormat, WavReader, WavSpec, WavWriter};

const SAMPLES: usize = 2 * 48_000 * 60;
const BLOCK_FRAMES: usize = 4096;

fn main() {
    divan::main();
}

fn path(name: &str) -> PathBuf {
    std::env::temp_dir().join(format!("tonewright-bench-{}-{name}.wav", std::process::id()))
}

fn hound_spec() -> hound::WavSpec {
    hound::WavSpec {
        channels: 2,
        sample_rate: 48_000,
        bits_per_sample: 16,
        sample_format: hound::SampleFormat::Int,
    }
}

/// Seeded 16-bit codes.
fn codes() -> Vec<i16> {
    let mut rng = SplitMix64::new(3);
    (0..SAMPLES).map(|_| rng.next_u64() as i16).collect()
}

/// A 16-bit stereo file of seeded codes, written by hound.
fn input_file() -> PathBuf {
    let p = path("input");
    let mut w = hound::WavWriter::create(&p, hound_spec()).expect("temp file");
    for c in codes() {
        w.write_sample(c).expect("write");
    }
    w.finalize().expect("finalize");
    p
}

#[divan::bench(sample_count = 10, sample_size = 1)]
fn read_tonewright(bencher: Bencher) {
    let p = input_file();
    bencher.counter(ItemsCount::new(SAMPLES)).bench_local(|| {
        let mut r = WavReader::open(&p).expect("open");
        let (mut block, mut sum) = (Vec::new(), 0.0);
        while r.read_block(&mut block, BLOCK_FRAMES).expect("read") > 0 {
            sum += block.iter().sum::<f64>();
        }
        sum
    });
}

#[divan::bench(sample_count = 10, sample_size = 1)]
fn read_hound_per_sample(bencher: Bencher) {
    let p = input_file();
    bencher.counter(ItemsCount::new(SAMPLES)).bench_local(|| {
        let mut r = hound::WavReader::open(&p).expect("open");
        r.samples::<i16>().map(|s| f64::from(s.expect("sample")) / 32768.0).sum::<f64>()
    });
}

#[divan::bench(sample_count = 10, sample_size = 1)]
fn write_tonewright(bencher: Bencher) {
    let x: Vec<f64> = codes().iter().map(|&c| f64::from(c) / 32768.0).collect();
    let (p, spec) = (
        path("ours"),
        WavSpec { channels: 2, rate: 48_000, sample: SampleFormat::Int { bits: 16 } },
    );
    bencher.counter(ItemsCount::new(SAMPLES)).bench_local(|| {
        let mut w = WavWriter::create(&p, spec, &[]).expect("create");
        for block in x.chunks(2 * BLOCK_FRAMES) {
            w.write_block(block).expect("write");
        }
        w.finish().expect("finish")
    });
}

/// The same without [`WavWriter::finish`], whose fsync (the file is durable before
/// it is renamed into place) hound does not do: the encoder and buffered writes alone.
#[divan::bench(sample_count = 10, sample_size = 1)]
fn write_tonewright_without_fsync(bencher: Bencher) {
    let x: Vec<f64> = codes().iter().map(|&c| f64::from(c) / 32768.0).collect();
    let spec = WavSpec { channels: 2, rate: 48_000, sample: SampleFormat::Int { bits: 16 } };
    let p = path("ours-unsynced");
    bencher.counter(ItemsCount::new(SAMPLES)).bench_local(|| {
        let mut w = WavWriter::create(&p, spec, &[]).expect("create");
        for block in x.chunks(2 * BLOCK_FRAMES) {
            w.write_block(block).expect("write");
        }
        w
    });
}

#[divan::bench(sample_count = 10, sample_size = 1)]
fn write_hound_per_sample(bencher: Bencher) {
    let (c, p) = (codes(), path("hound"));
    bencher.counter(ItemsCount::new(SAMPLES)).bench_local(|| {
        let mut w = hound::WavWriter::create(&p, hound_spec()).expect("create");
        for &s in &c {
            w.write_sample(s).expect("write");
        }
        w.finalize().expect("finalize");
    });
}

#[divan::bench(sample_count = 10, sample_size = 1)]
fn write_hound_i16_writer(bencher: Bencher) {
    let (c, p) = (codes(), path("hound16"));
    bencher.counter(ItemsCount::new(SAMPLES)).bench_local(|| {
        let mut w = hound::WavWriter::create(&p, hound_spec()).expect("create");
        for block in c.chunks(2 * BLOCK_FRAMES) {
            let mut f = w.get_i16_writer(block.len() as u32);
            for &s in block {
                f.write_sample(s);
            }
            f.flush().expect("flush");
        }
        w.finalize().expect("finalize");
    });
}
