//! Refinement of the roots of det A(z) against the matrix itself.
//!
//! Roots of a polynomial interpolated on a circle are only as accurate as its smallest
//! coefficients relative to the largest, and clustered roots lose much more: a 20-pole
//! RC ladder comes out with a few poles 1e-2 off. Aberth-Ehrlich iteration [1] with the
//! exact logarithmic derivative d/dz ln det A(z) = trace(A⁻¹·A1), from an LU of A(z),
//! converges from those estimates to the accuracy of the circuit equations. Each
//! estimate is repelled by the others, so two estimates do not settle on one root.
//!
//! Aberth steps commute with conjugation, so a conjugate pair of estimates could never
//! split into the two real roots of a close real pair; the estimates are nudged off
//! symmetry first and the result is made symmetric again at the end.
//!
//! # References
//! 1. O. Aberth, "Iteration methods for finding all zeros of a polynomial
//!    simultaneously", Mathematics of Computation 27(122), 1973.

use super::pencil::Pencil;
use crate::analog::roots::pair_conjugates;
use num_complex::Complex64;

const MAX_SWEEPS: usize = 60;
/// A root whose step is below this fraction of its size is done.
const CONVERGED: f64 = 1e-14;
/// A step that no longer halves while already this small is rounding noise: done.
const NOISE_FLOOR: f64 = 1e-9;
/// Relative size of the nudge that breaks conjugate symmetry.
const NUDGE: f64 = 1e-7;

/// Refines `roots` (all roots of det A(z)) and returns them with conjugate pairs exact
/// and real roots exactly real. Exact zeros are kept exact.
pub fn polish(pencil: &Pencil, roots: Vec<Complex64>) -> Vec<Complex64> {
    let n = roots.len();
    let origin = Complex64::new(0.0, 0.0);
    let mut z: Vec<Complex64> = roots
        .iter()
        .enumerate()
        .map(|(k, &r)| r * Complex64::new(1.0, NUDGE * (k + 1) as f64 / n as f64))
        .collect();
    let mut done: Vec<bool> = z.iter().map(|&r| r == origin).collect();
    let mut last_step = vec![f64::INFINITY; n];
    for _ in 0..MAX_SWEEPS {
        if done.iter().all(|&d| d) {
            break;
        }
        for i in 0..n {
            if done[i] {
                continue;
            }
            // An exactly singular A(z) means z is a root.
            let Some(lu) = pencil.factor_near_root(z[i]) else {
                done[i] = true;
                continue;
            };
            let repulsion: Complex64 =
                (0..n).filter(|&j| j != i).map(|j| 1.0 / (z[i] - z[j])).sum();
            let step = 1.0 / (pencil.log_derivative(&lu) - repulsion);
            if !step.is_finite() {
                done[i] = true;
                continue;
            }
            z[i] -= step;
            let size = step.norm() / z[i].norm();
            done[i] = size < CONVERGED || (size < NOISE_FLOOR && size > 0.5 * last_step[i]);
            last_step[i] = size;
        }
    }
    pair_conjugates(z)
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn perturbed_roots_of_a_pencil_return_to_the_eigenvalues() {
        // A(z) = [[z+2, −1, 0], [−1, z+2, −1], [0, −1, z+1]]: det A(z) = z³+5z²+6z+1,
        // expanded by hand; the roots of that cubic are the reference.
        let a0 = vec![2.0, -1.0, 0.0, -1.0, 2.0, -1.0, 0.0, -1.0, 1.0];
        let a1 = vec![1.0, 0.0, 0.0, 0.0, 1.0, 0.0, 0.0, 0.0, 1.0];
        let p = Pencil::new(3, a0, a1);
        let exact = crate::analog::roots::roots(&[1.0, 6.0, 5.0, 1.0]).unwrap();
        let start: Vec<Complex64> = exact.iter().map(|r| r * (1.0 + 3e-3)).collect();
        let got = polish(&p, start);
        for (got, want) in got.iter().zip(&exact) {
            assert!((got - want).norm() < 1e-15 * want.norm(), "got {got}, want {want}");
            assert_eq!(got.im, 0.0);
        }
    }

    #[test]
    fn conjugate_estimates_split_into_a_close_real_pair() {
        // A(z) = diag(z + 1, z + 1.01): roots −1 and −1.01, started as a conjugate pair.
        let p = Pencil::new(2, vec![1.0, 0.0, 0.0, 1.01], vec![1.0, 0.0, 0.0, 1.0]);
        let start = vec![Complex64::new(-1.005, 0.003), Complex64::new(-1.005, -0.003)];
        let got = polish(&p, start);
        assert!((got[0] + 1.0).norm() < 1e-15 && (got[1] + 1.01).norm() < 1e-15, "{got:?}");
    }

    #[test]
    fn conjugate_pair_stays_conjugate() {
        // A(z) = [[z, 1], [−1, z+1]]: det = z² + z + 1, roots −1/2 ± i·√3/2.
        let p = Pencil::new(2, vec![0.0, 1.0, -1.0, 1.0], vec![1.0, 0.0, 0.0, 1.0]);
        let want = Complex64::new(-0.5, 0.75f64.sqrt());
        let start = want * Complex64::new(1.0, 2e-3);
        let got = polish(&p, vec![start, start.conj()]);
        assert!((got[0] - want).norm() < 1e-15, "{got:?}");
        assert_eq!(got[1], got[0].conj());
    }
}
