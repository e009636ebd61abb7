//! Writes the demo recording audio-demos/plucked-phrase-hum50-48k-16bit.wav.
//!
//! Our scenario: a short plucked-string phrase taken on a bench recorder whose ground
//! loop adds 50 Hz mains hum with its harmonics, plus the recorder's hiss; 6 s, 48 kHz,
//! 16-bit mono, TPDF-dithered. A hum-notch design is meant to clean it. Every random
//! part is seeded, so running this again gives the same bytes:
//!
//! ```text
//! cargo run --example make_demo_audio
//! ```
//!
//! Levels (all stated here, invented for the demo): phrase normalised to −6 dBFS peak,
//! hum fundamental −36 dBFS peak with harmonic n at −36 − 20·log10(n) dB (n = 1..8),
//! hiss −66 dBFS RMS white noise.
//!
//! # References
//! 1. K. Karplus, A. Strong, "Digital synthesis of plucked-string and drum timbres",
//!    Computer Music Journal 7(2), 1983 (the plucked notes).
//! 2. Equal-tempered pitches from A4 = 440 Hz (common practice).

use std::path::Path;
use tonewright::audio::metrics::{db_to_amp, LevelMeter};
use tonewright::audio::signal::{mix_hum, pluck, white_noise, Mains, SignalSpec};
use tonewright::audio::{SampleFormat, WavSpec, WavWriter};

const RATE: u32 = 48_000;
const SECONDS: f64 = 6.0;
/// (onset in seconds, pitch in Hz): A2 E3 A3 C4 E4 A4 C4 A3, then an A minor chord; no
/// partial below 410 Hz lies within 10 Hz of a multiple of 50 Hz, so the hum harmonics
/// can be measured apart from the music.
const NOTES: [(f64, f64); 11] = [
    (0.10, 110.00),
    (0.55, 164.81),
    (1.00, 220.00),
    (1.40, 261.63),
    (1.80, 329.63),
    (2.30, 440.00),
    (2.75, 261.63),
    (3.20, 220.00),
    (3.90, 110.00),
    (3.93, 220.00),
    (3.96, 261.63),
];

fn main() -> tonewright::Result<()> {
    let frames = (SECONDS * f64::from(RATE)) as usize;
    let mut phrase = vec![0.0; frames];
    for (i, &(onset, hz)) in NOTES.iter().enumerate() {
        let start = (onset * f64::from(RATE)) as usize;
        let spec =
            SignalSpec { rate: RATE, channels: 1, seconds: SECONDS - onset, level_dbfs: 0.0 };
        let note = pluck(&spec, hz, 100 + i as u64)?;
        for (slot, x) in phrase[start..].iter_mut().zip(note) {
            *slot += x;
        }
    }
    let peak = phrase.iter().fold(0.0f64, |m, x| m.max(x.abs()));
    let gain = db_to_amp(-6.0) / peak;
    for x in &mut phrase {
        *x *= gain;
    }
    mix_hum(&mut phrase, 1, RATE, Mains::Hz50, -36.0)?;
    let hiss_spec = SignalSpec { rate: RATE, channels: 1, seconds: SECONDS, level_dbfs: -66.0 };
    for (x, h) in phrase.iter_mut().zip(white_noise(&hiss_spec, 7)?) {
        *x += h;
    }

    let path = Path::new(env!("CARGO_MANIFEST_DIR"))
        .join("audio-demos")
        .join("plucked-phrase-hum50-48k-16bit.wav");
    let spec = WavSpec { channels: 1, rate: RATE, sample: SampleFormat::Int { bits: 16 } };
    let mut writer = WavWriter::create(&path, spec, &[])?.with_tpdf_dither(1)?;
    writer.write_block(&phrase)?;
    let stats = writer.finish()?;
    let mut meter = LevelMeter::new(1, spec.sample);
    meter.add(&phrase);
    let levels = meter.levels()[0];
    println!(
        "wrote {}: {} frames, peak {:.1} dBFS, rms {:.1} dBFS, {} clipped",
        path.display(),
        stats.frames,
        levels.peak_dbfs,
        levels.rms_dbfs,
        stats.overs
    );
    Ok(())
}
