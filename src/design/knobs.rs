//! Knob positions and what they do to parameters and pots.
//!
//! A position runs from 0 to 1. A parameter follows its knob linearly or
//! geometrically (`log`: equal ratios per equal travel, the natural law for
//! frequencies). A pot's track splits into two resistors: end A to wiper and wiper to
//! end B; position 0 puts the wiper at end A. The audio ("log") taper used here is
//! the exponential law fraction(x) = (81^x − 1)/80, which puts 10 % of the track at
//! mid travel (common practice); `antilog` is its mirror, 1 − fraction(1 − x). Like a
//! real track, neither part ever reaches 0 Ω: each keeps at least [`END_RESISTANCE`] of
//! the total, so a wiper at an end stop still leaves the circuit connected (a volume pot
//! turned fully down gives a very small H, not a disconnected output).

use super::schema::{Design, Param, ParamValue, Place, Taper};
use crate::error::{Error, Result};
use std::collections::BTreeMap;

/// The position of every knob of a design.
#[derive(Debug, Clone, PartialEq, serde::Serialize)]
pub struct KnobPositions(pub BTreeMap<String, f64>);

impl KnobPositions {
    /// The design's own `at` positions, overridden by `NAME=POS` settings.
    ///
    /// # Errors
    /// An unknown knob name, a malformed setting, or a position outside 0..1.
    pub fn resolve(design: &Design, settings: &[String]) -> Result<Self> {
        let mut at: BTreeMap<String, f64> =
            design.knobs.iter().map(|(k, v)| (k.clone(), v.at)).collect();
        for setting in settings {
            let (name, pos) = setting.split_once('=').ok_or_else(|| {
                Error::input(format!("--knob {setting}: expected NAME=POSITION, like tone=0.8"))
            })?;
            let slot = at.get_mut(name.trim()).ok_or_else(|| {
                let known: Vec<&str> = design.knobs.keys().map(String::as_str).collect();
                Error::input(format!(
                    "--knob {setting}: {} has no knob `{name}` (knobs: {})",
                    design.file,
                    if known.is_empty() { "none".into() } else { known.join(", ") }
                ))
            })?;
            let value: f64 = pos
                .trim()
                .parse()
                .map_err(|_| Error::input(format!("--knob {setting}: `{pos}` is not a number")))?;
            if !(0.0..=1.0).contains(&value) {
                return Err(Error::input(format!(
                    "--knob {setting}: position {value} must be from 0 to 1"
                )));
            }
            *slot = value;
        }
        Ok(KnobPositions(at))
    }

    /// The position of a knob (0.5 for an unknown name; references are checked at load).
    pub fn get(&self, name: &str) -> f64 {
        self.0.get(name).copied().unwrap_or(0.5)
    }

    /// The value of a parameter at these positions.
    pub fn value(&self, param: &Param) -> f64 {
        match &param.value {
            ParamValue::Fixed(v) => *v,
            ParamValue::Knob { knob, from, to, taper } => {
                let x = self.get(knob);
                match taper {
                    Taper::Log => from * (to / from).powf(x),
                    Taper::Linear | Taper::Antilog => from + (to - from) * x,
                }
            }
        }
    }
}

/// The part of a pot's track that remains between the wiper and an end at the end
/// stop (common practice: real tracks keep a fraction of a percent; 1e-4 is on the
/// small side of that, so responses away from the stops are unchanged to 1e-4).
pub const END_RESISTANCE: f64 = 1e-4;

/// The two resistances of a pot of `ohms` at position `x`: end A to wiper and wiper to
/// end B, each at least [`END_RESISTANCE`] of the total.
pub fn pot_split(ohms: f64, taper: Taper, x: f64) -> (f64, f64) {
    let f = track_fraction(taper, x).clamp(END_RESISTANCE, 1.0 - END_RESISTANCE);
    (ohms * f, ohms * (1.0 - f))
}

/// The fraction of a pot's track between end A and the wiper at position `x`.
///
/// ```
/// use tonewright::design::{knobs::track_fraction, Taper};
/// assert!((track_fraction(Taper::Log, 0.5) - 0.1).abs() < 1e-15);
/// assert!((track_fraction(Taper::Antilog, 0.5) - 0.9).abs() < 1e-15);
/// ```
pub fn track_fraction(taper: Taper, x: f64) -> f64 {
    let audio = |x: f64| (81f64.powf(x) - 1.0) / 80.0;
    match taper {
        Taper::Linear => x,
        Taper::Log => audio(x),
        Taper::Antilog => 1.0 - audio(1.0 - x),
    }
}

/// A parameter's value, checked to be finite and positive (frequencies, Q).
///
/// # Errors
/// A non-positive value at the parameter's place.
pub fn positive(knobs: &KnobPositions, param: &Param, unit: &str) -> Result<f64> {
    let v = knobs.value(param);
    if v > 0.0 && v.is_finite() {
        Ok(v)
    } else {
        Err(param.place.error(format!("{v}{unit} must be positive")))
    }
}

/// A frequency parameter, checked to lie between 0 and rate/2.
///
/// # Errors
/// A frequency at or above Nyquist, or not positive.
pub fn below_nyquist(hz: f64, rate: f64, place: &Place) -> Result<f64> {
    if hz <= 0.0 || hz.is_nan() {
        return Err(place.error(format!("{hz} Hz must be positive")));
    }
    if hz >= rate / 2.0 {
        return Err(place.error(format!("{hz} Hz must be below rate/2 = {} Hz", rate / 2.0)));
    }
    Ok(hz)
}
