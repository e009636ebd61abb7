//! Classic analog filter families, returned as real first- and second-order factors.
//!
//! In: a [`Family`], a [`Band`] with its frequencies in Hz, and the order of the
//! low-pass prototype. Out: `Vec<AnalogSection>` whose product is H(s), s in rad/s.
//!
//! Conventions:
//! - Meaning of the frequency: Butterworth and Bessel, the −3 dB point (Bessel
//!   magnitude-normalised; [`bessel`] also gives the phase- and delay-normalised
//!   forms); Chebyshev, the edge of the ripple band (passband peak 0 dB); inverse
//!   Chebyshev, where the stopband attenuation `stop_db` begins; Linkwitz-Riley, the
//!   crossover (−6.02 dB), even orders only, the square of the Butterworth of half the
//!   order. These are the definitions of scipy.signal's analog designs (ref. 4).
//! - Band-pass and band-stop: `order` is the low-pass prototype order and the result
//!   has twice as many poles; the edges are in the same sense as above, with centre
//!   ω0 = √(lo·hi) and bandwidth hi − lo. Each prototype pole or pair is mapped on its
//!   own by solving a quadratic; no polynomial is ever expanded.
//! - Gain: every section has unit gain at the band's reference point (DC for low-pass
//!   and band-stop, s → ∞ for high-pass, the centre for band-pass); the even-order
//!   Chebyshev passband offset −ripple_db is carried by the first section. The product
//!   therefore equals scipy's zpk, gain included.
//! - Each section's `natural_hz` is the natural frequency of its own poles.
//! - Linkwitz-Riley outputs have positive gain in their passbands; for orders 2, 6, 10
//!   and 14 the low-pass and high-pass sum flat only with one of them inverted (ref. 3).
//!
//! Not done here: the Nyquist check (the caller knows the rate) and discretization.
//!
//! # References
//! 1. A. B. Williams, F. J. Taylor, "Electronic Filter Design Handbook", McGraw-Hill:
//!    normalized Butterworth, Chebyshev and Bessel prototypes, frequency transforms.
//! 2. W. E. Thomson, "Delay networks having maximally flat frequency characteristics",
//!    Proc. IEE 96(3), 1949: the Bessel (maximally flat delay) polynomials.
//! 3. S. H. Linkwitz, "Active crossover networks for noncoincident drivers", JAES
//!    24(1), 1976.
//! 4. scipy.signal `butter`, `bessel`, `cheby1`, `cheby2` with `analog=True`
//!    (the reference vectors in tests/reference/families.json).
//! 5. T. J. Dekker, "A floating-point technique for extending the available
//!    precision", Numerische Mathematik 18, 1971 (double-double arithmetic, used to
//!    polish the Bessel roots).

mod bessel;
mod butterworth;
mod chebyshev;
mod inverse_chebyshev;
mod linkwitz_riley;
mod transform;

use crate::analog::validate;
use crate::analog::AnalogSection;
use crate::error::{Error, Result};
use num_complex::Complex64;
use serde::Serialize;
use std::fmt;

pub use bessel::BesselNorm;

/// Highest low-pass prototype order accepted (a band-pass of this order has twice as
/// many poles).
pub const MAX_ORDER: usize = 16;

/// A classic filter family and its parameter.
#[derive(Debug, Clone, Copy, PartialEq, Serialize)]
pub enum Family {
    /// Maximally flat magnitude; `freq` is the −3 dB point.
    Butterworth,
    /// Maximally flat group delay, magnitude-normalised: `freq` is the −3 dB point.
    Bessel,
    /// Equiripple passband of `ripple_db` peak to peak; `freq` is the ripple band edge.
    Chebyshev {
        /// Passband ripple in dB, above 0.
        ripple_db: f64,
    },
    /// Flat passband, equiripple stopband at least `stop_db` down from `freq` on.
    InverseChebyshev {
        /// Minimum stopband attenuation in dB, above 0.
        stop_db: f64,
    },
    /// Squared Butterworth of half the order; −6.02 dB at `freq`; even orders.
    LinkwitzRiley,
}

/// Which band a family passes, with its edge frequencies in Hz.
#[derive(Debug, Clone, Copy, PartialEq, Serialize)]
pub enum Band {
    /// Passes below `hz`.
    Lowpass {
        /// Edge frequency, Hz.
        hz: f64,
    },
    /// Passes above `hz`.
    Highpass {
        /// Edge frequency, Hz.
        hz: f64,
    },
    /// Passes between the edges.
    Bandpass {
        /// Lower edge, Hz.
        lo_hz: f64,
        /// Upper edge, Hz.
        hi_hz: f64,
    },
    /// Rejects between the edges.
    Bandstop {
        /// Lower edge, Hz.
        lo_hz: f64,
        /// Upper edge, Hz.
        hi_hz: f64,
    },
}

impl fmt::Display for Band {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        match *self {
            Band::Lowpass { hz } => write!(f, "lowpass at {hz} Hz"),
            Band::Highpass { hz } => write!(f, "highpass at {hz} Hz"),
            Band::Bandpass { lo_hz, hi_hz } => write!(f, "bandpass {lo_hz} Hz to {hi_hz} Hz"),
            Band::Bandstop { lo_hz, hi_hz } => write!(f, "bandstop {lo_hz} Hz to {hi_hz} Hz"),
        }
    }
}

impl Band {
    fn validate(&self) -> Result<()> {
        match *self {
            Band::Lowpass { hz } | Band::Highpass { hz } => validate::positive("freq", hz, " Hz"),
            Band::Bandpass { lo_hz, hi_hz } | Band::Bandstop { lo_hz, hi_hz } => {
                validate::positive("lower band edge", lo_hz, " Hz")?;
                validate::positive("upper band edge", hi_hz, " Hz")?;
                if lo_hz < hi_hz {
                    Ok(())
                } else {
                    Err(Error::input(format!(
                        "band edges must satisfy lo < hi, got lo = {lo_hz} Hz, hi = {hi_hz} Hz"
                    )))
                }
            }
        }
    }
}

/// The real factors of a classic filter: `family` in `band`, prototype order `order`.
///
/// # Errors
/// `order` outside 1..=[`MAX_ORDER`]; a frequency that is not positive and finite;
/// band edges with lo ≥ hi; `ripple_db` or `stop_db` not positive and finite; a
/// Linkwitz-Riley order that is odd or a Linkwitz-Riley band-pass or band-stop; values
/// so extreme that the coefficients leave the f64 range.
///
/// ```
/// use tonewright::analog::families::{prototype, Band, Family};
/// // 4th-order Butterworth low-pass at 1 kHz: −3.0103 dB at the corner.
/// let h = prototype(Family::Butterworth, Band::Lowpass { hz: 1000.0 }, 4).unwrap();
/// let w = num_complex::Complex64::new(0.0, 2.0 * std::f64::consts::PI * 1000.0);
/// let db = 20.0 * h.iter().map(|s| s.eval(w)).product::<num_complex::Complex64>().norm().log10();
/// assert!((db + 3.0103).abs() < 1e-4);
/// ```
pub fn prototype(family: Family, band: Band, order: usize) -> Result<Vec<AnalogSection>> {
    design(band, order, || match family {
        Family::Butterworth => Ok(butterworth::prototype(order)),
        Family::Bessel => bessel::prototype(order, BesselNorm::Magnitude),
        Family::Chebyshev { ripple_db } => chebyshev::prototype(order, ripple_db),
        Family::InverseChebyshev { stop_db } => inverse_chebyshev::prototype(order, stop_db),
        Family::LinkwitzRiley => linkwitz_riley::prototype(order, band),
    })
}

/// The real factors of a Bessel filter with the chosen normalisation of `band`'s
/// frequencies (see [`BesselNorm`]).
///
/// # Errors
/// As [`prototype`]; also a failure of the root finder (not seen for orders up to
/// [`MAX_ORDER`]).
///
/// ```
/// use tonewright::analog::families::{bessel, Band, BesselNorm};
/// // Delay-normalised 3rd-order Bessel at 1/(2π) Hz: group delay 1 s at DC, so the
/// // phase slope near DC is −1 rad per rad/s.
/// let hz = 1.0 / (2.0 * std::f64::consts::PI);
/// let h = bessel(BesselNorm::Delay, Band::Lowpass { hz }, 3).unwrap();
/// let w = num_complex::Complex64::new(0.0, 1e-4);
/// let phase: f64 = h.iter().map(|s| s.eval(w).arg()).sum();
/// assert!((phase / 1e-4 + 1.0).abs() < 1e-6);
/// ```
pub fn bessel(norm: BesselNorm, band: Band, order: usize) -> Result<Vec<AnalogSection>> {
    design(band, order, || bessel::prototype(order, norm))
}

/// Validates the order and band, builds the normalised prototype, maps it to `band`.
fn design(
    band: Band,
    order: usize,
    make: impl FnOnce() -> Result<Prototype>,
) -> Result<Vec<AnalogSection>> {
    if !(1..=MAX_ORDER).contains(&order) {
        return Err(Error::input(format!("order {order} must be between 1 and {MAX_ORDER}")));
    }
    band.validate()?;
    let proto = make()?;
    let sections = transform::to_band(&proto, band);
    validate::representable(&sections, &format!("order {order} {band}"))?;
    Ok(sections)
}

/// One factor of a normalised low-pass prototype.
#[derive(Debug, Clone, Copy, PartialEq)]
enum Factor {
    /// One real pole (negative), no finite zero.
    Real(f64),
    /// The conjugate pole pair `pole`, `pole*` (`pole.im > 0`) with zeros at
    /// ±j·`notch` rad/s, or at infinity when `notch` is `None`.
    Pair { pole: Complex64, notch: Option<f64> },
}

/// A low-pass prototype normalised to 1 rad/s in its family's sense, kept factored.
#[derive(Debug, Clone, PartialEq)]
struct Prototype {
    factors: Vec<Factor>,
    /// |H(0)|: 1, or the even-order Chebyshev passband offset.
    dc_gain: f64,
}

/// The `n` poles −a·sin θk + j·b·cos θk, θk = (2k − 1)π/(2n), on the ellipse with
/// semi-axes a (real) and b (imaginary): the Butterworth circle for a = b = 1, the
/// Chebyshev ellipse for a = sinh μ, b = cosh μ (ref. 1). Pairs come first, in
/// decreasing Q, then the real pole of an odd order.
fn ellipse_poles(n: usize, a: f64, b: f64) -> Vec<Factor> {
    let theta = |k: usize| (2 * k - 1) as f64 * std::f64::consts::PI / (2 * n) as f64;
    let mut factors: Vec<Factor> = (1..=n / 2)
        .map(|k| Factor::Pair {
            pole: Complex64::new(-a * theta(k).sin(), b * theta(k).cos()),
            notch: None,
        })
        .collect();
    if n % 2 == 1 {
        factors.push(Factor::Real(-a));
    }
    factors
}
