//! Helpers shared by the integration tests.

// Each test binary includes this module and uses only some of it.
#![allow(dead_code)]

use num_complex::Complex64;
use tonewright::analog::AnalogSection;

/// Asserts |got − want| ≤ atol + rtol·|want|, naming the quantity on failure.
#[track_caller]
pub fn assert_close(what: &str, got: f64, want: f64, rtol: f64, atol: f64) {
    let err = (got - want).abs();
    assert!(
        err <= atol + rtol * want.abs(),
        "{what}: got {got:e}, want {want:e}, error {err:e} (rtol {rtol:e}, atol {atol:e})"
    );
}

/// H(j·2π·hz) of a cascade of analog sections.
pub fn response(sections: &[AnalogSection], hz: f64) -> Complex64 {
    let s = Complex64::new(0.0, 2.0 * std::f64::consts::PI * hz);
    sections.iter().map(|x| x.eval(s)).product()
}

/// 20·log10|H| of a cascade at `hz`.
pub fn db(sections: &[AnalogSection], hz: f64) -> f64 {
    20.0 * response(sections, hz).norm().log10()
}

/// A fresh, empty scratch folder for one test (`tonewright-TAG-PID-NAME` in the
/// system's temporary folder).
pub fn scratch(tag: &str, name: &str) -> std::path::PathBuf {
    let dir = std::env::temp_dir().join(format!("tonewright-{tag}-{}-{name}", std::process::id()));
    let _ = std::fs::remove_dir_all(&dir);
    std::fs::create_dir_all(&dir).unwrap();
    dir
}

/// Runs the tonewright binary in `dir`; returns (exit code, stdout, stderr).
pub fn cli(dir: &std::path::Path, args: &[&str]) -> (i32, String, String) {
    let out = std::process::Command::new(env!("CARGO_BIN_EXE_tonewright"))
        .args(args)
        .current_dir(dir)
        .output()
        .unwrap();
    (
        out.status.code().unwrap_or(-1),
        String::from_utf8_lossy(&out.stdout).into_owned(),
        String::from_utf8_lossy(&out.stderr).into_owned(),
    )
}

/// The sorted file names in a folder.
pub fn names_in(dir: &std::path::Path) -> Vec<String> {
    let mut v: Vec<String> = std::fs::read_dir(dir)
        .unwrap()
        .map(|e| e.unwrap().file_name().to_string_lossy().into_owned())
        .collect();
    v.sort();
    v
}

/// The path of a file under the crate root.
pub fn repo(path: &str) -> std::path::PathBuf {
    std::path::Path::new(env!("CARGO_MANIFEST_DIR")).join(path)
}

/// Asserts an input error whose one lowercase line, without a trailing period,
/// contains every needle.
#[track_caller]
pub fn assert_input_error<T: std::fmt::Debug>(r: tonewright::Result<T>, needles: &[&str]) {
    let msg = match r {
        Err(tonewright::Error::Input(m)) => m,
        other => panic!("expected an input error containing {needles:?}, got {other:?}"),
    };
    let first = msg.chars().next().unwrap();
    assert!(!first.is_uppercase() && !msg.ends_with('.'), "lowercase, no period: {msg}");
    for n in needles {
        assert!(msg.contains(n), "{msg:?} should contain {n:?}");
    }
}
