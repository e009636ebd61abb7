//! Running designs over recordings: measured responses, rejection on a synthesized hum
//! recording, bit-exact fixed-point output files, refusals and batches.

mod common;

use common::{cli, names_in, repo, scratch};
use tonewright::apply::{apply_file, ApplyOptions, FileReport, Outputs, BLOCK_FRAMES};
use tonewright::audio::signal::{mix_hum, white_noise, Mains, SignalSpec};
use tonewright::audio::{SampleFormat, WavReader, WavSpec, WavWriter};
use tonewright::design;
use tonewright::pipeline::{port, realize};
use tonewright::quantize::{NumberFormat, Structure};
use tonewright::report::inspect::measured;
use tonewright::simulate::{Engine, FixedEngine, Runner, SampleScale};

fn write_wav(path: &std::path::Path, spec: WavSpec, samples: &[f64]) {
    let mut w = WavWriter::create(path, spec, &[]).unwrap();
    w.write_block(samples).unwrap();
    w.finish().unwrap();
}

fn read_wav(path: &std::path::Path) -> (WavSpec, Vec<f64>) {
    let mut r = WavReader::open(path).unwrap();
    let (mut all, mut block) = (Vec::new(), Vec::new());
    while r.read_block(&mut block, 4096).unwrap() > 0 {
        all.extend_from_slice(&block);
    }
    (r.spec(), all)
}

/// A synthesized bench recording: white noise at −50 dBFS RMS under 50 Hz mains hum
/// with its harmonics at −20 dBFS peak, 24-bit mono at 48 kHz.
fn hum_recording(path: &std::path::Path, seconds: f64) {
    let spec = SignalSpec { rate: 48000, channels: 1, seconds, level_dbfs: -50.0 };
    let mut x = white_noise(&spec, 7).unwrap();
    mix_hum(&mut x, 1, 48000, Mains::Hz50, -20.0).unwrap();
    write_wav(
        path,
        WavSpec { channels: 1, rate: 48000, sample: SampleFormat::Int { bits: 24 } },
        &x,
    );
}

fn options(number: NumberFormat) -> ApplyOptions {
    ApplyOptions {
        knobs: Vec::new(),
        rate: None,
        number,
        bits: None,
        dither: true,
        seed: 1,
        force: false,
        compare: true,
    }
}

#[test]
fn measured_responses_agree_with_the_coefficients_within_a_tenth_of_a_db() {
    // Consistency of the engines with the analytic H(z) of the coefficients they run
    // (stepped sines read by a Goertzel detector, Goertzel 1958): the 0.1 dB.
    for demo in ["hum-reject-50", "lp-hp-bandpass", "two-knob-tone", "summed-band-reject"] {
        let d = design::load(&repo(&format!("audio-demos/{demo}.toml"))).unwrap();
        let number = d.target.number;
        let p = port(d, &[], 48000.0).unwrap();
        let m = measured(&p, number).unwrap();
        let above = m.target.iter().filter(|q| q.above_noise).count();
        assert!(above >= m.target.len() / 2, "{demo}: only {above} points above the noise");
        assert!(m.largest_difference_db < 0.1, "{demo}: {} dB", m.largest_difference_db);
    }
}

#[test]
fn measured_hum_rejection_matches_the_designed_cut_within_one_db() {
    // A −30 dB peak cut at 50 Hz: the Goertzel level of the 50 Hz hum component drops by
    // what |H(50 Hz)| predicts (the 1 dB).
    let dir = scratch("recordings", "rejection");
    let input = dir.join("bench-hum.wav");
    hum_recording(&input, 8.0);
    let text = "[[stage]]\nkind = \"peak\"\nfreq = 50\nq = 4\ngain_db = -30\n";
    let d = design::parse("cut.toml", text, text.as_bytes()).unwrap();
    for number in [NumberFormat::F64, NumberFormat::parse("n", "q31").unwrap()] {
        let outputs = Outputs {
            main: dir.join("out.wav"),
            float: None,
            residual: None,
            residual_gain_db: 0.0,
        };
        let r = apply_file(&d, &input, &outputs, &options(number), &|_| {}).unwrap();
        let rejection = r.rejection.expect("a band-reject design reports its rejection");
        assert!((rejection.hz - 50.0).abs() < 0.01, "{}", rejection.hz);
        let predicted = rejection.predicted_db.expect("a finite cut");
        assert!((predicted - 30.0).abs() < 0.01, "predicted {predicted}");
        assert!(
            (rejection.measured_db - predicted).abs() < 1.0,
            "measured {}",
            rejection.measured_db
        );
    }
}

/// The bundled hum band-reject applied in its own arithmetic to `seconds` of
/// [`hum_recording`], in the scratch folder `name`.
fn hum_demo_over_hum(name: &str, seconds: f64) -> FileReport {
    let dir = scratch("recordings", name);
    let input = dir.join("bench-hum.wav");
    hum_recording(&input, seconds);
    let d = design::load(&repo("audio-demos/hum-reject-50.toml")).unwrap();
    let outputs =
        Outputs { main: dir.join("out.wav"), float: None, residual: None, residual_gain_db: 0.0 };
    apply_file(&d, &input, &outputs, &options(d.target.number), &|_| {}).unwrap()
}

#[test]
fn exact_notch_removes_the_hum_fundamental_by_more_than_60_db() {
    let r = hum_demo_over_hum("notch", 6.0);
    let rejection = r.rejection.unwrap();
    assert_eq!(rejection.predicted_db, None, "an exact zero predicts unbounded rejection");
    assert!(rejection.measured_db > 60.0, "{}", rejection.measured_db);
    assert_eq!(r.clipped, 0);
}

#[test]
fn a_file_too_short_to_resolve_the_stop_frequency_reports_no_rejection_and_says_why() {
    // 0.4 s holds at most 20 periods of 50 Hz, fewer once the notch's poles settle: too
    // few for a Hann-windowed Goertzel to tell the hum from the noise around it.
    let r = hum_demo_over_hum("short", 0.4);
    assert_eq!(r.rejection, None);
    assert!(
        r.warnings.iter().any(|w| w.contains("too short to measure the rejection at 50.00 Hz")),
        "{:?}",
        r.warnings
    );
}

#[test]
fn a_q15_run_written_to_16_bits_is_exactly_the_fixed_engine_output() {
    // No dither is added when the output word equals the processing word, so the file
    // holds the kernel's integers (the bit-exactness the export check relies on).
    let dir = scratch("recordings", "bitexact");
    let input = dir.join("noise-16.wav");
    let spec = SignalSpec { rate: 48000, channels: 2, seconds: 0.5, level_dbfs: -10.0 };
    let x = white_noise(&spec, 3).unwrap();
    write_wav(
        &input,
        WavSpec { channels: 2, rate: 48000, sample: SampleFormat::Int { bits: 16 } },
        &x,
    );
    let (code, _, err) = cli(
        &dir,
        &[
            "apply",
            repo("audio-demos/lp-hp-bandpass.toml").to_str().unwrap(),
            "noise-16.wav",
            "-o",
            "out.wav",
        ],
    );
    assert_eq!(code, 0, "{err}");
    let (_, written) = read_wav(&dir.join("out.wav"));
    let (_, samples) = read_wav(&input);
    let d = design::load(&repo("audio-demos/lp-hp-bandpass.toml")).unwrap();
    let structure = d.target.structure;
    let number = d.target.number;
    let p = port(d, &[], 48000.0).unwrap();
    let tonewright::pipeline::Realized::Fixed(fixed) =
        realize(&p.cascade, number, structure).unwrap()
    else {
        panic!("the demo is fixed point");
    };
    let scale = SampleScale::new(16).unwrap();
    let mut ints: Vec<i32> = samples.iter().map(|&s| scale.to_int(s)).collect();
    FixedEngine::new(&fixed, 2).unwrap().process(&mut ints).unwrap();
    let got: Vec<i32> = written.iter().map(|&s| scale.to_int(s)).collect();
    assert_eq!(got, ints);
}

#[test]
fn streamed_outputs_equal_one_pass_of_the_engines_over_the_whole_file() {
    // 2.3 blocks of stereo: the block loop runs, meters and writes three blocks in
    // flight, the last one short. Each output must equal the engines run over the whole
    // file at once (f32 outputs: no dither).
    let dir = scratch("recordings", "streamed");
    let input = dir.join("noise.wav");
    let frames = BLOCK_FRAMES * 23 / 10;
    let spec = SignalSpec {
        rate: 48000,
        channels: 2,
        seconds: frames as f64 / 48000.0,
        level_dbfs: -10.0,
    };
    let x = white_noise(&spec, 11).unwrap();
    write_wav(
        &input,
        WavSpec { channels: 2, rate: 48000, sample: SampleFormat::Int { bits: 16 } },
        &x,
    );
    let d = design::load(&repo("audio-demos/lp-hp-bandpass.toml")).unwrap();
    let outputs = Outputs {
        main: dir.join("q.wav"),
        float: Some(dir.join("f.wav")),
        residual: Some(dir.join("r.wav")),
        residual_gain_db: 40.0,
    };
    let opts = ApplyOptions {
        number: d.target.number,
        bits: Some(SampleFormat::Float { bits: 32 }),
        ..options(d.target.number)
    };
    let report = apply_file(&d, &input, &outputs, &opts, &|_| {}).unwrap();
    assert_eq!(report.frames as usize, frames);

    let (_, samples) = read_wav(&input);
    let p = port(d.clone(), &[], 48000.0).unwrap();
    let mut fixed = Runner::new(
        &realize(&p.cascade, d.target.number, d.target.structure).unwrap(),
        d.target.structure,
        2,
    )
    .unwrap();
    let mut float = Runner::new(
        &realize(&p.cascade, NumberFormat::F64, Structure::Df2t).unwrap(),
        Structure::Df2t,
        2,
    )
    .unwrap();
    let (mut want_fixed, mut want_float) = (samples.clone(), samples);
    fixed.process(&mut want_fixed).unwrap();
    float.process(&mut want_float).unwrap();
    let gain = 10f64.powf(40.0 / 20.0);
    let want_residual: Vec<f64> =
        want_fixed.iter().zip(&want_float).map(|(q, f)| (q - f) * gain).collect();
    // The SNR summed block by block in lanes, against the plain sums over the file.
    let snr = report.snr_vs_float_db.unwrap();
    let want_snr = tonewright::audio::metrics::snr_db(&want_fixed, &want_float).unwrap();
    assert!((snr - want_snr).abs() < 1e-9, "SNR {snr} dB, one pass {want_snr} dB");
    for (file, want) in [("q.wav", want_fixed), ("f.wav", want_float), ("r.wav", want_residual)] {
        let (_, got) = read_wav(&dir.join(file));
        let want: Vec<f64> = want.iter().map(|&v| f64::from(v as f32)).collect();
        assert!(got == want, "{file} differs from one pass over the whole file");
    }
}

#[test]
fn an_unstable_quantized_design_is_refused_unless_forced_and_leaves_no_file() {
    let dir = scratch("recordings", "unstable");
    hum_recording(&dir.join("in.wav"), 0.5);
    let demo = repo("audio-demos/hum-reject-50.toml");
    let args = ["apply", demo.to_str().unwrap(), "in.wav", "-o", "out.wav", "--number", "q15"];
    let (code, _, err) = cli(&dir, &args);
    assert_eq!((code, err.lines().count()), (2, 1), "{err}");
    assert!(err.contains("--force"), "{err}");
    assert_eq!(names_in(&dir), ["in.wav"]);
    let forced: Vec<&str> = args.iter().copied().chain(["--force"]).collect();
    let (code, _, err) = cli(&dir, &forced);
    assert_eq!(code, 0, "{err}");
    assert_eq!(names_in(&dir), ["in.wav", "out.wav"]);
}

#[test]
fn output_equal_to_input_is_refused_and_the_input_is_untouched() {
    let dir = scratch("recordings", "same");
    hum_recording(&dir.join("in.wav"), 0.2);
    let before = std::fs::read(dir.join("in.wav")).unwrap();
    let demo = repo("audio-demos/hum-reject-50.toml");
    let (code, _, err) = cli(&dir, &["apply", demo.to_str().unwrap(), "in.wav", "-o", "./in.wav"]);
    assert_eq!((code, err.lines().count()), (2, 1), "{err}");
    assert_eq!(std::fs::read(dir.join("in.wav")).unwrap(), before);
    assert_eq!(names_in(&dir), ["in.wav"]);
}

#[test]
fn a_batch_writes_one_output_per_input_and_refuses_mixed_channel_counts() {
    let dir = scratch("recordings", "batch");
    hum_recording(&dir.join("a.wav"), 0.3);
    hum_recording(&dir.join("b.wav"), 0.4);
    let demo = repo("audio-demos/hum-reject-50.toml");
    let demo = demo.to_str().unwrap();
    let (code, out, err) = cli(&dir, &["apply", demo, "a.wav", "b.wav", "-o", "clean", "--json"]);
    assert_eq!(code, 0, "{err}");
    assert_eq!(names_in(&dir.join("clean")), ["a.wav", "b.wav"]);
    let reports: serde_json::Value = serde_json::from_str(&out).unwrap();
    assert_eq!(reports.as_array().unwrap().len(), 2);
    let stereo = SignalSpec { rate: 48000, channels: 2, seconds: 0.1, level_dbfs: -20.0 };
    write_wav(
        &dir.join("c.wav"),
        WavSpec { channels: 2, rate: 48000, sample: SampleFormat::Int { bits: 16 } },
        &white_noise(&stereo, 1).unwrap(),
    );
    let (code, _, err) = cli(&dir, &["apply", demo, "a.wav", "c.wav", "-o", "mixed"]);
    assert_eq!((code, err.lines().count()), (2, 1), "{err}");
    assert!(err.contains("channel"), "{err}");
    assert!(!dir.join("mixed").exists());
}

#[test]
fn audition_writes_every_file_the_page_names() {
    let dir = scratch("recordings", "audition");
    hum_recording(&dir.join("take.wav"), 0.5);
    let demo = repo("audio-demos/hum-reject-50.toml");
    let (code, _, err) = cli(&dir, &["audition", demo.to_str().unwrap(), "take.wav", "-o", "aud"]);
    assert_eq!(code, 0, "{err}");
    let page = std::fs::read_to_string(dir.join("aud/index.html")).unwrap();
    for name in names_in(&dir.join("aud")) {
        if name != "index.html" {
            assert!(page.contains(&name), "index.html does not reference {name}");
        }
    }
    for wav in ["input.wav", "float64.wav", "target.wav", "residual.wav"] {
        assert!(dir.join("aud").join(wav).exists(), "{wav} missing");
    }
    assert!(page.to_lowercase().contains("start playback quietly"));
}
