//! The circuit matrix as a pencil A(z) = A0 + z·A1 in the scaled frequency z = s/ω_ref.
//!
//! det A(z) is a polynomial in z whose degree is at most the rank of A1 (one per
//! capacitor or inductor). Cramer's rule turns the output voltage into a ratio of two
//! such determinants, each its own pencil.

use super::lu::Lu;
use num_complex::Complex64;

/// A(z) = A0 + z·A1 with real n×n row-major matrices.
#[derive(Debug, Clone, PartialEq)]
pub struct Pencil {
    n: usize,
    a0: Vec<f64>,
    a1: Vec<f64>,
    /// The nonzero columns of A1 (index, dense column): the only ones the derivative
    /// of det A(z) needs, fewer than n when there are resistors or op-amps.
    a1_columns: Vec<(usize, Vec<Complex64>)>,
}

impl Pencil {
    /// A pencil from its two matrices.
    pub fn new(n: usize, a0: Vec<f64>, a1: Vec<f64>) -> Pencil {
        debug_assert!(a0.len() == n * n && a1.len() == n * n);
        let a1_columns = (0..n)
            .filter(|&j| (0..n).any(|i| a1[i * n + j] != 0.0))
            .map(|j| (j, (0..n).map(|i| Complex64::new(a1[i * n + j], 0.0)).collect()))
            .collect();
        Pencil { n, a0, a1, a1_columns }
    }

    /// The LU factors of A(z); `None` when A(z) is singular to working precision.
    pub fn factor(&self, z: Complex64) -> Option<Lu> {
        Lu::new(self.n, self.at(z))
    }

    /// The LU factors of A(z) at a point near a root of det A(z); `None` only when a
    /// pivot is exactly zero.
    pub fn factor_near_root(&self, z: Complex64) -> Option<Lu> {
        Lu::with_tolerance(self.n, self.at(z), 0.0)
    }

    fn at(&self, z: Complex64) -> Vec<Complex64> {
        self.a0.iter().zip(&self.a1).map(|(&p, &q)| Complex64::new(p, 0.0) + z * q).collect()
    }

    /// The pencil with column `col` replaced by the constant vector `rhs`: its
    /// determinant over det A(z) is unknown `col` of A(z)·x = rhs (Cramer's rule).
    pub fn with_column(&self, col: usize, rhs: &[f64]) -> Pencil {
        let (mut a0, mut a1) = (self.a0.clone(), self.a1.clone());
        for (i, &value) in rhs.iter().enumerate() {
            a0[i * self.n + col] = value;
            a1[i * self.n + col] = 0.0;
        }
        Pencil::new(self.n, a0, a1)
    }

    /// d/dz ln det A(z) = trace(A(z)⁻¹·A1), from the factors of A(z).
    pub fn log_derivative(&self, lu: &Lu) -> Complex64 {
        self.a1_columns.iter().map(|(j, column)| lu.solve(column)[*j]).sum()
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn log_derivative_matches_the_polynomial_determinant() {
        // A(z) = [[1+2z, 1], [3, 4+z]]: det = (1+2z)(4+z) − 3 = 2z² + 9z + 1,
        // d/dz ln det = (4z + 9) / (2z² + 9z + 1).
        let p = Pencil::new(2, vec![1.0, 1.0, 3.0, 4.0], vec![2.0, 0.0, 0.0, 1.0]);
        let z = Complex64::new(0.3, 0.7);
        let lu = p.factor(z).unwrap();
        let det = lu.det().phase * lu.det().log_abs.exp();
        let want_det = 2.0 * z * z + 9.0 * z + 1.0;
        assert!((det - want_det).norm() < 1e-14 * want_det.norm());
        let want = (4.0 * z + 9.0) / want_det;
        assert!((p.log_derivative(&lu) - want).norm() < 1e-14 * want.norm());
    }

    #[test]
    fn replaced_column_gives_cramer_numerator() {
        // Same A(z), rhs (1, 0): x1 = det[[1+2z, 1], [3, 0]] / det A = −3 / det A.
        let p = Pencil::new(2, vec![1.0, 1.0, 3.0, 4.0], vec![2.0, 0.0, 0.0, 1.0]);
        let q = p.with_column(1, &[1.0, 0.0]);
        let z = Complex64::new(-0.2, 1.1);
        let d = q.factor(z).unwrap().det();
        let got = d.phase * d.log_abs.exp();
        assert!((got - Complex64::new(-3.0, 0.0)).norm() < 1e-14);
    }
}
