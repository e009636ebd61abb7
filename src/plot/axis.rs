//! Mapping data onto pixels and choosing tick positions and labels.

use crate::error::{Error, Result};
use crate::markup::fixed;

/// The most decades a log axis may span; more would draw thousands of grid lines.
pub const MAX_DECADES: f64 = 12.0;

/// Maps one data axis onto pixels, linearly or in log10, and back.
///
/// Figures write it into their SVG as the `data-x-map` and `data-y-map` attributes of
/// each plot group ([`AxisMap::to_attribute`]), so a reader can recover data
/// coordinates from the drawn paths with [`AxisMap::parse`] and [`AxisMap::px_to_data`].
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct AxisMap {
    /// Data value drawn at `px_from`.
    pub data_min: f64,
    /// Data value drawn at `px_to`.
    pub data_max: f64,
    /// Pixel coordinate of `data_min` (the bottom edge for a y axis).
    pub px_from: f64,
    /// Pixel coordinate of `data_max` (the top edge for a y axis).
    pub px_to: f64,
    /// Whether the axis is logarithmic (base 10).
    pub log: bool,
}

impl AxisMap {
    /// The pixel coordinate of data value `v` (not finite for `v <= 0` on a log axis).
    ///
    /// ```
    /// use tonewright::plot::AxisMap;
    /// let x =
    ///     AxisMap { data_min: 20.0, data_max: 20000.0, px_from: 0.0, px_to: 900.0, log: true };
    /// // 632.46 Hz is the geometric middle of three decades.
    /// assert!((x.data_to_px(632.455532) - 450.0).abs() < 1e-4);
    /// assert!((x.px_to_data(300.0) - 200.0).abs() < 1e-9);
    /// ```
    pub fn data_to_px(&self, v: f64) -> f64 {
        let (a, b, v) = if self.log {
            (self.data_min.log10(), self.data_max.log10(), v.log10())
        } else {
            (self.data_min, self.data_max, v)
        };
        self.px_from + (v - a) / (b - a) * (self.px_to - self.px_from)
    }

    /// The data value drawn at pixel coordinate `px`.
    pub fn px_to_data(&self, px: f64) -> f64 {
        let t = (px - self.px_from) / (self.px_to - self.px_from);
        if self.log {
            let (a, b) = (self.data_min.log10(), self.data_max.log10());
            10f64.powf(a + t * (b - a))
        } else {
            self.data_min + t * (self.data_max - self.data_min)
        }
    }

    /// The data span of one pixel at data value `v` (a ratio minus one on a log axis).
    pub fn data_per_px_at(&self, v: f64) -> f64 {
        (self.px_to_data(self.data_to_px(v) + 1.0) - v).abs()
    }

    /// The attribute text `log|linear data_min data_max px_from px_to` (shortest
    /// round-trip decimals), read back by [`AxisMap::parse`].
    pub fn to_attribute(&self) -> String {
        let kind = if self.log { "log" } else { "linear" };
        format!("{kind} {} {} {} {}", self.data_min, self.data_max, self.px_from, self.px_to)
    }

    /// Reads the text written by [`AxisMap::to_attribute`].
    ///
    /// # Errors
    /// [`Error::Input`] quoting the text when it does not hold a kind and four numbers.
    pub fn parse(text: &str) -> Result<AxisMap> {
        let bad =
            || Error::input(format!("axis map \"{text}\": expected `log|linear min max px0 px1`"));
        let mut words = text.split_whitespace();
        let log = match words.next() {
            Some("log") => true,
            Some("linear") => false,
            _ => return Err(bad()),
        };
        let mut number = || words.next().and_then(|w| w.parse::<f64>().ok()).ok_or_else(bad);
        let map = AxisMap {
            log,
            data_min: number()?,
            data_max: number()?,
            px_from: number()?,
            px_to: number()?,
        };
        match words.next() {
            None => Ok(map),
            Some(_) => Err(bad()),
        }
    }
}

/// One grid line: its data value and, for a labelled (major) tick, its label.
#[derive(Debug, Clone, PartialEq)]
pub(crate) struct Tick {
    pub value: f64,
    pub label: Option<String>,
}

/// The 1-2-5 step nearest above `span / target_count`.
fn nice_step(span: f64, target_count: f64) -> f64 {
    let raw = span / target_count;
    let decade = 10f64.powf(raw.log10().floor());
    [1.0, 2.0, 5.0, 10.0]
        .into_iter()
        .map(|m| m * decade)
        .find(|s| *s >= raw)
        .unwrap_or(10.0 * decade)
}

/// `(lo, hi)` widened outward to whole multiples of a 1-2-5 step, about 8 steps in all.
pub(crate) fn nice_range(lo: f64, hi: f64) -> (f64, f64) {
    let step = nice_step(hi - lo, 8.0);
    ((lo / step).floor() * step, (hi / step).ceil() * step)
}

/// Labelled ticks on a linear axis at multiples of a 1-2-5 step, about `target_count`.
pub(crate) fn linear_ticks(lo: f64, hi: f64, target_count: f64) -> Vec<Tick> {
    let step = nice_step(hi - lo, target_count);
    // Enough decimals to tell neighbouring ticks apart, never more than the step needs.
    let decimals = (-step.log10().floor()).max(0.0) as usize;
    let first = (lo / step - 1e-9).ceil() as i64;
    let last = (hi / step + 1e-9).floor() as i64;
    (first..=last)
        .map(|k| {
            let value = k as f64 * step;
            Tick { value, label: Some(fixed(value, decimals)) }
        })
        .collect()
}

/// `hz` as a frequency label: `20`, `500`, `1k`, `2.5k`, `20k`, `1M`.
pub(crate) fn hz_label(hz: f64) -> String {
    // Rounding to six significant digits removes the error of 10^k products.
    let short = |v: f64| {
        let digits = 5 - v.abs().log10().floor() as i32;
        let scale = 10f64.powi(digits.clamp(0, 12));
        format!("{}", (v * scale).round() / scale)
    };
    if hz >= 1e6 {
        format!("{}M", short(hz / 1e6))
    } else if hz >= 1e3 {
        format!("{}k", short(hz / 1e3))
    } else {
        short(hz)
    }
}

/// Grid lines of a log axis: every 1..9 × 10^k, labelled at 1, 2, 5 × 10^k, or at every
/// line when the range is too short to hold two of those.
pub(crate) fn log_ticks(lo: f64, hi: f64) -> Vec<Tick> {
    let in_range = |v: f64| v >= lo * (1.0 - 1e-9) && v <= hi * (1.0 + 1e-9);
    let mut values = Vec::new();
    for k in lo.log10().floor() as i32..=hi.log10().ceil() as i32 {
        for m in 1..=9 {
            let v = f64::from(m) * 10f64.powi(k);
            if in_range(v) {
                values.push((m, v));
            }
        }
    }
    let major = |m: i32| matches!(m, 1 | 2 | 5);
    let label_all = values.iter().filter(|(m, _)| major(*m)).count() < 2;
    values
        .into_iter()
        .map(|(m, v)| Tick { value: v, label: (label_all || major(m)).then(|| hz_label(v)) })
        .collect()
}

#[cfg(test)]
mod tests {
    use super::*;

    fn labels(ticks: &[Tick]) -> Vec<String> {
        ticks.iter().filter_map(|t| t.label.clone()).collect()
    }

    #[test]
    fn log_ticks_over_the_audio_band_are_labelled_1_2_5_with_k_suffix() {
        assert_eq!(
            labels(&log_ticks(20.0, 20000.0)),
            ["20", "50", "100", "200", "500", "1k", "2k", "5k", "10k", "20k"]
        );
    }

    #[test]
    fn log_ticks_label_every_line_in_a_short_range() {
        assert_eq!(
            labels(&log_ticks(300.0, 900.0)),
            ["300", "400", "500", "600", "700", "800", "900"]
        );
    }

    #[test]
    fn linear_ticks_use_the_decimals_the_step_needs() {
        assert_eq!(labels(&linear_ticks(-1.0, 1.0, 4.0)), ["-1.0", "-0.5", "0.0", "0.5", "1.0"]);
        assert_eq!(
            labels(&linear_ticks(-60.0, 10.0, 8.0)),
            ["-60", "-50", "-40", "-30", "-20", "-10", "0", "10"]
        );
    }

    #[test]
    fn axis_map_round_trips_through_its_attribute() {
        let map =
            AxisMap { data_min: 20.0, data_max: 20000.0, px_from: 130.0, px_to: 1270.0, log: true };
        let back = AxisMap::parse(&map.to_attribute()).unwrap();
        assert_eq!(back, map);
        let px = map.data_to_px(1000.0);
        assert!((map.px_to_data(px) - 1000.0).abs() < 1e-9);
        assert!(AxisMap::parse("log 1 2 3").is_err());
    }

    #[test]
    fn hz_labels_remove_product_rounding_error() {
        assert_eq!(hz_label(3.0 * 10f64.powi(-1)), "0.3");
        assert_eq!(hz_label(2500.0), "2.5k");
        assert_eq!(hz_label(2e6), "2M");
    }
}
