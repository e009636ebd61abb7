//! Checks on user-supplied numbers shared by the parametric stages and the families.
//!
//! Each check returns [`Error::input`] with a lowercase message that names the
//! parameter, the constraint and the value; the caller adds the place (stage, line).

use crate::analog::AnalogSection;
use crate::error::{Error, Result};

/// `value` must be finite and above 0; `name` and `unit` appear in the message.
pub(crate) fn positive(name: &str, value: f64, unit: &str) -> Result<()> {
    if value.is_finite() && value > 0.0 {
        Ok(())
    } else {
        Err(Error::input(format!("{name} {value}{unit} must be positive and finite")))
    }
}

/// `value` must be finite.
pub(crate) fn finite(name: &str, value: f64, unit: &str) -> Result<()> {
    if value.is_finite() {
        Ok(())
    } else {
        Err(Error::input(format!("{name} {value}{unit} must be finite")))
    }
}

/// Every coefficient finite and the denominator a stable polynomial (all coefficients
/// up to its order of one sign, here positive): parameters at the edge of the f64
/// range can overflow or put poles on the jω axis without any single one being
/// invalid on its own. `what` describes the request in the message.
pub(crate) fn representable(sections: &[AnalogSection], what: &str) -> Result<()> {
    let ok = sections.iter().all(|s| {
        let n = s.order();
        s.num.iter().chain(&s.den).all(|c| c.is_finite())
            && s.natural_hz.is_finite()
            && n > 0
            && s.den[..=n].iter().all(|&c| c > 0.0)
    });
    if ok {
        Ok(())
    } else {
        Err(Error::input(format!(
            "{what} cannot be represented: coefficients leave the f64 range or poles reach \
             the jω axis"
        )))
    }
}
