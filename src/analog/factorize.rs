//! Splitting an analog zpk into real first- and second-order factors, and rebuilding a
//! zpk from a polynomial ratio.
//!
//! Poles are grouped into conjugate pairs and pairs of real poles (the two slowest real
//! poles together), each group taking the zeros nearest to it without splitting a
//! conjugate pair. The overall gain rides on the first factor. Polynomials are handled
//! in the scaled variable u = s/ω_ref so their coefficients stay of similar size.

use super::poly;
use super::roots::roots;
use super::section::AnalogSection;
use super::zpk::AnalogZpk;
use crate::error::{Error, Result};
use num_complex::Complex64;

/// Real factors whose product is `zpk`, ordered by the natural frequency of their
/// poles (zeros-only remainders are refused: the caller checks properness).
///
/// # Errors
/// More zeros than poles.
pub fn factorize(zpk: &AnalogZpk) -> Result<Vec<AnalogSection>> {
    if zpk.zeros.len() > zpk.poles.len() {
        return Err(Error::input(format!(
            "H(s) has {} zeros but only {} poles (improper): it cannot be sampled",
            zpk.zeros.len(),
            zpk.poles.len()
        )));
    }
    if zpk.poles.is_empty() {
        return Ok(vec![AnalogSection::gain(zpk.gain)]);
    }
    let mut poles = split(&zpk.poles);
    let mut zeros = split(&zpk.zeros);
    poles.sort_by(|a, b| a[0].norm().total_cmp(&b[0].norm()));
    let mut groups: Vec<Vec<Complex64>> = Vec::new();
    let mut pending_real: Option<Complex64> = None;
    for g in poles {
        if g.len() == 2 {
            groups.push(g);
        } else if let Some(r) = pending_real.take() {
            groups.push(vec![r, g[0]]);
        } else {
            pending_real = Some(g[0]);
        }
    }
    if let Some(r) = pending_real {
        groups.push(vec![r]);
    }
    let mut out = Vec::with_capacity(groups.len());
    for (i, group) in groups.iter().enumerate() {
        let anchor = group[0];
        let taken = take_nearest(&mut zeros, group.len(), anchor);
        let gain = if i == 0 { zpk.gain } else { 1.0 };
        out.push(AnalogSection::from_zpk(&taken, group, gain));
    }
    // Zeros left over (possible only when reals and pairs did not fit the groups).
    while let Some(z) = zeros.pop() {
        let slot = out.iter_mut().find(|s| zero_count(s) + z.len() <= s.order());
        match slot {
            Some(s) => {
                let mut zpk_s = s.zpk()?;
                zpk_s.zeros.extend(z);
                *s = AnalogSection::from_zpk(&zpk_s.zeros, &zpk_s.poles, zpk_s.gain);
            }
            None => return Err(Error::Internal("zeros left after factorization".into())),
        }
    }
    Ok(out)
}

fn zero_count(s: &AnalogSection) -> usize {
    if s.num[2] != 0.0 {
        2
    } else if s.num[1] != 0.0 {
        1
    } else {
        0
    }
}

/// Groups roots into conjugate pairs (upper first) and single real roots.
fn split(roots: &[Complex64]) -> Vec<Vec<Complex64>> {
    let mut out: Vec<Vec<Complex64>> =
        roots.iter().filter(|r| r.im == 0.0).map(|&r| vec![r]).collect();
    out.extend(roots.iter().filter(|r| r.im > 0.0).map(|&r| vec![r, r.conj()]));
    out
}

/// Takes up to `count` zeros nearest to `anchor`, never splitting a pair.
fn take_nearest(
    zeros: &mut Vec<Vec<Complex64>>,
    count: usize,
    anchor: Complex64,
) -> Vec<Complex64> {
    let mut out = Vec::new();
    while out.len() < count {
        let room = count - out.len();
        let best = zeros
            .iter()
            .enumerate()
            .filter(|(_, g)| g.len() <= room)
            .min_by(|a, b| (a.1[0] - anchor).norm().total_cmp(&(b.1[0] - anchor).norm()))
            .map(|(i, _)| i);
        match best {
            Some(i) => out.extend(zeros.remove(i)),
            None => break,
        }
    }
    out
}

/// A zpk from N(u)/D(u) in the scaled variable u = s/ω_ref (ascending coefficients),
/// with the poles already known (in s) so only the numerator is rooted.
///
/// # Errors
/// A zero numerator, or the root finder failing.
pub fn zpk_from_scaled(
    num_u: &[f64],
    den_u: &[f64],
    poles: Vec<Complex64>,
    w_ref: f64,
) -> Result<AnalogZpk> {
    let num = poly::trim(num_u, 1e-13);
    if num.iter().all(|&c| c == 0.0) {
        return Err(Error::input(
            "the paths cancel completely: the sum is zero at every frequency",
        ));
    }
    let den = poly::trim(den_u, 0.0);
    let zeros_u = roots(&num)?;
    let zeros = zeros_u.iter().map(|z| z * w_ref).collect::<Vec<_>>();
    // H = N(u)/D(u) = (n_m/d_n) · Π(u − zu)/Π(u − pu) = (n_m/d_n)·ω^(n−m) · Π(s − z)/Π(s − p).
    let lead_n = num[num.len() - 1];
    let lead_d = den[den.len() - 1];
    let excess = den.len() as i32 - num.len() as i32;
    let gain = lead_n / lead_d * w_ref.powi(excess);
    Ok(AnalogZpk { zeros, poles, gain })
}

/// Removes pole-zero pairs closer than `tol` relative to the pole's modulus (or
/// absolute `tol`·ω_ref at the origin), returning the pairs removed.
pub fn cancel(zpk: &mut AnalogZpk, tol: f64, w_ref: f64) -> Vec<(Complex64, Complex64)> {
    let mut removed = Vec::new();
    let mut i = 0;
    while i < zpk.poles.len() {
        let p = zpk.poles[i];
        let scale = p.norm().max(w_ref * 1e-9);
        let hit = zpk
            .zeros
            .iter()
            .enumerate()
            .filter(|(_, z)| (*z - p).norm() <= tol * scale && (z.im == 0.0) == (p.im == 0.0))
            .min_by(|a, b| (a.1 - p).norm().total_cmp(&(b.1 - p).norm()))
            .map(|(j, _)| j);
        match hit {
            Some(j) => {
                let z = zpk.zeros.remove(j);
                // H = k·(s − z)/(s − p) → k exactly when z = p; the small mismatch is the
                // tolerance, so the gain is kept as is.
                zpk.poles.remove(i);
                removed.push((p, z));
            }
            None => i += 1,
        }
    }
    removed
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn factors_reproduce_the_zpk() {
        let zpk = AnalogZpk {
            zeros: vec![
                Complex64::new(0.0, 0.0),
                Complex64::new(-3.0, 4.0),
                Complex64::new(-3.0, -4.0),
            ],
            poles: vec![
                Complex64::new(-1.0, 0.0),
                Complex64::new(-2.0, 0.0),
                Complex64::new(-5.0, 0.0),
                Complex64::new(-1.0, 7.0),
                Complex64::new(-1.0, -7.0),
            ],
            gain: 3.0,
        };
        let f = factorize(&zpk).unwrap();
        assert_eq!(f.iter().map(|s| s.order()).sum::<usize>(), 5);
        let s = Complex64::new(0.3, 2.1);
        let got: Complex64 = f.iter().map(|x| x.eval(s)).product();
        assert!((got - zpk.eval(s)).norm() < 1e-12 * got.norm());
    }

    #[test]
    fn coincident_pole_and_zero_cancel() {
        let mut zpk = AnalogZpk {
            zeros: vec![Complex64::new(-10.0 * (1.0 + 1e-9), 0.0)],
            poles: vec![Complex64::new(-10.0, 0.0), Complex64::new(-1.0, 0.0)],
            gain: 1.0,
        };
        let removed = cancel(&mut zpk, 1e-6, 1.0);
        assert_eq!(removed.len(), 1);
        assert_eq!(zpk.poles, vec![Complex64::new(-1.0, 0.0)]);
    }
}
