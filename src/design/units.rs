//! Engineering-notation quantities: `22k`, `4.7n`, `100u`, `1M`, `10m`, `2.2p`,
//! `2.2e-9`, with an optional unit (`22kΩ`, `4.7nF`, `100mH`, `1kHz`).
//!
//! Prefixes are case-sensitive: `M` is mega, `m` is milli; `u` and `µ` are micro. Only
//! the unit of the quantity being read is accepted (a capacitance may end in `F`, not
//! `H`). The result is a plain SI number; whether it must be positive is the caller's
//! rule.

/// What a value measures, and so which unit symbols it may carry.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Quantity {
    /// Ohms: `Ω`, `ohm`, `ohms` or none.
    Resistance,
    /// Farads: `F` or none.
    Capacitance,
    /// Henries: `H` or none.
    Inductance,
    /// Hertz: `Hz` or none.
    Frequency,
    /// A plain number (Q, gain, weights, dB): no unit, but prefixes are allowed.
    Plain,
}

impl Quantity {
    fn units(self) -> &'static [&'static str] {
        match self {
            Quantity::Resistance => &["ohms", "ohm", "Ω"],
            Quantity::Capacitance => &["F"],
            Quantity::Inductance => &["H"],
            Quantity::Frequency => &["Hz"],
            Quantity::Plain => &[],
        }
    }

    /// The unit written after a value in messages.
    pub fn symbol(self) -> &'static str {
        match self {
            Quantity::Resistance => " Ω",
            Quantity::Capacitance => " F",
            Quantity::Inductance => " H",
            Quantity::Frequency => " Hz",
            Quantity::Plain => "",
        }
    }
}

/// Parses a value in engineering notation as a finite SI number.
///
/// # Errors
/// A message (without place) saying what was expected, for any other text.
///
/// ```
/// use tonewright::design::units::{parse_quantity, Quantity};
/// assert_eq!(parse_quantity("4.7nF", Quantity::Capacitance).unwrap(), 4.7e-9);
/// assert_eq!(parse_quantity("1M", Quantity::Resistance).unwrap(), 1e6);
/// assert!(parse_quantity("4.7nH", Quantity::Capacitance).is_err());
/// ```
pub fn parse_quantity(text: &str, quantity: Quantity) -> Result<f64, String> {
    let trimmed = text.trim();
    let bare = quantity
        .units()
        .iter()
        .find_map(|u| trimmed.strip_suffix(u))
        .map(str::trim_end)
        .unwrap_or(trimmed);
    let (number, exponent) = split_prefix(bare);
    let expected = || {
        let units = quantity.units();
        let unit_hint = if units.is_empty() {
            String::new()
        } else {
            format!(" with an optional unit {}", units.join(" or "))
        };
        format!(
            "`{text}` is not a number in engineering notation (like 22k, 4.7n, 2.2e-9){unit_hint}"
        )
    };
    if number.is_empty() || number.starts_with('+') && number.len() == 1 {
        return Err(expected());
    }
    // Writing the prefix as a decimal exponent keeps values like 4.7n correctly rounded
    // (4.7 × 1e-9 in floating point is one ulp off 4.7e-9).
    let value: f64 = if exponent == 0 || number.contains(['e', 'E']) {
        let v: f64 = number.parse().map_err(|_| expected())?;
        v * 10f64.powi(exponent)
    } else {
        if number.parse::<f64>().is_err() {
            return Err(expected());
        }
        format!("{number}e{exponent}").parse().map_err(|_| expected())?
    };
    if value.is_finite() {
        Ok(value)
    } else {
        Err(format!("`{text}` is not a finite number"))
    }
}

/// Splits a trailing SI prefix letter off a number, returning its decimal exponent.
fn split_prefix(text: &str) -> (&str, i32) {
    const PREFIXES: [(&str, i32); 10] = [
        ("f", -15),
        ("p", -12),
        ("n", -9),
        ("u", -6),
        ("µ", -6),
        ("m", -3),
        ("k", 3),
        ("M", 6),
        ("G", 9),
        ("T", 12),
    ];
    for (prefix, exponent) in PREFIXES {
        if let Some(number) = text.strip_suffix(prefix) {
            // "1e3" style exponents never end in a letter, so a letter is a prefix.
            return (number, exponent);
        }
    }
    (text, 0)
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn engineering_prefixes_and_units() {
        let cases = [
            ("22k", Quantity::Resistance, 22e3),
            ("22kΩ", Quantity::Resistance, 22e3),
            ("4.7n", Quantity::Capacitance, 4.7e-9),
            ("100u", Quantity::Capacitance, 100e-6),
            ("100µF", Quantity::Capacitance, 100e-6),
            ("1M", Quantity::Resistance, 1e6),
            ("10m", Quantity::Inductance, 10e-3),
            ("100mH", Quantity::Inductance, 100e-3),
            ("2.2p", Quantity::Capacitance, 2.2e-12),
            ("2.2e-9", Quantity::Capacitance, 2.2e-9),
            ("1kHz", Quantity::Frequency, 1e3),
            ("50 Hz", Quantity::Frequency, 50.0),
            ("-6", Quantity::Plain, -6.0),
        ];
        for (text, q, want) in cases {
            let got = parse_quantity(text, q).unwrap();
            assert_eq!(got, want, "{text}");
        }
    }

    #[test]
    fn wrong_unit_or_garbage_is_refused() {
        for (text, q) in [
            ("4.7nH", Quantity::Capacitance),
            ("abc", Quantity::Resistance),
            ("k", Quantity::Resistance),
            ("", Quantity::Frequency),
            ("1e999", Quantity::Plain),
            ("1kF", Quantity::Resistance),
        ] {
            assert!(parse_quantity(text, q).is_err(), "{text} accepted");
        }
    }
}
