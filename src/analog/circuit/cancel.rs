//! Removal of pole-zero pairs that coincide.
//!
//! Nodal analysis yields every natural mode of the circuit as a pole, including modes
//! the output cannot see (a branch hanging on the ideal source, a balanced bridge);
//! those appear as a zero at the same place and are removed here, so H(s) has the
//! lowest order that describes it.

use num_complex::Complex64;

/// Removes each zero that lies within `tolerance` (relative to the larger modulus) of a
/// remaining pole, together with the nearest such pole; returns the removed
/// (pole, zero) pairs. Exact zeros at the origin match exact poles at the origin.
pub fn cancel(
    poles: &mut Vec<Complex64>,
    zeros: &mut Vec<Complex64>,
    tolerance: f64,
) -> Vec<(Complex64, Complex64)> {
    let mut removed = Vec::new();
    let mut i = 0;
    while i < zeros.len() {
        let z = zeros[i];
        let nearest = poles
            .iter()
            .enumerate()
            .map(|(j, p)| (j, (p - z).norm()))
            .min_by(|a, b| a.1.total_cmp(&b.1));
        match nearest {
            Some((j, distance)) if distance <= tolerance * poles[j].norm().max(z.norm()) => {
                removed.push((poles.remove(j), zeros.remove(i)));
            }
            _ => i += 1,
        }
    }
    removed
}

#[cfg(test)]
mod tests {
    use super::*;

    fn c(re: f64, im: f64) -> Complex64 {
        Complex64::new(re, im)
    }

    #[test]
    fn coincident_conjugate_pair_is_removed_and_distinct_roots_stay() {
        let mut poles = vec![c(-1.0, 2.0), c(-1.0, -2.0), c(-5.0, 0.0)];
        let mut zeros = vec![c(-1.0, 2.0 + 1e-9), c(-1.0, -2.0 - 1e-9), c(-5.01, 0.0)];
        let removed = cancel(&mut poles, &mut zeros, 1e-6);
        assert_eq!(removed.len(), 2);
        assert_eq!(poles, vec![c(-5.0, 0.0)]);
        assert_eq!(zeros, vec![c(-5.01, 0.0)]);
    }

    #[test]
    fn zeros_at_origin_cancel_only_poles_at_origin() {
        let mut poles = vec![c(0.0, 0.0), c(-1e-3, 0.0)];
        let mut zeros = vec![c(0.0, 0.0), c(0.0, 0.0)];
        let removed = cancel(&mut poles, &mut zeros, 1e-6);
        assert_eq!(removed, vec![(c(0.0, 0.0), c(0.0, 0.0))]);
        assert_eq!(zeros.len(), 1);
    }
}
