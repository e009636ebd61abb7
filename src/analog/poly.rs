//! Polynomials with coefficients in ascending powers (`p[0] + p[1]·x + …`).
//!
//! Used only where a circuit or a sum of paths produces a polynomial; known factors are
//! never expanded and re-rooted (see ARCHITECTURE.md, numerical ground rules).

use num_complex::Complex64;

/// The product of two real polynomials.
pub fn mul(a: &[f64], b: &[f64]) -> Vec<f64> {
    if a.is_empty() || b.is_empty() {
        return Vec::new();
    }
    let mut out = vec![0.0; a.len() + b.len() - 1];
    for (i, &x) in a.iter().enumerate() {
        for (j, &y) in b.iter().enumerate() {
            out[i + j] += x * y;
        }
    }
    out
}

/// The weighted sum `wa·a + wb·b` of two real polynomials.
pub fn add_scaled(a: &[f64], wa: f64, b: &[f64], wb: f64) -> Vec<f64> {
    let n = a.len().max(b.len());
    (0..n)
        .map(|i| wa * a.get(i).copied().unwrap_or(0.0) + wb * b.get(i).copied().unwrap_or(0.0))
        .collect()
}

/// Evaluates a real polynomial at a complex point (Horner's rule).
pub fn eval(p: &[f64], x: Complex64) -> Complex64 {
    p.iter().rev().fold(Complex64::new(0.0, 0.0), |acc, &c| acc * x + c)
}

/// The monic real polynomial with the given roots; complex roots must come with their
/// conjugates, and the tiny imaginary residue of the expansion is dropped.
pub fn from_roots(roots: &[Complex64]) -> Vec<f64> {
    let mut p = vec![Complex64::new(1.0, 0.0)];
    for &r in roots {
        let mut next = vec![Complex64::new(0.0, 0.0); p.len() + 1];
        for (i, &c) in p.iter().enumerate() {
            next[i + 1] += c;
            next[i] -= c * r;
        }
        p = next;
    }
    p.into_iter().map(|c| c.re).collect()
}

/// Drops trailing (highest-power) coefficients whose magnitude is at most `tol` times
/// the largest coefficient.
pub fn trim(p: &[f64], tol: f64) -> Vec<f64> {
    let largest = p.iter().fold(0.0f64, |m, c| m.max(c.abs()));
    let mut out = p.to_vec();
    while out.len() > 1 && out.last().is_some_and(|c| c.abs() <= tol * largest) {
        out.pop();
    }
    out
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn from_roots_of_conjugate_pair_is_real_quadratic() {
        // (x - (1+2i))(x - (1-2i)) = x² - 2x + 5
        let p = from_roots(&[Complex64::new(1.0, 2.0), Complex64::new(1.0, -2.0)]);
        assert_eq!(p, vec![5.0, -2.0, 1.0]);
    }

    #[test]
    fn mul_and_eval_agree() {
        let a = [1.0, 2.0];
        let b = [3.0, 0.0, 1.0];
        let x = Complex64::new(0.3, -1.1);
        let lhs = eval(&mul(&a, &b), x);
        let rhs = eval(&a, x) * eval(&b, x);
        assert!((lhs - rhs).norm() < 1e-14);
    }
}
