//! Parametric first- and second-order stages: the `lowpass` … `highshelf` stage kinds.
//!
//! In: a [`Shape`], the order (1 or 2), the frequency f0 in Hz, Q and a gain in dB.
//! Out: one [`AnalogSection`], s in rad/s, prewarped at f0 (`natural_hz = f0`) for
//! every shape, shelves included.
//!
//! Second-order shapes are the analog prototypes of the audio EQ cookbook (ref. 1): with
//! x = s/ω0 and A = 10^(gain_db/40),
//!
//! | shape     | H(x)                                              |
//! |-----------|---------------------------------------------------|
//! | lowpass   | 1 / (x² + x/Q + 1)                                |
//! | highpass  | x² / (x² + x/Q + 1)                               |
//! | bandpass  | (x/Q) / (x² + x/Q + 1), 0 dB at f0                |
//! | notch     | (x² + 1) / (x² + x/Q + 1)                         |
//! | allpass   | (x² − x/Q + 1) / (x² + x/Q + 1)                   |
//! | peak      | (x² + x·A/Q + 1) / (x² + x/(A·Q) + 1)             |
//! | lowshelf  | A·(x² + x·√A/Q + A) / (A·x² + x·√A/Q + 1)         |
//! | highshelf | A·(A·x² + x·√A/Q + 1) / (x² + x·√A/Q + A)         |
//!
//! so the bilinear transform prewarped at f0 gives exactly the cookbook biquads. The
//! shelves take Q directly; the cookbook's slope S maps to it through
//! 1/Q = √((A + 1/A)(1/S − 1) + 2), and S = 1 (the steepest monotone shelf) is
//! Q = 1/√2. Order 1: lowpass 1/(x + 1), highpass x/(x + 1), allpass (1 − x)/(1 + x)
//! (−90° at f0), lowshelf (A·x + A²)/(A·x + 1) and highshelf (A²·x + A)/(x + A): shelves
//! of total gain A² = 10^(gain_db/20) whose midpoint, half the gain in dB, is at f0.
//!
//! Q applies to order 2 only and gain_db to peak and shelves only; otherwise they are
//! ignored. Not done here: the Nyquist check (the caller knows the rate).
//!
//! # References
//! 1. R. Bristow-Johnson, "Cookbook formulae for audio EQ biquad filter coefficients"
//!    (W3C Audio EQ Cookbook note).
//! 2. A. V. Oppenheim, R. W. Schafer, "Discrete-Time Signal Processing", 3rd ed., 2010,
//!    section 7.2 (the bilinear transform prewarped at one frequency).

use crate::analog::validate;
use crate::analog::AnalogSection;
use crate::error::{Error, Result};
use serde::Serialize;
use std::f64::consts::PI;
use std::fmt;

/// The response shape of a parametric stage.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize)]
pub enum Shape {
    /// Low-pass, order 1 or 2.
    Lowpass,
    /// High-pass, order 1 or 2.
    Highpass,
    /// Band-pass with 0 dB at f0, order 2.
    Bandpass,
    /// Band-reject with a null at f0, order 2.
    Notch,
    /// All-pass (flat magnitude, phase −90° or −180° at f0), order 1 or 2.
    Allpass,
    /// Peaking EQ, gain_db at f0, order 2.
    Peak,
    /// Low shelf, gain_db below f0, order 1 or 2.
    Lowshelf,
    /// High shelf, gain_db above f0, order 1 or 2.
    Highshelf,
}

impl fmt::Display for Shape {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        f.write_str(match self {
            Shape::Lowpass => "lowpass",
            Shape::Highpass => "highpass",
            Shape::Bandpass => "bandpass",
            Shape::Notch => "notch",
            Shape::Allpass => "allpass",
            Shape::Peak => "peak",
            Shape::Lowshelf => "lowshelf",
            Shape::Highshelf => "highshelf",
        })
    }
}

/// The analog section of a parametric stage: `shape` of `order` at `freq_hz`.
///
/// # Errors
/// `freq_hz` not positive and finite; `gain_db` not finite; for order 2, `q` not
/// positive and finite; an order the shape does not have (band-pass, notch and peak
/// are order 2 only; nothing above 2); values so extreme that the coefficients leave
/// the f64 range.
///
/// ```
/// use tonewright::analog::parametric::{parametric, Shape};
/// // A +6 dB peak at 1 kHz is 6 dB up at 1 kHz.
/// let h = parametric(Shape::Peak, 2, 1000.0, 1.0, 6.0).unwrap();
/// let w = num_complex::Complex64::new(0.0, 2.0 * std::f64::consts::PI * 1000.0);
/// assert!((20.0 * h.eval(w).norm().log10() - 6.0).abs() < 1e-12);
/// ```
pub fn parametric(
    shape: Shape,
    order: usize,
    freq_hz: f64,
    q: f64,
    gain_db: f64,
) -> Result<AnalogSection> {
    validate::positive("freq", freq_hz, " Hz")?;
    validate::finite("gain_db", gain_db, " dB")?;
    let a = 10f64.powf(gain_db / 40.0);
    // Numerator and denominator in ascending powers of x = s/ω0.
    let (num, den) = match (order, shape) {
        (1, Shape::Lowpass) => ([1.0, 0.0, 0.0], [1.0, 1.0, 0.0]),
        (1, Shape::Highpass) => ([0.0, 1.0, 0.0], [1.0, 1.0, 0.0]),
        (1, Shape::Allpass) => ([1.0, -1.0, 0.0], [1.0, 1.0, 0.0]),
        (1, Shape::Lowshelf) => ([a * a, a, 0.0], [1.0, a, 0.0]),
        (1, Shape::Highshelf) => ([a, a * a, 0.0], [a, 1.0, 0.0]),
        (2, _) => {
            validate::positive("q", q, "")?;
            let k = 1.0 / q;
            let ks = a.sqrt() * k;
            match shape {
                Shape::Lowpass => ([1.0, 0.0, 0.0], [1.0, k, 1.0]),
                Shape::Highpass => ([0.0, 0.0, 1.0], [1.0, k, 1.0]),
                Shape::Bandpass => ([0.0, k, 0.0], [1.0, k, 1.0]),
                Shape::Notch => ([1.0, 0.0, 1.0], [1.0, k, 1.0]),
                Shape::Allpass => ([1.0, -k, 1.0], [1.0, k, 1.0]),
                Shape::Peak => ([1.0, k * a, 1.0], [1.0, k / a, 1.0]),
                Shape::Lowshelf => ([a * a, a * ks, a], [1.0, ks, a]),
                Shape::Highshelf => ([a, a * ks, a * a], [a, ks, 1.0]),
            }
        }
        _ => {
            let allowed = match shape {
                Shape::Bandpass | Shape::Notch | Shape::Peak => "2",
                _ => "1 or 2",
            };
            return Err(Error::input(format!("{shape} order {order} must be {allowed}")));
        }
    };
    let w0 = 2.0 * PI * freq_hz;
    let in_s = |c: [f64; 3]| [c[0] * w0 * w0, c[1] * w0, c[2]];
    let mut section = AnalogSection::new(in_s(num), in_s(den));
    section.natural_hz = freq_hz;
    validate::representable(
        std::slice::from_ref(&section),
        &format!("{shape} at {freq_hz} Hz with gain {gain_db} dB"),
    )?;
    Ok(section)
}
