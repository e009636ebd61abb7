//! From a design and knob positions to the exact analog model of every stage.

use super::factorize::{cancel, factorize, zpk_from_scaled};
use super::section::AnalogSection;
use super::zpk::AnalogZpk;
use super::{circuit, families, parametric, poly, roots};
use crate::design::knobs::{below_nyquist, positive, pot_split};
use crate::design::{Design, KnobPositions, PartElement, PartSpec, Stage, StageKind, Transfer};
use crate::error::{Error, Result};
use num_complex::Complex64;
use serde::Serialize;
use std::f64::consts::PI;

/// Relative distance under which a pole and a zero of a sum of paths or a transfer
/// stage cancel. Rooting a numerator with a double root loses half the digits, so
/// coincident roots come out about √ε·(condition) apart: 1e-6 covers that with margin
/// while keeping genuine near-cancellations (1e-3 apart or more) visible.
pub const SUM_CANCEL_TOLERANCE: f64 = 1e-6;

/// The analog model of one stage.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct StageModel {
    /// `stage 2 (lowpass)`.
    pub label: String,
    /// The stage's real factors; their product is the stage's H(s).
    pub sections: Vec<AnalogSection>,
    /// The stage's H(s) as zeros, poles and gain.
    pub zpk: AnalogZpk,
    /// Pole-zero pairs removed as coincident: (pole, zero).
    pub cancelled: Vec<(Complex64, Complex64)>,
    /// Doubtful but usable findings.
    pub warnings: Vec<String>,
}

/// The exact analog model: stages in signal order, each driving the next through an
/// ideal buffer, so the whole H(s) is their product.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct AnalogModel {
    /// One entry per top-level stage.
    pub stages: Vec<StageModel>,
    /// The whole design.
    pub zpk: AnalogZpk,
}

impl AnalogModel {
    /// All factors of all stages, in signal order.
    pub fn sections(&self) -> Vec<AnalogSection> {
        self.stages.iter().flat_map(|s| s.sections.iter().cloned()).collect()
    }

    /// All warnings of all stages.
    pub fn warnings(&self) -> Vec<String> {
        self.stages.iter().flat_map(|s| s.warnings.iter().cloned()).collect()
    }
}

/// Solves every stage of a design at the given knob positions; `rate` is needed for
/// the checks that frequencies lie below rate/2.
///
/// # Errors
/// Invalid values for the resolved knobs, frequencies at or above Nyquist, singular
/// or unstable circuits, unstable or improper transfer functions.
///
/// ```
/// let design = tonewright::design::parse("demo.toml", r#"
/// [[stage]]
/// kind = "lowpass"
/// order = 1
/// freq = "1k"
/// "#, b"").unwrap();
/// let knobs = tonewright::design::KnobPositions::resolve(&design, &[]).unwrap();
/// let m = tonewright::analog::model(&design, &knobs, 48000.0).unwrap();
/// assert!((m.zpk.response_at_hz(1000.0).norm() - 0.5f64.sqrt()).abs() < 1e-12);
/// ```
pub fn model(design: &Design, knobs: &KnobPositions, rate: f64) -> Result<AnalogModel> {
    let stages = design
        .stages
        .iter()
        .map(|s| stage_model(design, s, knobs, rate))
        .collect::<Result<Vec<_>>>()?;
    let zpk = stages
        .iter()
        .fold(AnalogZpk { zeros: vec![], poles: vec![], gain: 1.0 }, |acc, s| acc.cascade(&s.zpk));
    Ok(AnalogModel { stages, zpk })
}

fn stage_model(
    design: &Design,
    stage: &Stage,
    knobs: &KnobPositions,
    rate: f64,
) -> Result<StageModel> {
    let place = &stage.place;
    let in_stage = |e: Error| match e {
        Error::Input(m) | Error::Numeric(m) if !m.starts_with(&place.file) => place.error(m),
        other => other,
    };
    let mut cancelled = Vec::new();
    let mut warnings = Vec::new();
    let (kind, sections) = match &stage.kind {
        StageKind::Circuit { input, output, parts } => {
            let netlist = circuit::Netlist {
                parts: parts.iter().flat_map(|p| part(p, knobs)).collect(),
                input: input.clone(),
                output: output.clone(),
            };
            let solution = circuit::solve(&netlist).map_err(in_stage)?;
            cancelled = solution.cancelled;
            warnings = solution.warnings.iter().map(|w| format!("{}: {w}", place.label)).collect();
            ("circuit", factorize(&solution.zpk).map_err(in_stage)?)
        }
        StageKind::Parametric { shape, order, freq, q, gain_db } => {
            let f = below_nyquist(knobs.value(freq), rate, &freq.place)?;
            let q = positive(knobs, q, "")?;
            let g = gain_db.as_ref().map(|g| knobs.value(g)).unwrap_or(0.0);
            let s = parametric::parametric(*shape, *order, f, q, g).map_err(in_stage)?;
            (shape_name(*shape), vec![s])
        }
        StageKind::Prototype { family, band, order, edges } => {
            for (hz, at) in edges {
                below_nyquist(*hz, rate, at)?;
            }
            ("prototype", families::prototype(*family, *band, *order).map_err(in_stage)?)
        }
        StageKind::Transfer(t) => {
            let zpk = transfer_zpk(t).map_err(in_stage)?;
            ("transfer", factorize(&zpk).map_err(in_stage)?)
        }
        StageKind::Sum { paths, weights } => {
            let path_models = paths
                .iter()
                .map(|name| {
                    design.paths[name]
                        .iter()
                        .map(|s| stage_model(design, s, knobs, rate))
                        .collect::<Result<Vec<_>>>()
                })
                .collect::<Result<Vec<_>>>()?;
            for m in path_models.iter().flatten() {
                warnings.extend(m.warnings.iter().cloned());
            }
            let path_sections: Vec<Vec<AnalogSection>> = path_models
                .iter()
                .map(|ms| ms.iter().flat_map(|m| m.sections.iter().cloned()).collect())
                .collect();
            let w: Vec<f64> = weights.iter().map(|p| knobs.value(p)).collect();
            let (zpk, removed) = sum_of_paths(&path_sections, &w).map_err(in_stage)?;
            cancelled = removed;
            ("sum", factorize(&zpk).map_err(in_stage)?)
        }
        StageKind::Gain { db } => {
            let amp = 10f64.powf(knobs.value(db) / 20.0);
            if !amp.is_finite() {
                let v = knobs.value(db);
                // Exponent form for values too long to read (1e300 written out).
                let shown = if v.abs() < 1e9 { v.to_string() } else { format!("{v:e}") };
                return Err(db.place.error(format!(
                    "{shown} dB is a gain beyond the f64 range (at most about 6000 dB)"
                )));
            }
            ("gain", vec![AnalogSection::gain(amp)])
        }
    };
    let zpk = sections
        .iter()
        .try_fold(AnalogZpk { zeros: vec![], poles: vec![], gain: 1.0 }, |acc, s| {
            s.zpk().map(|z| acc.cascade(&z))
        })?;
    if let Some(p) = zpk.poles.iter().find(|p| p.re >= 0.0) {
        return Err(place.error(format!(
            "unstable: pole at {:.6e}{:+.6e}j rad/s ({:.1} Hz) is not in the left half-plane",
            p.re,
            p.im,
            p.norm() / (2.0 * PI)
        )));
    }
    if !cancelled.is_empty() {
        warnings.push(format!(
            "{}: {} coincident pole-zero pair(s) cancelled, e.g. at {:.1} Hz",
            place.label,
            cancelled.len(),
            cancelled[0].0.norm() / (2.0 * PI)
        ));
    }
    Ok(StageModel {
        label: format!("{} ({kind})", place.label),
        sections,
        zpk,
        cancelled,
        warnings,
    })
}

fn shape_name(shape: parametric::Shape) -> &'static str {
    use parametric::Shape::*;
    match shape {
        Lowpass => "lowpass",
        Highpass => "highpass",
        Bandpass => "bandpass",
        Notch => "notch",
        Allpass => "allpass",
        Peak => "peak",
        Lowshelf => "lowshelf",
        Highshelf => "highshelf",
    }
}

/// One design part as circuit elements; a pot becomes its two track resistors.
fn part(spec: &PartSpec, knobs: &KnobPositions) -> Vec<circuit::Part> {
    use circuit::Element;
    let label = format!(
        "{} (line {})",
        spec.place.label.rsplit(": ").next().unwrap_or(""),
        spec.place.line
    );
    let one = |element| vec![circuit::Part { label: label.clone(), element }];
    match &spec.element {
        PartElement::Resistor(v, [a, b]) => {
            one(Element::Resistor { ohms: *v, a: a.clone(), b: b.clone() })
        }
        PartElement::Capacitor(v, [a, b]) => {
            one(Element::Capacitor { farads: *v, a: a.clone(), b: b.clone() })
        }
        PartElement::Inductor(v, [a, b]) => {
            one(Element::Inductor { henries: *v, a: a.clone(), b: b.clone() })
        }
        PartElement::OpAmp(_, [plus, minus, out]) => {
            one(Element::OpAmp { plus: plus.clone(), minus: minus.clone(), out: out.clone() })
        }
        PartElement::Amp(gain, [x, y]) => {
            one(Element::Amp { gain: *gain, input: x.clone(), output: y.clone() })
        }
        PartElement::Pot { ohms, nodes: [a, w, b], taper, knob } => {
            let (to_wiper, from_wiper) = pot_split(*ohms, *taper, knobs.get(knob));
            vec![
                circuit::Part {
                    label: format!("{label} end A to wiper"),
                    element: Element::Resistor { ohms: to_wiper, a: a.clone(), b: w.clone() },
                },
                circuit::Part {
                    label: format!("{label} wiper to end B"),
                    element: Element::Resistor { ohms: from_wiper, a: w.clone(), b: b.clone() },
                },
            ]
        }
    }
}

/// A transfer stage as a zpk, roots found in the scaled variable u = s/ω_ref.
fn transfer_zpk(t: &Transfer) -> Result<AnalogZpk> {
    match t {
        Transfer::Roots { zeros, poles, gain } => {
            for r in zeros.iter().chain(poles) {
                if r.im != 0.0 && !zeros.iter().chain(poles).any(|c| *c == r.conj()) {
                    return Err(Error::input(format!(
                        "root {}{:+}j has no conjugate: H(s) must be real",
                        r.re, r.im
                    )));
                }
            }
            Ok(AnalogZpk { zeros: zeros.clone(), poles: poles.clone(), gain: *gain })
        }
        Transfer::Coefficients { num, den } => {
            let asc = |v: &[f64]| poly::trim(&v.iter().rev().copied().collect::<Vec<_>>(), 0.0);
            let (num, den) = (asc(num), asc(den));
            if den.iter().all(|&c| c == 0.0) {
                return Err(Error::input("den: the denominator is zero"));
            }
            if num.iter().all(|&c| c == 0.0) {
                return Err(Error::input("num: the numerator is zero"));
            }
            let w_ref = reference_frequency(&den);
            let scale = |p: &[f64]| {
                p.iter().enumerate().map(|(k, c)| c * w_ref.powi(k as i32)).collect::<Vec<_>>()
            };
            let poles = roots::roots(&scale(&den))?.into_iter().map(|p| p * w_ref).collect();
            let mut zpk = zpk_from_scaled(&scale(&num), &scale(&den), poles, w_ref)?;
            cancel(&mut zpk, SUM_CANCEL_TOLERANCE, w_ref);
            Ok(zpk)
        }
    }
}

/// A frequency of the order of a polynomial's roots: |c0/cn|^(1/n) (the geometric mean
/// of the root moduli), or 2π·1 kHz when that is degenerate.
fn reference_frequency(p: &[f64]) -> f64 {
    let n = p.len().saturating_sub(1);
    let lowest = p.iter().position(|&c| c != 0.0).unwrap_or(0);
    if n > lowest {
        let w = (p[lowest] / p[n]).abs().powf(1.0 / (n - lowest) as f64);
        if w.is_finite() && w > 0.0 {
            return w;
        }
    }
    2.0 * PI * 1000.0
}

/// Σ w_i·H_i(s) over paths, over the least common denominator of exactly repeated
/// pole factors; only the new numerator is rooted.
fn sum_of_paths(
    paths: &[Vec<AnalogSection>],
    weights: &[f64],
) -> Result<(AnalogZpk, Vec<(Complex64, Complex64)>)> {
    let all_dens: Vec<[f64; 3]> = paths.iter().flatten().map(monic_den).collect();
    let w_ref = geometric_mean_natural(paths);
    // Least common denominator: each distinct factor as often as the most any path has it.
    let mut lcd: Vec<[f64; 3]> = Vec::new();
    for d in &all_dens {
        let need = paths
            .iter()
            .map(|p| p.iter().filter(|s| monic_den(s) == *d).count())
            .max()
            .unwrap_or(0);
        let have = lcd.iter().filter(|x| *x == d).count();
        if have < need {
            lcd.push(*d);
        }
    }
    let scaled =
        |c: &[f64; 3]| -> Vec<f64> { (0..3).map(|k| c[k] * w_ref.powi(k as i32)).collect() };
    let mut num_total = vec![0.0];
    for (path, &w) in paths.iter().zip(weights) {
        let mut num = vec![1.0];
        let mut missing = lcd.clone();
        for s in path {
            let d = monic_den(s);
            let lead = s.den[s.order()];
            num = poly::mul(&num, &scaled(&s.num.map(|c| c / lead)));
            if let Some(i) = missing.iter().position(|x| *x == d) {
                missing.remove(i);
            }
        }
        for d in &missing {
            num = poly::mul(&num, &scaled(d));
        }
        num_total = poly::add_scaled(&num_total, 1.0, &num, w);
    }
    let mut den = vec![1.0];
    let mut poles = Vec::new();
    for d in &lcd {
        den = poly::mul(&den, &scaled(d));
        let order = if d[2] != 0.0 {
            2
        } else if d[1] != 0.0 {
            1
        } else {
            0
        };
        if order > 0 {
            poles.extend(AnalogSection::new([1.0, 0.0, 0.0], *d).zpk()?.poles);
        }
    }
    let mut zpk = zpk_from_scaled(&num_total, &den, poles, w_ref)?;
    let removed = cancel(&mut zpk, SUM_CANCEL_TOLERANCE, w_ref);
    Ok((zpk, removed))
}

/// A factor's denominator divided by its leading coefficient.
fn monic_den(s: &AnalogSection) -> [f64; 3] {
    let lead = s.den[s.order()];
    s.den.map(|c| c / lead)
}

fn geometric_mean_natural(paths: &[Vec<AnalogSection>]) -> f64 {
    let logs: Vec<f64> =
        paths.iter().flatten().map(|s| s.natural_rad()).filter(|w| *w > 0.0).map(f64::ln).collect();
    if logs.is_empty() {
        2.0 * PI * 1000.0
    } else {
        (logs.iter().sum::<f64>() / logs.len() as f64).exp()
    }
}
