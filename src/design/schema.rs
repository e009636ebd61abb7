//! The validated design: what the user wrote, with units parsed and every value
//! carrying its place in the file. Knobs are not resolved here (see `knobs`).

use crate::analog::families::{Band, Family};
use crate::analog::parametric::Shape;
use crate::discretize::Prewarp;
use crate::error::Error;
use std::collections::BTreeMap;

/// Where a value came from: `file:line` and `stage 3: freq`.
#[derive(Debug, Clone, PartialEq)]
pub struct Place {
    /// The design file as named on the command line.
    pub file: String,
    /// 1-based line.
    pub line: usize,
    /// Stage and key, e.g. `stage 3: freq`.
    pub label: String,
}

impl Place {
    /// An input error at this place: `file:line: label: message`.
    pub fn error(&self, message: impl std::fmt::Display) -> Error {
        Error::input(format!("{}:{}: {}: {message}", self.file, self.line, self.label))
    }
}

/// A whole design file.
#[derive(Debug, Clone, PartialEq)]
pub struct Design {
    /// Free text shown in reports.
    pub name: String,
    /// Free text shown in reports.
    pub notes: String,
    /// The file as named on the command line.
    pub file: String,
    /// A 64-bit FNV-1a hash of the file's bytes, in hex, for generated headers.
    pub hash: String,
    /// What the target does with numbers.
    pub target: Target,
    /// Controls the user turns, by name.
    pub knobs: BTreeMap<String, Knob>,
    /// Stages in signal order.
    pub stages: Vec<Stage>,
    /// Named parallel paths for `sum` stages.
    pub paths: BTreeMap<String, Vec<Stage>>,
}

/// The `[target]` table.
#[derive(Debug, Clone, PartialEq)]
pub struct Target {
    /// Sample rate in Hz, if the design pins one.
    pub rate: Option<f64>,
    /// Where the bilinear transform matches frequencies.
    pub prewarp: Prewarp,
    /// Section gain scaling.
    pub scaling: Scaling,
    /// Number format of the target.
    pub number: crate::quantize::NumberFormat,
    /// Filter structure of the kernels.
    pub structure: crate::quantize::Structure,
    /// Place of `[target]` for messages about the rate.
    pub place: Place,
}

/// Gain scaling of the cascade's sections (Jackson 1970).
#[derive(Debug, Clone, Copy, PartialEq, Eq, serde::Serialize)]
#[serde(rename_all = "lowercase")]
pub enum Scaling {
    /// All gain in the first section.
    None,
    /// Peak gain to every section output at most 1.
    Linf,
    /// Energy gain to every section output 1.
    L2,
    /// Absolute sum of the impulse response to every section output 1 (no overflow).
    L1,
}

/// A `[knob.NAME]` table.
#[derive(Debug, Clone, PartialEq)]
pub struct Knob {
    /// Position 0..1 used when none is given.
    pub at: f64,
    /// Entries in an exported sweep table.
    pub steps: usize,
    /// Where the knob is defined.
    pub place: Place,
}

/// How a knob's travel maps to a parameter or a pot's resistance.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Taper {
    /// Proportional to travel.
    Linear,
    /// Parameters: geometric between the ends; pots: 10 % of the track at mid travel.
    Log,
    /// Pots only: the mirror of `Log` (90 % of the track at mid travel).
    Antilog,
}

/// A numeric parameter, fixed or following a knob.
#[derive(Debug, Clone, PartialEq)]
pub struct Param {
    /// The value or its knob binding.
    pub value: ParamValue,
    /// Where it was written.
    pub place: Place,
}

/// The two ways to give a parameter.
#[derive(Debug, Clone, PartialEq)]
pub enum ParamValue {
    /// A number.
    Fixed(f64),
    /// `{ knob = "tone", from = 200, to = 2000, taper = "log" }`.
    Knob {
        /// Knob name.
        knob: String,
        /// Value at position 0.
        from: f64,
        /// Value at position 1.
        to: f64,
        /// Linear or log (geometric).
        taper: Taper,
    },
}

/// One `[[stage]]` (or one stage of a path).
#[derive(Debug, Clone, PartialEq)]
pub struct Stage {
    /// The stage's own table: `stage 2` or `path.low 1`.
    pub place: Place,
    /// What the stage is.
    pub kind: StageKind,
}

/// The stage kinds of design-file.md.
// A design holds a handful of stages built once, so the size spread between variants
// costs nothing worth the indirection of boxing.
#[allow(clippy::large_enum_variant)]
#[derive(Debug, Clone, PartialEq)]
pub enum StageKind {
    /// A linear circuit solved exactly.
    Circuit {
        /// Input node.
        input: String,
        /// Output node.
        output: String,
        /// The parts.
        parts: Vec<PartSpec>,
    },
    /// A first- or second-order textbook shape.
    Parametric {
        /// Which shape.
        shape: Shape,
        /// 1 or 2.
        order: usize,
        /// Corner or centre frequency, Hz.
        freq: Param,
        /// Quality factor (order 2).
        q: Param,
        /// Gain in dB (peak and shelves).
        gain_db: Option<Param>,
    },
    /// A classic filter family.
    Prototype {
        /// The family and its ripple or stopband depth.
        family: Family,
        /// The band and its edges.
        band: Band,
        /// Low-pass prototype order.
        order: usize,
        /// Every edge frequency with its place, for the Nyquist check.
        edges: Vec<(f64, Place)>,
    },
    /// An H(s) the user already has.
    Transfer(Transfer),
    /// Paths in parallel, summed.
    Sum {
        /// Path names.
        paths: Vec<String>,
        /// One weight per path.
        weights: Vec<Param>,
    },
    /// A constant gain.
    Gain {
        /// Gain in dB.
        db: Param,
    },
}

/// The two ways to write a `transfer` stage.
#[derive(Debug, Clone, PartialEq)]
pub enum Transfer {
    /// Coefficients in descending powers of s.
    Coefficients {
        /// Numerator.
        num: Vec<f64>,
        /// Denominator.
        den: Vec<f64>,
    },
    /// Roots and gain, s in rad/s.
    Roots {
        /// Zeros.
        zeros: Vec<num_complex::Complex64>,
        /// Poles.
        poles: Vec<num_complex::Complex64>,
        /// Gain.
        gain: f64,
    },
}

/// One entry of a circuit's `parts`.
#[derive(Debug, Clone, PartialEq)]
pub struct PartSpec {
    /// Where the part was written (`stage 1: parts[3]`).
    pub place: Place,
    /// What it is.
    pub element: PartElement,
}

/// The part kinds of a circuit.
#[derive(Debug, Clone, PartialEq)]
pub enum PartElement {
    /// Resistor, ohms, between two nodes.
    Resistor(f64, [String; 2]),
    /// Capacitor, farads.
    Capacitor(f64, [String; 2]),
    /// Inductor, henries.
    Inductor(f64, [String; 2]),
    /// Potentiometer: total ohms, [end A, wiper, end B], taper, knob name.
    Pot {
        /// Total track resistance.
        ohms: f64,
        /// End A, wiper, end B.
        nodes: [String; 3],
        /// Track taper.
        taper: Taper,
        /// The knob that turns it.
        knob: String,
    },
    /// Ideal op-amp: [plus, minus, out].
    OpAmp(String, [String; 3]),
    /// Ideal voltage amplifier y = gain·x: [x, y].
    Amp(f64, [String; 2]),
}
