//! Designs at the numeric edges: poles a hair from z = 1 (5 Hz at 192 kHz), Q = 100,
//! ±40 dB, 8 kHz and 384 kHz. Each gives the textbook response in f64, and in every
//! target arithmetic either runs (no NaN or inf in the output samples or in the
//! exported C and Rust) or is refused with one clear line. Also: `apply` keeps the
//! channels of a file independent.

#[path = "common/corpus.rs"]
mod corpus;

use corpus::{scratch_dir, tonewright};
use std::path::Path;
use tonewright::apply::{apply_file, ApplyOptions, Outputs};
use tonewright::audio::dither::SplitMix64;
use tonewright::audio::{SampleFormat, WavReader, WavSpec, WavWriter};
use tonewright::pipeline::port;
use tonewright::quantize::{FixedFormat, NumberFormat};

/// (name, rate, stage text, frequency in Hz, |H| there in dB, tolerance in dB).
/// Sources: a second-order high-pass or low-pass with Q = 1/√2 is 3.01 dB down at its
/// corner (Butterworth, any filter text); a cookbook peak or shelf has exactly its
/// gain_db at f0 (peak) or far from f0 (shelf) (R. Bristow-Johnson, "Cookbook formulae
/// for audio EQ biquad filter coefficients"); prewarping at each stage's own frequency
/// makes the digital value at f0 equal the analog one.
const EDGES: [(&str, u32, &str, f64, f64, f64); 7] = [
    (
        "hp-5hz-192k",
        192_000,
        "kind = \"highpass\"\nfreq = 5\nq = 0.7071067811865476",
        5.0,
        -3.0103,
        1e-3,
    ),
    ("peak-q100", 48000, "kind = \"peak\"\nfreq = 1000\nq = 100\ngain_db = 12", 1000.0, 12.0, 1e-6),
    (
        "peak-plus-40db",
        48000,
        "kind = \"peak\"\nfreq = 1000\nq = 2\ngain_db = 40",
        1000.0,
        40.0,
        1e-6,
    ),
    (
        "peak-minus-40db",
        48000,
        "kind = \"peak\"\nfreq = 1000\nq = 2\ngain_db = -40",
        1000.0,
        -40.0,
        1e-6,
    ),
    ("lowshelf-plus-40db", 48000, "kind = \"lowshelf\"\nfreq = 200\ngain_db = 40", 1.0, 40.0, 1e-2),
    (
        "lp-3k-8k",
        8000,
        "kind = \"lowpass\"\nfreq = 3000\nq = 0.7071067811865476",
        3000.0,
        -3.0103,
        1e-3,
    ),
    (
        "lp-20k-384k",
        384_000,
        "kind = \"lowpass\"\nfreq = 20000\nq = 0.7071067811865476",
        20000.0,
        -3.0103,
        1e-3,
    ),
];

const NUMBERS: [(&str, NumberFormat); 4] = [
    ("f64", NumberFormat::F64),
    ("f32", NumberFormat::F32),
    ("q15", NumberFormat::Fixed(FixedFormat::q15())),
    ("q31", NumberFormat::Fixed(FixedFormat::q31())),
];

fn design_text(rate: u32, stage: &str, number: &str) -> String {
    format!("[target]\nrate = {rate}\nnumber = \"{number}\"\n\n[[stage]]\n{stage}\n")
}

/// 0.1 s of white noise at −20 dBFS, then an impulse at −6 dBFS: broadband and a
/// step-like edge, written as 32-bit float so nothing is clipped on the way in.
fn noise_file(path: &Path, rate: u32, channels: u16) -> Vec<f64> {
    let mut rng = SplitMix64::new(7);
    let frames = rate as usize / 10;
    let mut x: Vec<f64> =
        (0..frames * usize::from(channels)).map(|_| 0.1 * (2.0 * rng.next_f64() - 1.0)).collect();
    x[frames / 2 * usize::from(channels)] = 0.5;
    let spec = WavSpec { channels, rate, sample: SampleFormat::Float { bits: 64 } };
    let mut w = WavWriter::create(path, spec, &[]).unwrap();
    w.write_block(&x).unwrap();
    w.finish().unwrap();
    x
}

fn read(path: &Path) -> Vec<f64> {
    let mut r = WavReader::open(path).unwrap();
    let (mut all, mut block) = (Vec::new(), Vec::new());
    while r.read_block(&mut block, 4096).unwrap() > 0 {
        all.extend_from_slice(&block);
    }
    all
}

fn options(number: NumberFormat) -> ApplyOptions {
    ApplyOptions {
        knobs: Vec::new(),
        rate: None,
        number,
        bits: Some(SampleFormat::Float { bits: 64 }),
        dither: false,
        seed: 1,
        force: false,
        compare: true,
    }
}

#[test]
fn edge_designs_have_the_textbook_response_in_f64() {
    for (name, rate, stage, hz, want_db, tol) in EDGES {
        let text = design_text(rate, stage, "f64");
        let d = tonewright::design::parse(name, &text, text.as_bytes()).unwrap();
        let p = port(d, &[], f64::from(rate)).unwrap();
        let got = 20.0 * p.cascade.response_at_hz(hz).norm().log10();
        assert!((got - want_db).abs() <= tol, "{name}: {got} dB at {hz} Hz, want {want_db}");
        let radius = tonewright::sections::max_pole_radius(&p.cascade.sections);
        assert!(radius < 1.0, "{name}: pole radius {radius}");
    }
}

#[test]
fn edge_designs_run_in_every_arithmetic_without_nan_or_are_refused_clearly() {
    let dir = scratch_dir("numeric-edges");
    for (name, rate, stage, ..) in EDGES {
        let text = design_text(rate, stage, "f64");
        let design = tonewright::design::parse(name, &text, text.as_bytes()).unwrap();
        let input = dir.join(format!("{name}-in.wav"));
        let x = noise_file(&input, rate, 1);
        for (number_name, number) in NUMBERS {
            let out = dir.join(format!("{name}-{number_name}.wav"));
            let outputs =
                Outputs { main: out.clone(), float: None, residual: None, residual_gain_db: 0.0 };
            match apply_file(&design, &input, &outputs, &options(number), &|_| {}) {
                Ok(report) => {
                    let y = read(&out);
                    assert_eq!(y.len(), x.len(), "{name} {number_name}: length");
                    assert!(y.iter().all(|v| v.is_finite()), "{name} {number_name}: non-finite");
                    let snr = report.snr_vs_float_db.unwrap();
                    assert!(!snr.is_nan(), "{name} {number_name}: SNR is NaN");
                }
                Err(e) => {
                    let m = e.to_string();
                    assert_eq!(e.exit_code(), 2, "{name} {number_name}: {m}");
                    assert!(!m.contains('\n') && m.contains("pole"), "{name} {number_name}: {m}");
                    assert!(!out.exists(), "{name} {number_name}: output left after refusal");
                }
            }
        }
    }
}

/// Whether generated source text holds a NaN or infinite literal, as C or Rust spell them.
fn has_non_finite(text: &str) -> bool {
    text.split(|c: char| !(c.is_ascii_alphanumeric() || c == '_')).any(|t| {
        matches!(t, "nan" | "NaN" | "NAN" | "inf" | "Inf" | "INFINITY" | "INFINITE" | "infinity")
    })
}

#[test]
fn exported_edge_designs_hold_no_nan_or_inf_literal() {
    assert!(has_non_finite("{ inf, NaN, 0e0 }") && !has_non_finite("/* info: finite */"));
    let dir = scratch_dir("numeric-edges-export");
    for (name, rate, stage, ..) in EDGES {
        for number in ["f32", "q15", "q31"] {
            let path = dir.join(format!("{name}-{number}.toml"));
            std::fs::write(&path, design_text(rate, stage, number)).unwrap();
            for lang in ["c", "rust"] {
                let out = dir.join(format!("{name}-{number}-{lang}"));
                std::fs::create_dir(&out).unwrap();
                let result = tonewright([
                    "export",
                    path.to_str().unwrap(),
                    "--vectors",
                    "256",
                    "--lang",
                    lang,
                    "-o",
                    out.to_str().unwrap(),
                ]);
                let stderr = String::from_utf8_lossy(&result.stderr);
                match result.status.code() {
                    Some(0) => {
                        for file in std::fs::read_dir(&out).unwrap() {
                            let file = file.unwrap().path();
                            let text = std::fs::read_to_string(&file).unwrap();
                            assert!(!has_non_finite(&text), "{}: NaN or inf", file.display());
                        }
                    }
                    Some(2) => {
                        assert_eq!(stderr.lines().filter(|l| l.starts_with("error: ")).count(), 1);
                        assert_eq!(std::fs::read_dir(&out).unwrap().count(), 0, "{name}: wrote");
                    }
                    code => panic!("{name} {number} {lang}: exit {code:?}: {stderr}"),
                }
            }
        }
    }
}

#[test]
fn apply_filters_each_channel_of_a_file_as_if_it_were_alone() {
    // One filter state per channel: a 4-channel file gives the same samples per channel
    // as four mono files, in f64 and bit-exactly in q15.
    let dir = scratch_dir("channels");
    let text = design_text(48000, "kind = \"peak\"\nfreq = 1000\nq = 4\ngain_db = 9", "f64");
    let design = tonewright::design::parse("peak", &text, text.as_bytes()).unwrap();
    let multi = dir.join("multi.wav");
    let x = noise_file(&multi, 48000, 4);
    for (number_name, number) in [NUMBERS[0], NUMBERS[2]] {
        let run = |input: &Path, out: &Path| {
            let outputs =
                Outputs { main: out.into(), float: None, residual: None, residual_gain_db: 0.0 };
            let opts = ApplyOptions { compare: false, ..options(number) };
            apply_file(&design, input, &outputs, &opts, &|_| {}).unwrap();
            read(out)
        };
        let y = run(&multi, &dir.join(format!("multi-{number_name}-out.wav")));
        for ch in 0..4 {
            let mono = dir.join(format!("mono-{ch}.wav"));
            let spec =
                WavSpec { channels: 1, rate: 48000, sample: SampleFormat::Float { bits: 64 } };
            let mut w = WavWriter::create(&mono, spec, &[]).unwrap();
            w.write_block(&x.iter().skip(ch).step_by(4).copied().collect::<Vec<_>>()).unwrap();
            w.finish().unwrap();
            let alone = run(&mono, &dir.join(format!("mono-{ch}-{number_name}-out.wav")));
            let from_multi: Vec<f64> = y.iter().skip(ch).step_by(4).copied().collect();
            assert_eq!(alone, from_multi, "{number_name}: channel {ch}");
        }
    }
}
