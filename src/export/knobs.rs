//! Knob tables: coefficient sets over every knob's travel, made interpolable, and advice
//! on interpolating between them.
//!
//! In: a [`Port`] and the numbers its target stores. Out: a [`KnobTable`]: one set per
//! point of the grid of all knobs (`steps` positions each, evenly over the travel 0..1,
//! row-major, the first knob in name order varying slowest), and per knob a
//! [`KnobAdvice`]. Each set is the design ported afresh at that setting.
//!
//! Interpolable means: every set has the same section count and each section index
//! follows the same poles across the table. Pairing orders sections by pole radius, so
//! two sections can swap places between neighbouring settings; each set is therefore
//! reordered to match its neighbour (greedy nearest coefficients). A cascade's product
//! does not depend on the order, so H(z) is unchanged; the sections' gain scaling was
//! done in the original order, and the notes say how many sets moved. Sets with fewer
//! sections are padded with pass-through sections and the table is marked not
//! interpolable. Fixed-point sets share the exported `coef_frac` and one shift per
//! section (the largest any set needs), so firmware interpolates the integers directly.
//!
//! Advice: at every mid-step between neighbours along a knob's axis, the float64 sets
//! are averaged section by section (what linear interpolation does half-way) and the
//! response compared with the design ported at that mid position; the largest
//! magnitude difference in dB is reported, counted where the exact response is within
//! 60 dB of its peak (deeper, a notch's floor, the dB difference measures depth, not
//! tone). The suggested step count is searched along the knob's axis with the other
//! knobs at their exported positions, and verified. Stability: the region of stable
//! (a1, a2) is the triangle |a2| < 1, |a1| < 1 + a2, a convex set [1, 2], so when two
//! neighbouring stored sections are stable every section between them is too; the
//! mid-steps are also checked directly.
//!
//! # References
//! 1. A. V. Oppenheim, R. W. Schafer, "Discrete-Time Signal Processing", 3rd ed., 2010,
//!    chapter 6 (the stability triangle of a second-order section; from memory).
//! 2. L. B. Jackson, "Digital Filters and Signal Processing", 3rd ed., 1996 (the stable
//!    (a1, a2) triangle; from memory).

use super::context::{knob_label, sections_info, AxisInfo, EntryInfo, KnobTableInfo};
use super::{Lang, Numbers};
use crate::analysis::response::{log_grid, to_db};
use crate::error::{Error, Result};
use crate::pipeline::{port, Port};
use crate::quantize::{quantize, round_to_f32, FixedCascade, FixedFormat};
use crate::sections::max_pole_radius;
use crate::sections::{Cascade, Sos};
use num_complex::Complex64;
use rayon::prelude::*;

/// Largest number of coefficient sets a table may hold.
pub const MAX_SETS: usize = 4096;
/// Largest `steps` the suggestion search goes to (the design file's own limit).
pub const MAX_STEPS: usize = 1025;
/// Deviation the suggested step count keeps under, dB.
pub const ADVICE_DB: f64 = 0.5;
/// Depth below the peak beyond which deviations are not counted, dB.
const FLOOR_DB: f64 = 60.0;
/// Frequencies of the deviation grid (log spaced, 10 Hz to 0.49·rate).
const GRID_POINTS: usize = 256;

/// A section that passes the signal unchanged (padding).
const PASS: Sos = Sos { b: [1.0, 0.0, 0.0], a: [0.0, 0.0] };

/// One knob's axis of the table.
#[derive(Debug, Clone, PartialEq)]
pub struct Axis {
    /// Knob name.
    pub name: String,
    /// Entries along the axis.
    pub steps: usize,
    /// Distance in sets between neighbours along this axis.
    pub stride: usize,
}

/// One coefficient set of the table.
#[derive(Debug, Clone)]
pub struct Entry {
    /// Position of every knob, in axis order.
    pub positions: Vec<f64>,
    /// Float64 sections, aligned to the table's order.
    pub float: Vec<Sos>,
    /// What the target stores for them.
    pub(crate) stored: Numbers,
}

/// What interpolating one knob's table does.
#[derive(Debug, Clone, PartialEq)]
pub struct KnobAdvice {
    /// Knob name.
    pub knob: String,
    /// Steps in the table.
    pub steps: usize,
    /// Largest deviation at a mid-step, dB.
    pub max_deviation_db: f64,
    /// Where: the two neighbouring settings.
    pub worst_between: String,
    /// Whether every interpolated mid-step section is stable.
    pub mid_steps_stable: bool,
    /// Steps that keep the deviation under [`ADVICE_DB`] along the axis (or
    /// [`MAX_STEPS`] if none does).
    pub suggested_steps: usize,
    /// The deviation at the suggested steps, dB, measured.
    pub suggested_deviation_db: f64,
}

/// Coefficient sets over the knobs' travel with interpolation advice.
#[derive(Debug, Clone)]
pub struct KnobTable {
    /// One axis per knob, in name order.
    pub axes: Vec<Axis>,
    /// Sets in row-major order.
    pub entries: Vec<Entry>,
    /// Advice per knob.
    pub advice: Vec<KnobAdvice>,
    /// What was done to make the sets interpolable.
    pub notes: Vec<String>,
    /// Whether every set has the same section count.
    pub interpolable: bool,
    /// Whether every stored set has its poles strictly inside the unit circle.
    pub stable: bool,
}

/// The float64 sections of the design at knob positions given in axis order.
fn cascade_at(p: &Port, names: &[String], positions: &[f64]) -> Result<Vec<Sos>> {
    let settings: Vec<String> =
        names.iter().zip(positions).map(|(n, x)| format!("{n}={x}")).collect();
    port(p.design.clone(), &settings, p.rate)
        .map(|q| q.cascade.sections)
        .map_err(|e| Error::input(format!("--knobs: at {}: {e}", knob_label(names, positions))))
}

/// Largest |dB| difference of `approx` from `exact` within [`FLOOR_DB`] of the peak.
fn deviation_db(exact: &[Sos], approx: &[Sos], rate: f64) -> f64 {
    let grid = log_grid(10.0, 0.49 * rate, GRID_POINTS);
    let db = |secs: &[Sos], hz: f64| {
        let z = Complex64::from_polar(1.0, 2.0 * std::f64::consts::PI * hz / rate);
        to_db(secs.iter().map(|s| s.eval(z)).product())
    };
    let pairs: Vec<(f64, f64)> = grid.iter().map(|&f| (db(exact, f), db(approx, f))).collect();
    let peak = pairs.iter().map(|p| p.0).fold(f64::NEG_INFINITY, f64::max);
    pairs.iter().filter(|p| p.0 >= peak - FLOOR_DB).map(|p| (p.1 - p.0).abs()).fold(0.0, |m, d| {
        if d.is_nan() {
            f64::INFINITY
        } else {
            m.max(d)
        }
    })
}

/// The section-by-section average of two sets (linear interpolation half-way).
fn midpoint(a: &[Sos], b: &[Sos]) -> Vec<Sos> {
    let mid = |x: f64, y: f64| 0.5 * (x + y);
    a.iter()
        .zip(b)
        .map(|(s, t)| Sos {
            b: [mid(s.b[0], t.b[0]), mid(s.b[1], t.b[1]), mid(s.b[2], t.b[2])],
            a: [mid(s.a[0], t.a[0]), mid(s.a[1], t.a[1])],
        })
        .collect()
}

/// Sum of absolute coefficient differences.
fn distance(s: &Sos, t: &Sos) -> f64 {
    let d = |x: &[f64], y: &[f64]| x.iter().zip(y).map(|(p, q)| (p - q).abs()).sum::<f64>();
    d(&s.b, &t.b) + d(&s.a, &t.a)
}

/// Pads `cur` to `count` sections and orders it like `prev` (greedy nearest); returns
/// whether the order changed.
fn align(prev: Option<&[Sos]>, mut cur: Vec<Sos>, count: usize) -> (Vec<Sos>, bool) {
    cur.resize(count, PASS);
    let Some(prev) = prev else { return (cur, false) };
    let mut free: Vec<usize> = (0..cur.len()).collect();
    let mut order = Vec::with_capacity(cur.len());
    for p in prev {
        let best = (0..free.len())
            .min_by(|&i, &j| distance(p, &cur[free[i]]).total_cmp(&distance(p, &cur[free[j]])));
        if let Some(i) = best {
            order.push(free.remove(i));
        }
    }
    order.extend(free);
    let moved = order.iter().enumerate().any(|(i, &k)| i != k);
    (order.iter().map(|&k| cur[k]).collect(), moved)
}

/// The neighbour an entry is aligned to: one step back along the last axis whose index
/// is not 0.
fn neighbour(index: usize, axes: &[Axis]) -> Option<usize> {
    axes.iter()
        .rev()
        .find(|a| !(index / a.stride).is_multiple_of(a.steps))
        .map(|a| index - a.stride)
}

/// Aligns a list of sets in table order (each to its neighbour); returns the count of
/// sets that were reordered.
fn align_all(sets: Vec<Vec<Sos>>, axes: &[Axis]) -> (Vec<Vec<Sos>>, usize) {
    let count = sets.iter().map(Vec::len).max().unwrap_or(0);
    let mut out: Vec<Vec<Sos>> = Vec::with_capacity(sets.len());
    let mut moved = 0;
    for (i, set) in sets.into_iter().enumerate() {
        let prev = neighbour(i, axes).map(|k| out[k].as_slice());
        let (aligned, m) = align(prev, set, count);
        moved += usize::from(m);
        out.push(aligned);
    }
    (out, moved)
}

/// Stored numbers for every set: f32 rounding, or integers with the exported
/// `coef_frac` and one shift per section shared by all sets.
fn store_all(sets: &[Vec<Sos>], numbers: &Numbers, rate: f64) -> Result<Vec<Numbers>> {
    let cascade = |s: &[Sos]| Cascade { rate, sections: s.to_vec() };
    let q = match numbers {
        Numbers::F64(_) => return Ok(sets.iter().map(|s| Numbers::F64(cascade(s))).collect()),
        Numbers::F32(_) => {
            return Ok(sets.iter().map(|s| Numbers::F32(round_to_f32(&cascade(s)))).collect())
        }
        Numbers::Fixed(q) => q,
    };
    let frac = q.format.coef_frac.unwrap_or(0);
    let common = FixedFormat { coef_frac: Some(frac), ..q.format };
    let mut shifts = vec![0u32; sets.first().map_or(0, Vec::len)];
    for set in sets {
        for (k, s) in quantize(&cascade(set), &common, q.structure)?.sections.iter().enumerate() {
            shifts[k] = shifts[k].max(s.shift);
        }
    }
    sets.iter()
        .map(|set| {
            let sections = set
                .iter()
                .zip(&shifts)
                .map(|(s, &shift)| {
                    // Quantizing at coef_frac − shift stores round(c·2^(coef_frac − shift)),
                    // which the kernel reads with this shift.
                    let f = FixedFormat { coef_frac: Some(frac - shift), ..q.format };
                    let one = quantize(&cascade(std::slice::from_ref(s)), &f, q.structure)?;
                    let mut fs = one.sections[0];
                    fs.shift += shift;
                    Ok(fs)
                })
                .collect::<Result<Vec<_>>>()?;
            Ok(Numbers::Fixed(FixedCascade {
                format: common,
                structure: q.structure,
                sections,
                notes: Vec::new(),
            }))
        })
        .collect()
}

/// The sections a target runs for stored numbers (effective coefficients).
fn effective(n: &Numbers) -> Vec<Sos> {
    match n {
        Numbers::F64(c) | Numbers::F32(c) => c.sections.clone(),
        Numbers::Fixed(q) => q.effective_sections().unwrap_or_default(),
    }
}

/// Evenly spaced positions 0..1.
fn positions(steps: usize) -> Vec<f64> {
    (0..steps).map(|i| i as f64 / (steps - 1) as f64).collect()
}

/// The largest mid-step deviation along one axis at `steps` positions, the other knobs
/// at the exported positions.
fn axis_deviation(p: &Port, names: &[String], axis: usize, steps: usize) -> Result<f64> {
    let base: Vec<f64> = names.iter().map(|n| p.knobs.get(n)).collect();
    let at = |x: f64| {
        let mut pos = base.clone();
        pos[axis] = x;
        cascade_at(p, names, &pos)
    };
    let xs = positions(steps);
    let sets = xs.par_iter().map(|&x| at(x)).collect::<Result<Vec<_>>>()?;
    let line = [Axis { name: names[axis].clone(), steps, stride: 1 }];
    let (sets, _) = align_all(sets, &line);
    let devs = (0..steps - 1)
        .into_par_iter()
        .map(|i| {
            Ok(deviation_db(
                &at(0.5 * (xs[i] + xs[i + 1]))?,
                &midpoint(&sets[i], &sets[i + 1]),
                p.rate,
            ))
        })
        .collect::<Result<Vec<f64>>>()?;
    Ok(devs.into_iter().fold(0.0, f64::max))
}

/// The fewest steps (searched from an h² estimate, then verified) whose mid-step
/// deviation along the axis stays under [`ADVICE_DB`]; with the measured deviation.
fn suggest(
    p: &Port,
    names: &[String],
    axis: usize,
    steps: usize,
    dev: f64,
) -> Result<(usize, f64)> {
    // Linear interpolation error falls with the square of the step (h²), so the step
    // count scales with √(deviation); aim 20 % under the limit, then verify.
    let estimate = |n: usize, d: f64| {
        let ratio = if d.is_finite() { (d / (0.8 * ADVICE_DB)).sqrt() } else { 2.0 };
        (1 + ((n - 1) as f64 * ratio).ceil() as usize).clamp(2, MAX_STEPS)
    };
    let mut n = estimate(steps, dev);
    let mut d = axis_deviation(p, names, axis, n)?;
    for _ in 0..6 {
        if d < ADVICE_DB || n == MAX_STEPS {
            break;
        }
        n = estimate(n, d).max(n + n / 4 + 1).min(MAX_STEPS);
        d = axis_deviation(p, names, axis, n)?;
    }
    Ok((n, d))
}

impl KnobTable {
    /// Ports the design at every point of the knob grid and measures interpolation.
    ///
    /// # Errors
    /// A design without knobs, a grid of more than [`MAX_SETS`] sets, or a setting the
    /// pipeline or quantization refuses.
    pub(crate) fn build(p: &Port, numbers: &Numbers) -> Result<Self> {
        let d = &p.design;
        if d.knobs.is_empty() {
            return Err(Error::input(format!("--knobs: {} has no [knob.*] table", d.file)));
        }
        let names: Vec<String> = d.knobs.keys().cloned().collect();
        let steps: Vec<usize> = d.knobs.values().map(|k| k.steps).collect();
        let sets =
            steps.iter().try_fold(1usize, |acc, &s| acc.checked_mul(s).filter(|&n| n <= MAX_SETS));
        let Some(sets) = sets else {
            return Err(Error::input(format!(
                "--knobs: the grid of {} ({} steps) exceeds {MAX_SETS} sets; lower `steps` in \
                 the [knob.*] tables",
                names.join(" × "),
                steps.iter().map(|s| s.to_string()).collect::<Vec<_>>().join(" × ")
            )));
        };
        let mut axes = Vec::with_capacity(names.len());
        let mut stride = sets;
        for (name, &n) in names.iter().zip(&steps) {
            stride /= n;
            axes.push(Axis { name: name.clone(), steps: n, stride });
        }
        let point = |i: usize| -> Vec<f64> {
            axes.iter().map(|a| ((i / a.stride) % a.steps) as f64 / (a.steps - 1) as f64).collect()
        };
        let raw = (0..sets)
            .into_par_iter()
            .map(|i| cascade_at(p, &names, &point(i)))
            .collect::<Result<Vec<_>>>()?;
        let (lo, hi) =
            raw.iter().fold((usize::MAX, 0), |(lo, hi), s| (lo.min(s.len()), hi.max(s.len())));
        let (float, moved) = align_all(raw, &axes);
        let stored = store_all(&float, numbers, p.rate)?;
        let mut notes = Vec::new();
        let interpolable = lo == hi;
        if !interpolable {
            notes.push(format!(
                "knob table: the section count changes over the travel ({lo} to {hi}); sets \
                 are padded with pass-through sections and are not interpolable where it changes"
            ));
        }
        if moved > 0 {
            notes.push(format!(
                "knob table: sections reordered in {moved} of {sets} sets so each section \
                 follows the same poles across the table (H(z) unchanged; gains were scaled in \
                 the original order)"
            ));
        }
        let stable = stored.iter().all(|s| s.max_pole_radius() < 1.0);
        if !stable {
            notes.push(
                "knob table: some stored sets have poles on or outside the unit circle".into(),
            );
        }
        let entries: Vec<Entry> = (0..sets)
            .zip(float)
            .zip(stored)
            .map(|((i, float), stored)| Entry { positions: point(i), float, stored })
            .collect();
        let mut advice = Vec::with_capacity(axes.len());
        for (k, axis) in axes.iter().enumerate() {
            let pairs: Vec<usize> =
                (0..sets).filter(|i| (i / axis.stride) % axis.steps + 1 < axis.steps).collect();
            let measured = pairs
                .par_iter()
                .map(|&i| {
                    let (a, b) = (&entries[i], &entries[i + axis.stride]);
                    let mut mid = a.positions.clone();
                    mid[k] = 0.5 * (a.positions[k] + b.positions[k]);
                    let exact = cascade_at(p, &names, &mid)?;
                    let dev = deviation_db(&exact, &midpoint(&a.float, &b.float), p.rate);
                    let stored_mid = midpoint(&effective(&a.stored), &effective(&b.stored));
                    Ok((dev, max_pole_radius(&stored_mid) < 1.0, i))
                })
                .collect::<Result<Vec<_>>>()?;
            let worst = measured
                .iter()
                .copied()
                .fold((0.0, 0), |w, (d, _, i)| if d > w.0 { (d, i) } else { w });
            let between = format!(
                "{} and {}",
                knob_label(&names, &entries[worst.1].positions),
                knob_label(&names, &entries[worst.1 + axis.stride].positions)
            );
            let (suggested_steps, suggested_deviation_db) =
                suggest(p, &names, k, axis.steps, worst.0)?;
            advice.push(KnobAdvice {
                knob: axis.name.clone(),
                steps: axis.steps,
                max_deviation_db: worst.0,
                worst_between: between,
                mid_steps_stable: measured.iter().all(|m| m.1),
                suggested_steps,
                suggested_deviation_db,
            });
        }
        Ok(KnobTable { axes, entries, advice, notes, interpolable, stable })
    }

    /// The advice as text lines, for the terminal and the generated headers.
    pub fn advice_lines(&self) -> Vec<String> {
        let mut lines: Vec<String> = self
            .advice
            .iter()
            .map(|a| {
                format!(
                    "knob {}: {} steps; linear interpolation half-way between neighbours \
                     deviates at most {:.3} dB from the exact design (worst between {}); {} \
                     steps keep it under {ADVICE_DB} dB ({:.3} dB measured along {} with the \
                     other knobs at their exported positions)",
                    a.knob,
                    a.steps,
                    a.max_deviation_db,
                    a.worst_between,
                    a.suggested_steps,
                    a.suggested_deviation_db,
                    a.knob
                )
            })
            .collect();
        let mid_ok = self.advice.iter().all(|a| a.mid_steps_stable);
        lines.push(if self.stable && mid_ok {
            "stability: every stored set is stable, so every linear interpolation between \
             neighbours is too (the stable (a1, a2) region |a2| < 1, |a1| < 1 + a2 is a \
             convex triangle); the mid-steps were also checked"
                .to_string()
        } else {
            "stability: NOT every stored set or interpolated mid-step is stable; do not \
             interpolate this table"
                .to_string()
        });
        if !self.interpolable {
            lines.push(
                "the section count changes over the travel: the table is not interpolable".into(),
            );
        }
        lines
    }

    /// The table as template values for `lang`.
    ///
    /// # Errors
    /// An internal error when a set's stored and float sections disagree in number.
    pub(crate) fn info(&self, lang: Lang) -> Result<KnobTableInfo> {
        let names: Vec<String> = self.axes.iter().map(|a| a.name.clone()).collect();
        let entries = self
            .entries
            .iter()
            .map(|e| {
                Ok(EntryInfo {
                    label: knob_label(&names, &e.positions),
                    sections: sections_info(&e.float, &e.stored, lang)?,
                })
            })
            .collect::<Result<Vec<_>>>()?;
        Ok(KnobTableInfo {
            axes: self
                .axes
                .iter()
                .map(|a| AxisInfo {
                    name: a.name.clone(),
                    steps: a.steps,
                    stride: a.stride,
                    positions: positions(a.steps).iter().map(|x| x.to_string()).collect(),
                })
                .collect(),
            sets: self.entries.len(),
            entries,
            advice: self.advice_lines(),
            notes: self.notes.clone(),
            interpolable: self.interpolable,
        })
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn alignment_follows_the_neighbour_and_pads_missing_sections() {
        let s1 = Sos { b: [1.0, 0.0, 0.0], a: [-1.9, 0.95] };
        let s2 = Sos { b: [0.5, 0.1, 0.0], a: [-0.5, 0.1] };
        let (same, moved) = align(Some(&[s1, s2]), vec![s2, s1], 2);
        assert_eq!(same, vec![s1, s2]);
        assert!(moved);
        let (padded, _) = align(None, vec![s1], 2);
        assert_eq!(padded, vec![s1, PASS]);
    }

    #[test]
    fn grid_neighbours_step_back_along_the_last_nonzero_axis() {
        let axes = [
            Axis { name: "a".into(), steps: 3, stride: 4 },
            Axis { name: "b".into(), steps: 4, stride: 1 },
        ];
        assert_eq!(neighbour(0, &axes), None);
        assert_eq!(neighbour(5, &axes), Some(4));
        assert_eq!(neighbour(8, &axes), Some(4));
    }

    #[test]
    fn a_midpoint_of_two_stable_sections_is_stable() {
        // Two corners near the triangle's edges; their average stays inside (convexity).
        let s = Sos { b: [1.0, 0.0, 0.0], a: [-1.98, 0.99] };
        let t = Sos { b: [1.0, 0.0, 0.0], a: [1.4, 0.5] };
        assert!(max_pole_radius(&[s]) < 1.0 && max_pole_radius(&[t]) < 1.0);
        assert!(max_pole_radius(&midpoint(&[s], &[t])) < 1.0);
        assert!(deviation_db(&[s], &[s], 48000.0) == 0.0);
    }
}
