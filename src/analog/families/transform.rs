//! Low-pass prototype to low-pass, high-pass, band-pass or band-stop, factor by factor.
//!
//! With ω0 the edge (or the band centre √(ωlo·ωhi)) and B = ωhi − ωlo, the substitutions
//! are s → s/ω0, s → ω0/s, s → (s² + ω0²)/(B·s) and s → B·s/(s² + ω0²) (ref. 1). A
//! prototype pole p becomes ω0·p, ω0/p, or the two roots of s² − p·B·s + ω0² (band-pass)
//! or s² − (B/p)·s + ω0² (band-stop); zeros move the same way, and the zeros at
//! infinity land at s = 0 (high-pass, band-pass) or at ±jω0 (band-stop).

use super::{Band, Factor, Prototype};
use crate::analog::AnalogSection;
use num_complex::Complex64;
use std::f64::consts::PI;

/// The sections of `proto` mapped to `band` (already validated), each with unit gain at
/// the band's reference point and the prototype's DC gain on the first.
pub(super) fn to_band(proto: &Prototype, band: Band) -> Vec<AnalogSection> {
    let rad = |hz: f64| 2.0 * PI * hz;
    let (map, reference): (Map, Reference) = match band {
        Band::Lowpass { hz } => (Map::Low(rad(hz)), Reference::Dc),
        Band::Highpass { hz } => (Map::High(rad(hz)), Reference::Infinity),
        Band::Bandpass { lo_hz, hi_hz } => {
            let w0 = rad((lo_hz * hi_hz).sqrt());
            (Map::Pass { w0, bw: rad(hi_hz - lo_hz) }, Reference::Centre(w0))
        }
        Band::Bandstop { lo_hz, hi_hz } => {
            let w0 = rad((lo_hz * hi_hz).sqrt());
            (Map::Stop { w0, bw: rad(hi_hz - lo_hz) }, Reference::Dc)
        }
    };
    let mut sections: Vec<AnalogSection> = proto
        .factors
        .iter()
        .flat_map(|f| map.factor(f))
        .map(|(num, den)| {
            let unit = AnalogSection::new(num, den);
            let g = reference.magnitude(&unit);
            AnalogSection::new(num.map(|c| c / g), den)
        })
        .collect();
    if let Some(first) = sections.first_mut() {
        first.num = first.num.map(|c| c * proto.dc_gain);
    }
    sections
}

/// A frequency substitution, frequencies in rad/s.
#[derive(Debug, Clone, Copy)]
enum Map {
    Low(f64),
    High(f64),
    Pass { w0: f64, bw: f64 },
    Stop { w0: f64, bw: f64 },
}

/// Numerator and denominator of one monic section, ascending powers of s.
type Coeffs = ([f64; 3], [f64; 3]);

impl Map {
    /// The sections one prototype factor becomes (one, or two for a band pair).
    fn factor(self, f: &Factor) -> Vec<Coeffs> {
        match (*f, self) {
            (Factor::Real(p), Map::Low(w0)) => vec![([1.0, 0.0, 0.0], [-w0 * p, 1.0, 0.0])],
            (Factor::Real(p), Map::High(w0)) => vec![([0.0, 1.0, 0.0], [-w0 / p, 1.0, 0.0])],
            (Factor::Real(p), Map::Pass { w0, bw }) => {
                vec![([0.0, 1.0, 0.0], [w0 * w0, -p * bw, 1.0])]
            }
            (Factor::Real(p), Map::Stop { w0, bw }) => {
                vec![([w0 * w0, 0.0, 1.0], [w0 * w0, -bw / p, 1.0])]
            }
            (Factor::Pair { pole, notch }, Map::Low(w0)) => {
                vec![(notch.map_or([1.0, 0.0, 0.0], |u| notch_num(w0 * u)), pair_den(pole * w0))]
            }
            (Factor::Pair { pole, notch }, Map::High(w0)) => {
                vec![(notch.map_or([0.0, 0.0, 1.0], |u| notch_num(w0 / u)), pair_den(w0 / pole))]
            }
            (Factor::Pair { pole, notch }, Map::Pass { w0, bw }) => {
                // s² − p·B·s + ω0² = 0; an axis zero j·u solves v² − u·B·v − ω0² = 0.
                let (big, small) = band_roots(pole * bw, w0);
                let nums = match notch {
                    Some(u) => axis_zeros(u * bw, 1.0, w0).map(notch_num),
                    None => [[0.0, 1.0, 0.0]; 2],
                };
                vec![(nums[0], pair_den(big)), (nums[1], pair_den(small))]
            }
            (Factor::Pair { pole, notch }, Map::Stop { w0, bw }) => {
                // s² − (B/p)·s + ω0² = 0; an axis zero j·u solves u·v² + B·v − u·ω0² = 0.
                let (big, small) = band_roots(bw / pole, w0);
                let nums = match notch {
                    Some(u) => axis_zeros(bw, u, w0).map(notch_num),
                    None => [notch_num(w0); 2],
                };
                vec![(nums[0], pair_den(big)), (nums[1], pair_den(small))]
            }
        }
    }
}

/// Where a section's gain is set to 1.
#[derive(Debug, Clone, Copy)]
enum Reference {
    Dc,
    Infinity,
    Centre(f64),
}

impl Reference {
    fn magnitude(self, s: &AnalogSection) -> f64 {
        match self {
            Reference::Dc => (s.num[0] / s.den[0]).abs(),
            Reference::Infinity => (s.num[s.order()] / s.den[s.order()]).abs(),
            Reference::Centre(w0) => s.eval(Complex64::new(0.0, w0)).norm(),
        }
    }
}

/// s² − 2·Re(p)·s + |p|², the monic denominator of the pair p, p*.
fn pair_den(p: Complex64) -> [f64; 3] {
    [p.norm_sqr(), -2.0 * p.re, 1.0]
}

/// s² + u², the monic numerator with zeros at ±j·u.
fn notch_num(u: f64) -> [f64; 3] {
    [u * u, 0.0, 1.0]
}

/// The roots of s² − β·s + ω0² (β complex), larger modulus first. The product of the
/// roots is ω0², so the smaller is ω0²/larger, free of cancellation.
fn band_roots(beta: Complex64, w0: f64) -> (Complex64, Complex64) {
    let half = beta * 0.5;
    let mut root = (half * half - w0 * w0).sqrt();
    if (half.conj() * root).re < 0.0 {
        root = -root;
    }
    let big = half + root;
    (big, w0 * w0 / big)
}

/// The moduli of the two real roots of a·v² − b·v − a·ω0² (a, b > 0): zeros on the jω
/// axis after a band transform, larger first. Their product is ω0².
fn axis_zeros(b: f64, a: f64, w0: f64) -> [f64; 2] {
    let big = (b + (b * b + 4.0 * a * a * w0 * w0).sqrt()) / (2.0 * a);
    [big, w0 * w0 / big]
}
