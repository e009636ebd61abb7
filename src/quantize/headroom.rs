//! Headroom: gains from the input to every internal node against what the node holds.

use super::coefs::FixedCascade;
use super::format::Structure;
use crate::error::Result;
use crate::sections::norms::{l1_norm, linf_norm};
use crate::sections::Sos;
use serde::Serialize;

/// The gain from the input to one node, in full-scale units of that node.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct NodeGain {
    /// Section index.
    pub section: usize,
    /// `output`, or for df2t `s1` / `s2` (accumulator-width states).
    pub node: &'static str,
    /// Largest gain for a sine, max |H(e^{jω})|.
    pub linf: f64,
    /// Largest gain for any bounded input, Σ|h\[n\]|.
    pub l1: f64,
    /// Largest magnitude the node holds, in data full-scale units.
    pub capacity: f64,
    /// 20·log10(linf / capacity): above 0 a full-scale sine overflows by this much.
    pub sine_overflow_db: f64,
    /// 20·log10(l1 / capacity): above 0 some full-scale input overflows by this much.
    pub worst_overflow_db: f64,
}

/// Node gains of a quantized cascade and whether full-scale input can overflow.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct HeadroomReport {
    /// Every node in processing order.
    pub nodes: Vec<NodeGain>,
    /// Whether any full-scale input can overflow some node (an l1 gain above capacity).
    pub overflow_possible: bool,
    /// The largest `worst_overflow_db` over the nodes.
    pub worst_overflow_db: f64,
}

/// The df2t state transfers of section `s`, X → S1 and X → S2 (both over A(z)):
/// S1 = [(b1 − a1·b0) + (b2 − a2·b0) z⁻¹] / A, S2 = [(b2 − a2·b0) + (a1·b2 − a2·b1) z⁻¹] / A.
fn df2t_states(s: &Sos) -> [Sos; 2] {
    let [b0, b1, b2] = s.b;
    let [a1, a2] = s.a;
    [
        Sos { b: [b1 - a1 * b0, b2 - a2 * b0, 0.0], a: s.a },
        Sos { b: [b2 - a2 * b0, a1 * b2 - a2 * b1, 0.0], a: s.a },
    ]
}

/// The gain to one node, given the chain from the input to it.
fn node(section: usize, node: &'static str, chain: &[Sos], capacity: f64) -> NodeGain {
    let (linf, l1) = (linf_norm(chain), l1_norm(chain));
    NodeGain {
        section,
        node,
        linf,
        l1,
        capacity,
        sine_overflow_db: 20.0 * (linf / capacity).log10(),
        worst_overflow_db: 20.0 * (l1 / capacity).log10(),
    }
}

/// L∞ and L1 gains from the input to each section output (and df2t state) of the
/// quantized cascade, in units of what each node can hold: 1 for a sample word,
/// 2^(acc_bits − data_bits − r) for an accumulator-width state.
///
/// # Errors
/// A cascade refused by [`FixedCascade::validate`].
pub fn headroom(fixed: &FixedCascade) -> Result<HeadroomReport> {
    let frac = fixed.validate()?;
    let eff = fixed.effective_sections()?;
    let f = fixed.format;
    let mut nodes = Vec::new();
    for (k, s) in eff.iter().enumerate() {
        if fixed.structure == Structure::Df2t {
            let r = frac - fixed.sections[k].shift;
            let cap = 2f64.powi(f.acc_bits as i32 - f.data_bits as i32 - r as i32);
            for (name, state) in ["s1", "s2"].into_iter().zip(df2t_states(s)) {
                let mut chain = eff[..k].to_vec();
                chain.push(state);
                nodes.push(node(k, name, &chain, cap));
            }
        }
        nodes.push(node(k, "output", &eff[..=k], 1.0));
    }
    let worst = nodes.iter().map(|n| n.worst_overflow_db).fold(f64::NEG_INFINITY, f64::max);
    Ok(HeadroomReport { overflow_possible: worst > 0.0, worst_overflow_db: worst, nodes })
}

#[cfg(test)]
mod tests {
    use super::*;
    use num_complex::Complex64;

    #[test]
    fn df2t_state_transfers_reproduce_the_recursion() {
        // y = b0·x + s1[n−1] must equal H(z)·x: so H = b0 + z⁻¹·S1/X.
        let s = Sos { b: [0.3, -0.2, 0.1], a: [-1.2, 0.5] };
        let [s1, s2] = df2t_states(&s);
        for w in [0.1, 0.7, 2.0] {
            let z = Complex64::from_polar(1.0, w);
            let h = s.eval(z);
            assert!((h - (s.b[0] + s1.eval(z) / z)).norm() < 1e-12);
            // s1 = b1·x − a1·y + s2[n−1].
            let want = s.b[1] - s.a[0] * h + s2.eval(z) / z;
            assert!((s1.eval(z) - want).norm() < 1e-12);
        }
    }
}
