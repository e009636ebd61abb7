//! Frequency responses: magnitude, phase and group delay of analog and digital models.
//!
//! Group delay is computed from the roots, not by differencing phase: for a zero q of
//! H(s), d/dω arg(jω − q) = Re(1/(jω − q)); for a zero q of H(z) on z = e^{jω},
//! d/dω arg(e^{jω} − q) = Re(e^{jω}/(e^{jω} − q)). Poles enter with the opposite sign.
//! Analog delay is in seconds, digital delay in samples. A zero exactly on the
//! frequency axis makes the phase jump by 180° there (a delta in the delay), so its term
//! is left out at that one frequency rather than reported as infinite.
//!
//! # References
//! 1. A. V. Oppenheim, R. W. Schafer, "Discrete-Time Signal Processing", 3rd ed., 2010,
//!    section 5.1 (group delay of rational systems).

use crate::analog::AnalogZpk;
use crate::discretize::DigitalZpk;
use num_complex::Complex64;
use serde::Serialize;
use std::f64::consts::PI;

/// One point of a response.
#[derive(Debug, Clone, Copy, PartialEq, Serialize)]
pub struct ResponsePoint {
    /// Frequency, Hz.
    pub hz: f64,
    /// Magnitude, dB.
    pub db: f64,
    /// Phase, degrees (wrapped to ±180 unless unwrapped by [`unwrap_degrees`]).
    pub phase_deg: f64,
    /// Group delay, seconds.
    pub delay_s: f64,
}

/// `n` frequencies spaced evenly in log frequency from `lo` to `hi` Hz.
pub fn log_grid(lo: f64, hi: f64, n: usize) -> Vec<f64> {
    let n = n.max(2);
    (0..n).map(|k| lo * (hi / lo).powf(k as f64 / (n - 1) as f64)).collect()
}

/// 20·log10|h|, with silence floored at −400 dB.
pub fn to_db(h: Complex64) -> f64 {
    20.0 * h.norm().max(1e-20).log10()
}

/// The analog response at one frequency.
pub fn analog_point(zpk: &AnalogZpk, hz: f64) -> ResponsePoint {
    let s = Complex64::new(0.0, 2.0 * PI * hz);
    let h = zpk.eval(s);
    let term = |r: &Complex64| smooth((1.0 / (s - r)).re);
    let delay = zpk.poles.iter().map(term).sum::<f64>() - zpk.zeros.iter().map(term).sum::<f64>();
    ResponsePoint { hz, db: to_db(h), phase_deg: h.arg().to_degrees(), delay_s: delay }
}

/// The digital response at one frequency (delay converted to seconds).
pub fn digital_point(zpk: &DigitalZpk, hz: f64) -> ResponsePoint {
    let z = Complex64::from_polar(1.0, 2.0 * PI * hz / zpk.rate);
    let h = zpk.response_at_hz(hz);
    let term = |r: &Complex64| smooth((z / (z - r)).re);
    let samples = zpk.poles.iter().map(term).sum::<f64>() - zpk.zeros.iter().map(term).sum::<f64>();
    ResponsePoint { hz, db: to_db(h), phase_deg: h.arg().to_degrees(), delay_s: samples / zpk.rate }
}

/// A root's delay term, or 0 where the root sits on the axis itself.
fn smooth(term: f64) -> f64 {
    if term.is_finite() && term.abs() < 1e12 {
        term
    } else {
        0.0
    }
}

/// Unwraps a phase sequence in degrees so consecutive points differ by less than 180°.
pub fn unwrap_degrees(points: &mut [ResponsePoint]) {
    let mut offset = 0.0;
    for i in 1..points.len() {
        let raw = points[i].phase_deg + offset;
        let jump = raw - points[i - 1].phase_deg;
        let turns = (jump / 360.0).round();
        offset -= turns * 360.0;
        points[i].phase_deg = raw - turns * 360.0;
    }
}

/// Frequencies where the magnitude (dB, via `db_at`) crosses `level` dB between `lo`
/// and `hi` Hz, refined by bisection to 1e-9 relative.
pub fn crossings(db_at: impl Fn(f64) -> f64, level: f64, lo: f64, hi: f64) -> Vec<f64> {
    let grid = log_grid(lo, hi, 2000);
    let mut out = Vec::new();
    for w in grid.windows(2) {
        let (a, b) = (db_at(w[0]) - level, db_at(w[1]) - level);
        if a == 0.0 {
            out.push(w[0]);
        } else if a * b < 0.0 {
            let (mut x0, mut x1, mut f0) = (w[0], w[1], a);
            while (x1 - x0) > 1e-9 * x1 {
                let m = (x0 * x1).sqrt();
                let fm = db_at(m) - level;
                if fm * f0 <= 0.0 {
                    x1 = m;
                } else {
                    x0 = m;
                    f0 = fm;
                }
            }
            out.push((x0 * x1).sqrt());
        }
    }
    out
}

/// The largest |error| in dB between two magnitude functions over a band and where it
/// occurs, on a 1000-point log grid.
pub fn largest_deviation(
    a: impl Fn(f64) -> f64,
    b: impl Fn(f64) -> f64,
    lo: f64,
    hi: f64,
) -> (f64, f64) {
    log_grid(lo, hi, 1000).into_iter().map(|f| (f, a(f) - b(f))).fold((lo, 0.0), |best, (f, e)| {
        if e.abs() > best.1.abs() {
            (f, e)
        } else {
            best
        }
    })
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn first_order_lowpass_delay_and_phase_at_corner() {
        // H = w/(s + w): phase −45° and delay 1/(2w) at ω = w (textbook).
        let w = 2.0 * PI * 1000.0;
        let zpk = AnalogZpk { zeros: vec![], poles: vec![Complex64::new(-w, 0.0)], gain: w };
        let p = analog_point(&zpk, 1000.0);
        assert!((p.phase_deg + 45.0).abs() < 1e-12);
        assert!((p.delay_s - 0.5 / w).abs() < 1e-18);
        let f3 = crossings(|f| analog_point(&zpk, f).db, -10.0 * 2f64.log10(), 10.0, 20000.0);
        assert_eq!(f3.len(), 1);
        assert!((f3[0] - 1000.0).abs() < 1e-5);
    }
}
