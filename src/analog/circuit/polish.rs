//! Refinement of the roots of det A(z) against the matrix itself.
//!
//! Roots of a polynomial interpolated on a circle are only as accurate as its smallest
//! coefficients relative to the largest; for circuits whose poles span decades that
//! can leave 1e-8 relative error. Aberth-Ehrlich steps with the exact logarithmic
//! derivative d/dz ln det A(z) = trace(A⁻¹·A1), evaluated by LU of A(z), bring each
//! root to the accuracy of the circuit equations themselves. The other roots repel
//! each estimate, so two estimates do not settle on one root.

use super::pencil::Pencil;
use num_complex::Complex64;

/// Steps longer than this fraction of a root's size are refused: the interpolated
/// roots are already close, so a long step means a nearby root or a singular point.
const MAX_STEP: f64 = 1e-3;
const MAX_SWEEPS: usize = 30;

/// Refines `roots` (all roots of det A(z), conjugate pairs exact, real roots exactly
/// real) in place, keeping that symmetry. Exact zeros are left alone.
pub fn polish(pencil: &Pencil, roots: &mut [Complex64]) {
    for _ in 0..MAX_SWEEPS {
        let mut moved = false;
        for i in 0..roots.len() {
            let z = roots[i];
            // Conjugates follow their upper partner; zeros at the origin are exact.
            if z.im < 0.0 || z == Complex64::new(0.0, 0.0) {
                continue;
            }
            let Some(lu) = pencil.factor_near_root(z) else { continue };
            let repulsion: Complex64 = roots
                .iter()
                .enumerate()
                .filter(|&(j, _)| j != i)
                .map(|(_, &w)| 1.0 / (z - w))
                .sum();
            let step = 1.0 / (pencil.log_derivative(&lu) - repulsion);
            let step = if z.im == 0.0 { Complex64::new(step.re, 0.0) } else { step };
            if !step.is_finite() || step.norm() > MAX_STEP * z.norm() {
                continue;
            }
            if step.norm() > 4.0 * f64::EPSILON * z.norm() {
                moved = true;
            }
            let new = z - step;
            roots[i] = new;
            if z.im > 0.0 {
                if let Some(partner) = roots.iter().position(|&w| w == z.conj()) {
                    roots[partner] = new.conj();
                }
            }
        }
        if !moved {
            break;
        }
    }
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
        let mut roots: Vec<Complex64> = exact.iter().map(|r| r * (1.0 + 3e-5)).collect();
        polish(&p, &mut roots);
        for (got, want) in roots.iter().zip(&exact) {
            assert!((got - want).norm() < 1e-14 * want.norm(), "got {got}, want {want}");
        }
    }

    #[test]
    fn conjugate_pair_stays_conjugate() {
        // A(z) = [[z, 1], [−1, z+1]]: det = z² + z + 1, roots −1/2 ± i·√3/2.
        let p = Pencil::new(2, vec![0.0, 1.0, -1.0, 1.0], vec![1.0, 0.0, 0.0, 1.0]);
        let want = Complex64::new(-0.5, 0.75f64.sqrt());
        let start = want * Complex64::new(1.0, 2e-6);
        let mut roots = vec![start, start.conj()];
        polish(&p, &mut roots);
        assert!((roots[0] - want).norm() < 1e-15, "{roots:?}");
        assert_eq!(roots[1], roots[0].conj());
    }
}
