//! SVG figures: well-formed XML, labelled axes, one path per curve, points that read
//! back to the input data, reproducible bytes, no NaN text.

use num_complex::Complex64;
use std::path::PathBuf;

#[path = "common/svg.rs"]
mod svg;
use svg::{curve_paths, plot_maps, subpaths};
use tonewright::plot::{
    frequency_svg, write_svg, zplane_svg, AxisMap, Curve, CurveStyle, FrequencyFigure, Marker,
    RootSet, RootStyle, ZPlaneFigure,
};

/// 20·log10|H(j f)| of a second-order low-pass with corner `fc` and quality `q`.
fn lowpass_db(f: f64, fc: f64, q: f64) -> f64 {
    let w = f / fc;
    let re = 1.0 - w * w;
    let im = w / q;
    -10.0 * (re * re + im * im).log10()
}

fn log_space(lo: f64, hi: f64, n: usize) -> Vec<f64> {
    (0..n).map(|i| lo * (hi / lo).powf(i as f64 / (n - 1) as f64)).collect()
}

fn magnitude_figure() -> FrequencyFigure {
    let freqs = log_space(20.0, 20000.0, 400);
    let curve = |label: &str, style, q| Curve {
        label: label.to_string(),
        points: freqs.iter().map(|&f| (f, lowpass_db(f, 1000.0, q))).collect(),
        style,
    };
    FrequencyFigure {
        title: "tone-lp — 48 kHz, Q1.15".into(),
        y_label: "magnitude (dB)".into(),
        curves: vec![
            curve("analog", CurveStyle::Analog, std::f64::consts::FRAC_1_SQRT_2),
            curve("float", CurveStyle::Float, std::f64::consts::FRAC_1_SQRT_2),
            curve("fixed <Q1.15>", CurveStyle::Fixed, 0.69),
        ],
        markers: vec![Marker { x: 1000.0, label: "stage 1: 1 kHz".into() }],
        x_range: (20.0, 20000.0),
        y_range: Some((-60.0, 10.0)),
    }
}

#[test]
fn frequency_figure_is_xml_with_unit_labels_legend_and_one_path_per_curve() {
    let fig = magnitude_figure();
    let svg = frequency_svg(&fig).unwrap();
    let doc = roxmltree::Document::parse(&svg).expect("svg parses as xml");
    let texts: Vec<&str> =
        doc.descendants().filter(|n| n.has_tag_name("text")).filter_map(|n| n.text()).collect();
    for want in ["frequency (Hz)", "magnitude (dB)", "tone-lp — 48 kHz, Q1.15", "stage 1: 1 kHz"]
    {
        assert!(texts.contains(&want), "missing text {want:?} in {texts:?}");
    }
    for tick in ["20", "50", "100", "200", "500", "1k", "2k", "5k", "10k", "20k"] {
        assert!(texts.contains(&tick), "missing tick label {tick}");
    }
    let legend: Vec<&str> = doc
        .descendants()
        .filter(|n| n.attribute("class") == Some("legend-label"))
        .filter_map(|n| n.text())
        .collect();
    assert_eq!(legend, ["analog", "float", "fixed <Q1.15>", "stage frequency"]);
    let paths = curve_paths(&doc);
    let labels: Vec<&str> = paths.iter().map(|p| p.attribute("data-label").unwrap()).collect();
    assert_eq!(labels, ["analog", "float", "fixed <Q1.15>"]);
    let styles: Vec<&str> = paths.iter().map(|p| p.attribute("data-style").unwrap()).collect();
    assert_eq!(styles, ["analog", "float", "fixed"]);
    let markers = doc.descendants().filter(|n| n.attribute("class") == Some("marker")).count();
    assert_eq!(markers, 1);
}

#[test]
fn points_read_back_from_the_path_equal_the_input_within_half_a_pixel() {
    let fig = magnitude_figure();
    let svg = frequency_svg(&fig).unwrap();
    let doc = roxmltree::Document::parse(&svg).unwrap();
    let (x_map, y_map) = plot_maps(&doc);
    // Half a pixel in data units: a ratio on the log axis, a difference on the linear one.
    let half_px_ratio = x_map.px_to_data(x_map.px_from + 0.5) / x_map.data_min;
    let half_px_y = 0.5 * (y_map.data_max - y_map.data_min) / (y_map.px_from - y_map.px_to).abs();
    for (curve, path) in fig.curves.iter().zip(curve_paths(&doc)) {
        let parts = subpaths(path.attribute("d").unwrap());
        assert_eq!(parts.len(), 1, "{}: a curve inside the plot is one subpath", curve.label);
        let vertices = &parts[0];
        assert_eq!(vertices.len(), curve.points.len());
        for (i, (&(px, py), &(f, y))) in vertices.iter().zip(&curve.points).enumerate().step_by(7) {
            let (f_back, y_back) = (x_map.px_to_data(px), y_map.px_to_data(py));
            let ratio = (f_back / f).max(f / f_back);
            assert!(
                ratio <= half_px_ratio,
                "{} point {i}: {f} Hz read back as {f_back}",
                curve.label
            );
            assert!(
                (y_back - y).abs() <= half_px_y,
                "{} point {i}: {y} read back as {y_back}",
                curve.label
            );
        }
    }
}

#[test]
fn identical_inputs_give_identical_bytes() {
    let fig = magnitude_figure();
    assert_eq!(frequency_svg(&fig).unwrap(), frequency_svg(&fig.clone()).unwrap());
    let z = zplane_figure();
    assert_eq!(zplane_svg(&z), zplane_svg(&z.clone()));
}

#[test]
fn non_finite_points_leave_a_gap_and_no_nan_text() {
    let mut fig = magnitude_figure();
    fig.y_range = None;
    let points = &mut fig.curves[1].points;
    points[100].1 = f64::NAN;
    points[200].1 = f64::INFINITY;
    points[300].0 = f64::NAN;
    fig.curves.push(Curve {
        label: "all missing".into(),
        points: vec![(f64::NAN, f64::NAN); 5],
        style: CurveStyle::Error,
    });
    fig.markers.push(Marker { x: f64::NAN, label: "nowhere".into() });
    let svg = frequency_svg(&fig).unwrap();
    let lower = svg.to_lowercase();
    assert!(!lower.contains("nan") && !lower.contains("inf"), "non-finite text in svg");
    let doc = roxmltree::Document::parse(&svg).unwrap();
    let paths = curve_paths(&doc);
    assert_eq!(
        subpaths(paths[1].attribute("d").unwrap()).len(),
        4,
        "three gaps make four subpaths"
    );
    assert_eq!(paths[3].attribute("d"), Some(""));
}

#[test]
fn a_fitted_y_range_holds_every_finite_point_in_round_numbers() {
    let mut fig = magnitude_figure();
    fig.y_range = None;
    let svg = frequency_svg(&fig).unwrap();
    let doc = roxmltree::Document::parse(&svg).unwrap();
    let (_, y_map) = plot_maps(&doc);
    let lowest =
        fig.curves.iter().flat_map(|c| c.points.iter().map(|p| p.1)).fold(f64::INFINITY, f64::min);
    assert!(y_map.data_min <= lowest && y_map.data_max >= 0.0, "{y_map:?}");
    assert_eq!(y_map.data_min % 10.0, 0.0, "{y_map:?}");
}

#[test]
fn a_bad_x_range_is_an_error_naming_the_figure() {
    let mut fig = magnitude_figure();
    fig.x_range = (0.0, 20000.0);
    let err = frequency_svg(&fig).unwrap_err().to_string();
    assert!(err.contains("tone-lp") && err.contains("x range"), "{err}");
    fig.x_range = (1e-9, 1e9);
    assert!(frequency_svg(&fig).unwrap_err().to_string().contains("decades"));
    fig.x_range = (20.0, 20000.0);
    fig.y_range = Some((1.0, f64::NAN));
    assert!(frequency_svg(&fig).is_err());
}

fn zplane_figure() -> ZPlaneFigure {
    let c = Complex64::new;
    ZPlaneFigure {
        title: "hum-notch — 96 kHz, Q1.15".into(),
        sets: vec![
            RootSet {
                label: "ideal".into(),
                poles: vec![c(0.9987, 0.0013), c(0.9987, -0.0013), c(0.5, 0.6)],
                zeros: vec![c(-1.0, 0.0), c(0.99999, 0.0039), c(0.99999, -0.0039)],
                style: RootStyle::Ideal,
            },
            RootSet {
                label: "quantized".into(),
                poles: vec![c(0.99875, 0.0012), c(0.99875, -0.0012), c(0.5, 0.6), c(f64::NAN, 0.0)],
                zeros: vec![c(-1.0, 0.0), c(1.0, 0.0039), c(1.0, -0.0039), c(50.0, 0.0)],
                style: RootStyle::Quantized,
            },
        ],
        zoom_near_one: true,
    }
}

#[test]
fn zplane_figure_has_circle_two_panels_and_distinguishable_root_sets() {
    let fig = zplane_figure();
    let svg = zplane_svg(&fig);
    assert!(!svg.to_lowercase().contains("nan"));
    let doc = roxmltree::Document::parse(&svg).expect("svg parses as xml");
    let panels: Vec<_> =
        doc.descendants().filter(|n| n.attribute("class") == Some("panel")).collect();
    assert_eq!(
        panels.iter().map(|p| p.attribute("data-panel").unwrap()).collect::<Vec<_>>(),
        ["whole", "zoom"]
    );
    for panel in &panels {
        assert_eq!(
            panel.descendants().filter(|n| n.attribute("class") == Some("unit-circle")).count(),
            1
        );
        let styles: Vec<&str> = panel
            .descendants()
            .filter(|n| n.attribute("class") == Some("roots"))
            .map(|n| n.attribute("data-style").unwrap())
            .collect();
        assert_eq!(styles, ["ideal", "quantized"]);
    }
    let texts: Vec<&str> = doc.descendants().filter_map(|n| n.text()).collect();
    assert!(texts.contains(&"real part") && texts.contains(&"imaginary part"));
    assert!(texts.contains(&"1 root outside this view"), "the zero at z = 50 is counted");

    // The zoom panel is fitted to the roots near z = 1: each of its pole crosses is
    // centred on a pole within half a pixel.
    let zoom = panels[1];
    let x_map = AxisMap::parse(zoom.attribute("data-x-map").unwrap()).unwrap();
    let y_map = AxisMap::parse(zoom.attribute("data-y-map").unwrap()).unwrap();
    assert!(x_map.data_max - x_map.data_min < 0.02, "zoom box {x_map:?}");
    let ideal_poles = zoom
        .descendants()
        .find(|n| n.attribute("data-style") == Some("ideal"))
        .and_then(|g| g.children().find(|n| n.attribute("class") == Some("poles")))
        .unwrap();
    let strokes = subpaths(ideal_poles.attribute("d").unwrap());
    assert_eq!(strokes.len(), 4, "two poles in view, two strokes each");
    let half_px = 0.5 * (x_map.data_max - x_map.data_min) / (x_map.px_to - x_map.px_from);
    for (stroke, want) in strokes.iter().step_by(2).zip(&fig.sets[0].poles) {
        let centre = ((stroke[0].0 + stroke[1].0) / 2.0, (stroke[0].1 + stroke[1].1) / 2.0);
        assert!((x_map.px_to_data(centre.0) - want.re).abs() <= half_px);
        assert!((y_map.px_to_data(centre.1) - want.im).abs() <= half_px);
    }
}

#[test]
fn write_svg_writes_the_file_and_refuses_a_protected_path() {
    let dir = std::env::temp_dir().join(format!("tonewright-plot-{}", std::process::id()));
    std::fs::create_dir_all(&dir).unwrap();
    let path: PathBuf = dir.join("magnitude.svg");
    let svg = frequency_svg(&magnitude_figure()).unwrap();
    write_svg(&path, &svg, &[]).unwrap();
    assert_eq!(std::fs::read_to_string(&path).unwrap(), svg);
    let err = write_svg(&path, "x", &[&path]).unwrap_err().to_string();
    assert!(err.contains("magnitude.svg"), "{err}");
    std::fs::remove_dir_all(&dir).unwrap();
}
