//! Number formats a target can have, the structures a section can run in, and the
//! checks that refuse formats no kernel can run.

use crate::error::{Error, Result};
use serde::Serialize;
use std::fmt;

/// Accumulator widths a fixed-point target may have, in bits.
pub const ACC_BITS_ALLOWED: [u32; 5] = [32, 40, 48, 56, 64];

/// How the accumulator is narrowed to a sample word.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize)]
#[serde(rename_all = "lowercase")]
pub enum Rounding {
    /// Round half up: add 2^(r−1), then shift right arithmetically.
    Nearest,
    /// Truncate toward −∞: arithmetic shift right.
    Floor,
    /// Round half to even (convergent rounding).
    Even,
}

/// What a register does with a value outside its width.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize)]
#[serde(rename_all = "lowercase")]
pub enum Overflow {
    /// Clamp to the most positive or most negative value.
    Saturate,
    /// Keep the low bits (two's complement wrap-around).
    Wrap,
}

/// The arrangement of one second-order section's delays.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize)]
#[serde(rename_all = "lowercase")]
pub enum Structure {
    /// Direct form I: two input and two output delays per section.
    Df1,
    /// Transposed direct form II: two state registers per section.
    Df2t,
}

/// A fixed-point number format: word lengths, rounding, overflow and error feedback.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize)]
pub struct FixedFormat {
    /// Coefficient word length, 2..=32 bits.
    pub coef_bits: u32,
    /// Fractional bits of the coefficients; `None` lets [`crate::quantize::quantize`]
    /// choose the most precise value that holds every coefficient.
    pub coef_frac: Option<u32>,
    /// Sample word length, 2..=32 bits.
    pub data_bits: u32,
    /// Accumulator width, one of [`ACC_BITS_ALLOWED`].
    pub acc_bits: u32,
    /// Rounding at the one point where the accumulator is narrowed.
    pub rounding: Rounding,
    /// Overflow behaviour of the accumulator, the state and the output.
    pub overflow: Overflow,
    /// Order of error feedback on the narrowing (0, 1 or 2; direct form I only).
    pub error_feedback: u32,
}

/// A number format for coefficients and engines.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize)]
#[serde(rename_all = "lowercase")]
pub enum NumberFormat {
    /// IEEE double precision throughout.
    F64,
    /// IEEE single precision: coefficients rounded to f32, engine in f32.
    F32,
    /// Integer arithmetic in the given format.
    Fixed(FixedFormat),
}

impl FixedFormat {
    /// 16-bit data and coefficients, 32-bit accumulator, nearest, saturate.
    pub const fn q15() -> Self {
        Self::preset(16, 16, 32)
    }

    /// 24-bit data and coefficients, 56-bit accumulator, nearest, saturate.
    pub const fn q23() -> Self {
        Self::preset(24, 24, 56)
    }

    /// 32-bit data and coefficients, 64-bit accumulator, nearest, saturate.
    pub const fn q31() -> Self {
        Self::preset(32, 32, 64)
    }

    const fn preset(coef_bits: u32, data_bits: u32, acc_bits: u32) -> Self {
        Self {
            coef_bits,
            coef_frac: None,
            data_bits,
            acc_bits,
            rounding: Rounding::Nearest,
            overflow: Overflow::Saturate,
            error_feedback: 0,
        }
    }

    /// Checks that a kernel can run this format exactly.
    ///
    /// Rules: coef_bits and data_bits in 2..=32; coef_frac below coef_bits; acc_bits one
    /// of 32, 40, 48, 56, 64 and at least coef_bits + data_bits (the width of one full
    /// product, so a single multiply never loses bits); error_feedback 0, 1 or 2.
    ///
    /// # Errors
    /// [`Error::Input`] naming the offending `target.fixed.<key>`.
    ///
    /// ```
    /// use tonewright::quantize::FixedFormat;
    /// let mut f = FixedFormat::q15();
    /// f.coef_frac = Some(16);
    /// let msg = f.validate().unwrap_err().to_string();
    /// assert_eq!(msg, "target.fixed.coef_frac: 16 must be below coef_bits = 16");
    /// ```
    pub fn validate(&self) -> Result<()> {
        for (key, bits) in [("coef_bits", self.coef_bits), ("data_bits", self.data_bits)] {
            if !(2..=32).contains(&bits) {
                return Err(Error::input(format!(
                    "target.fixed.{key}: {bits} must be between 2 and 32"
                )));
            }
        }
        if let Some(frac) = self.coef_frac {
            if frac >= self.coef_bits {
                return Err(Error::input(format!(
                    "target.fixed.coef_frac: {frac} must be below coef_bits = {}",
                    self.coef_bits
                )));
            }
        }
        if !ACC_BITS_ALLOWED.contains(&self.acc_bits) {
            return Err(Error::input(format!(
                "target.fixed.acc_bits: {} must be one of 32, 40, 48, 56, 64",
                self.acc_bits
            )));
        }
        let product = self.coef_bits + self.data_bits;
        if self.acc_bits < product {
            return Err(Error::input(format!(
                "target.fixed.acc_bits: {} must be at least coef_bits + data_bits = {product} \
                 (one full product)",
                self.acc_bits
            )));
        }
        if self.error_feedback > 2 {
            return Err(Error::input(format!(
                "target.fixed.error_feedback: {} must be 0, 1 or 2",
                self.error_feedback
            )));
        }
        Ok(())
    }

    /// Checks the format together with the structure it will run in.
    ///
    /// # Errors
    /// Everything [`FixedFormat::validate`] refuses, and error feedback outside df1.
    pub fn validate_for(&self, structure: Structure) -> Result<()> {
        self.validate()?;
        if self.error_feedback > 0 && structure != Structure::Df1 {
            return Err(Error::input(format!(
                "target.fixed.error_feedback: {} needs structure = df1 (got {structure})",
                self.error_feedback
            )));
        }
        Ok(())
    }
}

/// Parses the value of a keyword option, listing the allowed values on failure.
fn parse_keyword<T: Copy>(key: &str, value: &str, table: &[(&str, T)]) -> Result<T> {
    table.iter().find(|(name, _)| *name == value).map(|&(_, v)| v).ok_or_else(|| {
        let allowed: Vec<&str> = table.iter().map(|(name, _)| *name).collect();
        Error::input(format!("{key}: \"{value}\" must be one of {}", allowed.join(", ")))
    })
}

impl Rounding {
    const NAMES: [(&'static str, Rounding); 3] =
        [("nearest", Rounding::Nearest), ("floor", Rounding::Floor), ("even", Rounding::Even)];

    /// Parses `nearest`, `floor` or `even` for the design key `key`.
    ///
    /// # Errors
    /// Any other value, named with `key` and the allowed values.
    pub fn parse(key: &str, value: &str) -> Result<Self> {
        parse_keyword(key, value, &Self::NAMES)
    }
}

impl Overflow {
    const NAMES: [(&'static str, Overflow); 2] =
        [("saturate", Overflow::Saturate), ("wrap", Overflow::Wrap)];

    /// Parses `saturate` or `wrap` for the design key `key`.
    ///
    /// # Errors
    /// Any other value, named with `key` and the allowed values.
    pub fn parse(key: &str, value: &str) -> Result<Self> {
        parse_keyword(key, value, &Self::NAMES)
    }
}

impl Structure {
    const NAMES: [(&'static str, Structure); 2] =
        [("df1", Structure::Df1), ("df2t", Structure::Df2t)];

    /// Parses `df1` or `df2t` for the design key `key`.
    ///
    /// # Errors
    /// Any other value, named with `key` and the allowed values.
    pub fn parse(key: &str, value: &str) -> Result<Self> {
        parse_keyword(key, value, &Self::NAMES)
    }
}

impl NumberFormat {
    const NAMES: [(&'static str, NumberFormat); 5] = [
        ("f64", NumberFormat::F64),
        ("f32", NumberFormat::F32),
        ("q15", NumberFormat::Fixed(FixedFormat::q15())),
        ("q23", NumberFormat::Fixed(FixedFormat::q23())),
        ("q31", NumberFormat::Fixed(FixedFormat::q31())),
    ];

    /// Parses a `number` preset: `f64`, `f32`, `q15`, `q23` or `q31`.
    ///
    /// # Errors
    /// Any other value, named with `key` and the allowed values.
    pub fn parse(key: &str, value: &str) -> Result<Self> {
        parse_keyword(key, value, &Self::NAMES)
    }
}

impl fmt::Display for Structure {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        let name = Self::NAMES.iter().find(|(_, s)| s == self).map_or("?", |(n, _)| n);
        f.write_str(name)
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    fn refused(f: FixedFormat) -> String {
        f.validate().unwrap_err().to_string()
    }

    #[test]
    fn presets_are_valid_and_match_the_design_file() {
        for (f, bits) in [(FixedFormat::q15(), (16, 16, 32)), (FixedFormat::q23(), (24, 24, 56))]
            .into_iter()
            .chain([(FixedFormat::q31(), (32, 32, 64))])
        {
            f.validate().unwrap();
            assert_eq!((f.coef_bits, f.data_bits, f.acc_bits), bits);
            assert_eq!((f.rounding, f.overflow), (Rounding::Nearest, Overflow::Saturate));
        }
    }

    #[test]
    fn impossible_formats_are_refused_with_the_key_named() {
        let q15 = FixedFormat::q15();
        assert_eq!(
            refused(FixedFormat { data_bits: 33, ..q15 }),
            "target.fixed.data_bits: 33 must be between 2 and 32"
        );
        assert_eq!(
            refused(FixedFormat { coef_bits: 40, ..q15 }),
            "target.fixed.coef_bits: 40 must be between 2 and 32"
        );
        assert_eq!(
            refused(FixedFormat { acc_bits: 36, ..q15 }),
            "target.fixed.acc_bits: 36 must be one of 32, 40, 48, 56, 64"
        );
        assert!(refused(FixedFormat { acc_bits: 32, ..FixedFormat::q23() })
            .starts_with("target.fixed.acc_bits: 32 must be at least coef_bits + data_bits = 48"));
        assert_eq!(
            refused(FixedFormat { error_feedback: 3, ..q15 }),
            "target.fixed.error_feedback: 3 must be 0, 1 or 2"
        );
        let ef = FixedFormat { error_feedback: 1, ..q15 };
        assert_eq!(
            ef.validate_for(Structure::Df2t).unwrap_err().to_string(),
            "target.fixed.error_feedback: 1 needs structure = df1 (got df2t)"
        );
        ef.validate_for(Structure::Df1).unwrap();
    }

    #[test]
    fn parsers_list_the_allowed_values() {
        assert_eq!(Rounding::parse("target.fixed.rounding", "even").unwrap(), Rounding::Even);
        assert_eq!(
            Overflow::parse("target.fixed.overflow", "clip").unwrap_err().to_string(),
            "target.fixed.overflow: \"clip\" must be one of saturate, wrap"
        );
        assert_eq!(Structure::parse("target.structure", "df2t").unwrap(), Structure::Df2t);
        assert_eq!(
            NumberFormat::parse("target.number", "q23").unwrap(),
            NumberFormat::Fixed(FixedFormat::q23())
        );
        assert!(NumberFormat::parse("target.number", "q16")
            .unwrap_err()
            .to_string()
            .ends_with("must be one of f64, f32, q15, q23, q31"));
    }
}
