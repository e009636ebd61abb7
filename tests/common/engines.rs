//! Reference engines: the plain per-sample loops the fast engines must equal exactly.
//!
//! The float loops are the engines' original kernels (one channel at a time, one
//! sample at a time, every section in turn). The fixed loop evaluates the arithmetic
//! written in `FixedEngine`'s documentation literally, on i128 (mathematical integers
//! for every value these formats produce), with no fast path. Shared by the tests and
//! by benches/engines.rs, which times them beside the engines.

use tonewright::quantize::{FixedCascade, Overflow, Rounding, Structure};
use tonewright::sections::Cascade;
use tonewright::simulate::FloatSample;

/// Filters interleaved `frames` of `channels` channels in place from zero state.
pub fn float_cascade<T: FloatSample>(
    cascade: &Cascade,
    structure: Structure,
    channels: usize,
    frames: &mut [T],
) {
    let coefs: Vec<[T; 5]> = cascade
        .sections
        .iter()
        .map(|s| [s.b[0], s.b[1], s.b[2], s.a[0], s.a[1]].map(T::from_f64))
        .collect();
    for ch in 0..channels {
        let mut state = vec![[T::default(); 4]; coefs.len()];
        for v in frames.iter_mut().skip(ch).step_by(channels) {
            let mut x = *v;
            for (c, s) in coefs.iter().zip(state.iter_mut()) {
                let y = match structure {
                    Structure::Df1 => {
                        let y = c[0] * x + c[1] * s[0] + c[2] * s[1] - c[3] * s[2] - c[4] * s[3];
                        *s = [x, s[0], y, s[2]];
                        y
                    }
                    Structure::Df2t => {
                        let y = c[0] * x + s[0];
                        s[0] = c[1] * x - c[3] * y + s[1];
                        s[1] = c[2] * x - c[4] * y;
                        y
                    }
                };
                x = y;
            }
            *v = x;
        }
    }
}

/// Filters interleaved `frames` of `channels` channels in place from zero state and
/// returns the number of overflow events.
pub fn fixed_cascade(fixed: &FixedCascade, channels: usize, frames: &mut [i32]) -> u64 {
    let frac = fixed.validate().expect("valid cascade");
    let f = fixed.format;
    let mut count = 0u64;
    // fit_W: saturate or wrap to `bits`, counting a change.
    let mut fit = |v: i128, bits: u32| -> i128 {
        let (lo, hi) = (-(1i128 << (bits - 1)), (1i128 << (bits - 1)) - 1);
        let w = match f.overflow {
            Overflow::Saturate => v.clamp(lo, hi),
            Overflow::Wrap => (v - lo).rem_euclid(1i128 << bits) + lo,
        };
        count += u64::from(w != v);
        w
    };
    // round_r.
    let round = |v: i128, r: u32| -> i128 {
        if r == 0 {
            return v;
        }
        match f.rounding {
            Rounding::Nearest => (v + (1i128 << (r - 1))) >> r,
            Rounding::Floor => v >> r,
            Rounding::Even => {
                let q = v >> r;
                let m = v - (q << r);
                let half = 1i128 << (r - 1);
                if m > half || (m == half && q & 1 == 1) {
                    q + 1
                } else {
                    q
                }
            }
        }
    };
    let (a_bits, d_bits) = (f.acc_bits, f.data_bits);
    for ch in 0..channels {
        // df1: x1, x2, y1, y2, e1, e2; df2t: s1, s2.
        let mut state = vec![[0i128; 6]; fixed.sections.len()];
        for v in frames.iter_mut().skip(ch).step_by(channels) {
            let mut x = fit(i128::from(*v), d_bits);
            for (s, st) in fixed.sections.iter().zip(state.iter_mut()) {
                let [b0, b1, b2] = s.b.map(i128::from);
                let [a1, a2] = s.a.map(i128::from);
                let r = frac - s.shift;
                let y = match fixed.structure {
                    Structure::Df1 => {
                        let mut sum = b0 * x + b1 * st[0] + b2 * st[1] - a1 * st[2] - a2 * st[3];
                        sum += match f.error_feedback {
                            0 => 0,
                            1 => st[4],
                            _ => 2 * st[4] - st[5],
                        };
                        let acc = fit(sum, a_bits);
                        let q = round(acc, r);
                        let y = fit(q, d_bits);
                        let e = if f.error_feedback > 0 { acc - (q << r) } else { 0 };
                        *st = [x, st[0], y, st[2], e, st[4]];
                        y
                    }
                    Structure::Df2t => {
                        let acc = fit(b0 * x + st[0], a_bits);
                        let y = fit(round(acc, r), d_bits);
                        st[0] = fit(b1 * x - a1 * y + st[1], a_bits);
                        st[1] = fit(b2 * x - a2 * y, a_bits);
                        y
                    }
                };
                x = y;
            }
            *v = i32::try_from(x).expect("fits the data word");
        }
    }
    count
}
