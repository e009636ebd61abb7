//! Coefficient quantization: float sections to the integers a target stores.

use super::format::{FixedFormat, Structure};
use crate::error::{Error, Result};
use crate::sections::poles;
use crate::sections::{Cascade, Sos};
use serde::Serialize;

/// Names of the five coefficients in the order they are handled.
const COEF_NAMES: [&str; 5] = ["b0", "b1", "b2", "a1", "a2"];

/// One section in integers: each effective coefficient is integer · 2^shift / 2^coef_frac.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize)]
pub struct FixedSos {
    /// b0, b1, b2 as stored.
    pub b: [i64; 3],
    /// a1, a2 as stored (same signs as the float a1, a2).
    pub a: [i64; 2],
    /// Left shift of the accumulator before narrowing.
    pub shift: u32,
}

/// A quantized cascade: the format with its resolved `coef_frac`, the structure, the
/// sections. Serializes as the `fixed` object of the design-file JSON contract.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct FixedCascade {
    /// The number format; `coef_frac` is always `Some` once quantized.
    #[serde(flatten)]
    pub format: FixedFormat,
    /// Direct form I or transposed direct form II.
    pub structure: Structure,
    /// Sections in processing order.
    pub sections: Vec<FixedSos>,
    /// What quantization chose (fraction bits, shifts), one line each.
    #[serde(skip)]
    pub notes: Vec<String>,
}

impl FixedSos {
    /// The five stored integers in the order b0, b1, b2, a1, a2.
    fn coefs(&self) -> [i64; 5] {
        [self.b[0], self.b[1], self.b[2], self.a[0], self.a[1]]
    }
}

impl FixedCascade {
    /// Checks that engines can run this cascade and returns its `coef_frac`.
    ///
    /// # Errors
    /// An invalid format, `coef_frac` unresolved, a shift above `coef_frac`, or a stored
    /// integer outside `coef_bits`.
    pub fn validate(&self) -> Result<u32> {
        self.format.validate_for(self.structure)?;
        let frac = self.format.coef_frac.ok_or_else(|| {
            Error::input("target.fixed.coef_frac: a quantized cascade needs a value")
        })?;
        let bits = self.format.coef_bits;
        let (lo, hi) = (-(1i64 << (bits - 1)), (1i64 << (bits - 1)) - 1);
        for (k, s) in self.sections.iter().enumerate() {
            if s.shift > frac {
                return Err(Error::input(format!(
                    "fixed.sections[{k}].shift: {} must not exceed coef_frac = {frac}",
                    s.shift
                )));
            }
            for (name, c) in COEF_NAMES.iter().zip(s.coefs()) {
                if !(lo..=hi).contains(&c) {
                    return Err(Error::input(format!(
                        "fixed.sections[{k}].{name}: {c} does not fit {bits}-bit coefficients"
                    )));
                }
            }
        }
        Ok(frac)
    }

    /// The effective coefficients as float sections (integer · 2^shift / 2^coef_frac).
    ///
    /// # Errors
    /// Those of [`FixedCascade::validate`].
    pub fn effective_sections(&self) -> Result<Vec<Sos>> {
        let frac = self.validate()?;
        Ok(self
            .sections
            .iter()
            .map(|s| {
                let scale = 2f64.powi(s.shift as i32 - frac as i32);
                let c = s.coefs().map(|v| v as f64 * scale);
                Sos { b: [c[0], c[1], c[2]], a: [c[3], c[4]] }
            })
            .collect())
    }

    /// The effective coefficients as a float cascade at `rate` Hz.
    ///
    /// # Errors
    /// Those of [`FixedCascade::validate`].
    pub fn to_cascade(&self, rate: f64) -> Result<Cascade> {
        Ok(Cascade { rate, sections: self.effective_sections()? })
    }

    /// Whether every quantized pole lies strictly inside the unit circle.
    ///
    /// An invalid cascade is reported as not stable.
    pub fn is_stable(&self) -> bool {
        self.effective_sections()
            .is_ok_and(|secs| secs.iter().all(|s| poles(s).iter().all(|p| p.norm() < 1.0)))
    }
}

/// Largest fraction bits (at most `bits − 1`) at which every coefficient, rounded to
/// the nearest integer, fits a signed `bits`-bit word; `None` if none from 0 up does.
fn best_frac(c: &[f64; 5], bits: u32) -> Option<u32> {
    let (lo, hi) = (-(2f64.powi(bits as i32 - 1)), 2f64.powi(bits as i32 - 1) - 1.0);
    (0..bits).rev().find(|&f| {
        c.iter().all(|&v| {
            let q = (v * 2f64.powi(f as i32)).round_ties_even();
            (lo..=hi).contains(&q)
        })
    })
}

/// Rounds a float cascade to the integers of `format` running in `structure`.
///
/// Each coefficient becomes round(c · 2^(coef_frac − shift)) (to nearest, ties to even).
/// Without a given `coef_frac`, each section gets the most precise fraction that holds
/// all five of its coefficients, the cascade's `coef_frac` is the largest of these and
/// every other section takes the difference as its `shift`. With a given `coef_frac`,
/// a section whose coefficients do not fit (|a1| near 2, gains above 1) takes the
/// smallest shift that makes them fit. `notes` says what was chosen.
///
/// # Errors
/// An invalid format for the structure, a non-finite coefficient, or a coefficient too
/// large for `coef_bits` even as an integer.
///
/// ```
/// use tonewright::quantize::{quantize, FixedFormat, Structure};
/// use tonewright::sections::{Cascade, Sos};
/// let lp = Sos { b: [0.25, 0.5, 0.25], a: [-1.5, 0.75] };
/// let c = Cascade { rate: 48000.0, sections: vec![lp] };
/// let q = quantize(&c, &FixedFormat::q15(), Structure::Df1).unwrap();
/// assert_eq!(q.format.coef_frac, Some(14)); // Q2.14 holds a1 = -1.5
/// assert_eq!(q.sections[0].a, [-24576, 12288]);
/// ```
pub fn quantize(
    cascade: &Cascade,
    format: &FixedFormat,
    structure: Structure,
) -> Result<FixedCascade> {
    format.validate_for(structure)?;
    let bits = format.coef_bits;
    let mut best = Vec::with_capacity(cascade.sections.len());
    for (k, s) in cascade.sections.iter().enumerate() {
        let n = k + 1;
        let c = [s.b[0], s.b[1], s.b[2], s.a[0], s.a[1]];
        if let Some(i) = c.iter().position(|v| !v.is_finite()) {
            return Err(Error::numeric(format!(
                "section {n}: coefficient {} = {} is not finite",
                COEF_NAMES[i], c[i]
            )));
        }
        let f = best_frac(&c, bits).ok_or_else(|| {
            let (i, v) = c
                .iter()
                .enumerate()
                .max_by(|x, y| x.1.abs().total_cmp(&y.1.abs()))
                .map_or((0, 0.0), |(i, v)| (i, *v));
            Error::numeric(format!(
                "section {n}: coefficient {} = {v} does not fit {bits}-bit coefficients \
                 even as an integer",
                COEF_NAMES[i]
            ))
        })?;
        best.push((c, f));
    }
    let mut notes = Vec::new();
    let frac = match format.coef_frac {
        Some(f) => f,
        None => {
            let f = best.iter().map(|&(_, f)| f).max().unwrap_or(bits - 1);
            notes.push(format!(
                "coef_frac = {f} chosen: the most precise {bits}-bit fraction that holds \
                 every coefficient (Q{}.{f})",
                bits - f
            ));
            f
        }
    };
    let sections = best
        .iter()
        .enumerate()
        .map(|(k, &(c, f))| {
            let shift = frac.saturating_sub(f);
            if shift > 0 {
                notes.push(format!(
                    "section {}: shift {shift} (its coefficients need Q{}.{f})",
                    k + 1,
                    bits - f
                ));
            }
            let scale = 2f64.powi(frac as i32 - shift as i32);
            let q = c.map(|v| (v * scale).round_ties_even() as i64);
            FixedSos { b: [q[0], q[1], q[2]], a: [q[3], q[4]], shift }
        })
        .collect();
    let format = FixedFormat { coef_frac: Some(frac), ..*format };
    Ok(FixedCascade { format, structure, sections, notes })
}

/// The cascade with every coefficient rounded to the nearest f32 (an f32 target).
pub fn round_to_f32(cascade: &Cascade) -> Cascade {
    let round = |v: f64| v as f32 as f64;
    Cascade {
        rate: cascade.rate,
        sections: cascade
            .sections
            .iter()
            .map(|s| Sos { b: s.b.map(round), a: s.a.map(round) })
            .collect(),
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    fn one(s: Sos) -> Cascade {
        Cascade { rate: 48000.0, sections: vec![s] }
    }

    #[test]
    fn a_gain_above_one_takes_a_shift_and_keeps_its_precision() {
        let c = Cascade {
            rate: 48000.0,
            sections: vec![
                Sos { b: [0.5, 0.0, 0.0], a: [-1.9, 0.95] },
                Sos { b: [6.0, -3.0, 0.0], a: [0.0, 0.0] },
            ],
        };
        let q = quantize(&c, &FixedFormat::q15(), Structure::Df1).unwrap();
        // |a1| = 1.9 needs Q2.14; 6.0 needs Q4.12 (sign + 3 integer bits).
        assert_eq!(q.format.coef_frac, Some(14));
        assert_eq!(q.sections[0].shift, 0);
        assert_eq!(q.sections[1].shift, 2);
        assert_eq!(q.sections[1].b, [6 << 12, -3 << 12, 0]);
        let eff = q.effective_sections().unwrap();
        assert_eq!(eff[1].b, [6.0, -3.0, 0.0]);
    }

    #[test]
    fn a_given_fraction_is_kept_and_shifts_cover_the_rest() {
        let f = FixedFormat { coef_frac: Some(15), ..FixedFormat::q15() };
        let q =
            quantize(&one(Sos { b: [0.1, 0.2, 0.1], a: [-1.5, 0.6] }), &f, Structure::Df1).unwrap();
        assert_eq!(q.format.coef_frac, Some(15));
        assert_eq!(q.sections[0].shift, 1);
        assert_eq!(q.sections[0].a, [-24576, 9830]); // round(-1.5·2^14), round(0.6·2^14)
    }

    #[test]
    fn a_coefficient_too_large_for_the_word_is_refused() {
        let err = quantize(
            &one(Sos { b: [40000.0, 0.0, 0.0], a: [0.0, 0.0] }),
            &FixedFormat::q15(),
            Structure::Df1,
        )
        .unwrap_err();
        assert_eq!(
            err.to_string(),
            "section 1: coefficient b0 = 40000 does not fit 16-bit coefficients even as an \
             integer"
        );
    }

    #[test]
    fn a_hand_built_cascade_with_a_bad_shift_is_refused() {
        let mut q = quantize(
            &one(Sos { b: [0.5, 0.0, 0.0], a: [0.0, 0.0] }),
            &FixedFormat::q15(),
            Structure::Df2t,
        )
        .unwrap();
        q.sections[0].shift = 20;
        assert!(q.validate().unwrap_err().to_string().starts_with("fixed.sections[0].shift"));
        assert!(!q.is_stable());
    }
}
