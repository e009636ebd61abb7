//! The bilinear map of zeros, poles and gain.

use crate::analog::{AnalogSection, AnalogZpk};
use crate::error::{Error, Result};
use num_complex::Complex64;
use serde::Serialize;
use std::f64::consts::PI;

/// Where the bilinear transform matches analog and digital frequency.
#[derive(Debug, Clone, Copy, PartialEq, Serialize)]
pub enum Prewarp {
    /// Every factor at its own natural frequency.
    Each,
    /// Plain bilinear transform, K = 2·rate.
    None,
    /// One frequency in Hz for the whole design.
    AtHz(f64),
}

/// H(z) = gain · Π(z − zero) / Π(z − pole), with as many zeros as poles.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct DigitalZpk {
    /// Zeros in the z plane.
    pub zeros: Vec<Complex64>,
    /// Poles in the z plane.
    pub poles: Vec<Complex64>,
    /// Real gain factor.
    pub gain: f64,
    /// Sample rate in Hz.
    pub rate: f64,
}

impl DigitalZpk {
    /// H(e^{jω}) at a frequency in Hz.
    pub fn response_at_hz(&self, hz: f64) -> Complex64 {
        let z = Complex64::from_polar(1.0, 2.0 * PI * hz / self.rate);
        let num: Complex64 = self.zeros.iter().map(|q| z - q).product();
        let den: Complex64 = self.poles.iter().map(|p| z - p).product();
        num / den * self.gain
    }
}

/// The digital model and what the transform had to give up.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct Discretized {
    /// The whole design in z.
    pub zpk: DigitalZpk,
    /// The prewarp frequency used for each analog factor, Hz (`None`: K = 2·rate).
    pub prewarp_hz: Vec<Option<f64>>,
    /// Doubtful but usable choices, one line each.
    pub warnings: Vec<String>,
}

/// Highest natural frequency, as a fraction of the rate, at which a factor is still
/// prewarped; above it tan() grows without bound, so the factor is mapped plainly.
const PREWARP_LIMIT: f64 = 0.45;

/// K = ω_p / tan(ω_p / (2·rate)) for a prewarp frequency in Hz, or 2·rate for 0 Hz.
pub fn prewarp_constant(prewarp_hz: f64, rate: f64) -> f64 {
    if prewarp_hz <= 0.0 {
        2.0 * rate
    } else {
        let w = 2.0 * PI * prewarp_hz;
        w / (w / (2.0 * rate)).tan()
    }
}

/// Maps analog factors to one digital zpk at `rate` Hz.
///
/// # Errors
/// A single prewarp frequency at or above rate/2, an improper factor, or a pole on the
/// bilinear singularity s = K.
///
/// ```
/// use tonewright::analog::AnalogSection;
/// use tonewright::discretize::{bilinear, Prewarp};
/// // 1 kHz first-order low-pass at 48 kHz, prewarped: |H| = 1/√2 at 1 kHz.
/// let w = 2.0 * std::f64::consts::PI * 1000.0;
/// let lp = AnalogSection::new([w, 0.0, 0.0], [w, 1.0, 0.0]);
/// let d = bilinear(&[lp], 48000.0, Prewarp::Each).unwrap();
/// assert!((d.zpk.response_at_hz(1000.0).norm() - 0.5f64.sqrt()).abs() < 1e-12);
/// ```
pub fn bilinear(sections: &[AnalogSection], rate: f64, prewarp: Prewarp) -> Result<Discretized> {
    let nyquist = rate / 2.0;
    if let Prewarp::AtHz(f) = prewarp {
        if !(f > 0.0 && f < nyquist) {
            return Err(Error::input(format!(
                "prewarp {f} Hz must be above 0 and below rate/2 = {nyquist} Hz"
            )));
        }
    }
    let mut out = DigitalZpk { zeros: vec![], poles: vec![], gain: 1.0, rate };
    let mut prewarp_hz = Vec::with_capacity(sections.len());
    let mut warnings = Vec::new();
    for (i, section) in sections.iter().enumerate() {
        let at = match prewarp {
            Prewarp::None => None,
            Prewarp::AtHz(f) => Some(f),
            Prewarp::Each => {
                let f0 = section.natural_hz;
                if f0 <= 0.0 {
                    None
                } else if f0 >= PREWARP_LIMIT * rate {
                    warnings.push(format!(
                        "factor {}: natural frequency {:.0} Hz is above {:.0} Hz \
                         ({PREWARP_LIMIT}·rate); mapped without prewarp",
                        i + 1,
                        f0,
                        PREWARP_LIMIT * rate
                    ));
                    None
                } else {
                    Some(f0)
                }
            }
        };
        let k = prewarp_constant(at.unwrap_or(0.0), rate);
        let part = map_zpk(&section.zpk()?, k)?;
        out.zeros.extend(part.zeros);
        out.poles.extend(part.poles);
        out.gain *= part.gain;
        prewarp_hz.push(at);
    }
    Ok(Discretized { zpk: out, prewarp_hz, warnings })
}

/// s = K·(z − 1)/(z + 1) applied to one analog zpk.
fn map_zpk(a: &AnalogZpk, k: f64) -> Result<DigitalZpk> {
    let map = |s: &Complex64| (k + s) / (k - s);
    if a.poles.iter().chain(&a.zeros).any(|s| (k - s).norm() == 0.0) {
        return Err(Error::numeric(format!(
            "a pole or zero sits at s = K = {k}, where the bilinear map is singular"
        )));
    }
    let mut zeros: Vec<Complex64> = a.zeros.iter().map(map).collect();
    let poles: Vec<Complex64> = a.poles.iter().map(map).collect();
    let num: Complex64 = a.zeros.iter().map(|z| k - z).product();
    let den: Complex64 = a.poles.iter().map(|p| k - p).product();
    zeros.resize(poles.len().max(zeros.len()), Complex64::new(-1.0, 0.0));
    Ok(DigitalZpk { zeros, poles, gain: a.gain * (num / den).re, rate: 0.0 })
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn bilinear_maps_zero_at_infinity_to_nyquist() {
        let lp = AnalogSection::new([1.0, 0.0, 0.0], [1.0, 1e-4, 1e-9]);
        let d = bilinear(&[lp], 48000.0, Prewarp::None).unwrap();
        assert_eq!(d.zpk.zeros, vec![Complex64::new(-1.0, 0.0); 2]);
    }

    #[test]
    fn single_prewarp_matches_analog_at_that_frequency() {
        // Oppenheim & Schafer 7.2: the map is exact at the prewarp frequency.
        let lp = AnalogSection::new([1.0, 0.0, 0.0], [1.0, 1e-4, 1e-9]);
        let d = bilinear(std::slice::from_ref(&lp), 48000.0, Prewarp::AtHz(7000.0)).unwrap();
        let want = lp.eval(Complex64::new(0.0, 2.0 * PI * 7000.0));
        assert!((d.zpk.response_at_hz(7000.0) - want).norm() < 1e-12);
    }
}
