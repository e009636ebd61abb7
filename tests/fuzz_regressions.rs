//! Inputs that once crashed, hung or misled a fuzz target (fuzz/, see fuzz/README.md),
//! and a sample of the fuzzers' coverage corpus, replayed through the same harness with
//! no fuzzer (tests/fuzz-regressions/README.md): each must give `Ok` or a clean refusal,
//! one non-empty line with exit code 2, never a panic, a broken promise of the harness
//! or an internal error.

#[path = "common/harness.rs"]
mod harness;

use std::path::Path;

fn replay(kind: &str, run: fn(&[u8]) -> tonewright::Result<()>) {
    let dir = Path::new(env!("CARGO_MANIFEST_DIR")).join("tests/fuzz-regressions").join(kind);
    let mut files: Vec<_> = std::fs::read_dir(&dir).unwrap().map(|e| e.unwrap().path()).collect();
    files.sort();
    assert!(!files.is_empty(), "{} holds no inputs", dir.display());
    for file in files {
        let bytes = std::fs::read(&file).unwrap();
        if let Err(e) = run(&bytes) {
            let message = e.to_string();
            let name = file.display();
            assert_eq!(e.exit_code(), 2, "{name}: not a refusal of bad input: {message}");
            assert!(!message.is_empty() && !message.contains('\n'), "{name}: `{message}`");
        }
    }
}

#[test]
fn design_inputs_that_broke_the_loader_are_refused_cleanly() {
    replay("design", harness::design);
}

#[test]
fn netlists_that_broke_the_solver_are_refused_cleanly() {
    replay("circuit", harness::circuit);
}

#[test]
fn wav_files_that_broke_the_reader_are_refused_cleanly() {
    replay("wav", harness::wav);
}

#[test]
fn recordings_that_broke_apply_are_processed_or_refused_cleanly() {
    replay("apply", harness::apply);
}
