//! Grouping digital poles and zeros into real sections.
//!
//! The pole (or conjugate pair) nearest the unit circle is taken first and given the
//! zeros nearest to it, so each section's zeros temper its own resonance; then the
//! next, and so on. Sections come out ordered from the least resonant to the most
//! resonant (common practice: the sharpest peak is last, where it sees the signal
//! already scaled by the others). Each section has unit leading coefficient b0 = 1;
//! the overall gain is distributed by `scaling`.
//!
//! # References
//! 1. L. B. Jackson, "On the interaction of roundoff noise and dynamic range in digital
//!    filters", Bell System Technical Journal 49(2), 1970 (pairing and ordering).

use super::sos::Sos;
use num_complex::Complex64;

/// A real root group: one real root or a conjugate pair (stored with im > 0).
#[derive(Debug, Clone, Copy)]
enum Group {
    Real(f64),
    Pair(Complex64),
}

impl Group {
    fn roots(self) -> Vec<Complex64> {
        match self {
            Group::Real(r) => vec![Complex64::new(r, 0.0)],
            Group::Pair(c) => vec![c, c.conj()],
        }
    }

    fn anchor(self) -> Complex64 {
        match self {
            Group::Real(r) => Complex64::new(r, 0.0),
            Group::Pair(c) => c,
        }
    }
}

/// Groups roots into reals and conjugate pairs; a root is real when its imaginary part
/// is below 1e-12 of its modulus.
fn groups(roots: &[Complex64]) -> Vec<Group> {
    let tol = |c: Complex64| 1e-12 * c.norm().max(1e-300);
    let mut out: Vec<Group> =
        roots.iter().filter(|c| c.im.abs() <= tol(**c)).map(|c| Group::Real(c.re)).collect();
    out.extend(roots.iter().filter(|c| c.im > tol(**c)).map(|&c| Group::Pair(c)));
    out
}

/// Pairs poles with zeros into sections of unit gain, least resonant first.
/// `zeros` and `poles` have equal length (the bilinear transform guarantees it).
pub fn pair(zeros: &[Complex64], poles: &[Complex64]) -> Vec<Sos> {
    let mut pole_groups = groups(poles);
    let mut zero_groups = groups(zeros);
    let mut sections = Vec::new();
    // Most resonant first while pairing; reversed at the end.
    pole_groups.sort_by(|a, b| b.anchor().norm().total_cmp(&a.anchor().norm()));
    let mut remaining_poles = pole_groups;
    while let Some(first) = remaining_poles.first().copied() {
        remaining_poles.remove(0);
        let mut section_poles = first.roots();
        if let Group::Real(_) = first {
            // A real pole takes a second real pole when one is left, so the last
            // real pole of an odd count forms the only first-order section.
            if let Some(i) = remaining_poles.iter().position(|g| matches!(g, Group::Real(_))) {
                section_poles.extend(remaining_poles.remove(i).roots());
            }
        }
        let section_zeros = take_zeros(&mut zero_groups, section_poles.len(), first.anchor());
        sections.push(unit_section(&section_zeros, &section_poles));
    }
    sections.reverse();
    sections
}

/// Takes `count` zeros (1 or 2) nearest to `near` without splitting a conjugate pair.
fn take_zeros(zeros: &mut Vec<Group>, count: usize, near: Complex64) -> Vec<Complex64> {
    let distance = |g: &Group| (g.anchor() - near).norm();
    let nearest_real = |zeros: &Vec<Group>| {
        zeros
            .iter()
            .enumerate()
            .filter(|(_, g)| matches!(g, Group::Real(_)))
            .min_by(|a, b| distance(a.1).total_cmp(&distance(b.1)))
            .map(|(i, _)| i)
    };
    let mut out = Vec::new();
    if count == 2 {
        let nearest_pair = zeros
            .iter()
            .enumerate()
            .filter(|(_, g)| matches!(g, Group::Pair(_)))
            .min_by(|a, b| distance(a.1).total_cmp(&distance(b.1)))
            .map(|(i, _)| i);
        let reals = zeros.iter().filter(|g| matches!(g, Group::Real(_))).count();
        let use_pair = match (nearest_pair, nearest_real(zeros)) {
            (Some(p), Some(r)) if reals >= 2 => distance(&zeros[p]) <= distance(&zeros[r]),
            (Some(_), _) => true,
            (None, _) => false,
        };
        if use_pair {
            if let Some(p) = nearest_pair {
                return zeros.remove(p).roots();
            }
        }
    }
    while out.len() < count {
        match nearest_real(zeros) {
            Some(i) => out.extend(zeros.remove(i).roots()),
            None => break,
        }
    }
    out
}

/// The section (z − q1)(z − q2) / ((z − p1)(z − p2)) in z⁻¹ form, b0 = 1.
fn unit_section(zeros: &[Complex64], poles: &[Complex64]) -> Sos {
    let expand = |r: &[Complex64]| -> [f64; 2] {
        match r {
            [] => [0.0, 0.0],
            [a] => [-a.re, 0.0],
            [a, b, ..] => [-(a + b).re, (a * b).re],
        }
    };
    let bz = expand(zeros);
    Sos { b: [1.0, bz[0], bz[1]], a: expand(poles) }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn resonant_pair_keeps_its_nearest_zeros_and_goes_last() {
        let p_sharp = Complex64::from_polar(0.99, 0.3);
        let p_soft = Complex64::from_polar(0.5, 1.0);
        let z_sharp = Complex64::from_polar(1.0, 0.31);
        let zeros = [z_sharp, z_sharp.conj(), Complex64::new(-1.0, 0.0), Complex64::new(-1.0, 0.0)];
        let poles = [p_soft, p_sharp, p_soft.conj(), p_sharp.conj()];
        let s = pair(&zeros, &poles);
        assert_eq!(s.len(), 2);
        assert!((s[1].a[1] - 0.99 * 0.99).abs() < 1e-15);
        assert!((s[1].b[2] - 1.0).abs() < 1e-15);
        assert_eq!(s[0].b, [1.0, 2.0, 1.0]);
    }

    #[test]
    fn odd_real_count_gives_one_first_order_section() {
        let zeros = [Complex64::new(-1.0, 0.0); 3];
        let poles = [Complex64::new(0.9, 0.0), Complex64::new(0.5, 0.0), Complex64::new(0.2, 0.0)];
        let s = pair(&zeros, &poles);
        assert_eq!(s.len(), 2);
        assert_eq!(s.iter().filter(|x| x.a[1] == 0.0 && x.b[2] == 0.0).count(), 1);
    }
}
