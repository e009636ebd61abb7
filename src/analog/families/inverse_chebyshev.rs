//! Inverse Chebyshev (type II) prototype: flat passband, equiripple stopband beginning
//! at 1 rad/s.

use super::chebyshev::ripple_factor_sq;
use super::{ellipse_poles, Factor, Prototype};
use crate::analog::validate;
use crate::error::Result;

/// The order-`n` inverse Chebyshev low-pass prototype, at least `stop_db` down from
/// 1 rad/s on: the poles are the reciprocals of Chebyshev poles with μ =
/// asinh(√(10^(stop_db/10) − 1))/n, the zeros lie at ±j/cos θk (ref. 1). DC gain 1.
///
/// # Errors
/// `stop_db` not positive and finite.
pub(super) fn prototype(n: usize, stop_db: f64) -> Result<Prototype> {
    validate::positive("inverse-chebyshev stop_db", stop_db, " dB")?;
    let mu = ripple_factor_sq(stop_db).sqrt().asinh() / n as f64;
    let cosh_mu = mu.cosh();
    let factors = ellipse_poles(n, mu.sinh(), cosh_mu)
        .into_iter()
        .map(|f| match f {
            // 1/q̄ = q/|q|² keeps the pole in the upper half plane; q.im = cosh μ·cos θk.
            Factor::Pair { pole, .. } => {
                Factor::Pair { pole: pole / pole.norm_sqr(), notch: Some(cosh_mu / pole.im) }
            }
            Factor::Real(p) => Factor::Real(1.0 / p),
        })
        .collect();
    Ok(Prototype { factors, dc_gain: 1.0 })
}
