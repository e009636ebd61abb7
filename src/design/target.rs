//! The `[target]` table: rate, number format, structure, prewarp and scaling.

use super::load::table_place;
use super::reader::Table;
use super::schema::{Scaling, Target};
use super::units::Quantity;
use crate::discretize::Prewarp;
use crate::error::Result;
use crate::quantize::{FixedFormat, NumberFormat, Overflow, Rounding, Structure};

/// Reads `[target]` (every key optional) from the top-level table.
///
/// # Errors
/// Unknown keys or values, each naming `target.KEY`.
pub fn read(top: &mut Table) -> Result<Target> {
    let field = top.get("target");
    let mut t = match &field {
        Some(f) => f.table("target".into())?,
        None => {
            return Ok(Target {
                rate: None,
                prewarp: Prewarp::Each,
                scaling: Scaling::Linf,
                number: NumberFormat::F64,
                structure: Structure::Df1,
                place: table_place(top),
            })
        }
    };
    let place = table_place(&t);
    let rate = match t.get("rate") {
        Some(f) => {
            let hz = f.number(Quantity::Frequency)?;
            if !(1000.0..=1_536_000.0).contains(&hz) {
                return Err(f.error(format!("{hz} Hz must be from 1000 to 1536000 Hz")));
            }
            Some(hz)
        }
        None => None,
    };
    let prewarp = match t.get("prewarp") {
        None => Prewarp::Each,
        Some(f) => match f.str().ok().as_deref() {
            Some("each") => Prewarp::Each,
            Some("none") => Prewarp::None,
            _ => {
                let hz = f
                    .number(Quantity::Frequency)
                    .map_err(|_| f.error("expected \"each\", \"none\" or a frequency in Hz"))?;
                if hz <= 0.0 {
                    return Err(f.error(format!("{hz} Hz must be positive")));
                }
                Prewarp::AtHz(hz)
            }
        },
    };
    let scaling = match t.get("scaling") {
        None => Scaling::Linf,
        Some(f) => match f.str()?.as_str() {
            "none" => Scaling::None,
            "linf" => Scaling::Linf,
            "l2" => Scaling::L2,
            "l1" => Scaling::L1,
            other => {
                return Err(
                    f.error(format!("unknown scaling `{other}` (expected none, linf, l2 or l1)"))
                )
            }
        },
    };
    let structure = match t.get("structure") {
        None => Structure::Df1,
        Some(f) => Structure::parse("target.structure", &f.str()?).map_err(|e| f.bare_error(e))?,
    };
    let mut number = match t.get("number") {
        None => NumberFormat::F64,
        Some(f) => NumberFormat::parse("target.number", &f.str()?).map_err(|e| f.bare_error(e))?,
    };
    if let Some(f) = t.get("fixed") {
        let mut fixed = f.table("target.fixed".into())?;
        let format = read_fixed(&mut fixed)?;
        format.validate_for(structure).map_err(|e| fixed.bare_error(e))?;
        number = NumberFormat::Fixed(format);
        fixed.finish()?;
    }
    t.finish()?;
    Ok(Target { rate, prewarp, scaling, number, structure, place })
}

fn read_fixed(t: &mut Table) -> Result<FixedFormat> {
    let mut format = FixedFormat::q15();
    let whole = |t: &mut Table, key: &str, lo: i64, hi: i64| -> Result<Option<u32>> {
        t.get(key).map(|f| f.whole(lo, hi).map(|v| v as u32)).transpose()
    };
    if let Some(v) = whole(t, "coef_bits", 2, 64)? {
        format.coef_bits = v;
    }
    format.coef_frac = whole(t, "coef_frac", 0, 64)?;
    if let Some(v) = whole(t, "data_bits", 2, 64)? {
        format.data_bits = v;
    }
    if let Some(v) = whole(t, "acc_bits", 2, 128)? {
        format.acc_bits = v;
    }
    if let Some(v) = whole(t, "error_feedback", 0, 2)? {
        format.error_feedback = v;
    }
    if let Some(f) = t.get("rounding") {
        format.rounding =
            Rounding::parse("target.fixed.rounding", &f.str()?).map_err(|e| f.bare_error(e))?;
    }
    if let Some(f) = t.get("overflow") {
        format.overflow =
            Overflow::parse("target.fixed.overflow", &f.str()?).map_err(|e| f.bare_error(e))?;
    }
    Ok(format)
}
