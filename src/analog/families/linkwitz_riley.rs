//! Linkwitz-Riley prototype: the square of a Butterworth of half the order.

use super::{butterworth, Band, Prototype};
use crate::error::{Error, Result};

/// The order-`n` Linkwitz-Riley low-pass prototype: every Butterworth factor of order
/// n/2 twice, so the crossover at 1 rad/s is (1/√2)² = −6.02 dB (ref. 3).
///
/// # Errors
/// An odd `n`, or a band-pass or band-stop `band` (a crossover has no such form).
pub(super) fn prototype(n: usize, band: Band) -> Result<Prototype> {
    if !n.is_multiple_of(2) {
        return Err(Error::input(format!("linkwitz-riley order {n} must be even")));
    }
    if let Band::Bandpass { .. } | Band::Bandstop { .. } = band {
        return Err(Error::input(format!(
            "linkwitz-riley is a crossover: band must be lowpass or highpass, got {band}"
        )));
    }
    let half = butterworth::prototype(n / 2);
    let factors = half.factors.iter().flat_map(|&f| [f, f]).collect();
    Ok(Prototype { factors, dc_gain: 1.0 })
}
