//! The float64 section and cascade types.

use num_complex::Complex64;
use serde::Serialize;
use std::f64::consts::PI;

/// One biquad: b = [b0, b1, b2], a = [a1, a2], a0 = 1 (see the module doc).
#[derive(Debug, Clone, Copy, PartialEq, Serialize)]
pub struct Sos {
    /// Feed-forward coefficients b0, b1, b2.
    pub b: [f64; 3],
    /// Feedback coefficients a1, a2.
    pub a: [f64; 2],
}

impl Sos {
    /// H(z) at a point of the z plane.
    pub fn eval(&self, z: Complex64) -> Complex64 {
        let zi = 1.0 / z;
        let num = (zi * self.b[2] + self.b[1]) * zi + self.b[0];
        let den = (zi * self.a[1] + self.a[0]) * zi + 1.0;
        num / den
    }
}

/// A cascade of sections at a sample rate; its product is the digital H(z).
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct Cascade {
    /// Sample rate in Hz.
    pub rate: f64,
    /// Sections in processing order.
    pub sections: Vec<Sos>,
}

impl Cascade {
    /// H(e^{jω}) of the whole cascade at a frequency in Hz.
    pub fn response_at_hz(&self, hz: f64) -> Complex64 {
        let z = Complex64::from_polar(1.0, 2.0 * PI * hz / self.rate);
        self.sections.iter().map(|s| s.eval(z)).product()
    }
}
