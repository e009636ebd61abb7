//! Helpers for the bad-input corpora: their tables of expected messages, scratch
//! folders, file fingerprints and the refusal every bad input must get from the binary.
//!
//! Each test binary that includes this file (`#[path = "common/corpus.rs"] mod corpus;`) uses only
//! part of it, hence the `dead_code` allowance; every item is used by some binary.
#![allow(dead_code)]

use std::hash::{DefaultHasher, Hasher};
use std::path::{Path, PathBuf};
use std::process::{Command, Output};

/// The rows of a tab-separated table, skipping blank lines and `#` comments; each row
/// must have exactly `columns` fields.
pub fn table(path: &Path, columns: usize) -> Vec<Vec<String>> {
    let text = std::fs::read_to_string(path).unwrap_or_else(|e| panic!("{}: {e}", path.display()));
    text.lines()
        .filter(|l| !l.starts_with('#') && !l.trim().is_empty())
        .map(|l| {
            let cols: Vec<String> = l.split('\t').map(str::to_string).collect();
            assert_eq!(cols.len(), columns, "{}: `{l}` needs {columns} columns", path.display());
            cols
        })
        .collect()
}

/// The names of the files in `dir` ending in `.ext`, sorted.
pub fn files_with_extension(dir: &Path, ext: &str) -> Vec<String> {
    let mut names: Vec<String> = std::fs::read_dir(dir)
        .unwrap()
        .map(|e| e.unwrap().file_name().to_string_lossy().into_owned())
        .filter(|n| n.ends_with(&format!(".{ext}")))
        .collect();
    names.sort();
    names
}

/// A fresh, empty folder for one test, unique to this process.
pub fn scratch_dir(name: &str) -> PathBuf {
    let dir = std::env::temp_dir().join(format!("tonewright-{}-{name}", std::process::id()));
    let _ = std::fs::remove_dir_all(&dir);
    std::fs::create_dir_all(&dir).unwrap();
    dir
}

/// A 64-bit fingerprint (SipHash) of a file's bytes, to show an input was not changed.
pub fn fingerprint(path: &Path) -> u64 {
    let mut h = DefaultHasher::new();
    h.write(&std::fs::read(path).unwrap_or_else(|e| panic!("{}: {e}", path.display())));
    h.finish()
}

/// Runs the tonewright binary.
pub fn tonewright<I, S>(args: I) -> Output
where
    I: IntoIterator<Item = S>,
    S: AsRef<std::ffi::OsStr>,
{
    Command::new(env!("CARGO_BIN_EXE_tonewright")).args(args).output().unwrap()
}

/// Asserts the refusal every bad input gets: exit 2 (never 101, a panic), nothing on
/// stdout, and exactly one line on stderr that starts with `want_start`.
#[track_caller]
pub fn assert_refused(what: &str, out: &Output, want_start: &str) {
    let stderr = String::from_utf8_lossy(&out.stderr);
    assert_ne!(out.status.code(), Some(101), "{what}: panicked: {stderr}");
    assert_eq!(out.status.code(), Some(2), "{what}: exit {:?}: {stderr}", out.status.code());
    let lines: Vec<&str> = stderr.lines().collect();
    assert_eq!(lines.len(), 1, "{what}: want one line, got {stderr}");
    assert!(
        lines[0].starts_with(want_start),
        "{what}: `{}` does not start with `{want_start}`",
        lines[0]
    );
    assert!(out.stdout.is_empty(), "{what}: printed on stdout");
}
