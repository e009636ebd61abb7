//! Polynomial coefficients of det A(z) from its values on a circle.
//!
//! A real polynomial p of degree < m is fixed by its values at m points
//! z_k = r·e^{iπ(2k+1)/m}; its coefficients are the discrete Fourier transform of those
//! values, which is well conditioned (unlike fitting at points on a line). With m a
//! multiple of 4 no point lies on either axis, where lossless resonances and
//! integrators put their roots, and the points come in conjugate pairs, so only the
//! upper half is evaluated: p(z̄) = conj(p(z)) for real coefficients.

use super::lu::LogDet;
use num_complex::Complex64;
use std::f64::consts::PI;

/// Coefficients below this fraction of the largest are rounding noise of the transform
/// (about m·ε·max|p| on the circle, under 1e-13 for the degrees allowed) and are set to
/// exactly 0, so zeros at s = 0 come out exact.
pub const NEGLIGIBLE: f64 = 1e-11;

/// The number of circle points for polynomials of degree at most `degree`.
pub fn point_count(degree: usize) -> usize {
    (degree + 1).div_ceil(4) * 4
}

/// The upper half of the m circle points of radius r, in order.
pub fn upper_points(m: usize, radius: f64) -> Vec<Complex64> {
    (0..m / 2).map(|k| Complex64::from_polar(radius, PI * (2 * k + 1) as f64 / m as f64)).collect()
}

/// The coefficients (ascending) of the real polynomial whose values at
/// `upper_points(m, radius)` are `values` (`None` for an exact zero), up to one common
/// positive factor, with negligible coefficients set to 0 and leading zeros dropped.
/// All-zero values give an empty vector.
pub fn coefficients(values: &[Option<LogDet>], m: usize, radius: f64) -> Vec<f64> {
    let top = values.iter().flatten().map(|d| d.log_abs).fold(f64::NEG_INFINITY, f64::max);
    if top == f64::NEG_INFINITY {
        return Vec::new();
    }
    let scaled: Vec<Complex64> = values
        .iter()
        .map(|v| v.map_or(Complex64::new(0.0, 0.0), |d| d.phase * (d.log_abs - top).exp()))
        .collect();
    let mut c: Vec<f64> = (0..m)
        .map(|j| {
            // Each upper point and its conjugate together contribute 2·Re(p(z_k)·e^{−ijθ_k}).
            let sum: Complex64 = scaled
                .iter()
                .enumerate()
                .map(|(k, v)| {
                    v * Complex64::from_polar(1.0, -PI * ((2 * k + 1) * j) as f64 / m as f64)
                })
                .sum();
            2.0 * sum.re / m as f64 / radius.powi(j as i32)
        })
        .collect();
    let largest = c.iter().fold(0.0f64, |a, x| a.max(x.abs()));
    for x in c.iter_mut() {
        if x.abs() <= NEGLIGIBLE * largest {
            *x = 0.0;
        }
    }
    while c.last() == Some(&0.0) {
        c.pop();
    }
    c
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::analog::poly;

    fn log_det(v: Complex64) -> Option<LogDet> {
        (v.norm() > 0.0).then(|| LogDet { log_abs: v.norm().ln(), phase: v / v.norm() })
    }

    #[test]
    fn recovers_a_cubic_with_a_zero_constant_term_exactly() {
        // p(z) = 3z³ − z² + 0.5z, degree 3 < m = 4; the constant term must come out 0.
        let p = [0.0, 0.5, -1.0, 3.0];
        for radius in [1.0, 1.13] {
            let m = point_count(3);
            let values: Vec<_> =
                upper_points(m, radius).iter().map(|&z| log_det(poly::eval(&p, z))).collect();
            let c = coefficients(&values, m, radius);
            // Up to the common factor: normalize by the leading coefficient.
            let lead = c[3] / 3.0;
            assert_eq!(c.len(), 4);
            assert_eq!(c[0], 0.0);
            for (got, want) in c.iter().zip(p) {
                assert!((got / lead - want).abs() < 1e-14, "{c:?}");
            }
        }
    }

    #[test]
    fn no_point_lies_on_an_axis() {
        for m in [4, 8, 24] {
            for z in upper_points(m, 1.0) {
                assert!(z.re.abs() > 1e-3 && z.im > 1e-3, "{z}");
            }
        }
    }
}
