//! The template context: every value a template may use, formatted for the language.
//!
//! Numbers are text here so templates never format them: integers in decimal (the C
//! spelling of −2^31 is `(-2147483647 - 1)`, since `2147483648` alone does not fit an
//! `int`), floats as the shortest decimal in exponent form that reads back to the same
//! f64 or f32 (`1.5e-1`; C float literals get the `f` suffix). The README's export
//! section lists every variable.

use super::knobs::KnobTable;
use super::vectors::Vectors;
use super::{ExportOptions, Lang, Numbers};
use crate::error::{Error, Result};
use crate::pipeline::Port;
use crate::quantize::{FixedFormat, NumberFormat, Overflow, Rounding, Structure};
use crate::sections::Sos;
use serde::Serialize;

/// Values per line in long generated arrays.
const ROW: usize = 8;

/// Every value the templates see (see the README for the table of variables).
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct Context {
    /// `tonewright`.
    pub tool: String,
    /// The tool's version.
    pub version: String,
    /// The command line that made the files.
    pub command: String,
    /// The generated-file header, one line each, without comment markers.
    pub header: Vec<String>,
    /// The design's name, file and hash.
    pub design: DesignInfo,
    /// C identifier prefix made from the design file name (`two_knob_tone`).
    pub prefix: String,
    /// The prefix in capitals, for macros.
    pub prefix_upper: String,
    /// Names of the generated files.
    pub files: FileNames,
    /// Sample rate in Hz, as text.
    pub rate: String,
    /// `q15`, `q23`, `q31`, `fixed` (a `[target.fixed]` table), `f32` or `f64`.
    pub number: String,
    /// The number format in words.
    pub format: String,
    /// `df1` or `df2t`.
    pub structure: String,
    /// The fixed-point format; absent for float targets.
    pub fixed: Option<FixedInfo>,
    /// The float type; absent for fixed targets.
    pub float: Option<FloatInfo>,
    /// The coefficient table at the exported knob setting.
    pub sections: Vec<SectionInfo>,
    /// Knob positions the table was made at.
    pub knobs: Vec<KnobInfo>,
    /// Tables over the knobs' travel (with `--knobs`).
    pub knob_table: Option<KnobTableInfo>,
    /// Golden vectors (with `--vectors`).
    pub vectors: Option<VectorInfo>,
}

/// The design as the header names it.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct DesignInfo {
    /// Free-text name (the file name when the design has none).
    pub name: String,
    /// File as given on the command line.
    pub file: String,
    /// FNV-1a 64-bit hash of the file's bytes, hex.
    pub hash: String,
}

/// File names of one export.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct FileNames {
    /// C header (`prefix.h`).
    pub header: String,
    /// C kernel (`prefix.c`).
    pub kernel: String,
    /// Rust module (`prefix.rs`).
    pub module: String,
    /// Vectors (`prefix_vectors.h` or `.rs`).
    pub vectors: String,
    /// Check program (`prefix_check.c` or `.rs`).
    pub check: String,
}

/// A fixed-point format with the types that hold it.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct FixedInfo {
    /// Coefficient word length.
    pub coef_bits: u32,
    /// Fractional bits of the coefficients.
    pub coef_frac: u32,
    /// Sample word length.
    pub data_bits: u32,
    /// Accumulator width.
    pub acc_bits: u32,
    /// `nearest`, `floor` or `even`.
    pub rounding: String,
    /// `saturate` or `wrap`.
    pub overflow: String,
    /// 0, 1 or 2.
    pub error_feedback: u32,
    /// True for a 64-bit accumulator, whose exact sums need more than 64 bits.
    pub wide_acc: bool,
    /// C coefficient type (`int16_t` or `int32_t`).
    pub coef_c: String,
    /// Rust coefficient type (`i16` or `i32`).
    pub coef_rust: String,
}

/// A float target's types.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct FloatInfo {
    /// 32 or 64.
    pub bits: u32,
    /// `float` or `double`.
    pub c: String,
    /// `f32` or `f64`.
    pub rust: String,
}

/// One section of a coefficient set.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct SectionInfo {
    /// Position in the cascade, from 0.
    pub index: usize,
    /// b0, b1, b2, a1, a2 of the float64 design.
    pub float: [String; 5],
    /// b0, b1, b2, a1, a2 as the target stores them, as literals of the language.
    pub stored: [String; 5],
    /// Left shift of the accumulator (fixed targets; 0 for float).
    pub shift: u32,
}

/// A knob and its position.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct KnobInfo {
    /// Knob name.
    pub name: String,
    /// Position 0..1.
    pub position: String,
}

/// Coefficient sets over the knobs' travel.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct KnobTableInfo {
    /// One axis per knob, in name order; the first axis varies slowest.
    pub axes: Vec<AxisInfo>,
    /// Number of sets (the product of the axes' steps).
    pub sets: usize,
    /// The sets in row-major order.
    pub entries: Vec<EntryInfo>,
    /// Interpolation advice, one line each.
    pub advice: Vec<String>,
    /// What was done to make the sets interpolable, one line each.
    pub notes: Vec<String>,
    /// Whether neighbouring sets may be interpolated section by section.
    pub interpolable: bool,
}

/// One knob's axis of the table.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct AxisInfo {
    /// Knob name.
    pub name: String,
    /// Entries along the axis.
    pub steps: usize,
    /// Distance in sets between neighbours along this axis.
    pub stride: usize,
    /// Positions of the entries, 0 to 1.
    pub positions: Vec<String>,
}

/// One coefficient set of the knob table.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct EntryInfo {
    /// `bass=0.25, treble=1`.
    pub label: String,
    /// The set's sections.
    pub sections: Vec<SectionInfo>,
}

/// Golden vectors, formatted in rows.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct VectorInfo {
    /// Frames (mono).
    pub frames: usize,
    /// Input samples, `ROW` per line, comma-separated.
    pub input: Vec<String>,
    /// The simulator's output, same layout.
    pub output: Vec<String>,
    /// Largest difference the C float check accepts, as a C literal ("0" = bit-exact).
    pub tolerance: String,
    /// What the input holds, one line each.
    pub segments: Vec<String>,
}

/// The name of a number format: a preset's name, `fixed` for any other format.
pub fn number_name(number: NumberFormat) -> &'static str {
    match number {
        NumberFormat::F64 => "f64",
        NumberFormat::F32 => "f32",
        NumberFormat::Fixed(f) => {
            let presets = [
                ("q15", FixedFormat::q15()),
                ("q23", FixedFormat::q23()),
                ("q31", FixedFormat::q31()),
            ];
            presets.iter().find(|(_, p)| *p == f).map_or("fixed", |(n, _)| n)
        }
    }
}

/// An f64 as the shortest exponent-form decimal that reads back exactly.
pub fn fmt_f64(v: f64) -> String {
    format!("{v:e}")
}

/// An f32 as the shortest exponent-form decimal that reads back exactly.
pub fn fmt_f32(v: f32) -> String {
    format!("{v:e}")
}

/// An integer as a literal of `lang`.
fn int_literal(v: i64, lang: Lang) -> String {
    if lang == Lang::C && v == i64::from(i32::MIN) {
        "(-2147483647 - 1)".into()
    } else {
        v.to_string()
    }
}

/// A stored float as a literal of `lang` (`bits` 32 or 64).
fn float_literal(v: f64, bits: u32, lang: Lang) -> String {
    match (bits, lang) {
        (32, Lang::C) => format!("{}f", fmt_f32(v as f32)),
        (32, Lang::Rust) => fmt_f32(v as f32),
        _ => fmt_f64(v),
    }
}

/// The five coefficients of a section in the order b0, b1, b2, a1, a2.
fn five(s: &Sos) -> [f64; 5] {
    [s.b[0], s.b[1], s.b[2], s.a[0], s.a[1]]
}

/// The sections of one coefficient set: the float64 design and what is stored.
///
/// # Errors
/// An internal error when the stored numbers do not have one section per float one.
pub(crate) fn sections_info(
    float: &[Sos],
    numbers: &Numbers,
    lang: Lang,
) -> Result<Vec<SectionInfo>> {
    let stored: Vec<([String; 5], u32)> = match numbers {
        Numbers::F64(c) => c.sections.iter().map(|s| (five(s).map(fmt_f64), 0)).collect(),
        Numbers::F32(c) => {
            c.sections.iter().map(|s| (five(s).map(|v| float_literal(v, 32, lang)), 0)).collect()
        }
        Numbers::Fixed(q) => q
            .sections
            .iter()
            .map(|s| {
                let c = [s.b[0], s.b[1], s.b[2], s.a[0], s.a[1]];
                (c.map(|v| int_literal(v, lang)), s.shift)
            })
            .collect(),
    };
    if stored.len() != float.len() {
        return Err(Error::Internal(format!(
            "{} stored sections for {} float sections",
            stored.len(),
            float.len()
        )));
    }
    Ok(float
        .iter()
        .zip(stored)
        .enumerate()
        .map(|(index, (s, (stored, shift)))| SectionInfo {
            index,
            float: five(s).map(fmt_f64),
            stored,
            shift,
        })
        .collect())
}

/// Values joined `ROW` to a line.
pub(crate) fn rows<T>(values: &[T], fmt: impl Fn(&T) -> String) -> Vec<String> {
    values.chunks(ROW).map(|c| c.iter().map(&fmt).collect::<Vec<_>>().join(", ")).collect()
}

/// A C identifier made from a file name: lowercase letters, digits and `_`.
pub fn identifier(file: &str) -> String {
    let stem = std::path::Path::new(file).file_stem().map(|s| s.to_string_lossy().into_owned());
    let mut id: String = stem
        .unwrap_or_default()
        .chars()
        .map(|c| if c.is_ascii_alphanumeric() { c.to_ascii_lowercase() } else { '_' })
        .collect();
    if id.is_empty() {
        id = "filter".into();
    }
    if id.starts_with(|c: char| c.is_ascii_digit()) {
        id.insert_str(0, "f_");
    }
    id
}

/// The format in words, for headers.
fn describe(number: NumberFormat, fixed: Option<&FixedInfo>) -> String {
    let name = number_name(number);
    match fixed {
        Some(f) => format!(
            "{name}: Q1.{} samples, Q{}.{} coefficients ({} bits), {}-bit accumulator, \
             rounding {}, {} on overflow, error feedback {}",
            f.data_bits - 1,
            f.coef_bits - f.coef_frac,
            f.coef_frac,
            f.coef_bits,
            f.acc_bits,
            f.rounding,
            f.overflow,
            f.error_feedback
        ),
        None if number == NumberFormat::F32 => {
            format!("{name}: IEEE 754 single precision coefficients and arithmetic")
        }
        None => format!("{name}: IEEE 754 double precision coefficients and arithmetic"),
    }
}

fn fixed_info(numbers: &Numbers) -> Option<FixedInfo> {
    let Numbers::Fixed(q) = numbers else { return None };
    let f = q.format;
    let wide = f.coef_bits > 16;
    Some(FixedInfo {
        coef_bits: f.coef_bits,
        coef_frac: f.coef_frac.unwrap_or(0),
        data_bits: f.data_bits,
        acc_bits: f.acc_bits,
        rounding: match f.rounding {
            Rounding::Nearest => "nearest",
            Rounding::Floor => "floor",
            Rounding::Even => "even",
        }
        .into(),
        overflow: match f.overflow {
            Overflow::Saturate => "saturate",
            Overflow::Wrap => "wrap",
        }
        .into(),
        error_feedback: f.error_feedback,
        wide_acc: f.acc_bits > 56,
        coef_c: if wide { "int32_t" } else { "int16_t" }.into(),
        coef_rust: if wide { "i32" } else { "i16" }.into(),
    })
}

fn float_info(numbers: &Numbers) -> Option<FloatInfo> {
    let bits = match numbers {
        Numbers::F64(_) => 64,
        Numbers::F32(_) => 32,
        Numbers::Fixed(_) => return None,
    };
    Some(FloatInfo {
        bits,
        c: if bits == 32 { "float" } else { "double" }.into(),
        rust: format!("f{bits}"),
    })
}

/// `name=pos, name=pos`.
pub(crate) fn knob_label(names: &[String], positions: &[f64]) -> String {
    names.iter().zip(positions).map(|(n, p)| format!("{n}={p}")).collect::<Vec<_>>().join(", ")
}

impl Context {
    /// Gathers everything the templates need.
    ///
    /// # Errors
    /// An internal error when stored and float sections disagree in number.
    pub(crate) fn build(
        port: &Port,
        options: &ExportOptions,
        numbers: &Numbers,
        vectors: Option<&Vectors>,
        table: Option<&KnobTable>,
    ) -> Result<Self> {
        let lang = options.lang;
        let d = &port.design;
        let prefix = identifier(&d.file);
        let ext = match lang {
            Lang::C => "h",
            Lang::Rust => "rs",
        };
        let files = FileNames {
            header: format!("{prefix}.h"),
            kernel: format!("{prefix}.c"),
            module: format!("{prefix}.rs"),
            vectors: format!("{prefix}_vectors.{ext}"),
            check: format!("{prefix}_check.{}", if lang == Lang::C { "c" } else { "rs" }),
        };
        let fixed = fixed_info(numbers);
        let format = describe(d.target.number, fixed.as_ref());
        let structure = match d.target.structure {
            Structure::Df1 => "df1",
            Structure::Df2t => "df2t",
        };
        let knobs: Vec<KnobInfo> = port
            .knobs
            .0
            .iter()
            .map(|(name, p)| KnobInfo { name: name.clone(), position: p.to_string() })
            .collect();
        let knob_text = if knobs.is_empty() {
            "none".to_string()
        } else {
            knobs
                .iter()
                .map(|k| format!("{}={}", k.name, k.position))
                .collect::<Vec<_>>()
                .join(", ")
        };
        let rate = port.rate.to_string();
        let version = env!("CARGO_PKG_VERSION").to_string();
        let header = vec![
            "generated: do not edit".to_string(),
            format!("tool: tonewright {version}"),
            format!("command: {}", options.command),
            format!("design: {} ({}, fnv1a-64 {})", d.name, d.file, d.hash),
            format!("format: {format}"),
            format!("structure: {structure}; rate: {rate} Hz; knobs: {knob_text}"),
        ];
        let knob_table = table.map(|t| t.info(lang)).transpose()?;
        let vectors = vectors.map(|v| v.info(lang));
        Ok(Context {
            tool: "tonewright".into(),
            version,
            command: options.command.clone(),
            header,
            design: DesignInfo {
                name: if d.name.is_empty() { d.file.clone() } else { d.name.clone() },
                file: d.file.clone(),
                hash: d.hash.clone(),
            },
            prefix_upper: prefix.to_ascii_uppercase(),
            prefix,
            files,
            rate,
            number: number_name(d.target.number).into(),
            format,
            structure: structure.into(),
            float: float_info(numbers),
            fixed,
            sections: sections_info(&port.cascade.sections, numbers, lang)?,
            knobs,
            knob_table,
            vectors,
        })
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn identifiers_are_c_names_made_from_the_file_stem() {
        assert_eq!(identifier("audio-demos/two-knob-tone.toml"), "two_knob_tone");
        assert_eq!(identifier("3band.toml"), "f_3band");
        assert_eq!(identifier("Ünï.toml"), "_n_");
    }

    #[test]
    fn float_text_reads_back_exactly_and_c_int_min_is_spelled_safely() {
        for v in [0.1, -1.8153396116604301, 1e-300, f64::MIN_POSITIVE] {
            assert_eq!(fmt_f64(v).parse::<f64>().unwrap(), v);
        }
        let f = 0.1f32;
        assert_eq!(fmt_f32(f).parse::<f32>().unwrap(), f);
        assert_eq!(float_literal(0.5, 32, Lang::C), "5e-1f");
        assert_eq!(int_literal(-2147483648, Lang::C), "(-2147483647 - 1)");
        assert_eq!(int_literal(-2147483648, Lang::Rust), "-2147483648");
    }
}
