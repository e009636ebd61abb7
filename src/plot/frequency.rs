//! The frequency-response figure: log frequency axis, curves, markers, legend.

use super::axis::{linear_ticks, log_ticks, nice_range, AxisMap, MAX_DECADES};
use super::style::{self, curve_stroke, curve_style_name};
use super::svg::{polyline_data, px, Anchor, Rect, Svg};
use super::FrequencyFigure;
use crate::error::{Error, Result};
use crate::markup::escape;

const WIDTH: f64 = 1600.0;
const HEIGHT: f64 = 960.0;
/// The plot area; the right-hand column holds the legend.
const PLOT: Rect = Rect { left: 120.0, top: 88.0, right: 1250.0, bottom: 838.0 };
const LEGEND_X: f64 = 1280.0;
const LEGEND_ROW: f64 = 34.0;
/// Clipping margin: lines may run 2 px past the frame so their width is not cut.
const CLIP_MARGIN: f64 = 2.0;

/// Draws `fig` as an SVG document of 1600 × 960 px.
///
/// ```
/// use tonewright::plot::{frequency_svg, AxisMap, Curve, CurveStyle, FrequencyFigure};
/// let fig = FrequencyFigure {
///     title: "demo".into(),
///     y_label: "magnitude (dB)".into(),
///     curves: vec![Curve {
///         label: "float".into(),
///         points: vec![(100.0, -3.0), (1000.0, -20.0)],
///         style: CurveStyle::Float,
///     }],
///     markers: vec![],
///     x_range: (20.0, 20000.0),
///     y_range: Some((-40.0, 0.0)),
/// };
/// let svg = frequency_svg(&fig)?;
/// // The first vertex of the curve reads back as (100 Hz, -3 dB) within 0.01 px.
/// let map = |name: &str| {
///     let start = svg.find(name).unwrap() + name.len() + 2;
///     AxisMap::parse(&svg[start..start + svg[start..].find('"').unwrap()]).unwrap()
/// };
/// let d = &svg[svg.find(" d=\"M").unwrap() + 5..];
/// let mut words = d.split(|c| c == ' ' || c == 'L');
/// let x: f64 = words.next().unwrap().parse().unwrap();
/// let y: f64 = words.next().unwrap().parse().unwrap();
/// assert!((map("data-x-map").px_to_data(x) / 100.0 - 1.0).abs() < 1e-4);
/// assert!((map("data-y-map").px_to_data(y) + 3.0).abs() < 1e-3);
/// # Ok::<(), tonewright::Error>(())
/// ```
///
/// # Errors
/// [`Error::Input`] naming the figure when `x_range` is not positive and increasing or
/// spans more than 12 decades, or when `y_range` (given or fitted) is not finite and
/// increasing.
pub fn frequency_svg(fig: &FrequencyFigure) -> Result<String> {
    let (x_lo, x_hi) = fig.x_range;
    let bad = |what: String| Error::input(format!("figure \"{}\": {what}", fig.title));
    if !(x_lo.is_finite() && x_hi.is_finite() && x_lo > 0.0 && x_lo < x_hi) {
        return Err(bad(format!("x range ({x_lo}, {x_hi}) Hz must be positive and increasing")));
    }
    if (x_hi / x_lo).log10() > MAX_DECADES {
        return Err(bad(format!(
            "x range ({x_lo}, {x_hi}) Hz spans more than {MAX_DECADES} decades"
        )));
    }
    let (y_lo, y_hi) = match fig.y_range {
        Some(range) => range,
        None => fitted_y_range(fig),
    };
    if !(y_lo.is_finite() && y_hi.is_finite() && y_lo < y_hi && (y_hi - y_lo).is_finite()) {
        return Err(bad(format!("y range ({y_lo}, {y_hi}) must be finite and increasing")));
    }
    let x_map = AxisMap {
        data_min: x_lo,
        data_max: x_hi,
        px_from: PLOT.left,
        px_to: PLOT.right,
        log: true,
    };
    let y_map = AxisMap {
        data_min: y_lo,
        data_max: y_hi,
        px_from: PLOT.bottom,
        px_to: PLOT.top,
        log: false,
    };

    let mut svg = Svg::new(WIDTH, HEIGHT, &fig.title, style::PAPER);
    svg.text(PLOT.left, 52.0, Anchor::Start, 28.0, style::INK, "title", 0.0, &fig.title);
    svg.clip_path("plot-area", &PLOT.grown(CLIP_MARGIN));
    svg.raw(&format!(
        "<g class=\"plot\" data-x-map=\"{}\" data-y-map=\"{}\">\n\
         <rect class=\"plot-bg\" {} fill=\"{}\"/>\n",
        x_map.to_attribute(),
        y_map.to_attribute(),
        PLOT.attributes(),
        style::PLOT_BG
    ));
    grid_and_ticks(&mut svg, &x_map, &y_map);
    markers(&mut svg, fig, &x_map);
    svg.raw(
        "<g class=\"curves\" clip-path=\"url(#plot-area)\" stroke-linejoin=\"round\" \
         stroke-linecap=\"round\">\n",
    );
    for curve in &fig.curves {
        let points: Vec<Option<(f64, f64)>> = curve
            .points
            .iter()
            .map(|&(x, y)| Some((x_map.data_to_px(x), y_map.data_to_px(y))))
            .collect();
        svg.raw(&format!(
            "<path class=\"curve\" data-label=\"{}\" data-style=\"{}\" {} d=\"{}\"/>\n",
            escape(&curve.label),
            curve_style_name(curve.style),
            curve_stroke(curve.style).attributes(),
            polyline_data(&points, &PLOT.grown(CLIP_MARGIN))
        ));
    }
    svg.raw("</g>\n");
    svg.raw(&format!(
        "<rect class=\"frame\" {} {}/>\n</g>\n",
        PLOT.attributes(),
        style::FRAME.attributes()
    ));
    let mid_x = (PLOT.left + PLOT.right) / 2.0;
    let mid_y = (PLOT.top + PLOT.bottom) / 2.0;
    svg.text(
        mid_x,
        PLOT.bottom + 70.0,
        Anchor::Middle,
        22.0,
        style::INK,
        "axis-label",
        0.0,
        "frequency (Hz)",
    );
    svg.text(44.0, mid_y, Anchor::Middle, 22.0, style::INK, "axis-label", -90.0, &fig.y_label);
    legend(&mut svg, fig);
    Ok(svg.finish())
}

/// The range of the finite points inside the x range, widened to round ticks.
fn fitted_y_range(fig: &FrequencyFigure) -> (f64, f64) {
    let (x_lo, x_hi) = fig.x_range;
    let (lo, hi) = fig
        .curves
        .iter()
        .flat_map(|c| c.points.iter())
        .filter(|(x, y)| *x >= x_lo && *x <= x_hi && y.is_finite())
        .fold((f64::INFINITY, f64::NEG_INFINITY), |(lo, hi), (_, y)| (lo.min(*y), hi.max(*y)));
    if lo > hi {
        (-1.0, 1.0)
    } else if lo == hi {
        nice_range(lo - 1.0, hi + 1.0)
    } else {
        nice_range(lo, hi)
    }
}

fn grid_and_ticks(svg: &mut Svg, x_map: &AxisMap, y_map: &AxisMap) {
    svg.raw("<g class=\"grid\">\n");
    let x_ticks = log_ticks(x_map.data_min, x_map.data_max);
    let y_ticks = linear_ticks(y_map.data_min, y_map.data_max, 8.0);
    for tick in &x_ticks {
        let x = x_map.data_to_px(tick.value);
        let stroke = if tick.label.is_some() { style::GRID_MAJOR } else { style::GRID_MINOR };
        svg.line((x, PLOT.top), (x, PLOT.bottom), stroke);
    }
    for tick in &y_ticks {
        let y = y_map.data_to_px(tick.value);
        svg.line((PLOT.left, y), (PLOT.right, y), style::GRID_MAJOR);
    }
    svg.raw("</g>\n<g class=\"ticks\">\n");
    for tick in &x_ticks {
        if let Some(label) = &tick.label {
            let x = x_map.data_to_px(tick.value);
            svg.text(
                x,
                PLOT.bottom + 30.0,
                Anchor::Middle,
                18.0,
                style::MUTED,
                "tick-x",
                0.0,
                label,
            );
        }
    }
    for tick in &y_ticks {
        if let Some(label) = &tick.label {
            let y = y_map.data_to_px(tick.value) + 6.0;
            svg.text(PLOT.left - 12.0, y, Anchor::End, 18.0, style::MUTED, "tick-y", 0.0, label);
        }
    }
    svg.raw("</g>\n");
}

fn markers(svg: &mut Svg, fig: &FrequencyFigure, x_map: &AxisMap) {
    svg.raw("<g class=\"markers\">\n");
    for marker in &fig.markers {
        if !(marker.x >= x_map.data_min && marker.x <= x_map.data_max) {
            continue;
        }
        let x = x_map.data_to_px(marker.x);
        svg.raw(&format!(
            "<line class=\"marker\" data-label=\"{}\" x1=\"{}\" y1=\"{}\" x2=\"{}\" \
             y2=\"{}\" {}/>\n",
            escape(&marker.label),
            px(x),
            px(PLOT.top),
            px(x),
            px(PLOT.bottom),
            style::MARKER.attributes()
        ));
        // Written along the line, reading upwards, so close markers do not collide.
        svg.text(
            x - 6.0,
            PLOT.top + 12.0,
            Anchor::End,
            16.0,
            style::MUTED,
            "marker-label",
            -90.0,
            &marker.label,
        );
    }
    svg.raw("</g>\n");
}

fn legend(svg: &mut Svg, fig: &FrequencyFigure) {
    svg.raw("<g class=\"legend\">\n");
    let mut y = PLOT.top + 20.0;
    for curve in &fig.curves {
        svg.raw(&format!(
            "<line class=\"legend-swatch\" x1=\"{}\" y1=\"{}\" x2=\"{}\" y2=\"{}\" {}/>\n",
            px(LEGEND_X),
            px(y - 6.0),
            px(LEGEND_X + 50.0),
            px(y - 6.0),
            curve_stroke(curve.style).attributes()
        ));
        svg.text(
            LEGEND_X + 62.0,
            y,
            Anchor::Start,
            18.0,
            style::INK,
            "legend-label",
            0.0,
            &curve.label,
        );
        y += LEGEND_ROW;
    }
    if !fig.markers.is_empty() {
        svg.line((LEGEND_X + 25.0, y - 20.0), (LEGEND_X + 25.0, y + 6.0), style::MARKER);
        svg.text(
            LEGEND_X + 62.0,
            y,
            Anchor::Start,
            18.0,
            style::INK,
            "legend-label",
            0.0,
            "stage frequency",
        );
    }
    svg.raw("</g>\n");
}
