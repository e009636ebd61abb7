//! The look of the figures: one palette, chosen here and nowhere else.

use super::svg::Stroke;
use super::{CurveStyle, RootStyle};

/// Page background around the plot.
pub(crate) const PAPER: &str = "#f7f5f0";
/// Plot area background.
pub(crate) const PLOT_BG: &str = "#ffffff";
/// Titles, labels, axes.
pub(crate) const INK: &str = "#2b2926";
/// Tick labels and secondary text.
pub(crate) const MUTED: &str = "#6b665d";
/// The frame around a plot area.
pub(crate) const FRAME: Stroke = Stroke { colour: "#5b5750", width: 1.5, dash: None };
/// Grid lines at labelled ticks.
pub(crate) const GRID_MAJOR: Stroke = Stroke { colour: "#dcd7cc", width: 1.2, dash: None };
/// Grid lines between labelled ticks.
pub(crate) const GRID_MINOR: Stroke = Stroke { colour: "#eeeae2", width: 1.0, dash: None };
/// The real and imaginary axes of a z-plane panel.
pub(crate) const ZERO_AXIS: Stroke = Stroke { colour: "#9c958a", width: 1.4, dash: None };
/// The unit circle.
pub(crate) const UNIT_CIRCLE: Stroke = Stroke { colour: "#2b2926", width: 1.8, dash: None };
/// Stage-frequency markers and the zoom box.
pub(crate) const MARKER: Stroke = Stroke { colour: "#8a8275", width: 1.3, dash: Some("6 6") };

/// Colours of successive stages: distinct hues of similar weight.
const STAGE_COLOURS: [&str; 6] = ["#3d6fb6", "#d08c1f", "#4f9a3a", "#b0417e", "#2e8c9a", "#7a6a4f"];

/// How a curve of `style` is stroked.
pub(crate) fn curve_stroke(style: CurveStyle) -> Stroke {
    match style {
        CurveStyle::Analog => Stroke { colour: "#aab6c4", width: 7.0, dash: None },
        CurveStyle::Float => Stroke { colour: "#1f6f5c", width: 2.4, dash: None },
        CurveStyle::Fixed => Stroke { colour: "#c2452d", width: 2.4, dash: Some("12 6") },
        CurveStyle::Stage(i) => Stroke {
            colour: STAGE_COLOURS[i % STAGE_COLOURS.len()],
            width: 1.6,
            dash: Some("8 3 2 3"),
        },
        CurveStyle::Error => Stroke { colour: "#6a3d9a", width: 2.0, dash: Some("3 5") },
    }
}

/// The `data-style` name of a curve style.
pub(crate) fn curve_style_name(style: CurveStyle) -> String {
    match style {
        CurveStyle::Analog => "analog".into(),
        CurveStyle::Float => "float".into(),
        CurveStyle::Fixed => "fixed".into(),
        CurveStyle::Stage(i) => format!("stage-{i}"),
        CurveStyle::Error => "error".into(),
    }
}

/// How the marks of a root set are drawn: stroke, cross half-size, circle radius.
pub(crate) fn root_marks(style: RootStyle) -> (Stroke, f64, f64) {
    match style {
        RootStyle::Ideal => (Stroke { colour: "#1d3a5f", width: 2.0, dash: None }, 10.0, 9.0),
        RootStyle::Quantized => (Stroke { colour: "#d1495b", width: 2.8, dash: None }, 6.0, 5.5),
    }
}

/// The `data-style` name of a root style.
pub(crate) fn root_style_name(style: RootStyle) -> &'static str {
    match style {
        RootStyle::Ideal => "ideal",
        RootStyle::Quantized => "quantized",
    }
}
