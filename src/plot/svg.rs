//! A tiny SVG writer: elements appended to a string with fixed-decimal coordinates.

use crate::markup::{escape, fixed};

/// Decimals of every pixel coordinate: 0.01 px, far below what a reader can see and
/// what a test reading points back needs (half a pixel).
const DECIMALS: usize = 2;

/// A pixel coordinate as written into the SVG.
pub(crate) fn px(v: f64) -> String {
    fixed(v, DECIMALS)
}

/// A rectangle in pixels, y growing downwards.
#[derive(Debug, Clone, Copy, PartialEq)]
pub(crate) struct Rect {
    pub left: f64,
    pub top: f64,
    pub right: f64,
    pub bottom: f64,
}

impl Rect {
    pub fn width(&self) -> f64 {
        self.right - self.left
    }

    pub fn height(&self) -> f64 {
        self.bottom - self.top
    }

    /// The rectangle grown by `margin` on every side.
    pub fn grown(&self, margin: f64) -> Rect {
        Rect {
            left: self.left - margin,
            top: self.top - margin,
            right: self.right + margin,
            bottom: self.bottom + margin,
        }
    }

    /// `x="…" y="…" width="…" height="…"` of this rectangle.
    pub fn attributes(&self) -> String {
        format!(
            "x=\"{}\" y=\"{}\" width=\"{}\" height=\"{}\"",
            px(self.left),
            px(self.top),
            px(self.width()),
            px(self.height())
        )
    }
}

/// How a line is drawn.
#[derive(Debug, Clone, Copy, PartialEq)]
pub(crate) struct Stroke {
    pub colour: &'static str,
    pub width: f64,
    /// SVG `stroke-dasharray`, `None` for a solid line.
    pub dash: Option<&'static str>,
}

impl Stroke {
    /// The presentation attributes of this stroke, unfilled.
    pub fn attributes(&self) -> String {
        let dash = self.dash.map(|d| format!(" stroke-dasharray=\"{d}\"")).unwrap_or_default();
        format!(
            "fill=\"none\" stroke=\"{}\" stroke-width=\"{}\"{dash}",
            self.colour,
            fixed(self.width, 1)
        )
    }
}

/// Where a text's anchor point sits along it.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub(crate) enum Anchor {
    Start,
    Middle,
    End,
}

/// An SVG document under construction.
#[derive(Debug)]
pub(crate) struct Svg {
    out: String,
}

impl Svg {
    /// Opens a `width` × `height` document with a background and a `<title>`.
    pub fn new(width: f64, height: f64, title: &str, background: &str) -> Svg {
        let mut out = String::new();
        out.push_str("<?xml version=\"1.0\" encoding=\"UTF-8\"?>\n");
        out.push_str(&format!(
            "<svg xmlns=\"http://www.w3.org/2000/svg\" width=\"{w}\" height=\"{h}\" \
             viewBox=\"0 0 {w} {h}\" font-family=\"sans-serif\">\n",
            w = px(width),
            h = px(height)
        ));
        out.push_str(&format!("<title>{}</title>\n", escape(title)));
        out.push_str(&format!(
            "<rect x=\"0\" y=\"0\" width=\"{}\" height=\"{}\" fill=\"{background}\"/>\n",
            px(width),
            px(height)
        ));
        Svg { out }
    }

    /// Appends markup written by the caller.
    pub fn raw(&mut self, markup: &str) {
        self.out.push_str(markup);
    }

    /// A text at (x, y) (baseline), rotated by `degrees` about that point.
    #[allow(clippy::too_many_arguments)]
    pub fn text(
        &mut self,
        x: f64,
        y: f64,
        anchor: Anchor,
        size: f64,
        fill: &str,
        class: &str,
        degrees: f64,
        text: &str,
    ) {
        let anchor = match anchor {
            Anchor::Start => "start",
            Anchor::Middle => "middle",
            Anchor::End => "end",
        };
        let rotate = if degrees == 0.0 {
            String::new()
        } else {
            format!(" transform=\"rotate({} {} {})\"", fixed(degrees, 1), px(x), px(y))
        };
        self.out.push_str(&format!(
            "<text class=\"{class}\" x=\"{}\" y=\"{}\" text-anchor=\"{anchor}\" font-size=\"{}\" \
             fill=\"{fill}\"{rotate}>{}</text>\n",
            px(x),
            px(y),
            fixed(size, 1),
            escape(text)
        ));
    }

    /// A straight line.
    pub fn line(&mut self, a: (f64, f64), b: (f64, f64), stroke: Stroke) {
        self.out.push_str(&format!(
            "<line x1=\"{}\" y1=\"{}\" x2=\"{}\" y2=\"{}\" {}/>\n",
            px(a.0),
            px(a.1),
            px(b.0),
            px(b.1),
            stroke.attributes()
        ));
    }

    /// A `<clipPath>` with id `id` holding `rect`.
    pub fn clip_path(&mut self, id: &str, rect: &Rect) {
        self.out.push_str(&format!(
            "<defs><clipPath id=\"{id}\"><rect {}/></clipPath></defs>\n",
            rect.attributes()
        ));
    }

    /// Closes the document and returns its text.
    pub fn finish(mut self) -> String {
        self.out.push_str("</svg>\n");
        self.out
    }
}

/// One end of a clipped segment and whether clipping moved it onto an edge.
type Clipped = ((f64, f64), bool);

/// The part of segment a–b inside `rect`, or `None` when the segment misses it
/// (Liang–Barsky, reference 2 of the module).
fn clip_segment(a: (f64, f64), b: (f64, f64), rect: &Rect) -> Option<(Clipped, Clipped)> {
    let (dx, dy) = (b.0 - a.0, b.1 - a.1);
    let (mut t0, mut t1) = (0.0f64, 1.0f64);
    let (mut moved0, mut moved1) = (false, false);
    for (p, q) in [
        (-dx, a.0 - rect.left),
        (dx, rect.right - a.0),
        (-dy, a.1 - rect.top),
        (dy, rect.bottom - a.1),
    ] {
        if p == 0.0 {
            if q < 0.0 {
                return None;
            }
        } else if p < 0.0 && q / p > t0 {
            (t0, moved0) = (q / p, true);
        } else if p > 0.0 && q / p < t1 {
            (t1, moved1) = (q / p, true);
        }
    }
    if t0 > t1 {
        return None;
    }
    // A moved end is clamped onto the rectangle to absorb rounding when the other end
    // is very far away; an unmoved end is the input point itself.
    let at = |t: f64| {
        ((a.0 + t * dx).clamp(rect.left, rect.right), (a.1 + t * dy).clamp(rect.top, rect.bottom))
    };
    let start = if moved0 { at(t0) } else { a };
    let end = if moved1 { at(t1) } else { b };
    Some(((start, moved0), (end, moved1)))
}

/// Path data through `points` (pixels; `None` or non-finite starts a new subpath),
/// each segment clipped to `rect`. A point inside `rect` is written unchanged, so a
/// reader finds every visible input point among the vertices.
pub(crate) fn polyline_data(points: &[Option<(f64, f64)>], rect: &Rect) -> String {
    let finite = |p: &Option<(f64, f64)>| p.filter(|(x, y)| x.is_finite() && y.is_finite());
    let mut d = String::new();
    let mut pen_at: Option<(f64, f64)> = None;
    let push = |d: &mut String, command: char, p: (f64, f64)| {
        if !d.is_empty() {
            d.push(' ');
        }
        d.push_str(&format!("{command}{} {}", px(p.0), px(p.1)));
    };
    for pair in points.windows(2) {
        let (Some(a), Some(b)) = (finite(&pair[0]), finite(&pair[1])) else {
            pen_at = None;
            continue;
        };
        let Some(((start, start_moved), (end, end_moved))) = clip_segment(a, b, rect) else {
            pen_at = None;
            continue;
        };
        if start_moved || pen_at != Some(start) {
            push(&mut d, 'M', start);
        }
        push(&mut d, 'L', end);
        pen_at = (!end_moved).then_some(end);
    }
    // A lone visible point between gaps still shows, as a dot of the line's round cap.
    for (i, p) in points.iter().enumerate() {
        let neighbour = |j: Option<usize>| j.and_then(|j| points.get(j)).and_then(finite).is_some();
        if let Some(p) = finite(p) {
            let inside =
                p.0 >= rect.left && p.0 <= rect.right && p.1 >= rect.top && p.1 <= rect.bottom;
            if inside && !neighbour(i.checked_sub(1)) && !neighbour(Some(i + 1)) {
                push(&mut d, 'M', p);
                push(&mut d, 'L', p);
            }
        }
    }
    d
}

#[cfg(test)]
mod tests {
    use super::*;

    const BOX: Rect = Rect { left: 0.0, top: 0.0, right: 100.0, bottom: 100.0 };

    #[test]
    fn polyline_keeps_inside_points_and_breaks_at_gaps() {
        let d = polyline_data(
            &[Some((10.0, 10.0)), Some((20.0, 30.0)), None, Some((40.0, 40.0)), Some((50.0, 50.0))],
            &BOX,
        );
        assert_eq!(d, "M10.00 10.00 L20.00 30.00 M40.00 40.00 L50.00 50.00");
    }

    #[test]
    fn polyline_clips_segments_leaving_the_box() {
        let d =
            polyline_data(&[Some((50.0, 50.0)), Some((50.0, -1e300)), Some((60.0, 50.0))], &BOX);
        assert_eq!(d, "M50.00 50.00 L50.00 0.00 M60.00 0.00 L60.00 50.00");
    }

    #[test]
    fn polyline_draws_a_lone_point_as_a_dot() {
        let d = polyline_data(&[None, Some((5.0, 5.0)), Some((f64::NAN, 1.0))], &BOX);
        assert_eq!(d, "M5.00 5.00 L5.00 5.00");
    }
}
