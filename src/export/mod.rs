//! Firmware export: a ported design to C or Rust source, rendered from templates.
//!
//! In: a [`Port`] (float64 cascade at one rate and knob setting) and
//! [`ExportOptions`]. Out: an [`Export`] holding every output file's text, the knob
//! interpolation advice and the warnings; [`write()`] puts the files on disk, all or
//! nothing. The stored numbers are exactly what the rest of the tool runs: fixed
//! targets get the integers of [`crate::quantize::quantize`], f32 targets the
//! coefficients of [`crate::quantize::round_to_f32`], f64 targets the cascade itself.
//! The generated kernels reproduce [`crate::simulate::FixedEngine`] integer for integer
//! (widths, rounding, saturation or wrap, error feedback, per-section shifts) and
//! [`crate::simulate::FloatEngine`] operation for operation; golden vectors
//! ([`ExportOptions::vectors`]) are the engines' own output, so a firmware build can
//! prove it.
//!
//! Templates ([`render`]) are minijinja text in strict mode: an unknown variable is an
//! error naming the template and line. The built-in templates live in
//! `firmware-templates/` and are embedded in the binary; a user template replaces the
//! built-in one of the same file name. Numbers are formatted here, never in a template:
//! floats as the shortest decimal that reads back to the same value, so the C and Rust
//! compilers recover the exact f32 or f64.
//!
//! This module does not decide what is stable enough to ship beyond one rule: a design
//! whose stored poles reach |z| ≥ 1 is refused unless forced.
//!
//! # References
//! 1. ISO/IEC 9899:1999 (C99), 6.5.7: `>>` of a negative value and conversion of an
//!    out-of-range value to a signed type are implementation-defined; the C kernels
//!    check the one they rely on at compile time and state the other.
//! 2. A. V. Oppenheim, R. W. Schafer, "Discrete-Time Signal Processing", 3rd ed., 2010,
//!    section 6.3 (direct form I and transposed direct form II).

pub mod context;
pub mod knobs;
pub mod render;
pub mod vectors;

pub use context::Context;
pub use knobs::{KnobAdvice, KnobTable};

use crate::atomic_file::AtomicFile;
use crate::error::{Error, Result};
use crate::pipeline::Port;
use crate::quantize::{quantize, round_to_f32, NumberFormat};
use crate::sections::max_pole_radius;
use std::io::Write;
use std::path::{Path, PathBuf};

/// The language of the generated source.
#[derive(Debug, Clone, Copy, PartialEq, Eq, clap::ValueEnum)]
pub enum Lang {
    /// C99: a header with the tables, a kernel, and with vectors a check program.
    C,
    /// A `#![no_std]`-compatible Rust module, and with vectors a test.
    Rust,
}

/// What to export besides the coefficient table and the kernel.
#[derive(Debug, Clone)]
pub struct ExportOptions {
    /// Target language.
    pub lang: Lang,
    /// User templates, each replacing the built-in template of the same file name.
    pub templates: Vec<PathBuf>,
    /// Golden test vectors of this many frames, with a check program.
    pub vectors: Option<usize>,
    /// Coefficient tables over every knob's travel, with interpolation advice.
    pub knob_tables: bool,
    /// Export even when the stored poles reach the unit circle.
    pub force: bool,
    /// The command line written into every generated header.
    pub command: String,
}

/// One generated file.
#[derive(Debug, Clone, PartialEq, Eq)]
pub struct OutputFile {
    /// File name (no directory).
    pub name: String,
    /// Contents.
    pub text: String,
}

/// Everything an export produced, before anything is written.
#[derive(Debug, Clone)]
pub struct Export {
    /// Generated files in a fixed order.
    pub files: Vec<OutputFile>,
    /// Knob interpolation advice, one line each (empty without knob tables).
    pub advice: Vec<String>,
    /// Doubtful but usable findings.
    pub warnings: Vec<String>,
    /// The template context the files were rendered from.
    pub context: Context,
}

/// What a target stores, before formatting.
#[derive(Debug, Clone)]
pub(crate) enum Numbers {
    /// f64 coefficients (the cascade itself).
    F64(crate::sections::Cascade),
    /// Coefficients rounded to f32.
    F32(crate::sections::Cascade),
    /// Quantized integers.
    Fixed(crate::quantize::FixedCascade),
}

impl Numbers {
    /// The stored numbers of `cascade` for a target format.
    ///
    /// # Errors
    /// Those of [`quantize`].
    pub(crate) fn of(
        cascade: &crate::sections::Cascade,
        number: NumberFormat,
        structure: crate::quantize::Structure,
    ) -> Result<Self> {
        Ok(match number {
            NumberFormat::F64 => Numbers::F64(cascade.clone()),
            NumberFormat::F32 => Numbers::F32(round_to_f32(cascade)),
            NumberFormat::Fixed(f) => Numbers::Fixed(quantize(cascade, &f, structure)?),
        })
    }

    /// The largest pole radius of the stored sections (∞ for an invalid cascade).
    pub(crate) fn max_pole_radius(&self) -> f64 {
        match self {
            Numbers::F64(c) | Numbers::F32(c) => max_pole_radius(&c.sections),
            Numbers::Fixed(q) => {
                q.effective_sections().map_or(f64::INFINITY, |s| max_pole_radius(&s))
            }
        }
    }
}

/// Renders a ported design into source files for `options.lang`.
///
/// # Errors
/// Quantization failures; stored poles on or outside the unit circle without
/// `force`; vectors of 0 frames or too many; knob tables for a design without knobs or
/// with too large a grid; an unreadable user template, a template whose name matches
/// no built-in one, a template syntax error or an unknown variable (each naming the
/// template and line).
///
/// ```
/// use tonewright::export::{export, ExportOptions, Lang};
/// let text = "[target]\nnumber = \"q15\"\n[[stage]]\nkind = \"lowpass\"\norder = 2\n\
///             freq = 1000\nq = 0.707\n";
/// let design = tonewright::design::parse("lp.toml", text, text.as_bytes()).unwrap();
/// let port = tonewright::pipeline::port(design, &[], 48000.0).unwrap();
/// let options = ExportOptions {
///     lang: Lang::C, templates: vec![], vectors: None, knob_tables: false,
///     force: false, command: "tonewright export lp.toml --lang c".into(),
/// };
/// let out = export(&port, &options).unwrap();
/// assert_eq!(out.files.iter().map(|f| f.name.as_str()).collect::<Vec<_>>(), ["lp.h", "lp.c"]);
/// // q15 stores a1 of the 1 kHz Butterworth (−1.8153 to 4 digits) in Q2.14.
/// let a1 = out.context.sections[0].stored[3].parse::<f64>().unwrap() / 16384.0;
/// assert!((a1 + 1.8153).abs() < 1e-4);
/// ```
pub fn export(port: &Port, options: &ExportOptions) -> Result<Export> {
    let target = &port.design.target;
    let numbers = Numbers::of(&port.cascade, target.number, target.structure)?;
    let radius = numbers.max_pole_radius();
    let mut warnings = port.warnings();
    if radius >= 1.0 {
        let msg = format!(
            "{}: stored poles reach |z| = {radius:.6} in {}: the exported filter would be \
             unstable",
            port.design.file,
            context::number_name(target.number)
        );
        if !options.force {
            return Err(Error::numeric(format!("{msg} (pass --force to export anyway)")));
        }
        warnings.push(msg);
    }
    let vectors = options.vectors.map(|n| vectors::golden(&numbers, target.structure, n));
    let vectors = vectors.transpose()?;
    let table = options.knob_tables.then(|| KnobTable::build(port, &numbers)).transpose()?;
    let advice = table.as_ref().map(KnobTable::advice_lines).unwrap_or_default();
    if let Some(t) = &table {
        warnings.extend(t.notes.iter().cloned());
    }
    let context = Context::build(port, options, &numbers, vectors.as_ref(), table.as_ref())?;
    let files = render::render_all(options.lang, &options.templates, &context)?;
    Ok(Export { files, advice, warnings, context })
}

/// Writes every file of `export` into the existing folder `dir`: all are written to
/// temporary files first and renamed into place only when every one is complete.
///
/// # Errors
/// A missing folder, an output that would overwrite one of `inputs`, or any I/O
/// failure, naming the path; no output is left half-written.
pub fn write(export: &Export, dir: &Path, inputs: &[&Path]) -> Result<Vec<PathBuf>> {
    if !dir.is_dir() {
        return Err(Error::io(dir, "output folder does not exist"));
    }
    let mut pending = Vec::with_capacity(export.files.len());
    for f in &export.files {
        let path = dir.join(&f.name);
        let mut out = AtomicFile::create(&path, inputs)?;
        out.write_all(f.text.as_bytes()).map_err(|e| Error::io(&path, e))?;
        pending.push((out, path));
    }
    let mut written = Vec::with_capacity(pending.len());
    for (out, path) in pending {
        out.commit()?;
        written.push(path);
    }
    Ok(written)
}
