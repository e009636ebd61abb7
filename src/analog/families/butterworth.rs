//! Butterworth prototype: poles evenly spaced on the unit circle, −3 dB at 1 rad/s.

use super::{ellipse_poles, Prototype};

/// The order-`n` Butterworth low-pass prototype (maximally flat, unit gain at DC).
pub(super) fn prototype(n: usize) -> Prototype {
    Prototype { factors: ellipse_poles(n, 1.0, 1.0), dc_gain: 1.0 }
}
