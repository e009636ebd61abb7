//! Reading a design file into a [`Design`]: the TOML tree walked key by key.

use super::reader::{Field, Source, Table};
use super::schema::*;
use super::target;
use super::units::Quantity;
use crate::analog::families::{Band, Family};
use crate::analog::parametric::Shape;
use crate::error::{Error, Result};
use num_complex::Complex64;
use std::collections::BTreeMap;
use std::path::Path;

/// Largest number of stages in one list, and of parts in one circuit; larger designs
/// are refused before any work is done.
const MAX_STAGES: usize = 256;

/// Reads and validates a design file.
///
/// # Errors
/// An unreadable file, malformed TOML, or any invalid key, each as one line naming
/// `file:line` and the key.
pub fn load(path: &Path) -> Result<Design> {
    let bytes = std::fs::read(path).map_err(|e| Error::io(path, e))?;
    let text = String::from_utf8(bytes.clone()).map_err(|e| {
        let line =
            1 + bytes[..e.utf8_error().valid_up_to()].iter().filter(|&&b| b == b'\n').count();
        Error::input(format!("{}:{line}: not UTF-8 text", path.display()))
    })?;
    parse(&path.display().to_string(), &text, &bytes)
}

/// Parses design text; `name` is the file name shown in messages.
///
/// # Errors
/// As [`load`].
pub fn parse(name: &str, text: &str, bytes: &[u8]) -> Result<Design> {
    let src = Source::new(name.to_string(), text);
    let root = toml::de::DeTable::parse(text).map_err(|e| toml_error(&src, &e))?;
    let mut top = Table::new(&src, root.get_ref(), root.span(), String::new());
    let name_text = match top.get("name") {
        Some(f) => f.str()?,
        None => String::new(),
    };
    let notes = match top.get("notes") {
        Some(f) => f.str()?,
        None => String::new(),
    };
    let target = target::read(&mut top)?;
    let knobs = read_knobs(&mut top)?;
    let stages = match top.get("stage") {
        Some(f) => read_stage_list(&f, "stage")?,
        None => Vec::new(),
    };
    let paths = read_paths(&mut top)?;
    if stages.is_empty() {
        return Err(top.error("the design has no [[stage]]: add at least one stage"));
    }
    top.finish()?;
    let design = Design {
        name: name_text,
        notes,
        file: name.to_string(),
        hash: fnv1a_hex(bytes),
        target,
        knobs,
        stages,
        paths,
    };
    super::check::references(&design)?;
    Ok(design)
}

fn toml_error(src: &Source, e: &toml::de::Error) -> Error {
    let message = e.message().lines().next().unwrap_or("malformed TOML").trim().to_string();
    match e.span() {
        Some(span) => src.error(&span, "", format!("malformed TOML: {message}")),
        None => Error::input(format!("{}: malformed TOML: {message}", src.name)),
    }
}

/// FNV-1a, 64 bit (Fowler, Noll, Vo): a stable fingerprint of the design text.
fn fnv1a_hex(bytes: &[u8]) -> String {
    let hash = bytes.iter().fold(0xcbf2_9ce4_8422_2325u64, |h, &b| {
        (h ^ u64::from(b)).wrapping_mul(0x0000_0100_0000_01b3)
    });
    format!("{hash:016x}")
}

pub(super) fn place_of(field: &Field) -> Place {
    Place { file: field.src.name.clone(), line: field.line(), label: field.place.clone() }
}

pub(super) fn table_place(table: &Table) -> Place {
    Place { file: table.src().name.clone(), line: table.line(), label: table.place.clone() }
}

fn read_knobs(top: &mut Table) -> Result<BTreeMap<String, Knob>> {
    let mut knobs = BTreeMap::new();
    let Some(field) = top.get("knob") else { return Ok(knobs) };
    let mut all = field.table("knob".into())?;
    for name in all.keys() {
        let entry = all.require(&name)?;
        let mut t = entry.table(format!("knob.{name}"))?;
        let at = match t.get("at") {
            Some(f) => {
                let v = f.number(Quantity::Plain)?;
                if !(0.0..=1.0).contains(&v) {
                    return Err(f.error(format!("{v} must be a knob position from 0 to 1")));
                }
                v
            }
            None => 0.5,
        };
        let steps = match t.get("steps") {
            Some(f) => f.whole(2, 1025)? as usize,
            None => 33,
        };
        let place = table_place(&t);
        t.finish()?;
        knobs.insert(name, Knob { at, steps, place });
    }
    all.finish()?;
    Ok(knobs)
}

fn read_paths(top: &mut Table) -> Result<BTreeMap<String, Vec<Stage>>> {
    let mut paths = BTreeMap::new();
    let Some(field) = top.get("path") else { return Ok(paths) };
    let mut all = field.table("path".into())?;
    for name in all.keys() {
        let list = all.require(&name)?;
        let stages = read_stage_list(&list, &format!("path.{name}"))?;
        if stages.is_empty() {
            return Err(list.error(format!("path `{name}` has no stages")));
        }
        paths.insert(name, stages);
    }
    all.finish()?;
    Ok(paths)
}

fn read_stage_list(field: &Field, prefix: &str) -> Result<Vec<Stage>> {
    let items = field.array()?;
    if items.len() > MAX_STAGES {
        return Err(
            field.error(format!("{} stages is more than the limit of {MAX_STAGES}", items.len()))
        );
    }
    items
        .iter()
        .enumerate()
        .map(|(i, item)| {
            let mut t = item.table(format!("{prefix} {}", i + 1))?;
            let stage = read_stage(&mut t)?;
            t.finish()?;
            Ok(stage)
        })
        .collect()
}

fn read_stage(t: &mut Table) -> Result<Stage> {
    let kind_field = t.require("kind")?;
    let kind_name = kind_field.str()?;
    let place = Place { label: t.place.clone(), ..place_of(&kind_field) };
    let kind = match kind_name.as_str() {
        "circuit" => read_circuit(t)?,
        "prototype" => read_prototype(t)?,
        "transfer" => read_transfer(t)?,
        "sum" => read_sum(t)?,
        "gain" => StageKind::Gain { db: param(t.require("db")?, Quantity::Plain)? },
        other => match parse_shape(other) {
            Some(shape) => read_parametric(t, shape)?,
            None => {
                return Err(kind_field.error(format!(
                    "unknown stage kind `{other}` (expected circuit, lowpass, highpass, bandpass, \
                     notch, allpass, peak, lowshelf, highshelf, prototype, transfer, sum or gain)"
                )))
            }
        },
    };
    Ok(Stage { place, kind })
}

fn parse_shape(name: &str) -> Option<Shape> {
    Some(match name {
        "lowpass" => Shape::Lowpass,
        "highpass" => Shape::Highpass,
        "bandpass" => Shape::Bandpass,
        "notch" => Shape::Notch,
        "allpass" => Shape::Allpass,
        "peak" => Shape::Peak,
        "lowshelf" => Shape::Lowshelf,
        "highshelf" => Shape::Highshelf,
        _ => return None,
    })
}

/// A numeric parameter: a number, or `{ knob, from, to, taper }`.
fn param(field: Field, quantity: Quantity) -> Result<Param> {
    let place = place_of(&field);
    if !field.is_table() {
        return Ok(Param { value: ParamValue::Fixed(field.number(quantity)?), place });
    }
    let mut t = field.table(field.place.clone())?;
    let knob = t.require("knob")?.str()?;
    let from = t.require("from")?.number(quantity)?;
    let to = t.require("to")?.number(quantity)?;
    let taper = match t.get("taper") {
        Some(f) => match f.str()?.as_str() {
            "linear" => Taper::Linear,
            "log" => {
                if from * to <= 0.0 {
                    return Err(f.error(format!(
                        "a log taper needs `from` and `to` of the same sign, not {from} and {to}"
                    )));
                }
                Taper::Log
            }
            other => {
                return Err(f.error(format!(
                    "unknown taper `{other}` for a parameter (expected linear or log)"
                )))
            }
        },
        None => Taper::Linear,
    };
    t.finish()?;
    Ok(Param { value: ParamValue::Knob { knob, from, to, taper }, place })
}

fn read_parametric(t: &mut Table, shape: Shape) -> Result<StageKind> {
    let centred = matches!(shape, Shape::Bandpass | Shape::Notch | Shape::Peak);
    let order = match t.get("order") {
        Some(f) => {
            let order = f.whole(1, 2)? as usize;
            if order == 1 && centred {
                return Err(f.error("this kind is second order only: use order = 2"));
            }
            order
        }
        None => 2,
    };
    let freq = param(t.require("freq")?, Quantity::Frequency)?;
    let q = match t.get("q") {
        Some(f) if order == 1 => return Err(f.error("`q` applies to order 2 only")),
        Some(f) => param(f, Quantity::Plain)?,
        None => Param {
            value: ParamValue::Fixed(std::f64::consts::FRAC_1_SQRT_2),
            place: table_place(t),
        },
    };
    let with_gain = matches!(shape, Shape::Peak | Shape::Lowshelf | Shape::Highshelf);
    let gain_db = match t.get("gain_db") {
        Some(f) if !with_gain => return Err(f.error("`gain_db` applies to peak and shelves only")),
        Some(f) => Some(param(f, Quantity::Plain)?),
        None if with_gain => return Err(t.error("missing key `gain_db`")),
        None => None,
    };
    Ok(StageKind::Parametric { shape, order, freq, q, gain_db })
}

fn read_prototype(t: &mut Table) -> Result<StageKind> {
    let family_field = t.require("family")?;
    let family = match family_field.str()?.as_str() {
        "butterworth" => Family::Butterworth,
        "bessel" => Family::Bessel,
        "chebyshev" => {
            Family::Chebyshev { ripple_db: t.require("ripple_db")?.number(Quantity::Plain)? }
        }
        "inverse-chebyshev" => {
            Family::InverseChebyshev { stop_db: t.require("stop_db")?.number(Quantity::Plain)? }
        }
        "linkwitz-riley" => Family::LinkwitzRiley,
        other => {
            return Err(family_field.error(format!(
                "unknown family `{other}` (expected butterworth, bessel, chebyshev, \
                 inverse-chebyshev or linkwitz-riley)"
            )))
        }
    };
    let order_field = t.require("order")?;
    let order = order_field.whole(1, crate::analog::families::MAX_ORDER as i64)? as usize;
    let band_field = t.require("band")?;
    let band_name = band_field.str()?;
    let mut edges = Vec::new();
    let band = match band_name.as_str() {
        "lowpass" | "highpass" => {
            let f = t.require("freq")?;
            let hz = f.number(Quantity::Frequency)?;
            edges.push((hz, place_of(&f)));
            if band_name == "lowpass" {
                Band::Lowpass { hz }
            } else {
                Band::Highpass { hz }
            }
        }
        "bandpass" | "bandstop" => {
            let f = t.require("freqs")?;
            let items = f.array()?;
            let [lo, hi] = items.as_slice() else {
                return Err(f.error("expected two band edges `[lo, hi]`"));
            };
            let (lo_hz, hi_hz) = (lo.number(Quantity::Frequency)?, hi.number(Quantity::Frequency)?);
            if lo_hz >= hi_hz {
                return Err(
                    f.error(format!("band edges must rise: {lo_hz} Hz is not below {hi_hz} Hz"))
                );
            }
            edges.push((lo_hz, place_of(lo)));
            edges.push((hi_hz, place_of(hi)));
            if band_name == "bandpass" {
                Band::Bandpass { lo_hz, hi_hz }
            } else {
                Band::Bandstop { lo_hz, hi_hz }
            }
        }
        other => {
            return Err(band_field.error(format!(
                "unknown band `{other}` (expected lowpass, highpass, bandpass or bandstop)"
            )))
        }
    };
    // Validate family, band and order together now, so mistakes point at the stage.
    crate::analog::families::prototype(family, band, order).map_err(|e| t.error(e))?;
    Ok(StageKind::Prototype { family, band, order, edges })
}

fn read_transfer(t: &mut Table) -> Result<StageKind> {
    let coefs = |t: &mut Table, key: &str| -> Result<Vec<f64>> {
        let f = t.require(key)?;
        let items = f.array()?;
        if items.is_empty() || items.len() > 65 {
            return Err(f.error(format!("expected 1 to 65 coefficients, found {}", items.len())));
        }
        items.iter().map(|i| i.number(Quantity::Plain)).collect()
    };
    let roots = |t: &mut Table, key: &str| -> Result<Vec<Complex64>> {
        let Some(f) = t.get(key) else { return Ok(Vec::new()) };
        let items = f.array()?;
        if items.len() > 64 {
            return Err(f.error(format!("{} roots is more than the limit of 64", items.len())));
        }
        let mut out = Vec::new();
        for item in items {
            let pair = item.array()?;
            let [re, im] = pair.as_slice() else {
                return Err(item.error("expected a root as [re, im]"));
            };
            out.push(Complex64::new(re.number(Quantity::Plain)?, im.number(Quantity::Plain)?));
        }
        Ok(out)
    };
    if t.has("num") || t.has("den") {
        let num = coefs(t, "num")?;
        let den = coefs(t, "den")?;
        return Ok(StageKind::Transfer(Transfer::Coefficients { num, den }));
    }
    if !t.has("poles") {
        return Err(t.error(
            "missing key `den` (or `poles`): a transfer stage needs num/den or zeros/poles/gain",
        ));
    }
    let zeros = roots(t, "zeros")?;
    let poles = roots(t, "poles")?;
    let gain = match t.get("gain") {
        Some(f) => f.number(Quantity::Plain)?,
        None => 1.0,
    };
    Ok(StageKind::Transfer(Transfer::Roots { zeros, poles, gain }))
}

fn read_sum(t: &mut Table) -> Result<StageKind> {
    let paths_field = t.require("paths")?;
    let paths: Vec<String> = paths_field.array()?.iter().map(Field::str).collect::<Result<_>>()?;
    if paths.is_empty() {
        return Err(paths_field.error("a sum needs at least one path"));
    }
    let weights = match t.get("weights") {
        Some(f) => {
            let items = f.array()?;
            if items.len() != paths.len() {
                return Err(f.error(format!(
                    "{} weights for {} paths: give one weight per path",
                    items.len(),
                    paths.len()
                )));
            }
            items.into_iter().map(|i| param(i, Quantity::Plain)).collect::<Result<_>>()?
        }
        None => {
            let place = place_of(&paths_field);
            vec![Param { value: ParamValue::Fixed(1.0), place }; paths.len()]
        }
    };
    Ok(StageKind::Sum { paths, weights })
}

fn read_circuit(t: &mut Table) -> Result<StageKind> {
    let node = |t: &mut Table, key: &str, default: &str| -> Result<String> {
        match t.get(key) {
            Some(f) => f.str(),
            None => Ok(default.to_string()),
        }
    };
    let input = node(t, "input", "in")?;
    let output = node(t, "output", "out")?;
    let parts_field = t.require("parts")?;
    let items = parts_field.array()?;
    if items.is_empty() {
        return Err(parts_field.error("a circuit needs at least one part"));
    }
    if items.len() > crate::analog::circuit::MAX_PARTS {
        return Err(parts_field.error(format!(
            "{} parts is more than the limit of {}",
            items.len(),
            crate::analog::circuit::MAX_PARTS
        )));
    }
    let parts = items.iter().map(read_part).collect::<Result<_>>()?;
    Ok(StageKind::Circuit { input, output, parts })
}

fn read_part(item: &Field) -> Result<PartSpec> {
    let mut t = item.table(item.place.clone())?;
    let place = place_of(item);
    let kinds = ["r", "c", "l", "pot", "opamp", "amp"];
    let present: Vec<&str> = kinds.iter().copied().filter(|k| t.has(k)).collect();
    let [kind] = present.as_slice() else {
        return Err(item.error(format!(
            "a part needs exactly one of r, c, l, pot, opamp, amp (found {})",
            if present.is_empty() { "none".to_string() } else { present.join(", ") }
        )));
    };
    let nodes_field = t.require("nodes")?;
    let nodes: Vec<String> = nodes_field.array()?.iter().map(Field::str).collect::<Result<_>>()?;
    let want = match *kind {
        "pot" | "opamp" => 3,
        _ => 2,
    };
    if nodes.len() != want {
        return Err(
            nodes_field.error(format!("a {kind} part takes {want} nodes, found {}", nodes.len()))
        );
    }
    if let Some(empty) = nodes.iter().find(|n| n.trim().is_empty()) {
        return Err(nodes_field.error(format!("node name `{empty}` is empty")));
    }
    let two = || [nodes[0].clone(), nodes[1].clone()];
    let three = || [nodes[0].clone(), nodes[1].clone(), nodes[2].clone()];
    let positive = |f: Field, q: Quantity| -> Result<f64> {
        let v = f.number(q)?;
        if v > 0.0 {
            Ok(v)
        } else {
            Err(f.error(format!("{v}{} must be positive", q.symbol())))
        }
    };
    let element = match *kind {
        "r" => PartElement::Resistor(positive(t.require("r")?, Quantity::Resistance)?, two()),
        "c" => PartElement::Capacitor(positive(t.require("c")?, Quantity::Capacitance)?, two()),
        "l" => PartElement::Inductor(positive(t.require("l")?, Quantity::Inductance)?, two()),
        "pot" => {
            let ohms = positive(t.require("pot")?, Quantity::Resistance)?;
            let taper = match t.get("taper") {
                Some(f) => match f.str()?.as_str() {
                    "linear" => Taper::Linear,
                    "log" => Taper::Log,
                    "antilog" => Taper::Antilog,
                    other => {
                        return Err(f.error(format!(
                            "unknown taper `{other}` (expected linear, log or antilog)"
                        )))
                    }
                },
                None => Taper::Linear,
            };
            let knob = match t.get("knob") {
                Some(f) => f.str()?,
                None => {
                    return Err(
                        item.error("a pot needs `knob = \"NAME\"` to say which control turns it")
                    )
                }
            };
            PartElement::Pot { ohms, nodes: three(), taper, knob }
        }
        "opamp" => PartElement::OpAmp(t.require("opamp")?.str()?, three()),
        "amp" => {
            let f = t.require("amp")?;
            let gain = f.number(Quantity::Plain)?;
            if gain == 0.0 {
                return Err(f.error("an amp gain of 0 disconnects the circuit"));
            }
            PartElement::Amp(gain, two())
        }
        _ => unreachable!("kinds list above"),
    };
    t.finish()?;
    Ok(PartSpec { place, element })
}
