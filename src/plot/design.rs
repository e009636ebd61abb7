//! The figures of one design: what `tonewright plot` and `audition` draw.
//!
//! Magnitude (analog, float, target arithmetic) with stage markers; unwrapped phase;
//! group delay; the cascade stage by stage (cumulative analog response after each
//! stage); the z plane, ideal against target; the target's error against float; and
//! optionally a family of magnitude responses over one knob's travel.

use super::{
    frequency_svg, zplane_svg, Curve, CurveStyle, FrequencyFigure, Marker, RootSet, RootStyle,
    ZPlaneFigure,
};
use crate::analog::AnalogZpk;
use crate::analysis::response::{analog_point, digital_point, log_grid, to_db, unwrap_degrees};
use crate::error::{Error, Result};
use crate::pipeline::{port, realize, Port, Realized};
use crate::quantize::NumberFormat;
use crate::report::fmt_hz;
use crate::report::inspect::number_name;
use crate::sections::{poles, zeros, Cascade};

/// Points per curve: dense enough that narrow notches show their depth.
const POINTS: usize = 1200;
/// Knob positions drawn by a sweep.
const SWEEP_POSITIONS: usize = 9;
/// A pole this close to z = 1 makes the z-plane figure add a zoomed panel.
const CROWDING: f64 = 0.05;

/// One figure: its file name and SVG text.
pub type Figure = (String, String);

/// The standard figures of a port in a number format, plus a knob sweep if asked.
///
/// # Errors
/// A format that cannot hold the coefficients, an unknown sweep knob, or a knob
/// position whose design is invalid.
pub fn figures(port_: &Port, number: NumberFormat, sweep: Option<&str>) -> Result<Vec<Figure>> {
    let rate = port_.rate;
    let structure = port_.design.target.structure;
    let realized = realize(&port_.cascade, number, structure)?;
    let effective = realized.effective(rate)?;
    let target_label = number_name(number);
    let name = if port_.design.name.is_empty() {
        port_.design.file.clone()
    } else {
        port_.design.name.clone()
    };
    let title = |what: &str| format!("{what}: {name} ({} Hz, {target_label})", rate);
    let x_range = (10.0f64.min(rate / 20.0), 0.5 * rate);
    let grid = log_grid(x_range.0, x_range.1 * 0.9999, POINTS);
    let markers: Vec<Marker> = port_
        .analog
        .sections()
        .iter()
        .map(|s| s.natural_hz)
        .filter(|&f| f > 0.0 && f < x_range.1)
        .map(|f| Marker { x: f, label: fmt_hz(f) })
        .collect();
    let analog = &port_.analog.zpk;
    let curve = |label: &str, style, f: &dyn Fn(f64) -> f64| Curve {
        label: label.to_string(),
        points: grid.iter().map(|&hz| (hz, f(hz))).collect(),
        style,
    };
    let fixed_is_float64 = matches!(realized, Realized::F64(_));
    let mut magnitude_curves = vec![
        curve("analog", CurveStyle::Analog, &|hz| analog_point(analog, hz).db),
        curve("float64", CurveStyle::Float, &|hz| to_db(port_.cascade.response_at_hz(hz))),
    ];
    if !fixed_is_float64 {
        magnitude_curves.push(curve(&target_label, CurveStyle::Fixed, &|hz| {
            to_db(effective.response_at_hz(hz))
        }));
    }
    let mut out = vec![(
        "magnitude.svg".to_string(),
        frequency_svg(&FrequencyFigure {
            title: title("magnitude"),
            y_label: "magnitude (dB)".into(),
            curves: magnitude_curves,
            markers: markers.clone(),
            x_range,
            y_range: None,
        })?,
    )];

    let unwrapped = |points: Vec<(f64, f64)>| -> Vec<(f64, f64)> {
        let mut p: Vec<_> = points
            .into_iter()
            .map(|(hz, deg)| crate::analysis::response::ResponsePoint {
                hz,
                db: 0.0,
                phase_deg: deg,
                delay_s: 0.0,
            })
            .collect();
        unwrap_degrees(&mut p);
        p.into_iter().map(|q| (q.hz, q.phase_deg)).collect()
    };
    let phase_of = |f: &dyn Fn(f64) -> f64| unwrapped(grid.iter().map(|&hz| (hz, f(hz))).collect());
    let mut phase_curves = vec![
        Curve {
            label: "analog".into(),
            points: phase_of(&|hz| analog_point(analog, hz).phase_deg),
            style: CurveStyle::Analog,
        },
        Curve {
            label: "float64".into(),
            points: phase_of(&|hz| port_.cascade.response_at_hz(hz).arg().to_degrees()),
            style: CurveStyle::Float,
        },
    ];
    if !fixed_is_float64 {
        phase_curves.push(Curve {
            label: target_label.clone(),
            points: phase_of(&|hz| effective.response_at_hz(hz).arg().to_degrees()),
            style: CurveStyle::Fixed,
        });
    }
    out.push((
        "phase.svg".into(),
        frequency_svg(&FrequencyFigure {
            title: title("phase"),
            y_label: "phase (degrees, unwrapped)".into(),
            curves: phase_curves,
            markers: markers.clone(),
            x_range,
            y_range: None,
        })?,
    ));

    let digital = &port_.digital.zpk;
    out.push((
        "group-delay.svg".into(),
        frequency_svg(&FrequencyFigure {
            title: title("group delay"),
            y_label: format!("group delay (ms; 1 ms = {:.0} samples)", rate / 1000.0),
            curves: vec![
                curve("analog", CurveStyle::Analog, &|hz| analog_point(analog, hz).delay_s * 1e3),
                curve("float64", CurveStyle::Float, &|hz| digital_point(digital, hz).delay_s * 1e3),
            ],
            markers: markers.clone(),
            x_range,
            y_range: None,
        })?,
    ));

    let mut cumulative = AnalogZpk { zeros: vec![], poles: vec![], gain: 1.0 };
    let mut stage_curves = Vec::new();
    for (i, stage) in port_.analog.stages.iter().enumerate() {
        cumulative = cumulative.cascade(&stage.zpk);
        let upto = cumulative.clone();
        stage_curves.push(curve(
            &format!("after {}", stage.label),
            CurveStyle::Stage(i),
            &move |hz| analog_point(&upto, hz).db,
        ));
    }
    out.push((
        "stages.svg".into(),
        frequency_svg(&FrequencyFigure {
            title: title("stage by stage"),
            y_label: "magnitude after each stage (dB)".into(),
            curves: stage_curves,
            markers: markers.clone(),
            x_range,
            y_range: None,
        })?,
    ));

    let roots = |c: &Cascade, label: &str, style| RootSet {
        label: label.to_string(),
        poles: c.sections.iter().flat_map(poles).collect(),
        zeros: c.sections.iter().flat_map(zeros).collect(),
        style,
    };
    let mut sets = vec![roots(&port_.cascade, "float64", RootStyle::Ideal)];
    if !fixed_is_float64 {
        sets.push(roots(&effective, &target_label, RootStyle::Quantized));
    }
    let crowded = sets[0].poles.iter().any(|p| (p - 1.0).norm() < CROWDING);
    out.push((
        "z-plane.svg".into(),
        zplane_svg(&ZPlaneFigure { title: title("z plane"), sets, zoom_near_one: crowded }),
    ));

    if !fixed_is_float64 {
        out.push((
            "quantization-error.svg".into(),
            frequency_svg(&FrequencyFigure {
                title: title("quantization error"),
                y_label: format!("{target_label} minus float64 (dB)"),
                curves: vec![curve("error", CurveStyle::Error, &|hz| {
                    to_db(effective.response_at_hz(hz)) - to_db(port_.cascade.response_at_hz(hz))
                })],
                markers: markers.clone(),
                x_range,
                y_range: None,
            })?,
        ));
    }

    if let Some(knob) = sweep {
        out.push(sweep_figure(port_, knob, &grid, x_range, &title(&format!("knob {knob}")))?);
    }
    Ok(out)
}

/// Float64 magnitude responses at evenly spaced positions of one knob.
fn sweep_figure(
    port_: &Port,
    knob: &str,
    grid: &[f64],
    x_range: (f64, f64),
    title: &str,
) -> Result<Figure> {
    if !port_.design.knobs.contains_key(knob) {
        let known: Vec<&str> = port_.design.knobs.keys().map(String::as_str).collect();
        return Err(Error::input(format!(
            "--sweep {knob}: {} has no such knob (knobs: {})",
            port_.design.file,
            if known.is_empty() { "none".into() } else { known.join(", ") }
        )));
    }
    let others: Vec<String> = port_
        .knobs
        .0
        .iter()
        .filter(|(k, _)| k.as_str() != knob)
        .map(|(k, v)| format!("{k}={v}"))
        .collect();
    let mut curves = Vec::new();
    for i in 0..SWEEP_POSITIONS {
        let pos = i as f64 / (SWEEP_POSITIONS - 1) as f64;
        let mut settings = others.clone();
        settings.push(format!("{knob}={pos}"));
        let at = port(port_.design.clone(), &settings, port_.rate)?;
        curves.push(Curve {
            label: format!("{knob} = {pos:.3}"),
            points: grid.iter().map(|&hz| (hz, to_db(at.cascade.response_at_hz(hz)))).collect(),
            style: CurveStyle::Stage(i),
        });
    }
    let svg = frequency_svg(&FrequencyFigure {
        title: title.to_string(),
        y_label: "magnitude (dB)".into(),
        curves,
        markers: Vec::new(),
        x_range,
        y_range: None,
    })?;
    Ok((format!("sweep-{knob}.svg"), svg))
}
