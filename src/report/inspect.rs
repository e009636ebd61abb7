//! The `inspect` report: per stage the analog frequencies, Q and gain; the digital
//! sections with each pole's radius, frequency and Q; the overall −3 dB points, the
//! analog-versus-digital error (and where bilinear cramping passes 0.5 dB), phase and
//! group delay at the stage frequencies; warnings.
//!
//! Digital poles are described by [`Root`]: radius, angle as a frequency, and the Q of
//! the equivalent analog pole s = rate·ln(p).

use super::fixed::{FixedReport, Float32Report};
use super::format::{fmt_db, fmt_hz};
use crate::analog::AnalogSection;
use crate::analysis::measure::{measure, MeasuredPoint};
use crate::analysis::response::{
    analog_point, crossings, digital_point, largest_deviation, unwrap_degrees,
};
use crate::error::Result;
use crate::pipeline::{realize, Port};
use crate::quantize::{default_band, FixedFormat, NumberFormat, Verdict};
use crate::sections::{poles, Root};
use num_complex::Complex64;
use serde::Serialize;
use std::collections::BTreeMap;
use std::f64::consts::PI;
use std::fmt::Write;

/// Error above which bilinear cramping is reported, dB.
pub const CRAMPING_DB: f64 = 0.5;
/// Pole radius margin below which a pole counts as crowding z = 1 or the unit circle.
pub const NEAR_UNIT_CIRCLE: f64 = 1e-4;

/// The whole inspect report.
#[derive(Debug, Clone, Serialize)]
pub struct InspectReport {
    /// Design name.
    pub name: String,
    /// Design file.
    pub file: String,
    /// Sample rate, Hz.
    pub rate: f64,
    /// Knob positions.
    pub knobs: BTreeMap<String, f64>,
    /// The whole analog H(s): zeros and poles as [re, im] rad/s, real gain.
    pub analog: ZpkJson,
    /// Per-stage analog facts.
    pub stages: Vec<StageReport>,
    /// Float64 sections, `a` = [1, a1, a2].
    pub sections: Vec<SectionJson>,
    /// Overall response facts.
    pub response: ResponseReport,
    /// Number format and structure of the target, e.g. `q15 df1`.
    pub target: String,
    /// What fixed-point arithmetic does (fixed targets only).
    #[serde(skip_serializing_if = "Option::is_none")]
    pub fixed: Option<FixedReport>,
    /// What f32 coefficients do (f32 targets only).
    #[serde(skip_serializing_if = "Option::is_none")]
    pub f32: Option<Float32Report>,
    /// Stepped-sine measurements through the engines (with `--measure`).
    #[serde(skip_serializing_if = "Option::is_none")]
    pub measured: Option<Measured>,
    /// Doubtful but usable findings.
    pub warnings: Vec<String>,
}

/// The response measured through the float64 engine and the target's engine.
#[derive(Debug, Clone, Serialize)]
pub struct Measured {
    /// Through the float64 engine.
    pub float64: Vec<MeasuredPoint>,
    /// Through the target's engine.
    pub target: Vec<MeasuredPoint>,
    /// Largest |measured − predicted| over the points above the noise, dB.
    pub largest_difference_db: f64,
}

/// Points measured by `inspect --measure`.
pub const MEASURE_POINTS: usize = 31;

/// Measures a port's float64 and target engines with stepped sines.
///
/// # Errors
/// A format that cannot hold the coefficients.
pub fn measured(port: &Port, number: NumberFormat) -> Result<Measured> {
    let structure = port.design.target.structure;
    let run =
        |n| measure(&realize(&port.cascade, n, structure)?, structure, port.rate, MEASURE_POINTS);
    let float64 = run(NumberFormat::F64)?;
    let target = run(number)?;
    let largest_difference_db = float64
        .iter()
        .chain(&target)
        .filter(|p| p.above_noise)
        .map(|p| (p.measured_db - p.predicted_db).abs())
        .fold(0.0, f64::max);
    Ok(Measured { float64, target, largest_difference_db })
}

/// Zeros, poles and gain as plain arrays.
#[derive(Debug, Clone, Serialize)]
pub struct ZpkJson {
    /// Zeros as [re, im].
    pub zeros: Vec<[f64; 2]>,
    /// Poles as [re, im].
    pub poles: Vec<[f64; 2]>,
    /// Gain.
    pub gain: f64,
}

/// One stage's analog factors.
#[derive(Debug, Clone, Serialize)]
pub struct StageReport {
    /// `stage 1 (circuit)`.
    pub label: String,
    /// The stage's factors.
    pub factors: Vec<FactorReport>,
    /// The stage's zeros and poles.
    pub zpk: ZpkJson,
    /// Cancelled (pole, zero) pairs, as [re, im] each.
    pub cancelled: Vec<[[f64; 2]; 2]>,
}

/// One analog factor.
#[derive(Debug, Clone, Serialize)]
pub struct FactorReport {
    /// 0, 1 or 2.
    pub order: usize,
    /// Natural frequency of the poles, Hz.
    pub natural_hz: f64,
    /// Q of a second-order factor.
    pub q: Option<f64>,
    /// Numerator n0, n1, n2 (ascending powers of s).
    pub num: [f64; 3],
    /// Denominator d0, d1, d2.
    pub den: [f64; 3],
}

/// One digital section.
#[derive(Debug, Clone, Serialize)]
pub struct SectionJson {
    /// b0, b1, b2.
    pub b: [f64; 3],
    /// 1, a1, a2.
    pub a: [f64; 3],
    /// The section's poles.
    pub poles: Vec<Root>,
}

/// Overall response facts.
#[derive(Debug, Clone, Serialize)]
pub struct ResponseReport {
    /// Peak of the digital magnitude and where (Hz, dB).
    pub peak: [f64; 2],
    /// Frequencies where the digital response is 3.01 dB below its peak.
    pub minus_3db_hz: Vec<f64>,
    /// Per stage frequency: analog vs digital.
    pub at_stage_frequencies: Vec<PointCompare>,
    /// Per band: the largest analog-minus-digital error, dB, and where.
    pub bands: Vec<BandError>,
    /// Lowest frequency above which the error stays beyond 0.5 dB (bilinear cramping).
    pub cramping_from_hz: Option<f64>,
}

/// Analog and digital at one frequency.
#[derive(Debug, Clone, Serialize)]
pub struct PointCompare {
    /// Frequency, Hz.
    pub hz: f64,
    /// Analog magnitude, dB.
    pub analog_db: f64,
    /// Digital magnitude, dB.
    pub digital_db: f64,
    /// Analog phase, degrees.
    pub analog_phase_deg: f64,
    /// Digital phase, degrees.
    pub digital_phase_deg: f64,
    /// Analog group delay, ms.
    pub analog_delay_ms: f64,
    /// Digital group delay, ms.
    pub digital_delay_ms: f64,
}

/// The largest error in a band.
#[derive(Debug, Clone, Serialize)]
pub struct BandError {
    /// Band edges, Hz.
    pub band: [f64; 2],
    /// Analog minus digital, dB.
    pub error_db: f64,
    /// Where, Hz.
    pub at_hz: f64,
}

fn zpk_json(zeros: &[Complex64], poles: &[Complex64], gain: f64) -> ZpkJson {
    let c = |v: &[Complex64]| v.iter().map(|z| [z.re, z.im]).collect();
    ZpkJson { zeros: c(zeros), poles: c(poles), gain }
}

fn factor(s: &AnalogSection) -> FactorReport {
    FactorReport {
        order: s.order(),
        natural_hz: s.natural_rad() / (2.0 * PI),
        q: s.q(),
        num: s.num,
        den: s.den,
    }
}

/// Builds the report for a port in a number format; `band` (Hz) bounds the
/// quantization comparison (default 20 Hz to min(20 kHz, 0.45·rate)).
///
/// # Errors
/// A format that cannot hold the coefficients, or a band outside (0, rate/2).
pub fn build(port: &Port, number: NumberFormat, band: Option<(f64, f64)>) -> Result<InspectReport> {
    let structure = port.design.target.structure;
    let realized = realize(&port.cascade, number, structure)?;
    let band = band.unwrap_or_else(|| default_band(port.rate));
    let (fixed, f32) = super::fixed::build(&port.cascade, &realized, band)?;
    let rate = port.rate;
    let nyq = rate / 2.0;
    let top = (0.499 * rate).min(0.5 * rate);
    let analog_db = |f: f64| analog_point(&port.analog.zpk, f).db;
    let digital_db = |f: f64| digital_point(&port.digital.zpk, f).db;

    let stages = port
        .analog
        .stages
        .iter()
        .map(|st| StageReport {
            label: st.label.clone(),
            factors: st.sections.iter().map(factor).collect(),
            zpk: zpk_json(&st.zpk.zeros, &st.zpk.poles, st.zpk.gain),
            cancelled: st.cancelled.iter().map(|(p, z)| [[p.re, p.im], [z.re, z.im]]).collect(),
        })
        .collect();
    let sections = port
        .cascade
        .sections
        .iter()
        .map(|s| SectionJson {
            b: s.b,
            a: [1.0, s.a[0], s.a[1]],
            poles: poles(s)
                .into_iter()
                .filter(|p| p.im >= 0.0)
                .map(|p| Root::new(p, rate))
                .collect(),
        })
        .collect();

    let lo = 10.0f64.min(top / 10.0);
    let grid = crate::analysis::response::log_grid(lo, top, 2000);
    let peak = grid.iter().map(|&f| [f, digital_db(f)]).fold([lo, f64::NEG_INFINITY], |a, b| {
        if b[1] > a[1] {
            b
        } else {
            a
        }
    });
    let minus_3db_hz = crossings(digital_db, peak[1] - 10.0 * 2f64.log10(), lo, top);

    let mut stage_freqs: Vec<f64> = port
        .analog
        .sections()
        .iter()
        .map(|s| s.natural_hz)
        .filter(|&f| f > 0.0 && f < nyq)
        .collect();
    stage_freqs.sort_by(f64::total_cmp);
    stage_freqs.dedup_by(|a, b| (*a - *b).abs() < 1e-9 * b.abs());
    let mut analog_pts: Vec<_> =
        stage_freqs.iter().map(|&f| analog_point(&port.analog.zpk, f)).collect();
    let mut digital_pts: Vec<_> =
        stage_freqs.iter().map(|&f| digital_point(&port.digital.zpk, f)).collect();
    unwrap_degrees(&mut analog_pts);
    unwrap_degrees(&mut digital_pts);
    let at_stage_frequencies = analog_pts
        .iter()
        .zip(&digital_pts)
        .map(|(a, d)| PointCompare {
            hz: a.hz,
            analog_db: a.db,
            digital_db: d.db,
            analog_phase_deg: a.phase_deg,
            digital_phase_deg: d.phase_deg,
            analog_delay_ms: a.delay_s * 1e3,
            digital_delay_ms: d.delay_s * 1e3,
        })
        .collect();

    let edges = [20.0, 200.0, 2000.0, 20000.0];
    let mut bands: Vec<BandError> = edges
        .windows(2)
        .filter(|w| w[0] < top)
        .map(|w| {
            let hi = w[1].min(top);
            let (at_hz, error_db) = largest_deviation(analog_db, digital_db, w[0], hi);
            BandError { band: [w[0], hi], error_db, at_hz }
        })
        .collect();
    if top > 20000.0 {
        let (at_hz, error_db) = largest_deviation(analog_db, digital_db, 20000.0, top);
        bands.push(BandError { band: [20000.0, top], error_db, at_hz });
    }
    let cramping_from_hz = cramping_onset(&analog_db, &digital_db, lo, top);

    let mut warnings = port.warnings();
    if let Some(f) = cramping_from_hz {
        warnings.push(format!(
            "bilinear cramping: analog and digital differ by more than {CRAMPING_DB} dB from {} up",
            fmt_hz(f)
        ));
    }
    if peak[1] > 0.0 {
        warnings.push(format!(
            "peak gain {} at {}: a full-scale input can clip; lower the input or add a gain stage",
            fmt_db(peak[1]),
            fmt_hz(peak[0])
        ));
    }
    for p in port.digital.zpk.poles.iter().filter(|p| p.im >= 0.0) {
        if 1.0 - p.norm() < NEAR_UNIT_CIRCLE {
            let d = Root::new(*p, rate);
            warnings.push(format!(
                "pole at radius {:.8} ({}) is within {NEAR_UNIT_CIRCLE} of the unit circle: \
                 coefficients need many bits; consider a lower rate for this section",
                d.radius,
                fmt_hz(d.freq_hz)
            ));
        }
    }
    if let Some(f) = &fixed {
        if !f.analysis.stable {
            warnings.push(
                "the quantized design is UNSTABLE: export and audio runs refuse it unless --force"
                    .into(),
            );
        } else if f.analysis.assessment.verdict == Verdict::DoesNotFit {
            warnings
                .push("the design does not fit the fixed-point format (see the verdict)".into());
        }
    }
    Ok(InspectReport {
        name: port.design.name.clone(),
        file: port.design.file.clone(),
        rate,
        knobs: port.knobs.0.clone(),
        analog: zpk_json(&port.analog.zpk.zeros, &port.analog.zpk.poles, port.analog.zpk.gain),
        stages,
        sections,
        response: ResponseReport {
            peak,
            minus_3db_hz,
            at_stage_frequencies,
            bands,
            cramping_from_hz,
        },
        target: format!("{} {}", number_name(number), structure),
        fixed,
        f32,
        measured: None,
        warnings,
    })
}

/// A number format's short name: `f64`, `f32`, `q15`, `q23`, `q31`, or for a
/// `[target.fixed]` table `fixed c32/d24/a64` (coefficient, data, accumulator bits).
pub fn number_name(number: NumberFormat) -> String {
    match number {
        NumberFormat::F64 => "f64".into(),
        NumberFormat::F32 => "f32".into(),
        NumberFormat::Fixed(f) if f == FixedFormat::q15() => "q15".into(),
        NumberFormat::Fixed(f) if f == FixedFormat::q23() => "q23".into(),
        NumberFormat::Fixed(f) if f == FixedFormat::q31() => "q31".into(),
        NumberFormat::Fixed(f) => {
            format!("fixed c{}/d{}/a{}", f.coef_bits, f.data_bits, f.acc_bits)
        }
    }
}

/// The lowest grid frequency from which the error stays above the cramping threshold
/// all the way to the top of the band.
fn cramping_onset(
    a: &impl Fn(f64) -> f64,
    d: &impl Fn(f64) -> f64,
    lo: f64,
    hi: f64,
) -> Option<f64> {
    let grid = crate::analysis::response::log_grid(lo, hi, 2000);
    let bad: Vec<bool> = grid.iter().map(|&f| (a(f) - d(f)).abs() > CRAMPING_DB).collect();
    let first_good_from_top = bad.iter().rposition(|b| !b);
    match first_good_from_top {
        Some(i) if i + 1 < grid.len() => Some(grid[i + 1]),
        None => Some(grid[0]),
        _ => None,
    }
}

impl InspectReport {
    /// The report as text for a terminal.
    pub fn to_text(&self) -> String {
        let mut t = String::new();
        let title = if self.name.is_empty() {
            self.file.clone()
        } else {
            format!("{} ({})", self.name, self.file)
        };
        let _ = writeln!(t, "{title}");
        let _ = writeln!(t, "rate {} Hz, target {}", self.rate, self.target);
        if !self.knobs.is_empty() {
            let k: Vec<String> = self.knobs.iter().map(|(n, v)| format!("{n} = {v:.3}")).collect();
            let _ = writeln!(t, "knobs: {}", k.join(", "));
        }
        let _ = writeln!(t, "\nanalog stages");
        for st in &self.stages {
            let _ = writeln!(t, "  {}", st.label);
            for f in &st.factors {
                let line = match (f.order, f.q) {
                    (2, Some(q)) => format!("pole pair  f0 {:>12}  Q {q:.4}", fmt_hz(f.natural_hz)),
                    (1, _) => format!("real pole  f  {:>12}", fmt_hz(f.natural_hz)),
                    _ => format!(
                        "gain       {}",
                        fmt_db(
                            20.0 * f.num[0].abs().max(1e-20).log10()
                                - 20.0 * f.den[0].abs().log10()
                        )
                    ),
                };
                let _ = writeln!(t, "    {line}");
            }
            if st.label.ends_with("(circuit)")
                || st.label.ends_with("(sum)")
                || st.label.ends_with("(transfer)")
            {
                let list = |v: &[[f64; 2]]| {
                    v.iter()
                        .map(|z| format!("{:.4e}{:+.4e}j", z[0], z[1]))
                        .collect::<Vec<_>>()
                        .join(", ")
                };
                let _ = writeln!(t, "    poles (rad/s): {}", list(&st.zpk.poles));
                let _ = writeln!(
                    t,
                    "    zeros (rad/s): {}",
                    if st.zpk.zeros.is_empty() { "none".into() } else { list(&st.zpk.zeros) }
                );
                let _ = writeln!(t, "    gain: {:.6e}", st.zpk.gain);
            }
            if !st.cancelled.is_empty() {
                let _ = writeln!(t, "    cancelled pole-zero pairs: {}", st.cancelled.len());
            }
        }
        let _ = writeln!(
            t,
            "\ndigital sections  H(z) = (b0 + b1 z^-1 + b2 z^-2) / (1 + a1 z^-1 + a2 z^-2)"
        );
        for (i, s) in self.sections.iter().enumerate() {
            let _ = writeln!(
                t,
                "  {:>2}: b = [{:+.12e}, {:+.12e}, {:+.12e}]  a1 = {:+.12e}  a2 = {:+.12e}",
                i + 1,
                s.b[0],
                s.b[1],
                s.b[2],
                s.a[1],
                s.a[2]
            );
            for p in &s.poles {
                let q = p.q.map(|q| format!("  Q {q:.4}")).unwrap_or_default();
                let _ = writeln!(
                    t,
                    "      pole radius {:.8}  f0 {}{q}",
                    p.radius,
                    fmt_hz(p.natural_hz(self.rate))
                );
            }
        }
        let r = &self.response;
        let _ = writeln!(t, "\nresponse");
        let _ = writeln!(t, "  peak {} at {}", fmt_db(r.peak[1]), fmt_hz(r.peak[0]));
        let m3: Vec<String> = r.minus_3db_hz.iter().map(|&f| fmt_hz(f)).collect();
        let _ = writeln!(
            t,
            "  -3 dB from peak at: {}",
            if m3.is_empty() { "none in band".into() } else { m3.join(", ") }
        );
        if !r.at_stage_frequencies.is_empty() {
            let _ = writeln!(t, "  at stage frequencies        analog      digital     phase a/d (deg)     delay a/d (ms)");
            for p in &r.at_stage_frequencies {
                let _ = writeln!(
                    t,
                    "    {:>12}  {:>11}  {:>11}  {:>8.2} / {:>8.2}  {:>7.4} / {:>7.4}",
                    fmt_hz(p.hz),
                    fmt_db(p.analog_db),
                    fmt_db(p.digital_db),
                    p.analog_phase_deg,
                    p.digital_phase_deg,
                    p.analog_delay_ms,
                    p.digital_delay_ms
                );
            }
        }
        let _ = writeln!(t, "  analog minus digital by band");
        for b in &r.bands {
            let _ = writeln!(
                t,
                "    {:>12} to {:>12}: largest {:+.4} dB at {}",
                fmt_hz(b.band[0]),
                fmt_hz(b.band[1]),
                b.error_db,
                fmt_hz(b.at_hz)
            );
        }
        match r.cramping_from_hz {
            Some(f) => {
                let _ =
                    writeln!(t, "  cramping: error beyond {CRAMPING_DB} dB from {} up", fmt_hz(f));
            }
            None => {
                let _ = writeln!(
                    t,
                    "  cramping: error within {CRAMPING_DB} dB up to {}",
                    fmt_hz(0.499 * self.rate)
                );
            }
        }
        if let Some(f) = &self.fixed {
            t.push_str(&f.to_text(self.rate));
        }
        if let Some(f) = &self.f32 {
            let _ = writeln!(
                t,
                "\nf32 coefficients: float64 and float32 differ by up to {:.2e} dB at {}",
                f.max_deviation_db,
                fmt_hz(f.at_hz)
            );
        }
        if let Some(m) = &self.measured {
            let _ =
                writeln!(t, "\nmeasured with stepped sines (dB)     predicted  float64    target");
            for (f, q) in m.float64.iter().zip(&m.target) {
                let mark = if q.above_noise { "" } else { "  (below noise)" };
                let _ = writeln!(
                    t,
                    "  {:>12}                      {:>9.3}  {:>9.3}  {:>9.3}{mark}",
                    fmt_hz(f.hz),
                    q.predicted_db,
                    f.measured_db,
                    q.measured_db
                );
            }
            let _ = writeln!(
                t,
                "  largest |measured - predicted| above the noise: {:.4} dB",
                m.largest_difference_db
            );
        }
        if !self.warnings.is_empty() {
            let _ = writeln!(t);
            for w in &self.warnings {
                let _ = writeln!(t, "warning: {w}");
            }
        }
        t
    }
}
