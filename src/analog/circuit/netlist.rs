//! The circuit a caller hands in, and the checks each part must pass on its own.

/// A linear circuit with one input node driven from gnd and one output node.
///
/// Node names are free text; `"gnd"` is the ground node. The input is driven by an
/// ideal voltage source from gnd and the output is read with no load.
#[derive(Debug, Clone, PartialEq)]
pub struct Netlist {
    /// The parts, in the order the user wrote them.
    pub parts: Vec<Part>,
    /// The node the ideal source drives.
    pub input: String,
    /// The node whose voltage is the output.
    pub output: String,
}

/// One part of a [`Netlist`] with the label errors use to name it.
#[derive(Debug, Clone, PartialEq)]
pub struct Part {
    /// Where the part came from, e.g. `stage 2: parts[3] (r)`.
    pub label: String,
    /// What the part is and where it connects.
    pub element: Element,
}

/// The kinds of part a circuit may contain; all are ideal and linear.
#[derive(Debug, Clone, PartialEq)]
pub enum Element {
    /// A resistor; `ohms == 0.0` is a wire (a pot at an end stop produces one).
    Resistor {
        /// Resistance in ohms, finite and ≥ 0.
        ohms: f64,
        /// One end.
        a: String,
        /// The other end.
        b: String,
    },
    /// A capacitor.
    Capacitor {
        /// Capacitance in farads, finite and > 0.
        farads: f64,
        /// One end.
        a: String,
        /// The other end.
        b: String,
    },
    /// An inductor.
    Inductor {
        /// Inductance in henries, finite and > 0.
        henries: f64,
        /// One end.
        a: String,
        /// The other end.
        b: String,
    },
    /// An ideal op-amp: v(plus) = v(minus), no input current, output driven.
    OpAmp {
        /// Non-inverting input.
        plus: String,
        /// Inverting input.
        minus: String,
        /// Output.
        out: String,
    },
    /// An ideal voltage amplifier: v(output) = gain · v(input), both to gnd, no input
    /// current.
    Amp {
        /// Voltage gain, finite, any sign.
        gain: f64,
        /// The node sensed.
        input: String,
        /// The node driven.
        output: String,
    },
}

/// The name of the ground node.
pub const GND: &str = "gnd";

impl Element {
    /// The node names this element touches, in its own terminal order.
    pub fn nodes(&self) -> Vec<&str> {
        match self {
            Element::Resistor { a, b, .. }
            | Element::Capacitor { a, b, .. }
            | Element::Inductor { a, b, .. } => vec![a, b],
            Element::OpAmp { plus, minus, out } => vec![plus, minus, out],
            Element::Amp { input, output, .. } => vec![input, output],
        }
    }
}

impl Part {
    /// Checks the part's value and node names on their own.
    pub(crate) fn check(&self) -> crate::Result<()> {
        let label = &self.label;
        if self.element.nodes().iter().any(|n| n.trim().is_empty()) {
            return Err(crate::Error::input(format!("{label}: node name must not be empty")));
        }
        let bad = |what: &str, value: f64, unit: &str| {
            Err(crate::Error::input(format!("{label}: {what}, got {value} {unit}")))
        };
        match self.element {
            Element::Resistor { ohms, .. } if !(ohms.is_finite() && ohms >= 0.0) => {
                bad("resistance must be finite and positive (or 0 for a wire)", ohms, "ohm")
            }
            Element::Capacitor { farads, .. } if !(farads.is_finite() && farads > 0.0) => {
                bad("capacitance must be finite and positive", farads, "F")
            }
            Element::Inductor { henries, .. } if !(henries.is_finite() && henries > 0.0) => {
                bad("inductance must be finite and positive", henries, "H")
            }
            Element::Amp { gain, .. } if !gain.is_finite() => bad("gain must be finite", gain, ""),
            _ => Ok(()),
        }
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    fn part(element: Element) -> Part {
        Part { label: "parts[7] (c)".into(), element }
    }

    #[test]
    fn negative_capacitance_is_refused_with_label_and_value() {
        let p = part(Element::Capacitor { farads: -1e-9, a: "a".into(), b: GND.into() });
        let msg = p.check().unwrap_err().to_string();
        assert!(msg.starts_with("parts[7] (c): capacitance"), "{msg}");
        assert!(msg.contains("-0.000000001"), "{msg}");
    }

    #[test]
    fn zero_ohms_is_a_wire_not_an_error() {
        let p = part(Element::Resistor { ohms: 0.0, a: "a".into(), b: "b".into() });
        assert!(p.check().is_ok());
    }

    #[test]
    fn blank_node_name_is_refused() {
        let p = part(Element::OpAmp { plus: "p".into(), minus: " ".into(), out: "o".into() });
        assert!(p.check().unwrap_err().to_string().contains("node name must not be empty"));
    }
}
