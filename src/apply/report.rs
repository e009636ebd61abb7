//! What one `apply` run measured.

use crate::audio::metrics::ChannelLevels;
use serde::Serialize;
use std::fmt::Write;

/// The measured rejection at a band-reject design's stop frequency.
#[derive(Debug, Clone, Copy, PartialEq, Serialize)]
pub struct Rejection {
    /// Stop frequency, Hz.
    pub hz: f64,
    /// Predicted by the realized coefficients, dB (None: an exact zero).
    pub predicted_db: Option<f64>,
    /// Input tone level minus output tone level (Goertzel, channel 1), dB.
    pub measured_db: f64,
}

/// Everything one file's run measured.
#[derive(Debug, Clone, Serialize)]
pub struct FileReport {
    /// Input file.
    pub input: String,
    /// Output file.
    pub output: String,
    /// The file's sample rate, Hz.
    pub file_rate: u32,
    /// The rate the design was discretized at, Hz.
    pub design_rate: f64,
    /// Number format and structure the output was computed in.
    pub target: String,
    /// Frames processed.
    pub frames: u64,
    /// Per channel, the input's levels.
    pub input_levels: Vec<ChannelLevels>,
    /// Per channel, the output's levels (before narrowing to the output word).
    pub output_levels: Vec<ChannelLevels>,
    /// Samples clipped when writing the output.
    pub clipped: u64,
    /// Internal overflow events of the fixed-point kernel.
    pub overflows: u64,
    /// SNR of the output against the f64 run (when compared), dB.
    pub snr_vs_float_db: Option<f64>,
    /// Rejection at the stop frequency of band-reject designs.
    pub rejection: Option<Rejection>,
    /// Wall-clock seconds.
    pub seconds: f64,
    /// Audio duration over wall-clock time.
    pub realtime_factor: f64,
    /// Doubtful findings.
    pub warnings: Vec<String>,
}

impl FileReport {
    /// The report as text.
    pub fn to_text(&self) -> String {
        let mut t = String::new();
        let _ = writeln!(t, "{} -> {}", self.input, self.output);
        let _ = writeln!(
            t,
            "  {} frames at {} Hz, design at {} Hz, {}",
            self.frames, self.file_rate, self.design_rate, self.target
        );
        for (i, (a, b)) in self.input_levels.iter().zip(&self.output_levels).enumerate() {
            let _ = writeln!(
                t,
                "  channel {}: in peak {:.2} dBFS rms {:.2} dBFS; out peak {:.2} dBFS rms {:.2} dBFS",
                i + 1,
                a.peak_dbfs,
                a.rms_dbfs,
                b.peak_dbfs,
                b.rms_dbfs
            );
        }
        let _ = writeln!(
            t,
            "  clipped samples: {}, internal overflows: {}",
            self.clipped, self.overflows
        );
        if let Some(snr) = self.snr_vs_float_db {
            let _ = writeln!(t, "  output vs f64: SNR {snr:.1} dB");
        }
        if let Some(r) = &self.rejection {
            let predicted = match r.predicted_db {
                Some(p) => format!("{p:.1} dB"),
                None => "unbounded (exact zero)".into(),
            };
            let _ = writeln!(
                t,
                "  rejection at {:.2} Hz: measured {:.1} dB, predicted {predicted}",
                r.hz, r.measured_db
            );
        }
        // Three significant digits down to 1x: a short file runs in a blink.
        let digits = if self.realtime_factor >= 100.0 {
            0
        } else if self.realtime_factor >= 10.0 {
            1
        } else {
            2
        };
        let _ =
            writeln!(t, "  {:.2} s, {:.digits$}x real time", self.seconds, self.realtime_factor);
        for w in &self.warnings {
            let _ = writeln!(t, "  warning: {w}");
        }
        t
    }
}
