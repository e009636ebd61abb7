//! Roots of real polynomials by the Aberth-Ehrlich simultaneous iteration.
//!
//! The caller scales the variable first (s / ω_ref) so the coefficients are of similar
//! size; the solver also scales by the geometric mean of the root moduli.
//!
//! # References
//! 1. O. Aberth, "Iteration methods for finding all zeros of a polynomial
//!    simultaneously", Mathematics of Computation 27(122), 1973.
//! 2. D. A. Bini, "Numerical computation of polynomial zeros by means of Aberth's
//!    method", Numerical Algorithms 13, 1996 (starting points on a circle).

use crate::error::{Error, Result};
use num_complex::Complex64;

/// All roots of the real polynomial `p` (ascending powers); leading zero coefficients
/// must already be trimmed. Conjugate pairs are returned exactly conjugate and real
/// roots exactly real.
///
/// # Errors
/// Non-finite coefficients, or no convergence within the iteration cap.
pub fn roots(p: &[f64]) -> Result<Vec<Complex64>> {
    if p.iter().any(|c| !c.is_finite()) {
        return Err(Error::numeric("polynomial has a non-finite coefficient"));
    }
    // Roots at zero are exact: strip them.
    let zeros_at_origin = p.iter().take_while(|&&c| c == 0.0).count();
    let p = &p[zeros_at_origin..];
    let mut out = vec![Complex64::new(0.0, 0.0); zeros_at_origin];
    let n = p.len().saturating_sub(1);
    if n == 0 {
        return Ok(out);
    }
    let lead = p[n];
    if lead == 0.0 {
        return Err(Error::internal_untrimmed());
    }
    // Scale x = σ·y so the constant and leading coefficients have equal size.
    let sigma = (p[0].abs() / lead.abs()).powf(1.0 / n as f64);
    let scaled: Vec<f64> =
        p.iter().enumerate().map(|(k, &c)| c * sigma.powi(k as i32) / lead).collect();
    let found = aberth(&scaled)?;
    out.extend(found.into_iter().map(|y| y * sigma));
    Ok(pair_conjugates(out))
}

fn aberth(p: &[f64]) -> Result<Vec<Complex64>> {
    let n = p.len() - 1;
    let dp: Vec<f64> = (1..=n).map(|k| p[k] * k as f64).collect();
    let eval =
        |q: &[f64], x: Complex64| q.iter().rev().fold(Complex64::new(0.0, 0.0), |a, &c| a * x + c);
    // Start on a circle with an irrational angle offset so no start is real-symmetric.
    let mut z: Vec<Complex64> = (0..n)
        .map(|k| Complex64::from_polar(1.0, 2.0 * std::f64::consts::PI * k as f64 / n as f64 + 0.4))
        .collect();
    for _ in 0..500 {
        let mut biggest_step = 0.0f64;
        for i in 0..n {
            let ratio = eval(p, z[i]) / eval(&dp, z[i]);
            let repulsion: Complex64 =
                (0..n).filter(|&j| j != i).map(|j| 1.0 / (z[i] - z[j])).sum();
            let step = ratio / (1.0 - ratio * repulsion);
            if step.is_finite() {
                z[i] -= step;
                biggest_step = biggest_step.max(step.norm() / z[i].norm().max(1e-300));
            }
        }
        if biggest_step < 1e-15 {
            return Ok(z);
        }
    }
    // Multiple roots converge only linearly; accept when the residual is tiny.
    let scale: f64 = p.iter().map(|c| c.abs()).sum();
    if z.iter().all(|&x| eval(p, x).norm() <= 1e-9 * scale * x.norm().max(1.0).powi(n as i32)) {
        Ok(z)
    } else {
        Err(Error::numeric("polynomial root finding did not converge"))
    }
}

/// Makes near-real roots exactly real and the rest exact conjugate pairs (positive
/// imaginary part first), sorted by modulus.
pub(crate) fn pair_conjugates(mut r: Vec<Complex64>) -> Vec<Complex64> {
    let tol = 1e-10;
    let mut out = Vec::with_capacity(r.len());
    r.sort_by(|a, b| a.norm().total_cmp(&b.norm()));
    let mut used = vec![false; r.len()];
    for i in 0..r.len() {
        if used[i] {
            continue;
        }
        used[i] = true;
        let x = r[i];
        if x.im.abs() <= tol * x.norm().max(1e-300) {
            out.push(Complex64::new(x.re, 0.0));
            continue;
        }
        let partner = (0..r.len())
            .filter(|&j| !used[j])
            .min_by(|&a, &b| (r[a] - x.conj()).norm().total_cmp(&(r[b] - x.conj()).norm()));
        match partner {
            Some(j) => {
                used[j] = true;
                let mean = (x + r[j].conj()) * 0.5;
                let upper = Complex64::new(mean.re, mean.im.abs());
                out.push(upper);
                out.push(upper.conj());
            }
            None => out.push(Complex64::new(x.re, 0.0)),
        }
    }
    out
}

impl Error {
    fn internal_untrimmed() -> Self {
        Error::Internal("roots() called with a zero leading coefficient".into())
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::analog::poly;

    #[test]
    fn roots_of_known_cubic() {
        // (x+1)(x²+2x+5): roots -1, -1±2i
        let p = poly::mul(&[1.0, 1.0], &[5.0, 2.0, 1.0]);
        let r = roots(&p).unwrap();
        assert_eq!(r.len(), 3);
        let want =
            [Complex64::new(-1.0, 0.0), Complex64::new(-1.0, 2.0), Complex64::new(-1.0, -2.0)];
        for w in want {
            assert!(r.iter().any(|x| (x - w).norm() < 1e-12), "{w} not in {r:?}");
        }
    }

    #[test]
    fn roots_at_origin_are_exact() {
        let r = roots(&[0.0, 0.0, 2.0, 1.0]).unwrap();
        assert_eq!(r.iter().filter(|x| x.norm() == 0.0).count(), 2);
        assert!(r.iter().any(|x| (x + 2.0).norm() < 1e-14));
    }

    #[test]
    fn non_finite_coefficients_are_refused() {
        assert!(roots(&[1.0, f64::NAN, 1.0]).is_err());
    }
}
