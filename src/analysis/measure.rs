//! Measured responses: stepped sines through the actual engines, next to the
//! predicted response of the coefficients they run.
//!
//! For each frequency of a log grid, a −6 dBFS sine runs through a fresh engine until
//! the slowest pole has settled (e^−7), then a Hann-windowed Goertzel detector reads the
//! output amplitude over [`WINDOW`] samples. A stepped sine is a log sweep taken one
//! frequency at a time, so each reading is a steady-state gain with no deconvolution.
//! A reading counts as above the noise when the tone stands at least 40 dB above the
//! engine's own error, measured as the RMS difference between its output and a float64
//! run of the very same coefficients (so correlated rounding error and limit cycles
//! count, not just an assumed white floor), and above −120 dB: an error 40 dB down can
//! move the reading by at most 0.09 dB.
//!
//! # References
//! 1. G. Goertzel, "An algorithm for the evaluation of finite trigonometric series",
//!    American Mathematical Monthly 65(1), 1958.
//! 2. F. J. Harris, "On the use of windows for harmonic analysis with the discrete
//!    Fourier transform", Proc. IEEE 66(1), 1978 (Hann window gains).

use super::response::{log_grid, to_db};
use crate::audio::metrics::{amp_to_db, ToneMeter};
use crate::error::Result;
use crate::pipeline::Realized;
use crate::quantize::Structure;
use crate::sections::{max_pole_radius, Cascade};
use crate::simulate::Runner;
use serde::Serialize;

/// Samples read by the detector at each frequency.
pub const WINDOW: usize = 8192;
/// Amplitude of the test sine (−6 dBFS).
pub const LEVEL: f64 = 0.5;
/// Longest settling run, samples (poles closer to z = 1 are cut short here).
const MAX_SETTLE: usize = 1 << 20;

/// One frequency of a measured response.
#[derive(Debug, Clone, Copy, PartialEq, Serialize)]
pub struct MeasuredPoint {
    /// Frequency, Hz.
    pub hz: f64,
    /// |H| of the coefficients the engine runs, dB.
    pub predicted_db: f64,
    /// Gain measured through the engine, dB.
    pub measured_db: f64,
    /// Whether the tone stood at least 40 dB above the engine's error.
    pub above_noise: bool,
}

/// Measures the realized cascade through its engine at `points` frequencies from
/// 20 Hz to 0.45·rate.
///
/// # Errors
/// An engine that cannot be built for the cascade.
pub fn measure(
    realized: &Realized,
    structure: Structure,
    rate: f64,
    points: usize,
) -> Result<Vec<MeasuredPoint>> {
    let effective: Cascade = realized.effective(rate)?;
    let radius = max_pole_radius(&effective.sections);
    let settle = ((7.0 / (1.0 - radius).max(1e-12)).ceil() as usize).clamp(WINDOW, MAX_SETTLE);
    let exact = Realized::F64(effective.clone());
    let mut out = Vec::with_capacity(points);
    let mut block = vec![0.0; settle + WINDOW];
    let mut reference = vec![0.0; settle + WINDOW];
    for hz in log_grid(20.0, 0.45 * rate, points) {
        let w = 2.0 * std::f64::consts::PI * hz / rate;
        for (n, x) in block.iter_mut().enumerate() {
            *x = LEVEL * (w * n as f64).sin();
        }
        reference.copy_from_slice(&block);
        Runner::new(realized, structure, 1)?.process(&mut block)?;
        Runner::new(&exact, structure, 1)?.process(&mut reference)?;
        let mut meter = ToneMeter::new(rate, hz, WINDOW);
        meter.add(block[settle..].iter().copied());
        let amplitude = meter.amplitude();
        let error_rms = (block[settle..]
            .iter()
            .zip(&reference[settle..])
            .map(|(a, b)| (a - b) * (a - b))
            .sum::<f64>()
            / WINDOW as f64)
            .sqrt();
        let predicted_db = to_db(effective.response_at_hz(hz));
        out.push(MeasuredPoint {
            hz,
            predicted_db,
            measured_db: amp_to_db(amplitude / LEVEL),
            above_noise: predicted_db > -120.0 && amplitude >= 100.0 * error_rms,
        });
    }
    Ok(out)
}
