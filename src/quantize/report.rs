//! `analyze`: everything quantization did to a cascade, with verdicts.

use super::coefs::FixedCascade;
use super::format::Structure;
use super::headroom::{headroom, HeadroomReport};
use super::limit_cycle::{find_limit_cycle, LimitCycleSearch};
use super::noise::{rounding_noise, NoiseReport};
use super::verdict::{limits, Assessment, Verdict};
use crate::error::{Error, Result};
use crate::sections::{poles, zeros, Root};
use crate::sections::{Cascade, Sos};
use num_complex::Complex64;
use serde::Serialize;
use std::f64::consts::PI;

/// A sine gain this far above a node's capacity is still only marginal: L∞ scaling puts
/// the peak at exactly 0 dB, and coefficient rounding and the one-LSB asymmetry of two's
/// complement can lift it by a few thousandths of a dB (one LSB at the very peak).
const SINE_OVERFLOW_TOLERANCE_DB: f64 = 0.05;
/// Frequencies compared by the response deviation, log-spaced over the band.
const BAND_POINTS: usize = 2000;
/// Magnitudes below this (−120 dB) count as this, so a null does not read as ∞ dB.
const FLOOR: f64 = 1e-6;

/// The largest response difference between float and quantized, in dB.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct Deviation {
    /// max |20·log10|H_q| − 20·log10|H||, dB.
    pub max_db: f64,
    /// Where it occurs, Hz.
    pub at_hz: f64,
    /// The band searched, Hz.
    pub band_hz: (f64, f64),
}

/// What quantization did to one section.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct SectionReport {
    /// Left shift of the accumulator before narrowing.
    pub shift: u32,
    /// Float poles.
    pub ideal_poles: Vec<Root>,
    /// Poles of the stored integers.
    pub quantized_poles: Vec<Root>,
    /// Float zeros.
    pub ideal_zeros: Vec<Root>,
    /// Zeros of the stored integers.
    pub quantized_zeros: Vec<Root>,
    /// 1 − largest quantized pole radius.
    pub stability_margin: f64,
    /// This section's own response deviation.
    pub deviation: Deviation,
    /// Noise gain from this section's narrowing to the output.
    pub noise_gain: f64,
    /// Verdict, reasons and suggestions.
    pub assessment: Assessment,
}

/// Everything quantization did to a cascade.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct QuantReport {
    /// Fraction bits of the stored coefficients.
    pub coef_frac: u32,
    /// What quantization chose.
    pub notes: Vec<String>,
    /// Whether every quantized pole is inside the unit circle.
    pub stable: bool,
    /// Per section, in processing order.
    pub sections: Vec<SectionReport>,
    /// Deviation of the whole cascade.
    pub response: Deviation,
    /// Predicted rounding noise.
    pub noise: NoiseReport,
    /// Gains to internal nodes.
    pub headroom: HeadroomReport,
    /// Zero-input limit cycle search.
    pub limit_cycles: LimitCycleSearch,
    /// Overall verdict: the worst section and whole-cascade findings.
    pub assessment: Assessment,
}

/// The default band of [`analyze`]: 20 Hz to min(20 kHz, 0.45·rate).
pub fn default_band(rate: f64) -> (f64, f64) {
    (20.0, 20000.0f64.min(0.45 * rate))
}

/// Largest dB difference between two chains over `band` at `rate`.
fn deviation(ideal: &[Sos], quant: &[Sos], rate: f64, band: (f64, f64)) -> Deviation {
    let db = |secs: &[Sos], z: Complex64| {
        20.0 * secs.iter().map(|s| s.eval(z)).product::<Complex64>().norm().max(FLOOR).log10()
    };
    let ratio = band.1 / band.0;
    (0..BAND_POINTS)
        .map(|i| band.0 * ratio.powf(i as f64 / (BAND_POINTS - 1) as f64))
        .map(|hz| {
            let z = Complex64::from_polar(1.0, 2.0 * PI * hz / rate);
            Deviation { max_db: (db(quant, z) - db(ideal, z)).abs(), at_hz: hz, band_hz: band }
        })
        .fold(Deviation { max_db: 0.0, at_hz: band.0, band_hz: band }, |b, d| {
            if d.max_db > b.max_db {
                d
            } else {
                b
            }
        })
}

/// The verdict of a response deviation.
fn deviation_verdict(db: f64) -> Verdict {
    if db.is_nan() || db > limits::DEVIATION_MARGINAL_DB {
        Verdict::DoesNotFit
    } else if db > limits::DEVIATION_FITS_DB {
        Verdict::Marginal
    } else {
        Verdict::Fits
    }
}

/// Analyzes what quantizing `cascade` into `fixed` did, over `band` (Hz).
///
/// # Errors
/// Section counts that differ, a band outside (0, rate/2) or empty, or a cascade
/// refused by [`FixedCascade::validate`].
pub fn analyze(cascade: &Cascade, fixed: &FixedCascade, band: (f64, f64)) -> Result<QuantReport> {
    let frac = fixed.validate()?;
    if cascade.sections.len() != fixed.sections.len() {
        return Err(Error::input(format!(
            "fixed cascade has {} sections, float cascade has {}",
            fixed.sections.len(),
            cascade.sections.len()
        )));
    }
    let rate = cascade.rate;
    if !(band.0 > 0.0 && band.0 < band.1 && band.1 < rate / 2.0) {
        return Err(Error::input(format!(
            "band: {} to {} Hz must satisfy 0 < low < high < rate/2 = {} Hz",
            band.0,
            band.1,
            rate / 2.0
        )));
    }
    let eff = fixed.effective_sections()?;
    // The three analyses are independent; the limit-cycle search takes about as long as
    // the other two together, so it runs on the second core.
    let ((noise, room), cycles) =
        rayon::join(|| (rounding_noise(fixed), headroom(fixed)), || find_limit_cycle(fixed));
    let (noise, room, cycles) = (noise?, room?, cycles?);
    let f = fixed.format;
    let more_bits = (f.coef_bits + 8).min(32);
    let roots = |v: Vec<Complex64>| v.into_iter().map(|z| Root::new(z, rate)).collect::<Vec<_>>();
    let mut sections = Vec::new();
    for (k, (ideal, quant)) in cascade.sections.iter().zip(&eff).enumerate() {
        let n = k + 1;
        let qp = roots(poles(quant));
        let top = qp.iter().fold(None::<&Root>, |b, p| match b {
            Some(b) if b.radius >= p.radius => Some(b),
            _ => Some(p),
        });
        let radius = top.map_or(0.0, |p| p.radius);
        let mut a = Assessment::new();
        let low_freq = top.is_some_and(|p| p.freq_hz < limits::LOW_FREQUENCY_FRACTION * rate);
        let lower_rate = if low_freq {
            " or run this low-frequency section at a lower rate (decimate first)"
        } else {
            ""
        };
        let step = 2f64.powi(fixed.sections[k].shift as i32 - frac as i32);
        if radius >= 1.0 {
            a.add(
                Verdict::DoesNotFit,
                format!(
                    "section {n}: quantized pole radius {radius:.6} is not below 1 (unstable): \
                     more coefficient bits (coef_bits = {more_bits}){lower_rate}"
                ),
            );
        } else if 1.0 - radius < limits::MARGIN_STEPS * step {
            a.add(
                Verdict::Marginal,
                format!(
                    "section {n}: pole radius {radius:.6} is within {} coefficient steps of \
                     the unit circle: more coefficient bits (coef_bits = {more_bits})",
                    limits::MARGIN_STEPS
                ),
            );
        }
        let dev = deviation(std::slice::from_ref(ideal), std::slice::from_ref(quant), rate, band);
        a.add(
            deviation_verdict(dev.max_db),
            format!(
                "section {n}: response off by {:.2} dB at {:.0} Hz: more coefficient bits \
                 (coef_bits = {more_bits}){lower_rate}",
                dev.max_db, dev.at_hz
            ),
        );
        for n in room.nodes.iter().filter(|n| n.section == k) {
            let cure = if n.node == "output" {
                "scale the sections (scaling = \"l1\") or use a different section order"
            } else {
                "a wider accumulator (acc_bits) or structure = \"df1\""
            };
            if n.sine_overflow_db > SINE_OVERFLOW_TOLERANCE_DB {
                a.add(
                    Verdict::DoesNotFit,
                    format!(
                        "section {} {}: a full-scale sine overflows by {:.1} dB: {cure}",
                        k + 1,
                        n.node,
                        n.sine_overflow_db
                    ),
                );
            } else if n.worst_overflow_db > 0.0 || n.sine_overflow_db > 0.0 {
                a.add(
                    Verdict::Marginal,
                    format!(
                        "section {} {}: some full-scale inputs overflow by {:.1} dB: {cure}",
                        k + 1,
                        n.node,
                        n.worst_overflow_db
                    ),
                );
            }
        }
        let gain = noise.section_gains[k];
        if gain > limits::NOISE_GAIN_MARGINAL {
            let cure = match (fixed.structure, f.error_feedback) {
                (Structure::Df1, 2) => "more data bits (data_bits)".to_string(),
                (Structure::Df1, _) => "error feedback (error_feedback = 2)".to_string(),
                (Structure::Df2t, _) => {
                    "df1 with error feedback (structure = \"df1\", error_feedback = 2)".to_string()
                }
            };
            a.add(
                Verdict::Marginal,
                format!(
                    "section {n}: rounding noise amplified by {:.1} dB: {cure}",
                    10.0 * gain.log10()
                ),
            );
        }
        sections.push(SectionReport {
            shift: fixed.sections[k].shift,
            ideal_poles: roots(poles(ideal)),
            quantized_poles: qp,
            ideal_zeros: roots(zeros(ideal)),
            quantized_zeros: roots(zeros(quant)),
            stability_margin: 1.0 - radius,
            deviation: dev,
            noise_gain: gain,
            assessment: a,
        });
    }
    let response = deviation(&cascade.sections, &eff, rate, band);
    let mut overall = Assessment::new();
    for s in &sections {
        for finding in &s.assessment.findings {
            overall.add(s.assessment.verdict, finding.clone());
        }
    }
    overall.add(
        deviation_verdict(response.max_db),
        format!("cascade: response off by {:.2} dB at {:.0} Hz", response.max_db, response.at_hz),
    );
    if let Some(c) = &cycles.largest {
        let cure = match fixed.structure {
            Structure::Df1 if f.error_feedback > 0 => "more data bits or dither",
            _ => "df1 with error feedback (error_feedback = 1 or 2) or dither",
        };
        overall.add(
            Verdict::Marginal,
            format!(
                "zero-input limit cycle of {} LSB, period {}: {cure}",
                c.amplitude_lsb, c.period
            ),
        );
    }
    Ok(QuantReport {
        coef_frac: frac,
        notes: fixed.notes.clone(),
        stable: fixed.is_stable(),
        sections,
        response,
        noise,
        headroom: room,
        limit_cycles: cycles,
        assessment: overall,
    })
}
