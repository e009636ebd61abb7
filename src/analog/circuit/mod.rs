//! The exact transfer function H(s) = V(output) / V(input) of a linear circuit.
//!
//! In: a [`Netlist`] of resistors, capacitors, inductors, ideal op-amps and ideal
//! voltage amplifiers. The input node is driven by an ideal voltage source from gnd and
//! the output node is read with no load. Out: a [`CircuitSolution`]: H(s) as an
//! [`AnalogZpk`] (s in rad/s) after coincident pole-zero pairs are removed, the removed
//! pairs, and warnings (poles in the right half-plane or on the imaginary axis, parts
//! ignored because both ends are one node).
//!
//! Method. Modified nodal analysis \[1\] writes the circuit as (A0 + z·A1)·x = b in the
//! scaled frequency z = s/ω_ref, where ω_ref is the geometric mean of the parts' own
//! rates (1/RC, R/L). By Cramer's rule H = det N(z) / det A(z), where N is A with the
//! output column replaced by b; both determinants are polynomials of degree at most the
//! number of capacitors and inductors. Each is evaluated by LU at points on the circle
//! |z| = 1, its coefficients come from a discrete Fourier transform of those values
//! \[3\], and its roots from Aberth iteration \[2\] on the scaled polynomial, refined
//! against the matrix itself with the exact derivative d/dz ln det A = trace(A⁻¹·A1).
//! The gain is H at the sample point farthest from every root divided by the root
//! factors there, and the result is checked against H solved directly at every
//! sample point before it is returned. A state-space form was not chosen: A1 is singular whenever the circuit
//! has op-amps, capacitor loops or inductor cutsets, which a state-space form has to
//! reduce away first; the determinant route needs only LU and handles what the
//! equations handle, and the refinement recovers the digits interpolation loses when
//! the poles spread over decades.
//!
//! Conventions: ground is `"gnd"`; a 0-ohm resistor is a wire and joins its two nodes;
//! a two-terminal part whose ends are one node is ignored with a warning; an output
//! joined to gnd by wires gives H = 0, one joined to the input gives H = 1 (both with a
//! warning).
//!
//! Not done here: nonlinear or large-signal behaviour, op-amp bandwidth, slew or
//! offset, noise, mutual inductance, sources other than the input. Unstable circuits
//! are returned with a warning and the caller decides. Netlists of more than
//! [`MAX_PARTS`] parts or [`MAX_REACTIVE`] capacitors and inductors are refused.
//!
//! # References
//! 1. C.-W. Ho, A. E. Ruehli, P. A. Brennan, "The modified nodal approach to network
//!    analysis", IEEE Transactions on Circuits and Systems 22(6), 1975.
//! 2. O. Aberth, "Iteration methods for finding all zeros of a polynomial
//!    simultaneously", Mathematics of Computation 27(122), 1973.
//! 3. J. Vlach, K. Singhal, "Computer Methods for Circuit Analysis and Design", 2nd ed.,
//!    1994: network functions as polynomials interpolated on the unit circle after
//!    frequency scaling (from memory).

mod cancel;
mod interpolate;
mod lu;
mod mna;
mod netlist;
mod pencil;
mod polish;
mod topology;

pub use netlist::{Element, Netlist, Part, GND};

use crate::analog::roots::roots;
use crate::analog::zpk::AnalogZpk;
use crate::error::{Error, Result};
use lu::LogDet;
use num_complex::Complex64;
use pencil::Pencil;
use topology::Circuit;

/// A pole and a zero closer than this, relative to their modulus, are one factor that
/// cancels. Refined simple roots agree to about 1e-12 and double roots (two identical
/// buffered sections) to about 1e-8, so exact cancellations fall well inside; a
/// genuine pair this close changes |H| by at most about 1e-6 relative near it.
pub const CANCEL_TOLERANCE: f64 = 1e-6;

/// The most parts a netlist may have. Each sample point and each refinement step costs
/// a dense LU of O(n³) in the number of nodes and branches, and a tone stage has tens
/// of parts; the bound keeps time and memory small whatever the caller passes.
pub const MAX_PARTS: usize = 250;

/// The most capacitors and inductors a circuit may have: the degree of the
/// interpolated determinants. Their coefficients span more than the 1e11 that f64
/// interpolation resolves once the degree passes about 25 with poles over three
/// decades (a 28-section RC ladder loses a pole); tone stages have under a dozen.
pub const MAX_REACTIVE: usize = 24;

/// |H| from the zeros, poles and gain must match H computed directly at every sample
/// point to this relative error (plus the same fraction of 1e-6 of the largest |H|), or
/// the solution is refused: 1e-6 is the accuracy promised by the reference tests.
const VERIFY: f64 = 1e-6;

/// Circle radii (in units of ω_ref) tried in turn: the later ones only when a sample
/// point happens to sit on a root of det A(z).
const RADII: [f64; 3] = [1.0, 1.13, 0.87];

/// A pole with |Re p| at most this fraction of |p| is on the imaginary axis.
const ON_AXIS: f64 = 1e-9;

/// H(s) of a circuit and what was done to reach it.
#[derive(Debug, Clone, PartialEq)]
pub struct CircuitSolution {
    /// H(s) = V(output) / V(input), s in rad/s, after cancellation.
    pub zpk: AnalogZpk,
    /// (pole, zero) pairs removed as coincident, rad/s.
    pub cancelled: Vec<(Complex64, Complex64)>,
    /// Doubtful but usable findings, one line each.
    pub warnings: Vec<String>,
}

/// Solves a linear circuit for H(s) = V(output) / V(input).
///
/// ```
/// use tonewright::analog::circuit::{solve, Element, Netlist, Part};
/// // RC low-pass, 10 kΩ and 10 nF: one pole at −1/RC = −10 000 rad/s (textbook).
/// let part = |label: &str, element| Part { label: label.into(), element };
/// let netlist = Netlist {
///     parts: vec![
///         part("r1", Element::Resistor { ohms: 10e3, a: "in".into(), b: "out".into() }),
///         part("c1", Element::Capacitor { farads: 10e-9, a: "out".into(), b: "gnd".into() }),
///     ],
///     input: "in".into(),
///     output: "out".into(),
/// };
/// let h = solve(&netlist).unwrap().zpk;
/// assert!((h.poles[0].re + 1e4).abs() < 1e-9 * 1e4);
/// assert!((h.gain - 1e4).abs() < 1e-9 * 1e4);
/// ```
///
/// # Errors
/// [`Error::Input`] naming the part or node for bad values, empty or equal port names,
/// floating nodes, islands, an output the input cannot reach, too many parts or
/// reactive parts, or more zeros than poles; [`Error::Numeric`] when the circuit
/// equations are singular (an op-amp without feedback, driven outputs tied together)
/// or the zeros and poles found do not reproduce the directly solved H.
pub fn solve(netlist: &Netlist) -> Result<CircuitSolution> {
    if netlist.parts.len() > MAX_PARTS {
        return Err(Error::input(format!(
            "circuit with output '{}' has {} parts, more than the {MAX_PARTS} allowed",
            netlist.output,
            netlist.parts.len()
        )));
    }
    let circuit = topology::resolve(netlist)?;
    let mut warnings = circuit.warnings.clone();
    let output = match circuit.output {
        None => {
            warnings.push(format!(
                "output node '{}' is joined to gnd by wires: H(s) = 0",
                netlist.output
            ));
            return Ok(constant(0.0, warnings));
        }
        Some(out) if out == circuit.input => {
            warnings.push(format!(
                "output node '{}' is joined to the input by wires: H(s) = 1",
                netlist.output
            ));
            return Ok(constant(1.0, warnings));
        }
        Some(out) => out,
    };
    let mna = mna::build(&circuit, output);
    if mna.reactive > MAX_REACTIVE {
        return Err(Error::input(format!(
            "circuit with output '{}' has {} capacitors and inductors, more than the \
             {MAX_REACTIVE} allowed",
            netlist.output, mna.reactive
        )));
    }
    let den_pencil = &mna.pencil;
    let num_pencil = mna.pencil.with_column(mna.output, &mna.rhs);
    let m = interpolate::point_count(mna.reactive);
    let dets = |p: &Pencil, z: &Complex64| p.factor(*z).map(|lu| lu.det());

    let (radius, points, den) = RADII
        .iter()
        .find_map(|&radius| {
            let points = interpolate::upper_points(m, radius);
            let den: Option<Vec<LogDet>> = points.iter().map(|z| dets(den_pencil, z)).collect();
            den.map(|den| (radius, points, den))
        })
        .ok_or_else(|| singular(&circuit, netlist))?;
    // N singular to working precision at every point is a response that is identically
    // zero (a balanced bridge). Otherwise N is evaluated exactly: a small det N is a
    // small |H| (a long low-pass far above its corner), not a failure.
    if points.iter().all(|z| num_pencil.factor(*z).is_none()) {
        warnings.push(format!(
            "output node '{}' carries no signal (its equations are singular): H(s) = 0",
            netlist.output
        ));
        return Ok(constant(0.0, warnings));
    }
    let num: Vec<Option<LogDet>> =
        points.iter().map(|z| num_pencil.factor_near_root(*z).map(|lu| lu.det())).collect();
    let h: Vec<Complex64> = den
        .iter()
        .zip(&num)
        .map(|(d, n)| {
            n.map_or(Complex64::new(0.0, 0.0), |n| {
                n.phase / d.phase * (n.log_abs - d.log_abs).exp()
            })
        })
        .collect();

    let den_coefficients =
        interpolate::coefficients(&den.iter().copied().map(Some).collect::<Vec<_>>(), m, radius);
    let num_coefficients = interpolate::coefficients(&num, m, radius);
    let (n_zeros, n_poles) = (num_coefficients.len() - 1, den_coefficients.len() - 1);
    if n_zeros > n_poles {
        return Err(Error::input(format!(
            "output node '{}': H(s) must have no more zeros than poles, got {n_zeros} zeros \
             and {n_poles} poles (an ideal differentiator; add resistance in series with \
             its capacitor)",
            netlist.output
        )));
    }
    let mut poles = refined_roots(&den_coefficients, den_pencil)?;
    let mut zeros = refined_roots(&num_coefficients, &num_pencil)?;
    let cancelled = cancel::cancel(&mut poles, &mut zeros, CANCEL_TOLERANCE);

    // Gain from H at the sample point farthest from every remaining root, where the
    // root factors are least sensitive to the roots' last digits.
    let distance = |z: Complex64| {
        poles.iter().chain(&zeros).map(|r| (z - r).norm()).fold(f64::INFINITY, f64::min)
    };
    let best = (0..points.len())
        .filter(|&k| h[k].norm() > 0.0)
        .max_by(|&a, &b| distance(points[a]).total_cmp(&distance(points[b])))
        .ok_or_else(|| Error::Internal("no sample point with a nonzero response".into()))?;
    let w = mna.omega_ref;
    let s0 = points[best] * w;
    let unscale = |r: Vec<Complex64>| -> Vec<Complex64> { r.into_iter().map(|x| x * w).collect() };
    let (poles, zeros) = (unscale(poles), unscale(zeros));
    let factor: Complex64 = poles.iter().map(|p| s0 - p).product::<Complex64>()
        / zeros.iter().map(|z| s0 - z).product::<Complex64>();
    let zpk = AnalogZpk { gain: (h[best] * factor).re, zeros, poles };
    verify(&zpk, &points, &h, w, &netlist.output)?;
    warnings.extend(stability_warnings(&zpk.poles));
    let cancelled = cancelled.into_iter().map(|(p, z)| (p * w, z * w)).collect();
    Ok(CircuitSolution { zpk, cancelled, warnings })
}

/// The roots of a determinant polynomial, refined against its pencil.
fn refined_roots(coefficients: &[f64], pencil: &Pencil) -> Result<Vec<Complex64>> {
    Ok(polish::polish(pencil, roots(coefficients)?))
}

/// Checks the solution against H computed directly at the sample points, so a
/// polynomial that interpolation could not resolve is refused rather than returned.
fn verify(
    zpk: &AnalogZpk,
    points: &[Complex64],
    h: &[Complex64],
    omega_ref: f64,
    output: &str,
) -> Result<()> {
    let largest = h.iter().fold(0.0f64, |m, v| m.max(v.norm()));
    for (z, want) in points.iter().zip(h) {
        let s = z * omega_ref;
        let error = (zpk.eval(s) - want).norm();
        if error > VERIFY * (want.norm() + 1e-6 * largest) {
            return Err(Error::numeric(format!(
                "circuit with output '{output}': H(s) from its poles and zeros misses the \
                 direct solution by {:.1e} (relative) at s = {:.4e}{:+.4e}i rad/s, more than \
                 {VERIFY:e}; hint: fewer capacitors and inductors, or part values closer \
                 in scale",
                error / want.norm().max(f64::MIN_POSITIVE),
                s.re,
                s.im
            )));
        }
    }
    Ok(())
}

fn constant(gain: f64, warnings: Vec<String>) -> CircuitSolution {
    CircuitSolution {
        zpk: AnalogZpk { zeros: Vec::new(), poles: Vec::new(), gain },
        cancelled: Vec::new(),
        warnings,
    }
}

fn singular(circuit: &Circuit, netlist: &Netlist) -> Error {
    let cause = match circuit.opamp_without_feedback() {
        Some(k) => format!(
            "{} has no feedback path from its output to its inputs; hint: connect its \
             output back to its minus input through a part",
            netlist.parts[k].label
        ),
        None => "hint: look for op-amps without feedback or driven outputs (op-amp, amp, \
                 input) tied to the same node"
            .into(),
    };
    Error::numeric(format!(
        "circuit with output '{}' is singular (its equations have no unique solution \
         at any frequency): {cause}",
        netlist.output
    ))
}

fn stability_warnings(poles: &[Complex64]) -> Vec<String> {
    let right: Vec<&Complex64> = poles.iter().filter(|p| p.re > ON_AXIS * p.norm()).collect();
    let axis: Vec<&Complex64> = poles.iter().filter(|p| p.re.abs() <= ON_AXIS * p.norm()).collect();
    let mut out = Vec::new();
    if let Some(p) = right.first() {
        out.push(format!(
            "H(s) has {} pole(s) in the right half-plane (e.g. s = {:.6e} {:+.6e}i rad/s): \
             the circuit is unstable",
            right.len(),
            p.re,
            p.im
        ));
    }
    if let Some(p) = axis.first() {
        out.push(format!(
            "H(s) has {} pole(s) on the imaginary axis (e.g. s = {:.6e}i rad/s): an \
             undamped resonance or an integrator",
            axis.len(),
            p.im
        ));
    }
    out
}
