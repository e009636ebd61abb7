//! Reading SVG figures back: path vertices, axis maps, curve elements.

// Each test binary that includes this file uses only some of it.
#![allow(dead_code)]

use tonewright::plot::AxisMap;

/// The vertices of path data written with `M` and `L` commands, split into subpaths.
pub fn subpaths(d: &str) -> Vec<Vec<(f64, f64)>> {
    let mut out: Vec<Vec<(f64, f64)>> = Vec::new();
    let mut words = d.split_whitespace();
    while let Some(word) = words.next() {
        let (command, x) = word.split_at(1);
        let y = words.next().expect("y after x");
        let point = (x.parse().unwrap(), y.parse().unwrap());
        match command {
            "M" => out.push(vec![point]),
            "L" => out.last_mut().expect("L after M").push(point),
            other => panic!("unexpected path command {other}"),
        }
    }
    out
}

pub fn plot_maps(doc: &roxmltree::Document) -> (AxisMap, AxisMap) {
    let plot = doc.descendants().find(|n| n.attribute("class") == Some("plot")).unwrap();
    (
        AxisMap::parse(plot.attribute("data-x-map").unwrap()).unwrap(),
        AxisMap::parse(plot.attribute("data-y-map").unwrap()).unwrap(),
    )
}

pub fn curve_paths<'a>(doc: &'a roxmltree::Document) -> Vec<roxmltree::Node<'a, 'a>> {
    doc.descendants()
        .filter(|n| n.has_tag_name("path") && n.attribute("class") == Some("curve"))
        .collect()
}
