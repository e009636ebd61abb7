//! The bad-design corpus: every file under tests/bad-designs/ is refused by `inspect`
//! with exit code 2 and one line `error: FILE:LINE: …` containing the fragment listed
//! in tests/bad-designs/expected.tsv; nothing panics and no file is changed.

use std::path::Path;
use std::process::Command;

fn expectations() -> Vec<(String, usize, String)> {
    let table = std::fs::read_to_string("tests/bad-designs/expected.tsv").expect("expected.tsv");
    table
        .lines()
        .filter(|l| !l.starts_with('#') && !l.trim().is_empty())
        .map(|l| {
            let cols: Vec<&str> = l.split('\t').collect();
            assert_eq!(cols.len(), 3, "expected.tsv line `{l}` needs 3 tab-separated columns");
            (cols[0].to_string(), cols[1].parse().expect("line number"), cols[2].to_string())
        })
        .collect()
}

#[test]
fn every_bad_design_is_listed_and_refused_with_its_line_and_message() {
    let expected = expectations();
    let mut files: Vec<String> = std::fs::read_dir("tests/bad-designs")
        .unwrap()
        .map(|e| e.unwrap().file_name().to_string_lossy().into_owned())
        .filter(|n| n.ends_with(".toml"))
        .collect();
    files.sort();
    let listed: Vec<&str> = expected.iter().map(|e| e.0.as_str()).collect();
    for f in &files {
        assert!(listed.contains(&f.as_str()), "{f} has no line in expected.tsv");
    }
    assert!(files.len() >= 30, "the corpus must hold at least 30 designs, has {}", files.len());
    for (name, line, fragment) in &expected {
        let path = Path::new("tests/bad-designs").join(name);
        let before = std::fs::read(&path).unwrap();
        let out = Command::new(env!("CARGO_BIN_EXE_tonewright"))
            .args(["inspect", path.to_str().unwrap(), "--rate", "48000"])
            .output()
            .unwrap();
        let stderr = String::from_utf8_lossy(&out.stderr);
        assert_eq!(
            out.status.code(),
            Some(2),
            "{name}: exit {:?}, stderr {stderr}",
            out.status.code()
        );
        let lines: Vec<&str> = stderr.lines().collect();
        assert_eq!(lines.len(), 1, "{name}: expected one line, got {stderr}");
        let want_start = format!("error: {}:{line}: ", path.display());
        assert!(
            lines[0].starts_with(&want_start),
            "{name}: `{}` does not start with `{want_start}`",
            lines[0]
        );
        assert!(lines[0].contains(fragment.as_str()), "{name}: `{}` lacks `{fragment}`", lines[0]);
        assert!(out.stdout.is_empty(), "{name}: printed a report on stdout");
        assert_eq!(std::fs::read(&path).unwrap(), before, "{name}: input changed");
    }
}
