//! Output files that appear complete or not at all.
//!
//! In: a target path and the input paths of the run. Out: an [`AtomicFile`] that
//! writes (and seeks, for headers patched at the end) into a temporary file in the
//! target's directory, named `.<target name>.<pid>-<n>.tmp`, and renames it onto the
//! target in [`AtomicFile::commit`]. Dropping it without a commit removes the
//! temporary file, so an error or a panic half-way leaves the old target untouched.
//! Every verb of the tool writes every output (WAV, JSON, SVG, C, HTML) through it.
//!
//! An output whose canonical path equals the canonical path of an input is refused
//! before anything is written, so `apply in.wav -o ./in.wav` cannot destroy its own
//! source. The rename is atomic on POSIX file systems when temporary file and target
//! share a directory, which is why the temporary file is made beside the target.
//! It does not lock the target against other writers.
//!
//! # References
//! 1. IEEE Std 1003.1 (POSIX), `rename()`: "If the link named by the new argument
//!    exists, it shall be removed and old renamed to new", as one atomic step.

use crate::error::{Error, Result};
use std::fs::{File, OpenOptions};
use std::io::{BufWriter, Seek, SeekFrom, Write};
use std::path::{Path, PathBuf};
use std::sync::atomic::{AtomicU64, Ordering};

/// Distinguishes temporary files of one process writing the same target twice.
static TEMP_COUNTER: AtomicU64 = AtomicU64::new(0);

/// A buffered output file renamed onto its target only when complete.
#[derive(Debug)]
pub struct AtomicFile {
    target: PathBuf,
    temp: PathBuf,
    /// `None` only after a successful commit.
    writer: Option<BufWriter<File>>,
}

impl AtomicFile {
    /// Creates a temporary file beside `target`, refusing a target that is one of `inputs`.
    ///
    /// # Errors
    /// [`Error::Input`] when `target` resolves to the same file as one of `inputs` or
    /// has no file name; [`Error::Io`] naming the path when the directory cannot be
    /// resolved or the temporary file cannot be created.
    pub fn create(target: &Path, inputs: &[&Path]) -> Result<AtomicFile> {
        let canonical_target = canonical_output(target)?;
        for input in inputs {
            // An input that does not exist cannot be overwritten, so it is skipped.
            if let Ok(canonical_input) = input.canonicalize() {
                if canonical_input == canonical_target {
                    return Err(Error::input(format!(
                        "{}: output would overwrite the input {}",
                        target.display(),
                        input.display()
                    )));
                }
            }
        }
        let name = target.file_name().ok_or_else(|| {
            Error::input(format!("{}: output path has no file name", target.display()))
        })?;
        let dir = canonical_target.parent().unwrap_or(Path::new("."));
        let n = TEMP_COUNTER.fetch_add(1, Ordering::Relaxed);
        let temp =
            dir.join(format!(".{}.{}-{}.tmp", name.to_string_lossy(), std::process::id(), n));
        let file = OpenOptions::new()
            .write(true)
            .create_new(true)
            .open(&temp)
            .map_err(|e| Error::io(target, format!("cannot create temporary file: {e}")))?;
        Ok(AtomicFile { target: target.to_path_buf(), temp, writer: Some(BufWriter::new(file)) })
    }

    /// The path the file will have after [`AtomicFile::commit`].
    pub fn target(&self) -> &Path {
        &self.target
    }

    /// Flushes, syncs and renames the temporary file onto the target.
    ///
    /// # Errors
    /// [`Error::Io`] naming the target when flushing, syncing or renaming fails; the
    /// temporary file is then removed.
    pub fn commit(mut self) -> Result<()> {
        let writer = self.writer.take().ok_or_else(|| {
            Error::Internal(format!("{}: committed twice", self.target.display()))
        })?;
        let file = writer.into_inner().map_err(|e| Error::io(&self.target, e.error()))?;
        file.sync_all().map_err(|e| Error::io(&self.target, e))?;
        drop(file);
        std::fs::rename(&self.temp, &self.target).map_err(|e| {
            let _ = std::fs::remove_file(&self.temp);
            Error::io(&self.target, format!("cannot rename temporary file into place: {e}"))
        })
    }

    fn writer(&mut self) -> std::io::Result<&mut BufWriter<File>> {
        self.writer.as_mut().ok_or_else(|| std::io::Error::other("file already committed"))
    }
}

impl Write for AtomicFile {
    fn write(&mut self, buf: &[u8]) -> std::io::Result<usize> {
        self.writer()?.write(buf)
    }

    fn write_all(&mut self, buf: &[u8]) -> std::io::Result<()> {
        self.writer()?.write_all(buf)
    }

    fn flush(&mut self) -> std::io::Result<()> {
        self.writer()?.flush()
    }
}

impl Seek for AtomicFile {
    fn seek(&mut self, pos: SeekFrom) -> std::io::Result<u64> {
        self.writer()?.seek(pos)
    }
}

impl Drop for AtomicFile {
    fn drop(&mut self) {
        if self.writer.take().is_some() {
            // Not committed: the partial output must not survive. A failure to remove
            // leaves only a hidden temporary file, never a damaged target.
            let _ = std::fs::remove_file(&self.temp);
        }
    }
}

/// The canonical path `target` will have: its own if it exists (following a symlink
/// to the file it would replace), otherwise its canonical directory plus its name.
fn canonical_output(target: &Path) -> Result<PathBuf> {
    if let Ok(path) = target.canonicalize() {
        return Ok(path);
    }
    let name = target.file_name().ok_or_else(|| {
        Error::input(format!("{}: output path has no file name", target.display()))
    })?;
    let dir = match target.parent() {
        Some(dir) if !dir.as_os_str().is_empty() => dir,
        _ => Path::new("."),
    };
    let dir = dir
        .canonicalize()
        .map_err(|e| Error::io(target, format!("cannot resolve output directory: {e}")))?;
    Ok(dir.join(name))
}

#[cfg(test)]
mod tests {
    use super::*;

    fn scratch_dir(name: &str) -> PathBuf {
        let dir =
            std::env::temp_dir().join(format!("tonewright-atomic-{}-{name}", std::process::id()));
        let _ = std::fs::remove_dir_all(&dir);
        std::fs::create_dir_all(&dir).unwrap();
        dir
    }

    fn entries(dir: &Path) -> Vec<String> {
        let mut names: Vec<String> = std::fs::read_dir(dir)
            .unwrap()
            .map(|e| e.unwrap().file_name().to_string_lossy().into_owned())
            .collect();
        names.sort();
        names
    }

    #[test]
    fn commit_replaces_target_and_leaves_no_temporary_file() {
        let dir = scratch_dir("commit");
        let target = dir.join("out.txt");
        std::fs::write(&target, b"old").unwrap();
        let mut file = AtomicFile::create(&target, &[]).unwrap();
        file.write_all(b"new contents").unwrap();
        assert_eq!(std::fs::read(&target).unwrap(), b"old", "target changed before commit");
        file.commit().unwrap();
        assert_eq!(std::fs::read(&target).unwrap(), b"new contents");
        assert_eq!(entries(&dir), ["out.txt"]);
    }

    #[test]
    fn drop_without_commit_removes_temporary_file_and_keeps_target() {
        let dir = scratch_dir("drop");
        let target = dir.join("out.txt");
        std::fs::write(&target, b"old").unwrap();
        {
            let mut file = AtomicFile::create(&target, &[]).unwrap();
            file.write_all(b"half").unwrap();
            assert_eq!(entries(&dir).len(), 2, "temporary file should exist while writing");
        }
        assert_eq!(std::fs::read(&target).unwrap(), b"old");
        assert_eq!(entries(&dir), ["out.txt"]);
    }

    #[test]
    fn output_equal_to_an_input_is_refused_through_a_different_spelling() {
        let dir = scratch_dir("same");
        let input = dir.join("in.wav");
        std::fs::write(&input, b"data").unwrap();
        std::fs::create_dir_all(dir.join("sub")).unwrap();
        let other_spelling = dir.join("sub").join("..").join("in.wav");
        let err = AtomicFile::create(&other_spelling, &[Path::new("unrelated"), &input])
            .unwrap_err()
            .to_string();
        assert!(err.contains("would overwrite the input"), "{err}");
        assert!(err.contains("in.wav"), "{err}");
        assert_eq!(std::fs::read(&input).unwrap(), b"data");
    }

    #[test]
    fn missing_output_directory_is_an_error_naming_the_path() {
        let dir = scratch_dir("nodir");
        let target = dir.join("no-such-dir").join("out.wav");
        let err = AtomicFile::create(&target, &[]).unwrap_err().to_string();
        assert!(err.contains("no-such-dir"), "{err}");
    }

    #[test]
    fn seek_allows_patching_bytes_written_earlier() {
        let dir = scratch_dir("seek");
        let target = dir.join("out.bin");
        let mut file = AtomicFile::create(&target, &[]).unwrap();
        file.write_all(b"0000abcd").unwrap();
        file.seek(SeekFrom::Start(0)).unwrap();
        file.write_all(b"12").unwrap();
        file.commit().unwrap();
        assert_eq!(std::fs::read(&target).unwrap(), b"1200abcd");
    }
}
