//! Modified nodal analysis: the resolved circuit written as A(z)·x = b.
//!
//! Unknowns are the joined node voltages, then one branch current each for the input
//! source, every inductor, every op-amp output and every amp output. The equations are
//! scaled so their entries are near 1 whatever the part values: currents are carried
//! as r_ref·i (volts), node equations are multiplied by r_ref, and s = ω_ref·z.

use super::pencil::Pencil;
use super::topology::{Branch, Circuit};

/// The circuit equations and the scales that turn z back into s.
#[derive(Debug, Clone, PartialEq)]
pub struct Mna {
    /// A(z) = A0 + z·A1.
    pub pencil: Pencil,
    /// The right-hand side: 1 V from the source equation.
    pub rhs: Vec<f64>,
    /// The unknown that is the output voltage.
    pub output: usize,
    /// s = omega_ref · z, rad/s.
    pub omega_ref: f64,
    /// Capacitors plus inductors: the most poles H(s) can have.
    pub reactive: usize,
}

/// The geometric mean of positive values, `fallback` when there are none.
fn geometric_mean(values: impl Iterator<Item = f64>, fallback: f64) -> f64 {
    let (sum, count) = values.fold((0.0, 0usize), |(s, c), v| (s + v.ln(), c + 1));
    if count == 0 {
        fallback
    } else {
        (sum / count as f64).exp()
    }
}

/// Writes the equations of a circuit whose output is a node (not gnd).
pub fn build(circuit: &Circuit, output: usize) -> Mna {
    let branches = || circuit.branches.iter().map(|(_, b)| b);
    // 1 kΩ when there is no resistor: any positive scale is exact, this one is typical.
    let r_ref = geometric_mean(
        branches().filter_map(|b| match b {
            Branch::Conductance { siemens, .. } => Some(1.0 / siemens),
            _ => None,
        }),
        1e3,
    );
    // Each reactive part's own rate with r_ref; their geometric mean sits among the
    // poles, so the scaled polynomial has coefficients of similar size.
    let omega_ref = geometric_mean(
        branches().filter_map(|b| match b {
            Branch::Capacitor { farads, .. } => Some(1.0 / (r_ref * farads)),
            Branch::Inductor { henries, .. } => Some(r_ref / henries),
            _ => None,
        }),
        1.0,
    );
    let nodes = circuit.nodes.count();
    let extra = branches()
        .filter(|b| {
            matches!(b, Branch::Inductor { .. } | Branch::OpAmp { .. } | Branch::Amp { .. })
        })
        .count();
    let n = nodes + 1 + extra;
    let mut a0 = vec![0.0; n * n];
    let mut a1 = vec![0.0; n * n];
    let at = |i: usize, j: usize| i * n + j;

    // A two-terminal admittance y between a and b (either may be gnd).
    let stamp = |m: &mut Vec<f64>, a: Option<usize>, b: Option<usize>, y: f64| {
        for (p, q, sign) in [(a, a, 1.0), (b, b, 1.0), (a, b, -1.0), (b, a, -1.0)] {
            if let (Some(p), Some(q)) = (p, q) {
                m[at(p, q)] += sign * y;
            }
        }
    };
    // A branch current k leaving node `from` and entering node `to`.
    let current = |m: &mut Vec<f64>, k: usize, from: Option<usize>, to: Option<usize>| {
        if let Some(p) = from {
            m[at(p, k)] += 1.0;
        }
        if let Some(q) = to {
            m[at(q, k)] -= 1.0;
        }
    };

    let source = nodes;
    current(&mut a0, source, Some(circuit.input), None);
    a0[at(source, circuit.input)] = 1.0;
    let mut rhs = vec![0.0; n];
    rhs[source] = 1.0;

    let mut next = source + 1;
    let mut reactive = 0;
    for branch in branches() {
        match *branch {
            Branch::Conductance { a, b, siemens } => stamp(&mut a0, a, b, siemens * r_ref),
            Branch::Capacitor { a, b, farads } => {
                reactive += 1;
                stamp(&mut a1, a, b, omega_ref * farads * r_ref);
            }
            Branch::Inductor { a, b, henries } => {
                reactive += 1;
                let k = next;
                next += 1;
                current(&mut a0, k, a, b);
                // v(a) − v(b) − s·L·i = 0
                difference_row(&mut a0, at(k, 0), a, b);
                a1[at(k, k)] = -omega_ref * henries / r_ref;
            }
            Branch::OpAmp { plus, minus, out } => {
                let k = next;
                next += 1;
                current(&mut a0, k, Some(out), None);
                // v(plus) − v(minus) = 0
                difference_row(&mut a0, at(k, 0), plus, minus);
            }
            Branch::Amp { gain, input, output } => {
                let k = next;
                next += 1;
                current(&mut a0, k, Some(output), None);
                // v(output) − gain·v(input) = 0
                a0[at(k, output)] += 1.0;
                if let Some(i) = input {
                    a0[at(k, i)] -= gain;
                }
            }
        }
    }
    Mna { pencil: Pencil::new(n, a0, a1), rhs, output, omega_ref, reactive }
}

/// Writes v(a) − v(b) into the equation row starting at `row_start`.
fn difference_row(m: &mut [f64], row_start: usize, a: Option<usize>, b: Option<usize>) {
    if let Some(a) = a {
        m[row_start + a] += 1.0;
    }
    if let Some(b) = b {
        m[row_start + b] -= 1.0;
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn geometric_mean_of_decades_is_the_middle_one() {
        let got = geometric_mean([10.0, 1e3].into_iter(), 7.0);
        assert!((got - 100.0).abs() < 1e-12);
        assert_eq!(geometric_mean(std::iter::empty(), 7.0), 7.0);
    }
}
