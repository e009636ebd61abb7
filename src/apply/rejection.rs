//! Where a band-reject design rejects most, and how much it should.

use crate::analysis::response::{log_grid, to_db};
use crate::sections::norms::golden_section_max;
use crate::sections::Cascade;
use serde::Serialize;

/// The deepest point of a band-reject response.
#[derive(Debug, Clone, Copy, PartialEq, Serialize)]
pub struct StopBand {
    /// Frequency of the deepest rejection, Hz.
    pub hz: f64,
    /// Predicted rejection there: the response's peak minus its value, dB (+∞ for an
    /// exact zero).
    pub predicted_db: f64,
}

/// Depth below the response's peak that makes a design band-reject for reporting.
pub const BAND_REJECT_DB: f64 = 10.0;

/// Periods of the stop frequency the metered part of a file must hold for the rejection
/// to be reported: a Hann window's main lobe spans ±2 bins of rate/length (Harris 1978),
/// so over 20 periods it stays within ±10 % of the stop frequency instead of taking in
/// the content around it.
pub const MIN_TONE_PERIODS: f64 = 20.0;

/// The deepest minimum of |H| strictly inside 20 Hz to 0.45·rate, when it lies at least
/// [`BAND_REJECT_DB`] below the response at both ends of that band (a dip, not a
/// low-pass or high-pass skirt).
pub fn stop_frequency(cascade: &Cascade) -> Option<StopBand> {
    let (lo, hi) = (20.0, 0.45 * cascade.rate);
    let db = |f: f64| to_db(cascade.response_at_hz(f));
    let grid = log_grid(lo, hi, 4000);
    let levels: Vec<f64> = grid.iter().map(|&f| db(f)).collect();
    let (i, &min) = levels.iter().enumerate().min_by(|a, b| a.1.total_cmp(b.1))?;
    let edges = levels[0].min(levels[levels.len() - 1]);
    if i == 0 || i + 1 == levels.len() || min > edges - BAND_REJECT_DB {
        return None;
    }
    // Refine the minimum between the neighbouring grid points.
    let hz = golden_section_max(|f| -db(f), (grid[i - 1], grid[i + 1]), 100);
    let peak = levels.iter().copied().fold(f64::NEG_INFINITY, f64::max);
    let depth = cascade.response_at_hz(hz).norm();
    let predicted_db = if depth < 1e-12 { f64::INFINITY } else { peak - db(hz) };
    Some(StopBand { hz, predicted_db })
}
