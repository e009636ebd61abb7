//! Bessel (Thomson) prototype: maximally flat group delay.
//!
//! The poles are the roots of the reverse Bessel polynomial θn(s) = Σ ak·s^k,
//! ak = (2n − k)! / (2^(n−k)·k!·(n − k)!) (module ref. 2), which has unit group delay at DC.
//! The polynomial is scaled to s·a0^(1/n) before rooting, so its constant and leading
//! coefficients are both 1 and the roots have unit geometric mean modulus; each root
//! is then polished against the exact integer coefficients. This is the only place in
//! the families where a polynomial is rooted.

use super::{Factor, Prototype};
use crate::analog::roots::roots;
use crate::error::{Error, Result};
use num_complex::Complex64;
use serde::Serialize;

/// What the frequency of a Bessel filter means.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize)]
pub enum BesselNorm {
    /// The −3 dB point (scipy `norm='mag'`); what `family = "bessel"` uses.
    Magnitude,
    /// The high-frequency magnitude asymptote equals that of a Butterworth with the
    /// same corner: the product of the pole moduli is 1 (scipy `norm='phase'`).
    Phase,
    /// Group delay at DC of 1/(2π·f) seconds (scipy `norm='delay'`).
    Delay,
}

/// The order-`n` Bessel low-pass prototype with unit DC gain, normalised by `norm`.
///
/// # Errors
/// The root finder failing to converge.
pub(super) fn prototype(n: usize, norm: BesselNorm) -> Result<Prototype> {
    let exact = coefficients(n);
    let a0 = exact[0] as f64;
    let sigma = a0.powf(1.0 / n as f64);
    // Start from the roots of θn(σ·y)/a0 (constant and leading coefficient 1), then
    // polish each in s against the exact integer coefficients.
    let scaled: Vec<f64> =
        exact.iter().enumerate().map(|(k, &a)| a as f64 * sigma.powi(k as i32) / a0).collect();
    let dd: Vec<Dd> = exact.iter().map(|&a| Dd::from_u128(a)).collect();
    let approx: Vec<f64> = exact.iter().map(|&a| a as f64).collect();
    let phase_poles: Vec<Complex64> = roots(&scaled)?
        .into_iter()
        .filter(|p| p.im >= 0.0)
        .map(|y| polish(&dd, &approx, y * sigma) / sigma)
        .collect();
    let scale = match norm {
        BesselNorm::Phase => 1.0,
        BesselNorm::Delay => 1.0 / sigma,
        BesselNorm::Magnitude => half_power_rad(&phase_poles)?,
    };
    let factors = phase_poles
        .iter()
        .map(|&p| {
            let p = p / scale;
            if p.im == 0.0 {
                Factor::Real(p.re)
            } else {
                Factor::Pair { pole: p, notch: None }
            }
        })
        .collect();
    Ok(Prototype { factors, dc_gain: 1.0 })
}

/// The exact coefficients a0..an of θn, from an = 1 and
/// a(k) = a(k+1)·(2n − k)(k + 1) / (2(n − k)) (an integer at every step). For
/// n ≤ 16 the largest is below 2^64.
fn coefficients(n: usize) -> Vec<u128> {
    let mut a = vec![1u128; n + 1];
    for k in (0..n).rev() {
        a[k] = a[k + 1] * ((2 * n - k) * (k + 1)) as u128 / (2 * (n - k)) as u128;
    }
    a
}

/// Newton steps on θn at `s`, with θn evaluated in double-double arithmetic so the
/// root is accurate to a few ulps: in f64 the roots of θ16 are only good to about
/// 1e-9 (their condition number), which double-length evaluation removes (module ref. 5).
fn polish(exact: &[Dd], approx: &[f64], mut s: Complex64) -> Complex64 {
    for _ in 0..3 {
        let (mut re, mut im) = (Dd(0.0, 0.0), Dd(0.0, 0.0));
        for &a in exact.iter().rev() {
            (re, im) = (re.mul(s.re).add(im.mul(-s.im)).add(a), re.mul(s.im).add(im.mul(s.re)));
        }
        let value = Complex64::new(re.0 + re.1, im.0 + im.1);
        let slope = approx
            .iter()
            .enumerate()
            .skip(1)
            .rev()
            .fold(Complex64::new(0.0, 0.0), |acc, (k, &a)| acc * s + a * k as f64);
        s -= value / slope;
    }
    s
}

/// A double-double number hi + lo, |lo| ≤ ulp(hi)/2 (module ref. 5).
#[derive(Debug, Clone, Copy)]
struct Dd(f64, f64);

impl Dd {
    fn from_u128(a: u128) -> Dd {
        let hi = a as f64;
        Dd(hi, (a as i128 - hi as i128) as f64)
    }

    /// hi + lo renormalised, assuming |a| ≥ |b| or a = 0.
    fn fast(a: f64, b: f64) -> Dd {
        let s = a + b;
        Dd(s, b - (s - a))
    }

    fn add(self, o: Dd) -> Dd {
        let s = self.0 + o.0;
        let v = s - self.0;
        let err = (self.0 - (s - v)) + (o.0 - v);
        Dd::fast(s, err + self.1 + o.1)
    }

    fn mul(self, x: f64) -> Dd {
        let p = self.0 * x;
        Dd::fast(p, self.0.mul_add(x, -p) + self.1 * x)
    }
}

/// The frequency (rad/s) where the all-pole filter with unit DC gain and these poles
/// (one of each conjugate pair) is 3.0103 dB down, |H|² = 1/2, found by bisection on the factored response (the
/// Bessel magnitude falls monotonically, so the crossing is unique).
fn half_power_rad(poles: &[Complex64]) -> Result<f64> {
    // ln |H(jω)|² + ln 2, positive below the crossing.
    let excess = |w: f64| {
        let s = Complex64::new(0.0, w);
        let term = |p: Complex64| (p.norm_sqr() / (s - p).norm_sqr()).ln();
        poles
            .iter()
            .map(|&p| if p.im > 0.0 { term(p) + term(p.conj()) } else { term(p) })
            .sum::<f64>()
            + std::f64::consts::LN_2
    };
    let (mut lo, mut hi) = (0.0, 1.0);
    while excess(hi) > 0.0 {
        (lo, hi) = (hi, 2.0 * hi);
        if hi > 1e6 {
            return Err(Error::numeric("bessel: no −3 dB point below 1e6 rad/s"));
        }
    }
    while hi - lo > f64::EPSILON * hi {
        let mid = 0.5 * (lo + hi);
        if excess(mid) > 0.0 {
            lo = mid;
        } else {
            hi = mid;
        }
    }
    Ok(0.5 * (lo + hi))
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn bessel_coefficients_are_exact() {
        // Reverse Bessel polynomials θ3 = s³ + 6s² + 15s + 15 and
        // θ4 = s⁴ + 10s³ + 45s² + 105s + 105 (Williams & Taylor, from memory); a0 is the
        // double factorial (2n − 1)!! = 1·3·5·…·(2n − 1) (module ref. 2).
        assert_eq!(coefficients(3), vec![15, 15, 6, 1]);
        assert_eq!(coefficients(4), vec![105, 105, 45, 10, 1]);
        let odd_product: u128 = (1..=31u128).step_by(2).product();
        assert_eq!(coefficients(16)[0], odd_product);
    }
}
