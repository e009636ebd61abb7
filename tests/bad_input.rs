//! Bad input through the binary: what `tonewright apply` does with defective WAV files,
//! outputs it cannot or must not write, inconsistent batches, inputs that ask for
//! absurd resources, and a process killed half-way. Every refusal is exit 2 with one
//! line naming the file (never 101, a panic); no output file appears; inputs keep
//! their bytes (compared by fingerprint).

#[path = "common/corpus.rs"]
mod corpus;

use corpus::{assert_refused, files_with_extension, fingerprint, scratch_dir, table, tonewright};
use std::os::unix::process::ExitStatusExt;
use std::path::{Path, PathBuf};
use std::process::{Command, Stdio};
use std::time::{Duration, Instant};
use tonewright::audio::signal::{sine, SignalSpec};
use tonewright::audio::{SampleFormat, WavSpec, WavWriter};

/// A design every good file can run: a second-order 1 kHz low-pass in q15, no pinned rate.
const GOOD_DESIGN: &str =
    "[target]\nnumber = \"q15\"\n\n[[stage]]\nkind = \"lowpass\"\nfreq = 1000\n";

fn good_design(dir: &Path) -> PathBuf {
    let path = dir.join("good.toml");
    std::fs::write(&path, GOOD_DESIGN).unwrap();
    path
}

/// A short 16-bit sine file.
fn good_wav(path: &Path, channels: u16, rate: u32) {
    let spec = SignalSpec { rate, channels, seconds: 0.05, level_dbfs: -6.0 };
    let sample = SampleFormat::Int { bits: 16 };
    let mut w = WavWriter::create(path, WavSpec { channels, rate, sample }, &[]).unwrap();
    w.write_block(&sine(&spec, 100.0).unwrap()).unwrap();
    w.finish().unwrap();
}

fn apply(design: &Path, inputs: &[&Path], output: &Path) -> std::process::Output {
    let mut args = vec![Path::new("apply"), design];
    args.extend_from_slice(inputs);
    args.extend([Path::new("-o"), output]);
    tonewright(args)
}

/// Nothing but the files named in `keep` is in `dir`: no output and no temporary file.
#[track_caller]
fn assert_only(dir: &Path, keep: &[&str]) {
    let mut names = files_with_extension(dir, "wav");
    names.extend(files_with_extension(dir, "tmp"));
    names.extend(files_with_extension(dir, "toml"));
    names.retain(|n| !keep.contains(&n.as_str()));
    assert!(names.is_empty(), "unexpected files in {}: {names:?}", dir.display());
}

#[test]
fn every_bad_wav_is_refused_by_apply_without_output_or_change() {
    let corpus_dir = Path::new(env!("CARGO_MANIFEST_DIR")).join("tests/bad-wav");
    let dir = scratch_dir("bad-wav-apply");
    let design = good_design(&dir);
    let out = dir.join("out.wav");
    let expected = table(&corpus_dir.join("expected.tsv"), 2);
    assert!(expected.len() >= 25, "the corpus must hold at least 25 WAV files");
    for row in &expected {
        let (name, start) = (&row[0], &row[1]);
        let input = corpus_dir.join(name);
        let before = fingerprint(&input);
        let result = apply(&design, &[&input], &out);
        assert_refused(name, &result, &format!("error: {}: {start}", input.display()));
        assert!(!out.exists(), "{name}: output created");
        assert_only(&dir, &["good.toml"]);
        assert_eq!(fingerprint(&input), before, "{name}: input changed");
    }
}

#[test]
fn a_wav_whose_own_rate_is_out_of_range_is_refused_naming_it() {
    let dir = scratch_dir("rate-500");
    let design = good_design(&dir);
    let input = dir.join("rate-500.wav");
    good_wav(&input, 1, 500);
    let result = apply(&design, &[&input], &dir.join("out.wav"));
    let want = format!("error: {}: rate 500 Hz must be from 1000", input.display());
    assert_refused("500 Hz file", &result, &want);
    assert_only(&dir, &["good.toml", "rate-500.wav"]);
}

#[test]
fn outputs_that_cannot_be_written_are_refused_naming_the_output() {
    let dir = scratch_dir("unwritable");
    let design = good_design(&dir);
    let input = dir.join("in.wav");
    good_wav(&input, 1, 48000);
    let before = fingerprint(&input);
    // A folder that does not exist, a file used as a folder, and a folder as the target.
    // (Permission bits are not used: the tests may run as root, who ignores them.)
    std::fs::create_dir(dir.join("taken")).unwrap();
    for (target, message) in [
        (dir.join("no-such-dir").join("out.wav"), "cannot resolve output directory"),
        (input.join("out.wav"), "cannot create temporary file"),
        (dir.join("taken"), "cannot rename temporary file into place"),
    ] {
        let result = apply(&design, &[&input], &target);
        let want = format!("error: {}: {message}", target.display());
        assert_refused(&target.display().to_string(), &result, &want);
        assert_only(&dir, &["good.toml", "in.wav"]);
        assert!(std::fs::read_dir(dir.join("taken")).unwrap().next().is_none());
        assert_eq!(fingerprint(&input), before);
    }
}

#[test]
fn an_output_equal_to_the_input_is_refused_whatever_its_spelling() {
    let dir = scratch_dir("same-file");
    let design = good_design(&dir);
    let input = dir.join("in.wav");
    good_wav(&input, 2, 44100);
    let before = fingerprint(&input);
    std::fs::create_dir(dir.join("sub")).unwrap();
    for target in [input.clone(), dir.join("sub").join("..").join("in.wav")] {
        let result = apply(&design, &[&input], &target);
        let want = format!("error: {}: output would overwrite the input", target.display());
        assert_refused("same file", &result, &want);
        assert_eq!(fingerprint(&input), before, "input changed");
        assert_only(&dir, &["good.toml", "in.wav"]);
    }
}

#[test]
fn a_batch_with_mixed_channel_counts_is_refused_before_anything_is_written() {
    let dir = scratch_dir("batch");
    let design = good_design(&dir);
    let (mono, stereo) = (dir.join("mono.wav"), dir.join("stereo.wav"));
    good_wav(&mono, 1, 48000);
    good_wav(&stereo, 2, 48000);
    let out = dir.join("out");
    let result = apply(&design, &[&mono, &stereo], &out);
    let want = format!("error: {}: 2 channels, but {} has 1", stereo.display(), mono.display());
    assert_refused("mixed batch", &result, &want);
    assert!(!out.exists(), "output folder created");
}

#[test]
fn a_batch_reports_each_failed_file_on_one_line_and_still_writes_the_others() {
    let dir = scratch_dir("batch-partial");
    let design = good_design(&dir);
    let (good, low) = (dir.join("good.wav"), dir.join("low.wav"));
    good_wav(&good, 1, 48000);
    good_wav(&low, 1, 500);
    let out = dir.join("out");
    let result = apply(&design, &[&low, &good], &out);
    let want = format!("error: {}: rate 500 Hz must be from 1000", low.display());
    assert_refused("batch with a 500 Hz file", &result_without_stdout(result), &want);
    assert!(out.join("good.wav").exists(), "the good file was not written");
    assert!(!out.join("low.wav").exists(), "the failed file has an output");
}

/// The batch prints the good file's report on stdout; only stderr is judged here.
fn result_without_stdout(mut out: std::process::Output) -> std::process::Output {
    out.stdout.clear();
    out
}

#[test]
fn bad_option_values_are_refused_before_any_output() {
    let dir = scratch_dir("options");
    let design = good_design(&dir);
    let input = dir.join("in.wav");
    good_wav(&input, 1, 48000);
    let (out, residual) = (dir.join("out.wav"), dir.join("residual.wav"));
    let base =
        ["apply", design.to_str().unwrap(), input.to_str().unwrap(), "-o", out.to_str().unwrap()];
    for (extra, want) in [
        (
            vec!["--residual-gain", "nan", "--residual", residual.to_str().unwrap()],
            "error: --residual-gain NaN: must be",
        ),
        (
            vec!["--residual-gain", "1000", "--residual", residual.to_str().unwrap()],
            "error: --residual-gain 1000: must be",
        ),
        (vec!["--bits", "12"], "error: --bits 12: expected"),
        (vec!["--knob", "tone=0.5"], "error: --knob tone=0.5: "),
        (vec!["--rate", "nan"], "error: rate NaN Hz must be"),
        (vec!["--rate", "-5"], "error: rate -5 Hz must be"),
    ] {
        let result = tonewright(base.iter().chain(&extra));
        assert_refused(&extra.join(" "), &result, want);
        assert_only(&dir, &["good.toml", "in.wav"]);
    }
}

#[test]
fn absurd_requests_are_refused_quickly_before_any_large_allocation() {
    // Memory is bounded by construction, not measured: the loader counts a circuit's
    // parts and a transfer's coefficients before building anything (MAX_PARTS,
    // 65 coefficients), families stop at order 16, and the WAV reader compares the data
    // size its header declares with the file's length before it reads, then reads in
    // blocks of fixed size. Time is bounded loosely here, for a debug build.
    let dir = scratch_dir("absurd");
    let huge = dir.join("declares-4gib.wav");
    // The largest size a RIFF header can declare (4 GiB − 1 in a 32-bit field; 64-bit
    // RF64 sizes are refused outright), over a file of 44 bytes.
    let mut header = b"RIFF\xff\xff\xff\xffWAVEfmt \x10\0\0\0\x01\0\x02\0".to_vec();
    header.extend(48000u32.to_le_bytes());
    header.extend((48000u32 * 4).to_le_bytes());
    header.extend(b"\x04\0\x10\0data\xff\xff\xff\xff");
    std::fs::write(&huge, &header).unwrap();
    let order = dir.join("order-million.toml");
    std::fs::write(
        &order,
        "[[stage]]\nkind = \"prototype\"\nfamily = \"butterworth\"\norder = 1000000\n\
         band = \"lowpass\"\nfreq = 1000\n",
    )
    .unwrap();
    let design = good_design(&dir);
    let out = dir.join("o.wav");
    let parts =
        Path::new(env!("CARGO_MANIFEST_DIR")).join("tests/bad-designs/circuit-10000-parts.toml");
    let cases: [(&str, Vec<&Path>, String); 3] = [
        (
            "4 GiB header",
            vec![Path::new("apply"), &design, &huge, Path::new("-o"), &out],
            format!("error: {}: truncated data chunk: header declares 4294967295", huge.display()),
        ),
        (
            "order 1000000",
            vec![Path::new("inspect"), &order, Path::new("--rate"), Path::new("48000")],
            format!("error: {}:4: stage 1: order: 1000000 must be a whole number", order.display()),
        ),
        (
            "10 000 parts",
            vec![Path::new("inspect"), &parts, Path::new("--rate"), Path::new("48000")],
            format!("error: {}:3: stage 1: parts: 10003 parts is more than", parts.display()),
        ),
    ];
    for (what, args, want) in cases {
        let started = Instant::now();
        let result = tonewright(args);
        let took = started.elapsed();
        assert_refused(what, &result, &want);
        assert!(took < Duration::from_secs(5), "{what}: took {took:?}");
    }
}

#[test]
fn killing_apply_half_way_leaves_no_file_at_the_target_and_the_input_intact() {
    // Ten minutes of 48 kHz stereo 16-bit (115 MB), written one second at a time.
    let dir = scratch_dir("kill");
    let design = good_design(&dir);
    let input = dir.join("long.wav");
    let spec = SignalSpec { rate: 48000, channels: 2, seconds: 1.0, level_dbfs: -6.0 };
    let second = sine(&spec, 440.0).unwrap();
    let wav = WavSpec { channels: 2, rate: 48000, sample: SampleFormat::Int { bits: 16 } };
    let mut w = WavWriter::create(&input, wav, &[]).unwrap();
    for _ in 0..600 {
        w.write_block(&second).unwrap();
    }
    w.finish().unwrap();
    let before = fingerprint(&input);
    let target = dir.join("out.wav");
    let mut child = Command::new(env!("CARGO_BIN_EXE_tonewright"))
        .args([Path::new("apply"), &design, &input, Path::new("-o"), &target])
        .stdout(Stdio::null())
        .stderr(Stdio::null())
        .spawn()
        .unwrap();
    // Wait until the temporary file beside the target appears (output has started).
    let started = Instant::now();
    while files_with_extension(&dir, "tmp").is_empty()
        && started.elapsed() < Duration::from_secs(10)
    {
        std::thread::sleep(Duration::from_millis(5));
    }
    std::thread::sleep(Duration::from_millis(200));
    child.kill().unwrap(); // SIGKILL on Unix: no destructor, no cleanup runs.
    let status = child.wait().unwrap();
    assert_eq!(status.signal(), Some(9), "apply finished before it was killed: {status:?}");
    assert!(!target.exists(), "a file exists at the target after the kill");
    assert_eq!(fingerprint(&input), before, "input changed");
    // What SIGKILL leaves is the hidden temporary file, never the target.
    let temps = files_with_extension(&dir, "tmp");
    assert!(temps.iter().all(|t| t.starts_with(".out.wav.")), "{temps:?}");
    // 115 MB of input: not left in the temporary directory.
    std::fs::remove_dir_all(&dir).unwrap();
}
