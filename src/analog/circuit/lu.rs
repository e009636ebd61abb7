//! Dense complex LU factorization with partial pivoting, for one evaluation of the
//! circuit matrix A(z) = A0 + z·A1 at a complex point.
//!
//! The determinant is kept as a log-magnitude and a unit phase: a few hundred pivots of
//! ordinary size can over- or underflow f64 as a plain product, and only ratios and
//! relative sizes of determinants are ever used.

use num_complex::Complex64;

/// A pivot smaller than this, relative to the largest entry of the matrix, marks the
/// matrix as singular. The stamped entries are scaled to be near 1 (see `mna`), so a
/// genuine pivot this small would need part values 1e12 apart.
const SINGULAR_PIVOT: f64 = 1e-12;

/// det(A) = exp(log_abs) · phase.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct LogDet {
    /// ln |det A|.
    pub log_abs: f64,
    /// det A / |det A|.
    pub phase: Complex64,
}

/// The factors P·A = L·U of a square matrix, stored in place (row-major).
pub struct Lu {
    n: usize,
    lu: Vec<Complex64>,
    perm: Vec<usize>,
    det: LogDet,
}

impl Lu {
    /// Factors the n×n row-major matrix `a`; `None` when it is singular to working
    /// precision.
    pub fn new(n: usize, a: Vec<Complex64>) -> Option<Lu> {
        Lu::with_tolerance(n, a, SINGULAR_PIVOT)
    }

    /// Factors `a`, failing only on a pivot at most `tolerance` times the largest
    /// entry. Refining a root needs tolerance 0: there A(z) is as near singular as the
    /// root is accurate, and the factors stay usable.
    pub fn with_tolerance(n: usize, mut a: Vec<Complex64>, tolerance: f64) -> Option<Lu> {
        debug_assert_eq!(a.len(), n * n);
        let largest = a.iter().fold(0.0f64, |m, x| m.max(x.norm()));
        if largest == 0.0 || !largest.is_finite() {
            return None;
        }
        let mut perm: Vec<usize> = (0..n).collect();
        let mut log_abs = 0.0;
        let mut phase = Complex64::new(1.0, 0.0);
        for k in 0..n {
            let (p, size) = (k..n).map(|i| (i, a[i * n + k].norm())).fold((k, -1.0), |best, c| {
                if c.1 > best.1 {
                    c
                } else {
                    best
                }
            });
            if size <= tolerance * largest {
                return None;
            }
            if p != k {
                for j in 0..n {
                    a.swap(k * n + j, p * n + j);
                }
                perm.swap(k, p);
                phase = -phase;
            }
            let pivot = a[k * n + k];
            log_abs += size.ln();
            phase *= pivot / size;
            for i in k + 1..n {
                let factor = a[i * n + k] / pivot;
                if factor == Complex64::new(0.0, 0.0) {
                    continue;
                }
                a[i * n + k] = factor;
                for j in k + 1..n {
                    let upper = a[k * n + j];
                    a[i * n + j] -= factor * upper;
                }
            }
        }
        Some(Lu { n, lu: a, perm, det: LogDet { log_abs, phase } })
    }

    /// The determinant of the factored matrix.
    pub fn det(&self) -> LogDet {
        self.det
    }

    /// Solves A·x = b.
    pub fn solve(&self, b: &[Complex64]) -> Vec<Complex64> {
        let n = self.n;
        let mut x: Vec<Complex64> = self.perm.iter().map(|&p| b[p]).collect();
        for i in 0..n {
            let row = &self.lu[i * n..i * n + i];
            let dot: Complex64 = row.iter().zip(&x[..i]).map(|(l, y)| l * y).sum();
            x[i] -= dot;
        }
        for i in (0..n).rev() {
            let row = &self.lu[i * n + i + 1..(i + 1) * n];
            let dot: Complex64 = row.iter().zip(&x[i + 1..]).map(|(u, y)| u * y).sum();
            x[i] = (x[i] - dot) / self.lu[i * n + i];
        }
        x
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    fn c(re: f64, im: f64) -> Complex64 {
        Complex64::new(re, im)
    }

    #[test]
    fn determinant_of_a_pivoted_matrix_matches_cofactor_expansion() {
        // det [[0, 2, 1], [1, 1, 0], [3, 0, 1i]] by cofactor expansion along the first
        // row: 0 − 2·(1·1i − 0·3) + 1·(1·0 − 1·3) = −3 − 2i.
        let a = vec![c(0.0, 0.0), c(2.0, 0.0), c(1.0, 0.0), c(1.0, 0.0), c(1.0, 0.0)]
            .into_iter()
            .chain([c(0.0, 0.0), c(3.0, 0.0), c(0.0, 0.0), c(0.0, 1.0)])
            .collect();
        let lu = Lu::new(3, a).unwrap();
        let d = lu.det();
        let got = d.phase * d.log_abs.exp();
        assert!((got - c(-3.0, -2.0)).norm() < 1e-14, "det = {got}");
    }

    #[test]
    fn solve_reproduces_the_right_hand_side() {
        let a: Vec<Complex64> =
            [4.0, 1.0, 0.5, 1.0, 3.0, 0.0, 0.5, 2.0, 5.0].iter().map(|&v| c(v, 0.3 * v)).collect();
        let x_true = [c(1.0, -1.0), c(0.5, 2.0), c(-3.0, 0.25)];
        let b: Vec<Complex64> =
            (0..3).map(|i| (0..3).map(|j| a[i * 3 + j] * x_true[j]).sum()).collect();
        let x = Lu::new(3, a).unwrap().solve(&b);
        for (got, want) in x.iter().zip(x_true) {
            assert!((got - want).norm() < 1e-14, "got {got}, want {want}");
        }
    }

    #[test]
    fn rank_deficient_matrix_is_singular() {
        // The second row is twice the first.
        let a = [1.0, 2.0, 2.0, 4.0].iter().map(|&v| c(v, 0.0)).collect();
        assert!(Lu::new(2, a).is_none());
    }
}
