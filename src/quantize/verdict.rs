//! Verdicts: whether a quantized section fits its format, and what would help.

use serde::Serialize;

/// How well a quantized design fits its target.
#[derive(Debug, Clone, Copy, PartialEq, Eq, PartialOrd, Ord, Serialize)]
#[serde(rename_all = "snake_case")]
pub enum Verdict {
    /// Within every limit.
    Fits,
    /// Usable, with a warning.
    Marginal,
    /// Unstable, overflowing or audibly wrong.
    DoesNotFit,
}

/// Thresholds of the verdicts (common practice for audio filters, not from a source).
pub mod limits {
    /// Largest response deviation in the band that still fits, dB.
    pub const DEVIATION_FITS_DB: f64 = 0.1;
    /// Largest response deviation that is still marginal, dB.
    pub const DEVIATION_MARGINAL_DB: f64 = 1.0;
    /// A pole closer to the unit circle than this many coefficient steps is marginal.
    pub const MARGIN_STEPS: f64 = 4.0;
    /// A noise gain above this (12 dB, two bits) is marginal.
    pub const NOISE_GAIN_MARGINAL: f64 = 16.0;
    /// A section whose poles sit below rate × this is "low-frequency".
    pub const LOW_FREQUENCY_FRACTION: f64 = 0.01;
}

/// A verdict with the reasons and suggestions that led to it.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct Assessment {
    /// The worst verdict of any finding.
    pub verdict: Verdict,
    /// One line per finding that is not `Fits`, with a concrete suggestion.
    pub findings: Vec<String>,
}

impl Assessment {
    /// Nothing found yet.
    pub fn new() -> Self {
        Self { verdict: Verdict::Fits, findings: Vec::new() }
    }

    /// Records a finding of verdict `v` (ignored when `v` is `Fits`).
    pub fn add(&mut self, v: Verdict, finding: String) {
        if v > Verdict::Fits {
            self.verdict = self.verdict.max(v);
            self.findings.push(finding);
        }
    }
}

impl Default for Assessment {
    fn default() -> Self {
        Self::new()
    }
}
