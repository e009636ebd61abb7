//! Analog transfer functions in zeros/poles/gain form, s in rad/s.

use num_complex::Complex64;
use serde::Serialize;

/// H(s) = gain · Π(s − zero) / Π(s − pole), s in rad/s. Complex zeros and poles come
/// in conjugate pairs, so the gain is real.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct AnalogZpk {
    /// Finite zeros, rad/s.
    pub zeros: Vec<Complex64>,
    /// Poles, rad/s.
    pub poles: Vec<Complex64>,
    /// Real gain factor.
    pub gain: f64,
}

impl AnalogZpk {
    /// H(s) at a complex frequency s (rad/s).
    pub fn eval(&self, s: Complex64) -> Complex64 {
        let num: Complex64 = self.zeros.iter().map(|z| s - z).product();
        let den: Complex64 = self.poles.iter().map(|p| s - p).product();
        num / den * self.gain
    }

    /// H(j·2π·f) at a frequency in Hz.
    pub fn response_at_hz(&self, hz: f64) -> Complex64 {
        self.eval(Complex64::new(0.0, 2.0 * std::f64::consts::PI * hz))
    }

    /// The product of two transfer functions.
    pub fn cascade(&self, other: &AnalogZpk) -> AnalogZpk {
        AnalogZpk {
            zeros: self.zeros.iter().chain(&other.zeros).copied().collect(),
            poles: self.poles.iter().chain(&other.poles).copied().collect(),
            gain: self.gain * other.gain,
        }
    }

    /// True when every pole lies strictly in the left half plane.
    pub fn is_stable(&self) -> bool {
        self.poles.iter().all(|p| p.re < 0.0)
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn first_order_lowpass_is_3db_down_at_its_pole() {
        // H(s) = w/(s+w): |H(jw)| = 1/sqrt(2) (textbook)
        let w = 2.0 * std::f64::consts::PI * 1000.0;
        let h = AnalogZpk { zeros: vec![], poles: vec![Complex64::new(-w, 0.0)], gain: w };
        assert!((h.response_at_hz(1000.0).norm() - 0.5f64.sqrt()).abs() < 1e-15);
    }
}
