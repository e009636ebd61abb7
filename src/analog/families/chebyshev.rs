//! Chebyshev (type I) prototype: equiripple passband, ripple band edge at 1 rad/s.

use super::{ellipse_poles, Prototype};
use crate::analog::validate;
use crate::error::Result;
use std::f64::consts::LN_10;

/// ε² = 10^(db/10) − 1, the Chebyshev ripple factor of a level in dB, computed without
/// cancellation for small `db`.
pub(super) fn ripple_factor_sq(db: f64) -> f64 {
    (db / 10.0 * LN_10).exp_m1()
}

/// The order-`n` Chebyshev low-pass prototype with `ripple_db` of passband ripple:
/// poles on the ellipse with semi-axes sinh μ and cosh μ, μ = asinh(1/ε)/n; the peak
/// gain is 0 dB, so an even order has DC gain 1/√(1 + ε²) (ref. 1).
///
/// # Errors
/// `ripple_db` not positive and finite.
pub(super) fn prototype(n: usize, ripple_db: f64) -> Result<Prototype> {
    validate::positive("chebyshev ripple_db", ripple_db, " dB")?;
    let eps_sq = ripple_factor_sq(ripple_db);
    let mu = (1.0 / eps_sq.sqrt()).asinh() / n as f64;
    let dc_gain = if n.is_multiple_of(2) { 1.0 / (1.0 + eps_sq).sqrt() } else { 1.0 };
    Ok(Prototype { factors: ellipse_poles(n, mu.sinh(), mu.cosh()), dc_gain })
}
