//! The figures of a design: the plotted points are the computed responses, the z plane
//! holds the quantized roots, a sweep draws every position, and the committed README
//! figure is what the tool draws today.

mod common;
#[path = "common/svg.rs"]
mod svg;

use common::repo;
use svg::{curve_paths, plot_maps, subpaths};
use tonewright::analysis::response::to_db;
use tonewright::design;
use tonewright::pipeline::port;
use tonewright::plot::design::figures;

fn demo_figures(
    name: &str,
    sweep: Option<&str>,
) -> (tonewright::pipeline::Port, Vec<(String, String)>) {
    let d = design::load(&repo(&format!("audio-demos/{name}.toml"))).unwrap();
    let number = d.target.number;
    let p = port(d, &[], 48000.0).unwrap();
    let figs = figures(&p, number, sweep).unwrap();
    (p, figs)
}

fn figure<'a>(figs: &'a [(String, String)], name: &str) -> &'a str {
    &figs.iter().find(|(n, _)| n == name).unwrap_or_else(|| panic!("no {name}")).1
}

#[test]
fn plotted_float_magnitude_is_the_cascade_response_within_drawing_resolution() {
    // Read every vertex of the float64 curve back through the axis maps and compare with
    // |H(e^{jω})| of the cascade: within half a pixel vertically, plus what half a pixel
    // of horizontal rounding moves a steep curve.
    let (p, figs) = demo_figures("two-knob-tone", None);
    let svg = figure(&figs, "magnitude.svg");
    let doc = roxmltree::Document::parse(svg).unwrap();
    let (xm, ym) = plot_maps(&doc);
    let path = curve_paths(&doc)
        .into_iter()
        .find(|n| n.attribute("data-label") == Some("float64"))
        .unwrap();
    let db = |hz: f64| to_db(p.cascade.response_at_hz(hz));
    let mut checked = 0;
    for (px, py) in subpaths(path.attribute("d").unwrap()).into_iter().flatten() {
        let hz = xm.px_to_data(px);
        let half_x = 0.5 * xm.data_per_px_at(hz);
        let slope = (db(hz + half_x) - db(hz - half_x)).abs();
        let tolerance = 0.5 * ym.data_per_px_at(0.0).abs() + slope;
        let got = ym.px_to_data(py);
        assert!((got - db(hz)).abs() <= tolerance, "{hz} Hz: plotted {got}, computed {}", db(hz));
        checked += 1;
    }
    assert!(checked > 500, "only {checked} vertices");
}

#[test]
fn every_standard_figure_is_drawn_and_the_z_plane_shows_the_quantized_roots() {
    let (_, figs) = demo_figures("hum-reject-50", None);
    let names: Vec<&str> = figs.iter().map(|(n, _)| n.as_str()).collect();
    assert_eq!(
        names,
        [
            "magnitude.svg",
            "phase.svg",
            "group-delay.svg",
            "stages.svg",
            "z-plane.svg",
            "quantization-error.svg"
        ]
    );
    let z = figure(&figs, "z-plane.svg");
    assert!(z.contains("fixed c32/d24/a64"), "the quantized set is labelled");
    let doc = roxmltree::Document::parse(z).unwrap();
    let panels = doc.descendants().filter(|n| n.attribute("class") == Some("panel")).count();
    assert_eq!(panels, 2, "poles crowd z = 1, so a zoomed panel is added");
    let stages = roxmltree::Document::parse(figure(&figs, "stages.svg")).unwrap();
    assert_eq!(curve_paths(&stages).len(), 4, "one cumulative curve per stage");
}

#[test]
fn a_knob_sweep_draws_nine_positions() {
    let (_, figs) = demo_figures("two-knob-tone", Some("treble"));
    let doc = roxmltree::Document::parse(figure(&figs, "sweep-treble.svg")).unwrap();
    assert_eq!(curve_paths(&doc).len(), 9);
}

#[test]
fn the_readme_figure_is_what_the_tool_draws() {
    // Figures are reproducible byte for byte; regenerate with
    // `tonewright plot audio-demos/hum-reject-50.toml -o DIR` and copy magnitude.svg.
    let (_, figs) = demo_figures("hum-reject-50", None);
    let committed =
        std::fs::read_to_string(repo("audio-demos/figures/hum-reject-50-magnitude.svg")).unwrap();
    assert!(figure(&figs, "magnitude.svg") == committed, "README figure is stale");
}
