//! WAV throughput beside hound, one run: 16-bit stereo, 60 s at 48 kHz (5.76 M
//! samples) per iteration, in items/s where one item is one sample. Files go to the
//! system temporary folder, and every write starts a new file there.
//!
//! - Reading: our bulk decoder against hound's per-sample iterator.
//! - Writing, the sample path: from creating the file until the last block has gone
//!   through the writer. Ours takes f64 blocks of the `apply` verb's size and rounds,
//!   clips and counts overs; hound is handed the ready 16-bit codes (its best case),
//!   one `write_sample` at a time or per block through its `get_i16_writer`. Removing
//!   the previous file, and whatever a writer still buffers when the clock stops, are
//!   not timed.
//! - Committing: our [`WavWriter::finish`] alone on a fully written file: the
//!   buffered rest, header sizes, fsync and rename onto the target. hound has no
//!   durable commit, so this row has no hound counterpart.
//!
//! Run: `uptime; cargo bench --bench wav`.

use divan::counter::ItemsCount;
use divan::Bencher;
use std::path::{Path, PathBuf};
use tonewright::apply::BLOCK_FRAMES;
use tonewright::audio::dither::SplitMix64;
use tonewright::audio::{SampleFormat, WavReader, WavSpec, WavWriter};

const SAMPLES: usize = 2 * 48_000 * 60;

fn main() {
    divan::main();
    for name in ["input", "hound", "hound16", "ours-committed"] {
        remove(&path(name));
    }
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

const SPEC: WavSpec = WavSpec { channels: 2, rate: 48_000, sample: SampleFormat::Int { bits: 16 } };

/// Seeded 16-bit codes.
fn codes() -> Vec<i16> {
    let mut rng = SplitMix64::new(3);
    (0..SAMPLES).map(|_| rng.next_u64() as i16).collect()
}

/// The same samples as f64, which our writer takes.
fn samples() -> Vec<f64> {
    codes().iter().map(|&c| f64::from(c) / 32768.0).collect()
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

/// Our writer at `p` with every sample of `x` written.
fn write_ours(p: &Path, x: &[f64]) -> WavWriter {
    let mut w = WavWriter::create(p, SPEC, &[]).expect("create");
    for block in x.chunks(2 * BLOCK_FRAMES) {
        w.write_block(block).expect("write");
    }
    w
}

/// Removes a file left by an earlier iteration or benchmark.
fn remove(p: &Path) {
    let _ = std::fs::remove_file(p);
}

#[divan::bench(sample_count = 20, sample_size = 1)]
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

#[divan::bench(sample_count = 20, sample_size = 1)]
fn read_hound_per_sample(bencher: Bencher) {
    let p = input_file();
    bencher.counter(ItemsCount::new(SAMPLES)).bench_local(|| {
        let mut r = hound::WavReader::open(&p).expect("open");
        r.samples::<i16>().map(|s| f64::from(s.expect("sample")) / 32768.0).sum::<f64>()
    });
}

/// Dropping the unfinished writer (untimed) removes its temporary file.
#[divan::bench(sample_count = 20, sample_size = 1)]
fn write_tonewright(bencher: Bencher) {
    let (x, p) = (samples(), path("ours"));
    bencher.counter(ItemsCount::new(SAMPLES)).bench_local(|| write_ours(&p, &x));
}

/// Dropping the writer (untimed) finalizes the file.
#[divan::bench(sample_count = 20, sample_size = 1)]
fn write_hound_per_sample(bencher: Bencher) {
    let (c, p) = (codes(), path("hound"));
    bencher.counter(ItemsCount::new(SAMPLES)).with_inputs(|| remove(&p)).bench_local_values(|()| {
        let mut w = hound::WavWriter::create(&p, hound_spec()).expect("create");
        for &s in &c {
            w.write_sample(s).expect("write");
        }
        w
    });
}

#[divan::bench(sample_count = 20, sample_size = 1)]
fn write_hound_i16_writer(bencher: Bencher) {
    let (c, p) = (codes(), path("hound16"));
    bencher.counter(ItemsCount::new(SAMPLES)).with_inputs(|| remove(&p)).bench_local_values(|()| {
        let mut w = hound::WavWriter::create(&p, hound_spec()).expect("create");
        for block in c.chunks(2 * BLOCK_FRAMES) {
            let mut f = w.get_i16_writer(block.len() as u32);
            for &s in block {
                f.write_sample(s);
            }
            f.flush().expect("flush");
        }
        w
    });
}

/// The durable commit of a written file, which replaces the previous iteration's.
#[divan::bench(sample_count = 20, sample_size = 1)]
fn commit_tonewright(bencher: Bencher) {
    let (x, p) = (samples(), path("ours-committed"));
    bencher
        .counter(ItemsCount::new(SAMPLES))
        .with_inputs(|| write_ours(&p, &x))
        .bench_local_values(|w| w.finish().expect("finish"));
}
