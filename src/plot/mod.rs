//! SVG figures from plain data: frequency responses and pole/zero maps.
//!
//! In: a [`FrequencyFigure`] (curves of `(Hz, value)` points on a log frequency axis,
//! vertical markers at stage frequencies) or a [`ZPlaneFigure`] (sets of poles and
//! zeros in z). Out: the SVG text ([`frequency_svg`], [`zplane_svg`]) and a file
//! written whole or not at all ([`write_svg`]). No analysis happens here: the caller
//! computes the responses and roots and chooses the title (design name, rate, number
//! format).
//!
//! Conventions:
//! - Each curve is ONE `<path class="curve" data-label="…" data-style="…">`; points
//!   that are not finite (or `x <= 0` on the log axis) leave a gap, started again with
//!   an `M` command, so no `NaN` ever reaches the file. Segments leaving the plot are
//!   clipped exactly (reference 2); points inside are written unchanged.
//! - Every plot group (`<g class="plot">`, `<g class="panel">`) carries `data-x-map`
//!   and `data-y-map` attributes, the [`AxisMap`] of each axis, so a reader turns path
//!   vertices back into data with [`AxisMap::parse`] and [`AxisMap::px_to_data`].
//! - Coordinates are written with two decimals (0.01 px) and every number with a fixed
//!   format, so equal inputs give equal bytes. Text uses the generic `sans-serif`
//!   family: no font is embedded or fetched.
//! - Curves are drawn in the order given, so put the analog reference first: its style
//!   is a wide pale band that the digital curves sit on.
//!
//! Why a hand-written writer rather than a plotting crate: a curve must be one path
//! with a class and a data label, a gap must not split it into several elements, the
//! mapping must be exposed as attributes, and sub-pixel coordinates keep steep
//! responses smooth at 1600 × 960. A general plotting crate's SVG backend writes
//! integer pixels and anonymous polylines, so those needs meant rewriting its output;
//! the writer here is about 200 lines with nothing to post-process.
//!
//! Not here: raster output, interactive figures, text measurement (long labels are not
//! wrapped; legends assume labels of up to about 30 characters).
//!
//! # References
//! 1. W3C, "Scalable Vector Graphics (SVG) 1.1 (Second Edition)", 2011: path data
//!    (section 8.3), `clipPath` (14.3), text and `text-anchor` (10.9).
//! 2. Y.-D. Liang, B. A. Barsky, "A New Concept and Method for Line Clipping", ACM
//!    Transactions on Graphics 3(1), 1984, pp. 1-25.

mod axis;
pub mod design;
mod frequency;
mod style;
mod svg;
mod zplane;

pub use axis::AxisMap;
pub use frequency::frequency_svg;
pub use zplane::zplane_svg;

use crate::atomic_file::AtomicFile;
use crate::error::{Error, Result};
use num_complex::Complex64;
use std::io::Write;
use std::path::Path;

/// What a curve shows, which chooses how it is drawn.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum CurveStyle {
    /// The exact analog response: a wide pale band under the other curves.
    Analog,
    /// The float64 digital response: a solid dark line.
    Float,
    /// The quantized fixed-point response: a dashed warm line.
    Fixed,
    /// One section of the cascade (index from 0): thin dash-dot lines, colours cycling.
    Stage(usize),
    /// An error or difference curve: a dotted line.
    Error,
}

/// One curve of a frequency figure.
#[derive(Debug, Clone, PartialEq)]
pub struct Curve {
    /// Legend text, also written as the path's `data-label`.
    pub label: String,
    /// `(frequency in Hz, value in the figure's y unit)`, in drawing order.
    pub points: Vec<(f64, f64)>,
    /// How the curve is drawn.
    pub style: CurveStyle,
}

/// A dashed vertical line with a label, such as a stage's natural frequency.
#[derive(Debug, Clone, PartialEq)]
pub struct Marker {
    /// Frequency in Hz; markers outside the x range or not finite are not drawn.
    pub x: f64,
    /// Text written along the line.
    pub label: String,
}

/// A response against frequency on a log axis.
#[derive(Debug, Clone, PartialEq)]
pub struct FrequencyFigure {
    /// Title above the plot (design name, rate, number format).
    pub title: String,
    /// The y axis label with its unit: `magnitude (dB)`, `phase (degrees)`, `group delay (ms)`.
    pub y_label: String,
    /// Curves, drawn in this order.
    pub curves: Vec<Curve>,
    /// Vertical markers.
    pub markers: Vec<Marker>,
    /// Frequency range in Hz, both positive, lower first, at most 12 decades apart.
    pub x_range: (f64, f64),
    /// Value range; `None` fits the finite points inside `x_range`, widened to round ticks.
    pub y_range: Option<(f64, f64)>,
}

/// Whether a root set is the design's exact roots or those of the quantized coefficients.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum RootStyle {
    /// Roots of the float64 design: large dark marks.
    Ideal,
    /// Roots of the quantized coefficients: small bold red marks, visible on top.
    Quantized,
}

/// Poles and zeros in the z plane drawn in one style.
#[derive(Debug, Clone, PartialEq)]
pub struct RootSet {
    /// Legend text, also the group's `data-label`.
    pub label: String,
    /// Poles, drawn as crosses; non-finite values are skipped.
    pub poles: Vec<Complex64>,
    /// Zeros, drawn as circles; non-finite values are skipped.
    pub zeros: Vec<Complex64>,
    /// How the set is drawn.
    pub style: RootStyle,
}

/// A pole/zero map with the unit circle.
#[derive(Debug, Clone, PartialEq)]
pub struct ZPlaneFigure {
    /// Title above the panels.
    pub title: String,
    /// Root sets, drawn in this order (put quantized after ideal).
    pub sets: Vec<RootSet>,
    /// Adds a second panel zoomed on the roots near z = 1, where low-frequency poles
    /// of high-rate designs crowd together.
    pub zoom_near_one: bool,
}

/// Writes `svg` to `path` through [`AtomicFile`], refusing to overwrite any of `protect`.
///
/// # Errors
/// [`Error::Input`] when `path` is one of `protect`; [`Error::Io`] naming `path` when
/// it cannot be written.
pub fn write_svg(path: &Path, svg: &str, protect: &[&Path]) -> Result<()> {
    let mut file = AtomicFile::create(path, protect)?;
    file.write_all(svg.as_bytes()).map_err(|e| Error::io(path, e))?;
    file.commit()
}
