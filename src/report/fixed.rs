//! The number-format part of `inspect`: what the target's arithmetic does to the
//! design. For fixed point this is the quantization analysis of [`crate::quantize`];
//! for f32 the response deviation of f32-rounded coefficients.

use super::format::{fmt_db, fmt_hz};
use crate::analysis::response::{largest_deviation, to_db};
use crate::error::Result;
use crate::pipeline::Realized;
use crate::quantize::{analyze, FixedCascade, QuantReport, Verdict};
use crate::sections::Cascade;
use serde::Serialize;
use std::fmt::Write;

/// The `fixed` object of the inspect JSON: the contract's integers plus the analysis.
#[derive(Debug, Clone, Serialize)]
pub struct FixedReport {
    /// Format, structure and stored integers (the design-file.md contract).
    #[serde(flatten)]
    pub cascade: FixedCascade,
    /// What quantization did.
    pub analysis: QuantReport,
}

/// What an f32 target does: coefficients rounded to f32.
#[derive(Debug, Clone, Serialize)]
pub struct Float32Report {
    /// Largest |dB| difference between f64 and f32 coefficients over the band.
    pub max_deviation_db: f64,
    /// Where, Hz.
    pub at_hz: f64,
}

/// Analyses a realized cascade over `band` (Hz); f64 needs no report.
///
/// # Errors
/// A band outside (0, rate/2).
pub fn build(
    cascade: &Cascade,
    realized: &Realized,
    band: (f64, f64),
) -> Result<(Option<FixedReport>, Option<Float32Report>)> {
    match realized {
        Realized::F64(_) => Ok((None, None)),
        Realized::F32(rounded) => {
            let (at_hz, e) = largest_deviation(
                |f| to_db(cascade.response_at_hz(f)),
                |f| to_db(rounded.response_at_hz(f)),
                band.0,
                band.1,
            );
            Ok((None, Some(Float32Report { max_deviation_db: e.abs(), at_hz })))
        }
        Realized::Fixed(fixed) => {
            let analysis = analyze(cascade, fixed, band)?;
            Ok((Some(FixedReport { cascade: fixed.clone(), analysis }), None))
        }
    }
}

fn verdict_text(v: Verdict) -> &'static str {
    match v {
        Verdict::Fits => "fits",
        Verdict::Marginal => "marginal",
        Verdict::DoesNotFit => "does not fit",
    }
}

impl FixedReport {
    /// The report as text; `rate` turns pole positions into frequencies.
    pub fn to_text(&self, rate: f64) -> String {
        let mut t = String::new();
        let f = &self.cascade.format;
        let a = &self.analysis;
        let frac = a.coef_frac;
        let _ = writeln!(
            t,
            "\nfixed point: {} data bits, {}-bit coefficients Q{}.{}, {}-bit accumulator, {:?} rounding, {:?} on overflow, error feedback {}, {}",
            f.data_bits,
            f.coef_bits,
            f.coef_bits - frac,
            frac,
            f.acc_bits,
            f.rounding,
            f.overflow,
            f.error_feedback,
            self.cascade.structure
        );
        for note in &a.notes {
            let _ = writeln!(t, "  {note}");
        }
        for (i, (s, q)) in self.cascade.sections.iter().zip(&a.sections).enumerate() {
            let _ = writeln!(
                t,
                "  {:>2}: b = [{}, {}, {}]  a = [{}, {}]  shift {}   {}",
                i + 1,
                s.b[0],
                s.b[1],
                s.b[2],
                s.a[0],
                s.a[1],
                s.shift,
                verdict_text(q.assessment.verdict)
            );
            for (ideal, quant) in
                q.ideal_poles.iter().zip(&q.quantized_poles).filter(|(p, _)| p.im >= 0.0)
            {
                let qf = |r: Option<f64>| r.map(|q| format!(" Q {q:.3}")).unwrap_or_default();
                let _ = writeln!(
                    t,
                    "      pole f0 {} r {:.8}{} -> f0 {} r {:.8}{}",
                    fmt_hz(ideal.natural_hz(rate)),
                    ideal.radius,
                    qf(ideal.q),
                    fmt_hz(quant.natural_hz(rate)),
                    quant.radius,
                    qf(quant.q)
                );
            }
            let _ = writeln!(
                t,
                "      margin 1-|p| {:.3e}, deviation {:.4} dB at {}, noise gain {:.2}",
                q.stability_margin,
                q.deviation.max_db,
                fmt_hz(q.deviation.at_hz),
                q.noise_gain
            );
        }
        let _ = writeln!(
            t,
            "  response: float vs fixed differ by up to {:.4} dB at {} ({} to {})",
            a.response.max_db,
            fmt_hz(a.response.at_hz),
            fmt_hz(a.response.band_hz.0),
            fmt_hz(a.response.band_hz.1)
        );
        let _ = writeln!(
            t,
            "  rounding noise: {:.1} dBFS at the output; full-scale sine SNR {:.1} dB",
            a.noise.output_dbfs, a.noise.snr_full_scale_sine_db
        );
        let worst = &a.headroom;
        let _ = writeln!(
            t,
            "  headroom: overflow {} for a full-scale input (worst node {})",
            if worst.overflow_possible { "possible" } else { "impossible" },
            fmt_db(worst.worst_overflow_db)
        );
        for n in &worst.nodes {
            let _ = writeln!(
                t,
                "      section {} {}: peak gain {} (sine), {} (any input)",
                n.section + 1,
                n.node,
                fmt_db(crate::audio::metrics::amp_to_db(n.linf / n.capacity)),
                fmt_db(crate::audio::metrics::amp_to_db(n.l1 / n.capacity))
            );
        }
        match &a.limit_cycles.largest {
            Some(c) => {
                let _ = writeln!(
                    t,
                    "  limit cycles: found, {} LSB peak, period {} samples ({} seeded states)",
                    c.amplitude_lsb, c.period, a.limit_cycles.seeds
                );
            }
            None => {
                let _ =
                    writeln!(t, "  limit cycles: none in {} seeded states", a.limit_cycles.seeds);
            }
        }
        let _ = writeln!(t, "  verdict: {}", verdict_text(a.assessment.verdict));
        for finding in &a.assessment.findings {
            let _ = writeln!(t, "    - {finding}");
        }
        if !a.stable {
            let _ = writeln!(t, "  UNSTABLE: a quantized pole is on or outside the unit circle");
        }
        t
    }
}
