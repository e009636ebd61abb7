//! Library entry points driven by arbitrary bytes. The fuzz targets under fuzz/ call
//! these, and tests/fuzz_regressions.rs replays the inputs that once broke them, so a
//! crash input is reproduced by `cargo test` with no fuzzer installed.
//!
//! Each function returns the library's own `Result`: an `Err` is a clean refusal.
//! A panic, a hang or a runaway allocation is the bug the fuzzer looks for; so is a
//! broken promise, checked with `assert!`: finite coefficients out of a design that
//! was accepted, and as many finite frames out of `apply` as went in.

use std::path::PathBuf;
use std::sync::atomic::{AtomicU64, Ordering};
use tonewright::analog::circuit::{self, Element, Netlist, Part};
use tonewright::apply::{apply_file, ApplyOptions, Outputs};
use tonewright::audio::{SampleFormat, WavReader, WavSpec, WavWriter};
use tonewright::design::Design;
use tonewright::pipeline::{choose_rate, port, realize};
use tonewright::quantize::{FixedFormat, NumberFormat};
use tonewright::Result;

/// Parses `bytes` as a design file (lossily decoded, as the fuzzer rarely writes valid
/// UTF-8) and, when it is accepted, runs it through to the target's coefficients.
pub fn design(bytes: &[u8]) -> Result<()> {
    let text = String::from_utf8_lossy(bytes);
    let design = tonewright::design::parse("fuzz.toml", &text, bytes)?;
    let rate = choose_rate(None, &design, Some(48000.0))?;
    let (number, structure) = (design.target.number, design.target.structure);
    let port = port(design, &[], rate)?;
    for s in &port.cascade.sections {
        assert!(
            s.b.iter().chain(&s.a).all(|c| c.is_finite()),
            "accepted design gave a non-finite section {s:?}"
        );
    }
    realize(&port.cascade, number, structure)?;
    Ok(())
}

/// Node names the circuit fuzzer draws from: ground, the two ports and three inner nodes.
const NODES: [&str; 6] = ["gnd", "in", "out", "a", "b", "c"];

/// Values that must be refused or handled, chosen by a value byte of 250 and above.
const ODD_VALUES: [f64; 6] = [0.0, -1.0, f64::NAN, f64::INFINITY, 1e-300, 1e300];

/// Builds a netlist from `bytes`, five per part (kind, three nodes, value), and solves it.
pub fn circuit(bytes: &[u8]) -> Result<()> {
    let node = |b: u8| NODES[usize::from(b) % NODES.len()].to_string();
    let parts = bytes
        .chunks_exact(5)
        .enumerate()
        .map(|(i, p)| {
            // A log-spaced value over eight decades, or an odd one.
            let value = |lo: f64| match ODD_VALUES.get(usize::from(p[4].saturating_sub(250))) {
                Some(odd) if p[4] >= 250 => *odd,
                _ => lo * 10f64.powf(f64::from(p[4]) / 250.0 * 8.0),
            };
            let (a, b, c) = (node(p[1]), node(p[2]), node(p[3]));
            let element = match p[0] % 5 {
                0 => Element::Resistor { ohms: value(1.0), a, b },
                1 => Element::Capacitor { farads: value(1e-12), a, b },
                2 => Element::Inductor { henries: value(1e-6), a, b },
                3 => Element::OpAmp { plus: a, minus: b, out: c },
                _ => Element::Amp { gain: value(1e-4) - 1.0, input: a, output: b },
            };
            Part { label: format!("parts[{i}]"), element }
        })
        .collect();
    let netlist = Netlist { parts, input: "in".into(), output: "out".into() };
    circuit::solve(&netlist).map(|_| ())
}

/// A path in the temporary directory no other call of this process uses at the same time.
fn scratch(ext: &str) -> PathBuf {
    static COUNTER: AtomicU64 = AtomicU64::new(0);
    let n = COUNTER.fetch_add(1, Ordering::Relaxed);
    std::env::temp_dir().join(format!("tonewright-harness-{}-{n}.{ext}", std::process::id()))
}

/// Removes the file when dropped, so a refused input leaves nothing behind either.
struct Scratch(PathBuf);

impl Drop for Scratch {
    fn drop(&mut self) {
        let _ = std::fs::remove_file(&self.0);
    }
}

/// Writes `bytes` to a temporary file, opens it as WAV and reads every frame.
pub fn wav(bytes: &[u8]) -> Result<()> {
    let file = Scratch(scratch("wav"));
    std::fs::write(&file.0, bytes).expect("temporary directory is writable");
    let mut reader = WavReader::open(&file.0)?;
    let mut block = Vec::new();
    let mut frames = 0u64;
    loop {
        let n = reader.read_block(&mut block, 4096)?;
        if n == 0 {
            break;
        }
        frames += n as u64;
    }
    assert_eq!(frames, reader.frames(), "frames read differ from frames declared");
    Ok(())
}

/// Designs `apply` is fuzzed with: the demos, which cover circuits, sums and families.
const DESIGNS: [&str; 4] = [
    include_str!("../../audio-demos/two-knob-tone.toml"),
    include_str!("../../audio-demos/hum-reject-50.toml"),
    include_str!("../../audio-demos/lp-hp-bandpass.toml"),
    include_str!("../../audio-demos/summed-band-reject.toml"),
];

const RATES: [u32; 6] = [8000, 22050, 44100, 48000, 96000, 192_000];

const FORMATS: [SampleFormat; 6] = [
    SampleFormat::Int { bits: 8 },
    SampleFormat::Int { bits: 16 },
    SampleFormat::Int { bits: 24 },
    SampleFormat::Int { bits: 32 },
    SampleFormat::Float { bits: 32 },
    SampleFormat::Float { bits: 64 },
];

const NUMBERS: [NumberFormat; 5] = [
    NumberFormat::F64,
    NumberFormat::F32,
    NumberFormat::Fixed(FixedFormat::q15()),
    NumberFormat::Fixed(FixedFormat::q23()),
    NumberFormat::Fixed(FixedFormat::q31()),
];

/// Makes a small WAV from `bytes` (four header bytes choose channels, rate, format,
/// design and arithmetic; the rest are 16-bit samples, any value a float file holds
/// included) and applies a demo design to it.
pub fn apply(bytes: &[u8]) -> Result<()> {
    let [c, r, f, d, samples @ ..] = bytes else { return Ok(()) };
    let spec = WavSpec {
        channels: 1 + u16::from(c % 4),
        rate: RATES[usize::from(*r) % RATES.len()],
        sample: FORMATS[usize::from(*f) % FORMATS.len()],
    };
    let design: Design = tonewright::design::parse(
        "demo.toml",
        DESIGNS[usize::from(*d) % DESIGNS.len()],
        DESIGNS[usize::from(*d) % DESIGNS.len()].as_bytes(),
    )
    .expect("demo designs load");
    let channels = usize::from(spec.channels);
    let mut data: Vec<f64> = samples
        .chunks_exact(2)
        .map(|x| f64::from(i16::from_le_bytes([x[0], x[1]])) / 16384.0)
        .collect();
    data.truncate(data.len() / channels * channels);
    let input = Scratch(scratch("wav"));
    let output = Scratch(scratch("wav"));
    let mut writer = WavWriter::create(&input.0, spec, &[])?;
    writer.write_block(&data)?;
    writer.finish()?;
    let opts = ApplyOptions {
        knobs: Vec::new(),
        rate: None,
        number: NUMBERS[usize::from(d / 4) % NUMBERS.len()],
        bits: None,
        dither: true,
        seed: 1,
        force: false,
        compare: d & 0x80 != 0,
    };
    let outputs =
        Outputs { main: output.0.clone(), float: None, residual: None, residual_gain_db: 40.0 };
    let report = apply_file(&design, &input.0, &outputs, &opts, &|_| {})?;
    let mut reader = WavReader::open(&output.0)?;
    let mut block = Vec::new();
    let mut out = Vec::new();
    while reader.read_block(&mut block, 4096)? > 0 {
        out.extend_from_slice(&block);
    }
    assert_eq!(report.frames as usize * channels, data.len(), "frames processed");
    assert_eq!(out.len(), data.len(), "frames written");
    assert!(out.iter().all(|x| x.is_finite()), "non-finite sample in the output");
    Ok(())
}
