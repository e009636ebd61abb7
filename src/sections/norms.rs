//! L1, L2 and L∞ norms of a chain of sections, for gain scaling and noise analysis.
//!
//! L1 and L2 sum the impulse response of the chain; the sum runs until the slowest
//! pole (radius ρ) has decayed to 10^−12, n = ln(10^−12)/ln ρ samples (the tail left out is
//! then below 10^−12/(1 − ρ) of the L1 norm)
//! plus 16 per section (so repeated poles and the FIR part are covered), at most
//! [`MAX_IMPULSE_LEN`] samples. A chain with a pole on or outside the unit circle has
//! infinite norms. L∞ is the largest |H(e^{jω})| on a grid of 8192 uniform
//! frequencies plus every pole angle, refined by golden-section search around the
//! best grid point.
//!
//! # References
//! 1. L. B. Jackson, "On the interaction of roundoff noise and dynamic range in digital
//!    filters", Bell System Technical Journal 49(2), 1970.

use super::roots::{max_pole_radius, poles};
use super::sos::Sos;
use num_complex::Complex64;
use std::f64::consts::PI;

/// The longest impulse response summed by [`l1_norm`] and [`l2_norm`].
pub const MAX_IMPULSE_LEN: usize = 1 << 24;

/// Samples of impulse response summed for a chain (None: not stable).
fn impulse_len(sections: &[Sos]) -> Option<usize> {
    let rho = max_pole_radius(sections);
    if rho.is_nan() || rho >= 1.0 {
        return None;
    }
    let fir = 16 * sections.len() + 1;
    let decay = if rho == 0.0 { 0.0 } else { (1e-12f64).ln() / rho.ln() };
    Some((decay.ceil() as usize).saturating_add(fir).min(MAX_IMPULSE_LEN))
}

/// Σ f(h[n]) over the truncated impulse response of the chain (∞ if unstable).
fn impulse_sum(sections: &[Sos], f: impl Fn(f64) -> f64) -> f64 {
    let Some(len) = impulse_len(sections) else {
        return f64::INFINITY;
    };
    // Direct form I per section, state [x1, x2, y1, y2]: plain f64, exact enough for
    // norms and independent of the engines built on top of this layer.
    let mut state = vec![[0.0f64; 4]; sections.len()];
    let mut total = 0.0;
    for n in 0..len {
        let mut x = if n == 0 { 1.0 } else { 0.0 };
        for (s, st) in sections.iter().zip(&mut state) {
            let y = s.b[0] * x + s.b[1] * st[0] + s.b[2] * st[1] - s.a[0] * st[2] - s.a[1] * st[3];
            *st = [x, st[0], y, st[2]];
            x = y;
        }
        total += f(x);
    }
    total
}

/// Σ|h\[n\]|: the largest output peak for an input bounded by 1 (∞ if unstable).
///
/// ```
/// use tonewright::sections::norms::l1_norm;
/// use tonewright::sections::Sos;
/// // y[n] = x[n] + 0.5·y[n−1]: Σ 0.5^n = 2.
/// let s = Sos { b: [1.0, 0.0, 0.0], a: [-0.5, 0.0] };
/// assert!((l1_norm(&[s]) - 2.0).abs() < 1e-12);
/// ```
pub fn l1_norm(sections: &[Sos]) -> f64 {
    impulse_sum(sections, f64::abs)
}

/// √(Σ h\[n\]²): output RMS for unit-variance white input (∞ if unstable).
///
/// ```
/// use tonewright::sections::norms::l2_norm;
/// use tonewright::sections::Sos;
/// // Σ 0.25^n = 4/3.
/// let s = Sos { b: [1.0, 0.0, 0.0], a: [-0.5, 0.0] };
/// assert!((l2_norm(&[s]) - (4.0f64 / 3.0).sqrt()).abs() < 1e-12);
/// ```
pub fn l2_norm(sections: &[Sos]) -> f64 {
    impulse_sum(sections, |h| h * h).sqrt()
}

/// |H| of the chain at normalized angular frequency ω (radians per sample).
fn gain_at(sections: &[Sos], w: f64) -> f64 {
    let z = Complex64::from_polar(1.0, w);
    sections.iter().map(|s| s.eval(z)).product::<Complex64>().norm()
}

/// max over ω of |H(e^{jω})|: the largest gain for a sine (∞ if unstable).
///
/// ```
/// use tonewright::sections::norms::linf_norm;
/// use tonewright::sections::Sos;
/// // 1/(1 − 0.5 z⁻¹) peaks at DC: 2.
/// let s = Sos { b: [1.0, 0.0, 0.0], a: [-0.5, 0.0] };
/// assert!((linf_norm(&[s]) - 2.0).abs() < 1e-12);
/// ```
pub fn linf_norm(sections: &[Sos]) -> f64 {
    let rho = max_pole_radius(sections);
    if rho.is_nan() || rho >= 1.0 {
        return f64::INFINITY;
    }
    const GRID: usize = 8192;
    let step = PI / GRID as f64;
    let candidates = (0..=GRID)
        .map(|k| k as f64 * step)
        .chain(sections.iter().flat_map(poles).map(|p| p.arg().abs()));
    let (w_best, g_best) = candidates
        .map(|w| (w, gain_at(sections, w)))
        .fold((0.0, f64::NEG_INFINITY), |b, c| if c.1 > b.1 { c } else { b });
    let bracket = ((w_best - step).max(0.0), (w_best + step).min(PI));
    let w = golden_section_max(|w| gain_at(sections, w), bracket, 60);
    g_best.max(gain_at(sections, w))
}

/// The argument of the maximum of a unimodal `f` on `[lo, hi]` by golden-section search
/// (J. Kiefer, "Sequential minimax search for a maximum", Proc. AMS 4(3), 1953):
/// each of `iterations` steps keeps 0.618 of the bracket.
pub(crate) fn golden_section_max(
    f: impl Fn(f64) -> f64,
    (mut lo, mut hi): (f64, f64),
    iterations: usize,
) -> f64 {
    let inv_phi = (5f64.sqrt() - 1.0) / 2.0;
    for _ in 0..iterations {
        let (m1, m2) = (hi - inv_phi * (hi - lo), lo + inv_phi * (hi - lo));
        if f(m1) < f(m2) {
            lo = m1;
        } else {
            hi = m2;
        }
    }
    0.5 * (lo + hi)
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn a_sharp_resonance_between_grid_points_is_found() {
        // Pole radius 0.99999 at an angle off the grid: peak width ~1e-5 rad.
        let (r, th) = (0.99999_f64, 1.000_123_f64);
        let s = Sos { b: [1.0, 0.0, 0.0], a: [-2.0 * r * th.cos(), r * r] };
        let z = Complex64::from_polar(1.0, th);
        let near_peak = s.eval(z).norm();
        let got = linf_norm(&[s]);
        assert!(got >= near_peak * (1.0 - 1e-9), "{got} < {near_peak}");
    }

    #[test]
    fn unstable_chains_have_infinite_norms() {
        let s = Sos { b: [1.0, 0.0, 0.0], a: [-1.0, 0.0] };
        assert!(l1_norm(&[s]).is_infinite() && l2_norm(&[s]).is_infinite());
        assert!(linf_norm(&[s]).is_infinite());
    }

    #[test]
    fn l2_of_a_resonator_matches_its_closed_form() {
        // 1/(1 + a1 z⁻¹ + a2 z⁻²): Σh² = (1 + a2) / ((1 − a2)((1 + a2)² − a1²)), a
        // standard result for the all-pole second-order section (common practice).
        let (a1, a2) = (-1.8, 0.9);
        let s = Sos { b: [1.0, 0.0, 0.0], a: [a1, a2] };
        let want = (1.0 + a2) / ((1.0 - a2) * ((1.0 + a2) * (1.0 + a2) - a1 * a1));
        assert!((l2_norm(&[s]).powi(2) - want).abs() < 1e-10 * want);
    }
}
