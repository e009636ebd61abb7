//! Real first- and second-order analog factors of H(s).
//!
//! A factor is H(s) = (n0 + n1·s + n2·s²) / (d0 + d1·s + d2·s²), coefficients in
//! ascending powers, s in rad/s. A first-order factor has d2 = 0 (and n2 = 0); a pure
//! gain has d1 = d2 = 0. Each factor carries the frequency where `prewarp = "each"`
//! matches the digital response to the analog one: the natural frequency of its poles,
//! or the design frequency f0 where a formula defines one (shelves, whose poles sit at
//! f0·A^(∓1/4), are prewarped at f0 as in the audio EQ cookbook).

use crate::analog::zpk::AnalogZpk;
use crate::error::{Error, Result};
use num_complex::Complex64;
use serde::Serialize;

/// One real factor of H(s) of order 0, 1 or 2.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct AnalogSection {
    /// Numerator n0, n1, n2 (ascending powers of s).
    pub num: [f64; 3],
    /// Denominator d0, d1, d2 (ascending powers of s).
    pub den: [f64; 3],
    /// The frequency this factor is prewarped at under `prewarp = "each"`, Hz
    /// (0 for a pure gain or poles at s = 0: plain bilinear transform).
    pub natural_hz: f64,
}

impl AnalogSection {
    /// A constant gain.
    pub fn gain(k: f64) -> Self {
        AnalogSection { num: [k, 0.0, 0.0], den: [1.0, 0.0, 0.0], natural_hz: 0.0 }
    }

    /// A factor from its coefficients, prewarped at the natural frequency of its poles.
    pub fn new(num: [f64; 3], den: [f64; 3]) -> Self {
        let mut s = AnalogSection { num, den, natural_hz: 0.0 };
        s.natural_hz = s.natural_rad() / (2.0 * std::f64::consts::PI);
        s
    }

    /// H(s) at a complex frequency (rad/s).
    pub fn eval(&self, s: Complex64) -> Complex64 {
        let p = |c: &[f64; 3]| (s * c[2] + c[1]) * s + c[0];
        p(&self.num) / p(&self.den)
    }

    /// The order of the denominator: 0, 1 or 2.
    pub fn order(&self) -> usize {
        if self.den[2] != 0.0 {
            2
        } else if self.den[1] != 0.0 {
            1
        } else {
            0
        }
    }

    /// Natural frequency of the poles in rad/s: √(d0/d2) for order 2, d0/d1 for
    /// order 1, 0 for a gain (and for poles at s = 0).
    pub fn natural_rad(&self) -> f64 {
        let d = &self.den;
        match self.order() {
            2 => (d[0] / d[2]).abs().sqrt(),
            1 => (d[0] / d[1]).abs(),
            _ => 0.0,
        }
    }

    /// Quality factor of a second-order factor, √(d0·d2)/d1 (infinite for d1 = 0);
    /// `None` below order 2.
    pub fn q(&self) -> Option<f64> {
        (self.order() == 2).then(|| (self.den[0] * self.den[2]).abs().sqrt() / self.den[1])
    }

    /// The factor as zeros, poles and gain.
    ///
    /// # Errors
    /// A numerator of higher order than the denominator (an improper factor).
    pub fn zpk(&self) -> Result<AnalogZpk> {
        let (zeros, zlead) = quadratic_roots(&self.num);
        let (poles, plead) = quadratic_roots(&self.den);
        if zeros.len() > poles.len() {
            return Err(Error::input("a factor has more zeros than poles (improper H(s))"));
        }
        Ok(AnalogZpk { zeros, poles, gain: zlead / plead })
    }

    /// Builds a real factor from at most two zeros and two poles, each either real or a
    /// conjugate pair, with H = gain · Π(s − z) / Π(s − p).
    pub fn from_zpk(zeros: &[Complex64], poles: &[Complex64], gain: f64) -> Self {
        let expand = |r: &[Complex64]| -> [f64; 3] {
            match r {
                [] => [1.0, 0.0, 0.0],
                [a] => [-a.re, 1.0, 0.0],
                [a, b] => [(a * b).re, -(a + b).re, 1.0],
                _ => unreachable!("a section holds at most two roots"),
            }
        };
        let mut num = expand(zeros);
        for c in &mut num {
            *c *= gain;
        }
        AnalogSection::new(num, expand(poles))
    }
}

/// Roots of c0 + c1·s + c2·s² (trailing zero coefficients dropped) and the leading
/// coefficient. Uses the cancellation-free form of the quadratic formula.
fn quadratic_roots(c: &[f64; 3]) -> (Vec<Complex64>, f64) {
    if c[2] != 0.0 {
        let (a, b, k) = (c[2], c[1], c[0]);
        let disc = b * b - 4.0 * a * k;
        let roots = if disc >= 0.0 {
            let q = -0.5 * (b + b.signum() * disc.sqrt());
            if q == 0.0 {
                vec![Complex64::new(0.0, 0.0); 2]
            } else {
                vec![Complex64::new(q / a, 0.0), Complex64::new(k / q, 0.0)]
            }
        } else {
            let re = -b / (2.0 * a);
            let im = (-disc).sqrt() / (2.0 * a.abs());
            vec![Complex64::new(re, im), Complex64::new(re, -im)]
        };
        (roots, a)
    } else if c[1] != 0.0 {
        (vec![Complex64::new(-c[0] / c[1], 0.0)], c[1])
    } else {
        (vec![], c[0])
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn zpk_round_trip_of_resonant_section() {
        let s = AnalogSection::new([4.0, 0.0, 1.0], [4.0, 0.5, 1.0]);
        let z = s.zpk().unwrap();
        let back = AnalogSection::from_zpk(&z.zeros, &z.poles, z.gain);
        let x = Complex64::new(0.1, 1.7);
        assert!((s.eval(x) - back.eval(x)).norm() < 1e-14);
        assert_eq!(s.natural_rad(), 2.0);
        assert_eq!(s.natural_hz, 1.0 / std::f64::consts::PI);
        assert_eq!(s.q(), Some(4.0));
    }
}
