//! WAV throughput beside hound, one run: 16-bit stereo, 60 s at 48 kHz (5.76 M
//! samples) per iteration, in elements/s where one element is one sample. Files go
//! to the system temporary folder, and every write starts a new file there.
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
//! Ids are `wav/<row>`. Run: `uptime; cargo bench --bench wav`, then
//! `python3 benches/medians.py wav`.

use criterion::measurement::WallTime;
use criterion::{
    criterion_group, criterion_main, BatchSize, BenchmarkGroup, Criterion, SamplingMode, Throughput,
};
use std::path::{Path, PathBuf};
use std::time::Duration;
use tonewright::apply::BLOCK_FRAMES;
use tonewright::audio::dither::SplitMix64;
use tonewright::audio::{SampleFormat, WavReader, WavSpec, WavWriter};

type Group<'a> = BenchmarkGroup<'a, WallTime>;

const SAMPLES: usize = 2 * 48_000 * 60;

criterion_group!(benches, wav);
criterion_main!(benches);

/// Every row, 20 samples each. An iteration takes 5 to 100 ms, so a sample averages a
/// few iterations. The write rows run one iteration per batch: each writer is dropped,
/// untimed, before the next one creates its file.
fn wav(c: &mut Criterion) {
    let mut g = c.benchmark_group("wav");
    g.sampling_mode(SamplingMode::Flat)
        .sample_size(20)
        .warm_up_time(Duration::from_secs(1))
        .measurement_time(Duration::from_secs(3))
        .throughput(Throughput::Elements(SAMPLES as u64));
    read_tonewright(&mut g);
    read_hound_per_sample(&mut g);
    write_tonewright(&mut g);
    write_hound_per_sample(&mut g);
    write_hound_i16_writer(&mut g);
    commit_tonewright(&mut g);
    g.finish();
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

fn read_tonewright(g: &mut Group) {
    let p = input_file();
    g.bench_function("read_tonewright", |b| {
        b.iter(|| {
            let mut r = WavReader::open(&p).expect("open");
            let (mut block, mut sum) = (Vec::new(), 0.0);
            while r.read_block(&mut block, BLOCK_FRAMES).expect("read") > 0 {
                sum += block.iter().sum::<f64>();
            }
            sum
        })
    });
}

fn read_hound_per_sample(g: &mut Group) {
    let p = input_file();
    g.bench_function("read_hound_per_sample", |b| {
        b.iter(|| {
            let mut r = hound::WavReader::open(&p).expect("open");
            r.samples::<i16>().map(|s| f64::from(s.expect("sample")) / 32768.0).sum::<f64>()
        })
    });
}

/// Dropping the unfinished writer (untimed) removes its temporary file.
fn write_tonewright(g: &mut Group) {
    let (x, p) = (samples(), path("ours"));
    g.bench_function("write_tonewright", |b| {
        b.iter_batched(|| (), |()| write_ours(&p, &x), BatchSize::PerIteration)
    });
}

/// Dropping the writer (untimed) finalizes the file.
fn write_hound_per_sample(g: &mut Group) {
    let (c, p) = (codes(), path("hound"));
    g.bench_function("write_hound_per_sample", |b| {
        b.iter_batched(
            || remove(&p),
            |()| {
                let mut w = hound::WavWriter::create(&p, hound_spec()).expect("create");
                for &s in &c {
                    w.write_sample(s).expect("write");
                }
                w
            },
            BatchSize::PerIteration,
        )
    });
}

fn write_hound_i16_writer(g: &mut Group) {
    let (c, p) = (codes(), path("hound16"));
    g.bench_function("write_hound_i16_writer", |b| {
        b.iter_batched(
            || remove(&p),
            |()| {
                let mut w = hound::WavWriter::create(&p, hound_spec()).expect("create");
                for block in c.chunks(2 * BLOCK_FRAMES) {
                    let mut f = w.get_i16_writer(block.len() as u32);
                    for &s in block {
                        f.write_sample(s);
                    }
                    f.flush().expect("flush");
                }
                w
            },
            BatchSize::PerIteration,
        )
    });
}

/// The durable commit of a written file, which replaces the previous iteration's.
fn commit_tonewright(g: &mut Group) {
    let (x, p) = (samples(), path("ours-committed"));
    g.bench_function("commit_tonewright", |b| {
        b.iter_batched(
            || write_ours(&p, &x),
            |w| w.finish().expect("finish"),
            BatchSize::PerIteration,
        )
    });
}
