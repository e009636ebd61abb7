//! The pole/zero map: unit circle, axes, roots, and a panel zoomed near z = 1.

use super::axis::{linear_ticks, AxisMap};
use super::style::{self, root_marks, root_style_name};
use super::svg::{px, Anchor, Rect, Stroke, Svg};
use super::{RootSet, ZPlaneFigure};
use crate::markup::escape;
use num_complex::Complex64;

const PANEL: f64 = 700.0;
const TOP: f64 = 100.0;
const LEFT: f64 = 110.0;
/// Horizontal distance between the two panels' left edges.
const PANEL_STEP: f64 = PANEL + 150.0;
const HEIGHT: f64 = 960.0;
/// The whole-plane view shows at least |re|, |im| <= 1.2 and grows to hold roots up to
/// this magnitude; roots beyond are counted in a note instead of shrinking the circle.
const MAX_VIEW: f64 = 10.0;
/// Roots closer than this to z = 1 decide the zoom box.
const NEAR_ONE: f64 = 0.5;
/// The smallest half-width of the zoom box, for roots sitting exactly on z = 1.
const MIN_ZOOM: f64 = 1e-6;

/// A square region of the z plane: centre and half-width.
#[derive(Debug, Clone, Copy, PartialEq)]
struct View {
    centre: (f64, f64),
    half: f64,
}

/// Draws `fig` as an SVG document: one 700 px panel of the whole plane, and with
/// `zoom_near_one` a second panel around z = 1 fitted to the roots there.
///
/// Every input draws, so there is no error: non-finite roots are skipped, and roots
/// beyond the view are counted in a note on the panel.
///
/// ```
/// use num_complex::Complex64;
/// use tonewright::plot::{zplane_svg, RootSet, RootStyle, ZPlaneFigure};
/// let pole = Complex64::from_polar(0.999, 0.002);
/// let fig = ZPlaneFigure {
///     title: "demo".into(),
///     sets: vec![RootSet {
///         label: "ideal".into(),
///         poles: vec![pole, pole.conj()],
///         zeros: vec![],
///         style: RootStyle::Ideal,
///     }],
///     zoom_near_one: true,
/// };
/// let svg = zplane_svg(&fig);
/// assert_eq!(svg.matches("class=\"panel\"").count(), 2);
/// // The zoom panel is narrower than the poles' distance from 1 times ten (within 1e-12).
/// let zoom = &svg[svg.find("data-panel=\"zoom\"").unwrap()..];
/// let map = &zoom[zoom.find("data-x-map=\"linear ").unwrap() + 19..];
/// let number = |w: &str| w.trim_end_matches('"').parse::<f64>().unwrap();
/// let mut numbers = map.split_whitespace().map(number);
/// let (lo, hi) = (numbers.next().unwrap(), numbers.next().unwrap());
/// assert!(hi - lo < 10.0 * (1.0 - pole).norm() + 1e-12);
/// ```
pub fn zplane_svg(fig: &ZPlaneFigure) -> String {
    let roots: Vec<Complex64> = fig
        .sets
        .iter()
        .flat_map(|s| s.poles.iter().chain(s.zeros.iter()))
        .copied()
        .filter(|z| z.re.is_finite() && z.im.is_finite())
        .collect();
    let width =
        if fig.zoom_near_one { LEFT + PANEL_STEP + PANEL + 60.0 } else { LEFT + PANEL + 90.0 };
    let mut svg = Svg::new(width, HEIGHT, &fig.title, style::PAPER);
    svg.text(LEFT, 52.0, Anchor::Start, 28.0, style::INK, "title", 0.0, &fig.title);
    let whole = whole_view(&roots);
    let zoom = fig.zoom_near_one.then(|| zoom_view(&roots));
    panel(&mut svg, fig, "whole", "whole plane", LEFT, whole, zoom);
    if let Some(zoom) = zoom {
        panel(&mut svg, fig, "zoom", "near z = 1", LEFT + PANEL_STEP, zoom, None);
    }
    legend(&mut svg, &fig.sets);
    svg.finish()
}

fn whole_view(roots: &[Complex64]) -> View {
    let reach = roots
        .iter()
        .map(|z| z.re.abs().max(z.im.abs()))
        .filter(|r| *r <= MAX_VIEW)
        .fold(0.0f64, f64::max);
    View { centre: (0.0, 0.0), half: (1.1 * reach).max(1.2) }
}

/// The square holding z = 1 and every root within [`NEAR_ONE`] of it, with a margin.
fn zoom_view(roots: &[Complex64]) -> View {
    let one = Complex64::new(1.0, 0.0);
    let (mut lo, mut hi) = ((1.0f64, 0.0f64), (1.0f64, 0.0f64));
    for z in roots.iter().filter(|z| (*z - one).norm() <= NEAR_ONE) {
        lo = (lo.0.min(z.re), lo.1.min(z.im));
        hi = (hi.0.max(z.re), hi.1.max(z.im));
    }
    let half = 0.6 * (hi.0 - lo.0).max(hi.1 - lo.1);
    View { centre: ((lo.0 + hi.0) / 2.0, (lo.1 + hi.1) / 2.0), half: half.max(MIN_ZOOM) }
}

fn maps(view: View, area: &Rect) -> (AxisMap, AxisMap) {
    let (cx, cy) = view.centre;
    let x = AxisMap {
        data_min: cx - view.half,
        data_max: cx + view.half,
        px_from: area.left,
        px_to: area.right,
        log: false,
    };
    let y = AxisMap {
        data_min: cy - view.half,
        data_max: cy + view.half,
        px_from: area.bottom,
        px_to: area.top,
        log: false,
    };
    (x, y)
}

#[allow(clippy::too_many_arguments)]
fn panel(
    svg: &mut Svg,
    fig: &ZPlaneFigure,
    id: &str,
    caption: &str,
    left: f64,
    view: View,
    zoom_box: Option<View>,
) {
    let area = Rect { left, top: TOP, right: left + PANEL, bottom: TOP + PANEL };
    let (x_map, y_map) = maps(view, &area);
    let clip = format!("zplane-{id}");
    svg.clip_path(&clip, &area);
    svg.raw(&format!(
        "<g class=\"panel\" data-panel=\"{id}\" data-x-map=\"{}\" data-y-map=\"{}\">\n\
         <rect class=\"plot-bg\" {} fill=\"{}\"/>\n",
        x_map.to_attribute(),
        y_map.to_attribute(),
        area.attributes(),
        style::PLOT_BG
    ));
    let x_ticks = linear_ticks(x_map.data_min, x_map.data_max, 6.0);
    let y_ticks = linear_ticks(y_map.data_min, y_map.data_max, 6.0);
    svg.raw("<g class=\"grid\">\n");
    for tick in &x_ticks {
        let x = x_map.data_to_px(tick.value);
        svg.line((x, area.top), (x, area.bottom), style::GRID_MAJOR);
    }
    for tick in &y_ticks {
        let y = y_map.data_to_px(tick.value);
        svg.line((area.left, y), (area.right, y), style::GRID_MAJOR);
    }
    svg.raw("</g>\n");
    svg.raw(&format!("<g clip-path=\"url(#{clip})\">\n"));
    let (x0, y0) = (x_map.data_to_px(0.0), y_map.data_to_px(0.0));
    svg.line((area.left, y0), (area.right, y0), style::ZERO_AXIS);
    svg.line((x0, area.top), (x0, area.bottom), style::ZERO_AXIS);
    // The radius in pixels can be very large in the zoom panel; the clip keeps the arc.
    svg.raw(&format!(
        "<circle class=\"unit-circle\" cx=\"{}\" cy=\"{}\" r=\"{}\" {}/>\n",
        px(x0),
        px(y0),
        px(x_map.data_to_px(1.0) - x0),
        style::UNIT_CIRCLE.attributes()
    ));
    if let Some(zoom) = zoom_box {
        // Drawn at least 24 px wide, so a zoom region of a few pixels stays visible
        // around the marks it holds.
        let (cx, cy) = (x_map.data_to_px(zoom.centre.0), y_map.data_to_px(zoom.centre.1));
        let half = (x_map.data_to_px(zoom.centre.0 + zoom.half) - cx).max(12.0);
        let rect = Rect { left: cx - half, top: cy - half, right: cx + half, bottom: cy + half };
        svg.raw(&format!(
            "<rect class=\"zoom-box\" {} {}/>\n",
            rect.attributes(),
            style::MARKER.attributes()
        ));
    }
    let mut outside = 0usize;
    for set in &fig.sets {
        outside += root_set(svg, set, &x_map, &y_map, &area);
    }
    svg.raw("</g>\n");
    svg.raw(&format!(
        "<rect class=\"frame\" {} {}/>\n",
        area.attributes(),
        style::FRAME.attributes()
    ));
    for tick in &x_ticks {
        if let Some(label) = &tick.label {
            svg.text(
                x_map.data_to_px(tick.value),
                area.bottom + 28.0,
                Anchor::Middle,
                17.0,
                style::MUTED,
                "tick-x",
                0.0,
                label,
            );
        }
    }
    for tick in &y_ticks {
        if let Some(label) = &tick.label {
            svg.text(
                area.left - 10.0,
                y_map.data_to_px(tick.value) + 6.0,
                Anchor::End,
                17.0,
                style::MUTED,
                "tick-y",
                0.0,
                label,
            );
        }
    }
    let mid_x = (area.left + area.right) / 2.0;
    svg.text(mid_x, area.top - 14.0, Anchor::Middle, 20.0, style::INK, "panel-title", 0.0, caption);
    svg.text(
        mid_x,
        area.bottom + 62.0,
        Anchor::Middle,
        20.0,
        style::INK,
        "axis-label",
        0.0,
        "real part",
    );
    svg.text(
        area.left - 88.0,
        (area.top + area.bottom) / 2.0,
        Anchor::Middle,
        20.0,
        style::INK,
        "axis-label",
        -90.0,
        "imaginary part",
    );
    if outside > 0 {
        let note = if outside == 1 {
            "1 root outside this view".to_string()
        } else {
            format!("{outside} roots outside this view")
        };
        svg.text(
            area.left + 12.0,
            area.bottom - 12.0,
            Anchor::Start,
            16.0,
            style::MUTED,
            "note",
            0.0,
            &note,
        );
    }
    svg.raw("</g>\n");
}

/// Draws one set's poles and zeros; returns how many finite roots fell outside `area`.
fn root_set(svg: &mut Svg, set: &RootSet, x_map: &AxisMap, y_map: &AxisMap, area: &Rect) -> usize {
    let (stroke, cross, radius) = root_marks(set.style);
    let mut outside = 0;
    let mut place = |roots: &[Complex64]| -> Vec<(f64, f64)> {
        let finite = roots.iter().filter(|z| z.re.is_finite() && z.im.is_finite());
        let placed: Vec<(f64, f64)> =
            finite.map(|z| (x_map.data_to_px(z.re), y_map.data_to_px(z.im))).collect();
        let (inside, out): (Vec<_>, Vec<_>) = placed.into_iter().partition(|&(x, y)| {
            x >= area.left && x <= area.right && y >= area.top && y <= area.bottom
        });
        outside += out.len();
        inside
    };
    let poles: Vec<String> = place(&set.poles)
        .into_iter()
        .map(|(x, y)| {
            format!(
                "M{} {} L{} {} M{} {} L{} {}",
                px(x - cross),
                px(y - cross),
                px(x + cross),
                px(y + cross),
                px(x - cross),
                px(y + cross),
                px(x + cross),
                px(y - cross)
            )
        })
        .collect();
    let zeros: Vec<String> =
        place(&set.zeros).into_iter().map(|(x, y)| circle_data(x, y, radius)).collect();
    svg.raw(&format!(
        "<g class=\"roots\" data-label=\"{}\" data-style=\"{}\" {}>\n\
         <path class=\"poles\" d=\"{}\"/>\n<path class=\"zeros\" d=\"{}\"/>\n</g>\n",
        escape(&set.label),
        root_style_name(set.style),
        stroke.attributes(),
        poles.join(" "),
        zeros.join(" ")
    ));
    outside
}

/// Path data of a circle as two arcs, so all zeros of a set fit in one path.
fn circle_data(x: f64, y: f64, r: f64) -> String {
    let r_text = px(r);
    format!(
        "M{} {} A{r_text} {r_text} 0 1 0 {} {} A{r_text} {r_text} 0 1 0 {} {}",
        px(x + r),
        px(y),
        px(x - r),
        px(y),
        px(x + r),
        px(y)
    )
}

fn legend(svg: &mut Svg, sets: &[RootSet]) {
    svg.raw("<g class=\"legend\">\n");
    let y = HEIGHT - 40.0;
    let mut x = LEFT;
    for set in sets {
        let (stroke, cross, radius) = root_marks(set.style);
        let swatch = Stroke { dash: None, ..stroke };
        svg.raw(&format!(
            "<path class=\"legend-swatch\" {} d=\"M{} {} L{} {} M{} {} L{} {} {}\"/>\n",
            swatch.attributes(),
            px(x + 10.0 - cross),
            px(y - 6.0 - cross),
            px(x + 10.0 + cross),
            px(y - 6.0 + cross),
            px(x + 10.0 - cross),
            px(y - 6.0 + cross),
            px(x + 10.0 + cross),
            px(y - 6.0 - cross),
            circle_data(x + 40.0, y - 6.0, radius)
        ));
        let label = format!("{} (× poles, ○ zeros)", set.label);
        svg.text(x + 62.0, y, Anchor::Start, 18.0, style::INK, "legend-label", 0.0, &label);
        // About 10 px per character at 18 px; labels are not measured.
        x += 62.0 + 10.0 * label.chars().count() as f64 + 40.0;
    }
    svg.raw("</g>\n");
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn zoom_box_holds_one_and_the_crowded_poles() {
        let roots = [
            Complex64::new(0.9987, 0.0013),
            Complex64::new(0.9987, -0.0013),
            Complex64::new(-0.5, 0.0),
        ];
        let view = zoom_view(&roots);
        assert!(view.half < 0.01, "{view:?}");
        for z in &roots[..2] {
            assert!(
                (z.re - view.centre.0).abs() < view.half
                    && (z.im - view.centre.1).abs() < view.half
            );
        }
        assert!((1.0 - view.centre.0).abs() < view.half);
    }

    #[test]
    fn whole_view_grows_for_roots_outside_the_circle_up_to_a_limit() {
        assert_eq!(whole_view(&[Complex64::new(0.5, 0.5)]).half, 1.2);
        assert!((whole_view(&[Complex64::new(2.0, 0.0)]).half - 2.2).abs() < 1e-12);
        assert_eq!(whole_view(&[Complex64::new(1e9, 0.0)]).half, 1.2);
    }
}
