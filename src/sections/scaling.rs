//! Distributing the overall gain over the sections (Jackson's Lp scaling).
//!
//! With unit sections U_1 … U_n and overall gain k, section i gets the gain g_i that
//! makes the cumulative path from the input to its output have unit norm,
//! ‖g_1·U_1 ⋯ g_i·U_i‖_p = 1, and the last section takes what keeps the product equal
//! to k. `none` puts all of k into the first section.
//!
//! # References
//! 1. L. B. Jackson, "On the interaction of roundoff noise and dynamic range in digital
//!    filters", Bell System Technical Journal 49(2), 1970.

use super::norms::{l1_norm, l2_norm, linf_norm};
use super::sos::Sos;
use crate::design::Scaling;

/// Scales unit-gain sections in place so their product carries `gain`.
pub fn scale(sections: &mut [Sos], gain: f64, scaling: Scaling) {
    let Some(last) = sections.len().checked_sub(1) else { return };
    let norm: fn(&[Sos]) -> f64 = match scaling {
        Scaling::None => {
            times(&mut sections[0], gain);
            return;
        }
        Scaling::Linf => linf_norm,
        Scaling::L2 => l2_norm,
        Scaling::L1 => l1_norm,
    };
    let mut applied = 1.0;
    for i in 0..last {
        let n = norm(&sections[..=i]);
        if n > 0.0 && n.is_finite() {
            times(&mut sections[i], 1.0 / n);
            applied /= n;
        }
    }
    times(&mut sections[last], gain / applied);
}

fn times(s: &mut Sos, g: f64) {
    for b in &mut s.b {
        *b *= g;
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn linf_scaling_keeps_the_product_and_unit_peaks() {
        let mut s = vec![
            Sos { b: [1.0, 2.0, 1.0], a: [-1.6, 0.8] },
            Sos { b: [1.0, 2.0, 1.0], a: [-1.8, 0.95] },
        ];
        let before = s.clone();
        scale(&mut s, 0.01, Scaling::Linf);
        assert!((linf_norm(&s[..1]) - 1.0).abs() < 1e-9);
        let z = num_complex::Complex64::from_polar(1.0, 0.2);
        let want: num_complex::Complex64 =
            before.iter().map(|x| x.eval(z)).product::<num_complex::Complex64>() * 0.01;
        let got: num_complex::Complex64 = s.iter().map(|x| x.eval(z)).product();
        assert!((got - want).norm() < 1e-12 * want.norm());
    }
}
