//! The bad-design corpus: every file under tests/bad-designs/ is refused by `inspect`
//! with exit code 2 and one line `error: FILE:LINE: …` containing the fragment listed
//! in tests/bad-designs/expected.tsv, and by `export` with exit code 2, one line and no
//! file written; nothing panics and no design file is changed.

#[path = "common/corpus.rs"]
mod corpus;

use corpus::{assert_refused, files_with_extension, fingerprint, scratch_dir, table, tonewright};
use std::path::Path;

#[test]
fn every_bad_design_is_listed_and_refused_with_its_line_and_message() {
    let dir = Path::new("tests/bad-designs");
    let expected = table(&dir.join("expected.tsv"), 3);
    let files = files_with_extension(dir, "toml");
    for f in &files {
        assert!(expected.iter().any(|row| &row[0] == f), "{f} has no line in expected.tsv");
    }
    assert!(files.len() >= 60, "the corpus must hold at least 60 designs, has {}", files.len());
    let out_dir = scratch_dir("bad-designs-export");
    for row in &expected {
        let (name, line, fragment) = (&row[0], &row[1], &row[2]);
        let path = dir.join(name);
        let before = fingerprint(&path);
        let out = tonewright(["inspect", path.to_str().unwrap(), "--rate", "48000"]);
        let want_start = format!("error: {}:{line}: ", path.display());
        assert_refused(name, &out, &want_start);
        let stderr = String::from_utf8_lossy(&out.stderr);
        assert!(stderr.contains(fragment.as_str()), "{name}: `{stderr}` lacks `{fragment}`");

        let out = tonewright([
            "export",
            path.to_str().unwrap(),
            "--rate",
            "48000",
            "--lang",
            "c",
            "-o",
            out_dir.to_str().unwrap(),
        ]);
        assert_refused(name, &out, &want_start);
        assert_eq!(std::fs::read_dir(&out_dir).unwrap().count(), 0, "{name}: export wrote");
        assert_eq!(fingerprint(&path), before, "{name}: input changed");
    }
}
