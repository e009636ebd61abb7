//! Rules across keys: every knob and path named exists, and no path contains itself.

use super::schema::*;
use crate::error::Result;

/// Checks that knobs and paths referenced by stages exist and that paths do not recurse.
///
/// # Errors
/// The first unknown knob, unknown path or recursive path, at its place.
pub fn references(design: &Design) -> Result<()> {
    let all_stages = design.stages.iter().chain(design.paths.values().flatten());
    for stage in all_stages {
        for (knob, place) in knob_uses(stage) {
            if !design.knobs.contains_key(knob) {
                let known: Vec<&str> = design.knobs.keys().map(String::as_str).collect();
                let hint = if known.is_empty() {
                    format!("add a [knob.{knob}] table")
                } else {
                    format!("defined knobs: {}", known.join(", "))
                };
                return Err(place.error(format!("unknown knob `{knob}` ({hint})")));
            }
        }
        if let StageKind::Sum { paths, .. } = &stage.kind {
            for name in paths {
                if !design.paths.contains_key(name) {
                    return Err(stage
                        .place
                        .error(format!("unknown path `{name}`: add [[path.{name}]] stages")));
                }
            }
        }
    }
    for name in design.paths.keys() {
        let mut trail = vec![name.as_str()];
        no_cycle(design, name, &mut trail)?;
    }
    Ok(())
}

fn no_cycle<'d>(design: &'d Design, path: &str, trail: &mut Vec<&'d str>) -> Result<()> {
    for stage in &design.paths[path] {
        if let StageKind::Sum { paths, .. } = &stage.kind {
            for inner in paths {
                if trail.contains(&inner.as_str()) {
                    return Err(stage.place.error(format!(
                        "path `{inner}` contains itself ({} -> {inner})",
                        trail.join(" -> ")
                    )));
                }
                trail.push(inner);
                no_cycle(design, inner, trail)?;
                trail.pop();
            }
        }
    }
    Ok(())
}

fn from_param(p: &Param) -> Option<(&str, &Place)> {
    match &p.value {
        ParamValue::Knob { knob, .. } => Some((knob.as_str(), &p.place)),
        ParamValue::Fixed(_) => None,
    }
}

/// Every knob a stage refers to, with the place of the reference.
fn knob_uses(stage: &Stage) -> Vec<(&str, &Place)> {
    match &stage.kind {
        StageKind::Circuit { parts, .. } => parts
            .iter()
            .filter_map(|p| match &p.element {
                PartElement::Pot { knob, .. } => Some((knob.as_str(), &p.place)),
                _ => None,
            })
            .collect(),
        StageKind::Parametric { freq, q, gain_db, .. } => [Some(freq), Some(q), gain_db.as_ref()]
            .into_iter()
            .flatten()
            .filter_map(from_param)
            .collect(),
        StageKind::Sum { weights, .. } => weights.iter().filter_map(from_param).collect(),
        StageKind::Gain { db } => from_param(db).into_iter().collect(),
        StageKind::Prototype { .. } | StageKind::Transfer(_) => Vec::new(),
    }
}
