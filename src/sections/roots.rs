//! Poles and zeros of one section, and their description as radius, frequency and Q.

use super::sos::Sos;
use num_complex::Complex64;
use serde::Serialize;
use std::f64::consts::PI;

/// A pole or zero in the z plane with the numbers a filter designer reads.
#[derive(Debug, Clone, Copy, PartialEq, Serialize)]
pub struct Root {
    /// Real part.
    pub re: f64,
    /// Imaginary part.
    pub im: f64,
    /// |z|.
    pub radius: f64,
    /// Angle of z as a frequency, Hz (0 to rate/2 for the upper member of a pair).
    pub freq_hz: f64,
    /// Q of the equivalent analog pair s = rate·ln z (complex roots only):
    /// ω0 = |s|, Q = ω0 / (2·|Re s|).
    pub q: Option<f64>,
}

impl Root {
    /// Describes `z` at a sample rate of `rate` Hz.
    pub fn new(z: Complex64, rate: f64) -> Self {
        let q = (z.im != 0.0 && z.norm() > 0.0).then(|| {
            let s = z.ln() * rate;
            s.norm() / (2.0 * s.re.abs())
        });
        Self { re: z.re, im: z.im, radius: z.norm(), freq_hz: z.arg().abs() * rate / (2.0 * PI), q }
    }
}

impl Root {
    /// Natural frequency of the equivalent analog root s = rate·ln z, Hz: the corner of
    /// a real pole, close to `freq_hz` for a sharp complex pair (0 for z = 0).
    pub fn natural_hz(&self, rate: f64) -> f64 {
        let z = Complex64::new(self.re, self.im);
        if z.norm() == 0.0 {
            0.0
        } else {
            (z.ln() * rate).norm() / (2.0 * PI)
        }
    }
}

/// Roots of c0·z² + c1·z + c2, leaving out roots at the origin (c2 = 0) and at
/// infinity (c0 = 0). Conjugate pairs are exactly conjugate.
fn quadratic_roots(c0: f64, c1: f64, c2: f64) -> Vec<Complex64> {
    match (c0 == 0.0, c2 == 0.0) {
        (true, true) => Vec::new(),
        (true, false) if c1 == 0.0 => Vec::new(),
        (true, false) => vec![Complex64::new(-c2 / c1, 0.0)],
        (false, true) if c1 == 0.0 => Vec::new(),
        (false, true) => vec![Complex64::new(-c1 / c0, 0.0)],
        (false, false) => {
            let (p, q) = (c1 / c0, c2 / c0);
            let disc = p * p / 4.0 - q;
            if disc >= 0.0 {
                // The larger root first, the other from the product, so no cancellation.
                let big = -p / 2.0 - p.signum() * disc.sqrt();
                let big = if big == 0.0 { disc.sqrt() } else { big };
                vec![Complex64::new(big, 0.0), Complex64::new(q / big, 0.0)]
            } else {
                let im = (-disc).sqrt();
                vec![Complex64::new(-p / 2.0, im), Complex64::new(-p / 2.0, -im)]
            }
        }
    }
}

/// Poles of a section: roots of z² + a1·z + a2 away from the origin.
pub fn poles(s: &Sos) -> Vec<Complex64> {
    quadratic_roots(1.0, s.a[0], s.a[1])
}

/// Zeros of a section: roots of b0·z² + b1·z + b2 away from the origin and infinity.
pub fn zeros(s: &Sos) -> Vec<Complex64> {
    quadratic_roots(s.b[0], s.b[1], s.b[2])
}

/// The largest pole radius of a chain of sections (0 for a chain without poles).
pub fn max_pole_radius(sections: &[Sos]) -> f64 {
    sections.iter().flat_map(poles).map(|p| p.norm()).fold(0.0, f64::max)
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn poles_of_a_resonator_have_the_radius_and_angle_they_were_built_from() {
        let (r, th) = (0.95_f64, 0.3_f64);
        let s = Sos { b: [1.0, 0.0, 0.0], a: [-2.0 * r * th.cos(), r * r] };
        let p = poles(&s);
        assert_eq!(p.len(), 2);
        assert!((p[0].norm() - r).abs() < 1e-15 && (p[0].arg().abs() - th).abs() < 1e-14);
        assert_eq!(p[0].conj(), p[1]);
    }

    #[test]
    fn real_poles_keep_full_precision_near_one() {
        // (z − 0.999999)(z − 1e-9): the small root by the product, not by cancellation.
        let (x, y) = (0.999_999, 1e-9);
        let p = poles(&Sos { b: [1.0, 0.0, 0.0], a: [-(x + y), x * y] });
        assert!((p[0].re - x).abs() < 1e-15);
        assert!((p[1].re - y).abs() / y < 1e-9);
    }

    #[test]
    fn first_order_and_pure_delay_sections_drop_trivial_roots() {
        let s = Sos { b: [0.0, 1.0, 0.0], a: [-0.5, 0.0] };
        assert_eq!(poles(&s), vec![Complex64::new(0.5, 0.0)]);
        assert!(zeros(&s).is_empty());
    }

    #[test]
    fn q_of_a_digital_pair_matches_the_analog_pair_it_came_from() {
        // s = -w0/(2Q) ± j·w0·sqrt(1 − 1/(4Q²)), mapped by z = e^{s/rate}.
        let (rate, f0, q) = (48000.0, 1000.0, 2.0);
        let w0 = 2.0 * PI * f0;
        let s = Complex64::new(-w0 / (2.0 * q), w0 * (1.0 - 1.0 / (4.0 * q * q)).sqrt());
        let root = Root::new((s / rate).exp(), rate);
        assert!((root.q.unwrap() - q).abs() < 1e-9);
    }
}
