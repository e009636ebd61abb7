//! L1, L2 and L∞ norms of a chain of sections, the measures of Jackson's scaling.
//!
//! L1 and L2 come from the impulse response, run until its tail is negligible (the
//! last 256 samples carry less than 1e-24 of the energy so far, or a cap of 2^23
//! samples for poles on the unit circle's doorstep). L∞ is the largest |H(e^{jω})| over
//! a grid dense in both linear and log frequency plus every pole angle, where the
//! peaks of resonant sections sit.
//!
//! # References
//! 1. L. B. Jackson, "On the interaction of roundoff noise and dynamic range in digital
//!    filters", Bell System Technical Journal 49(2), 1970.

use super::sos::Sos;
use num_complex::Complex64;
use std::f64::consts::PI;

const IMPULSE_CAP: usize = 1 << 23;
const TAIL_WINDOW: usize = 256;

/// The impulse response of a chain of sections, until it has decayed.
pub fn impulse_response(chain: &[Sos]) -> Vec<f64> {
    let mut state = vec![[0.0f64; 4]; chain.len()];
    let mut out = Vec::new();
    let mut energy = 0.0;
    let mut window = 0.0;
    for n in 0..IMPULSE_CAP {
        let mut x = if n == 0 { 1.0 } else { 0.0 };
        for (s, st) in chain.iter().zip(&mut state) {
            // Direct form I: st = [x1, x2, y1, y2].
            let y = s.b[0] * x + s.b[1] * st[0] + s.b[2] * st[1] - s.a[0] * st[2] - s.a[1] * st[3];
            *st = [x, st[0], y, st[2]];
            x = y;
        }
        out.push(x);
        energy += x * x;
        window += x * x;
        if (n + 1) % TAIL_WINDOW == 0 {
            if window <= 1e-24 * energy || energy == 0.0 {
                break;
            }
            window = 0.0;
        }
    }
    out
}

/// Σ|h[n]|: the largest output for any input bounded by 1.
pub fn l1_norm(chain: &[Sos]) -> f64 {
    impulse_response(chain).iter().map(|h| h.abs()).sum()
}

/// √Σh[n]²: the output RMS for unit-variance white input.
pub fn l2_norm(chain: &[Sos]) -> f64 {
    impulse_response(chain).iter().map(|h| h * h).sum::<f64>().sqrt()
}

/// max |H(e^{jω})|: the largest output for a unit sine.
pub fn linf_norm(chain: &[Sos]) -> f64 {
    peak_response(chain).1
}

/// The normalised frequency (0..π) and value of the largest |H(e^{jω})|.
pub fn peak_response(chain: &[Sos]) -> (f64, f64) {
    let gain_at = |w: f64| {
        let z = Complex64::from_polar(1.0, w);
        chain.iter().map(|s| s.eval(z)).product::<Complex64>().norm()
    };
    let mut grid: Vec<f64> = (0..=2048).map(|k| PI * k as f64 / 2048.0).collect();
    grid.extend((0..=1024).map(|k| PI * 10f64.powf(-6.0 + 6.0 * k as f64 / 1024.0)));
    for s in chain {
        grid.extend(pole_angles(s));
    }
    let mut best = grid.iter().map(|&w| (w, gain_at(w))).fold((0.0, f64::NEG_INFINITY), |a, b| {
        if b.1 > a.1 {
            b
        } else {
            a
        }
    });
    // Golden-section refinement around the best grid point.
    let (mut lo, mut hi) = ((best.0 * 0.98 - 1e-3).max(0.0), (best.0 * 1.02 + 1e-3).min(PI));
    for _ in 0..80 {
        let m1 = hi - (hi - lo) * 0.618_033_988_749_895;
        let m2 = lo + (hi - lo) * 0.618_033_988_749_895;
        if gain_at(m1) < gain_at(m2) {
            lo = m1;
        } else {
            hi = m2;
        }
    }
    let w = 0.5 * (lo + hi);
    let g = gain_at(w);
    if g > best.1 {
        best = (w, g);
    }
    best
}

/// Angles of a section's complex poles (empty for real poles).
fn pole_angles(s: &Sos) -> Vec<f64> {
    let disc = s.a[0] * s.a[0] - 4.0 * s.a[1];
    if disc < 0.0 {
        let re = -s.a[0] / 2.0;
        let im = (-disc).sqrt() / 2.0;
        vec![im.atan2(re)]
    } else {
        Vec::new()
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn first_order_recursion_norms_match_closed_forms() {
        // y[n] = x[n] + 0.5·y[n−1]: h = 0.5^n, L1 = 2, L2 = 1/√0.75, L∞ = 2 at DC.
        let s = [Sos { b: [1.0, 0.0, 0.0], a: [-0.5, 0.0] }];
        assert!((l1_norm(&s) - 2.0).abs() < 1e-12);
        assert!((l2_norm(&s) - (1.0f64 / 0.75).sqrt()).abs() < 1e-12);
        assert!((linf_norm(&s) - 2.0).abs() < 1e-12);
    }
}
