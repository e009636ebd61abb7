//! The bit-exact fixed-point engine: direct form I (with optional error feedback) and
//! transposed direct form II, in the exact widths, rounding and overflow of a format.

use super::{check_channels, check_frames, Engine};
use crate::error::Result;
use crate::quantize::{FixedCascade, Overflow, Rounding, Structure};
use std::ops::{Add, BitAnd, Mul, Shl, Shr, Sub};

/// Runs a [`FixedCascade`] on integer samples exactly as a target does.
///
/// Notation: `D` = data_bits, `A` = acc_bits, `F` = coef_frac; per section the stored
/// integers b0 b1 b2 a1 a2 and `shift`; `r = F − shift` (0 ≤ r ≤ F). All arithmetic is
/// on mathematical integers (int64, or int128 when A = 64); `>>` is an arithmetic
/// (floor) shift.
///
/// ```text
/// fit_W(v):   saturate: min(max(v, −2^(W−1)), 2^(W−1) − 1)
///             wrap:     v mod 2^W, read as a W-bit two's complement number
///             every fit that changes its value counts one overflow event
/// round_r(v): r = 0:    v
///             nearest:  (v + 2^(r−1)) >> r                        (half up)
///             floor:    v >> r
///             even:     q = v >> r; m = v − q·2^r;
///                       q + 1 if m > 2^(r−1) or (m = 2^(r−1) and q is odd), else q
///
/// per frame, per channel:   x = fit_D(input sample)
/// per section, df1:
///     S   = b0·x + b1·x1 + b2·x2 − a1·y1 − a2·y2          (exact sum)
///           + e1                  if error_feedback = 1
///           + 2·e1 − e2           if error_feedback = 2
///     acc = fit_A(S)
///     q   = round_r(acc)          the one narrowing (shift applied as r = F − shift)
///     y   = fit_D(q)
///     e2 = e1; e1 = acc − q·2^r   (error feedback only)
///     x2 = x1; x1 = x; y2 = y1; y1 = y; x = y
/// per section, df2t (states s1, s2 are kept at accumulator width, never rounded):
///     acc = fit_A(b0·x + s1);  y = fit_D(round_r(acc))
///     s1  = fit_A(b1·x − a1·y + s2)
///     s2  = fit_A(b2·x − a2·y)
///     x = y
/// output sample = x after the last section; all states start at 0
/// ```
///
/// The accumulator is fitted once, after its last term. With wrap that is exactly
/// what a wrapping accumulator does term by term (addition modulo 2^A). With saturate
/// it equals a term-by-term saturating accumulator whenever no partial sum leaves the
/// A-bit range, which holds in any term order when A ≥ coef_bits + data_bits + 2 (five
/// products of at most 2^(coef_bits+data_bits−2) each, plus an error feedback term
/// below 2^(coef_bits+1)) — the q23 preset; for narrower accumulators it is the
/// behaviour of an accumulator with guard bits that saturates on readout, and C
/// kernels must do the same (sum in int64_t or __int128, then saturate).
///
/// Error feedback adds the previous narrowing errors so the error reaching the output
/// is shaped by (1 − z⁻¹) (order 1) or (1 − z⁻¹)² (order 2): zeros at DC, which cut the
/// large low-frequency noise gain of poles near z = 1.
#[derive(Debug, Clone)]
pub struct FixedEngine {
    channels: usize,
    params: Params,
    sections: Vec<SectionCoefs>,
    /// Per channel, per section: df1 x1, x2, y1, y2, e1, e2; df2t s1, s2, then unused.
    state: Vec<[i64; 6]>,
    overflows: u64,
    kernel: Kernel,
}

/// Word limits of one format, shared by every section.
#[derive(Debug, Clone, Copy)]
struct Params {
    acc_bits: u32,
    acc_lo: i64,
    acc_hi: i64,
    data_bits: u32,
    data_lo: i64,
    data_hi: i64,
}

/// One section's integers and its precomputed narrowing constants.
#[derive(Debug, Clone, Copy)]
struct SectionCoefs {
    /// b0, b1, b2, a1, a2.
    c: [i64; 5],
    /// Narrowing shift r = coef_frac − shift.
    r: u32,
    /// Added before the shift: 2^(r−1) for nearest, 0 for floor or r = 0.
    half: i64,
    /// Round-half-even threshold on m + (q & 1): 2^(r−1), or 1 when r = 0 (never up).
    even_thr: i64,
}

/// A specialised loop over one channel of an interleaved buffer; returns overflows.
type Kernel = fn(&Params, &[SectionCoefs], &mut [[i64; 6]], &mut [i32], usize, usize) -> u64;

/// The integer type a kernel accumulates in: i64, or i128 for a 64-bit accumulator.
trait Word:
    Copy
    + Ord
    + Add<Output = Self>
    + Sub<Output = Self>
    + Mul<Output = Self>
    + Shl<u32, Output = Self>
    + Shr<u32, Output = Self>
    + BitAnd<Output = Self>
{
    /// Bits in the type.
    const BITS: u32;
    /// Widens an i64.
    fn of(v: i64) -> Self;
    /// The low 64 bits (exact for values that fit).
    fn low(self) -> i64;
}

impl Word for i64 {
    const BITS: u32 = 64;
    fn of(v: i64) -> Self {
        v
    }
    fn low(self) -> i64 {
        self
    }
}

impl Word for i128 {
    const BITS: u32 = 128;
    fn of(v: i64) -> Self {
        v as i128
    }
    fn low(self) -> i64 {
        self as i64
    }
}

/// fit_W of the module doc: saturate or wrap `v` to `bits` bits.
#[inline(always)]
fn fit<W: Word, const SAT: bool>(v: W, lo: i64, hi: i64, bits: u32) -> W {
    if SAT {
        v.clamp(W::of(lo), W::of(hi))
    } else {
        let k = W::BITS - bits;
        (v << k) >> k
    }
}

/// round_r of the module doc; nearest and floor differ only in `half`.
#[inline(always)]
fn round<W: Word, const EVEN: bool>(v: W, s: &SectionCoefs) -> W {
    if EVEN {
        let q = v >> s.r;
        let m = v - (q << s.r);
        let odd = q & W::of(1);
        if m + odd > W::of(s.even_thr) {
            q + W::of(1)
        } else {
            q
        }
    } else {
        (v + W::of(s.half)) >> s.r
    }
}

/// Narrows an accumulator to a sample: y = fit_D(round_r(acc)); counts overflows.
#[inline(always)]
fn narrow<W: Word, const SAT: bool, const EVEN: bool>(
    acc: W,
    s: &SectionCoefs,
    p: &Params,
    count: &mut u64,
) -> (W, i64) {
    let q = round::<W, EVEN>(acc, s);
    let y = fit::<W, SAT>(q, p.data_lo, p.data_hi, p.data_bits);
    *count += u64::from(y != q);
    (q, y.low())
}

/// fit_A with the overflow count.
#[inline(always)]
fn fit_acc<W: Word, const SAT: bool>(v: W, p: &Params, count: &mut u64) -> W {
    let a = fit::<W, SAT>(v, p.acc_lo, p.acc_hi, p.acc_bits);
    *count += u64::from(a != v);
    a
}

/// The input sample narrowed to the data word.
#[inline(always)]
fn fit_input<const SAT: bool>(v: i32, p: &Params, count: &mut u64) -> i64 {
    let x = fit::<i64, SAT>(i64::from(v), p.data_lo, p.data_hi, p.data_bits);
    *count += u64::from(x != i64::from(v));
    x
}

/// Direct form I, error feedback of order `EF`, over one channel.
fn df1<W: Word, const SAT: bool, const EVEN: bool, const EF: u32>(
    p: &Params,
    secs: &[SectionCoefs],
    state: &mut [[i64; 6]],
    samples: &mut [i32],
    ch: usize,
    n: usize,
) -> u64 {
    let mut count = 0;
    for v in samples.iter_mut().skip(ch).step_by(n) {
        let mut x = fit_input::<SAT>(*v, p, &mut count);
        for (s, st) in secs.iter().zip(state.iter_mut()) {
            let [b0, b1, b2, a1, a2] = s.c.map(W::of);
            let mut sum = b0 * W::of(x) + b1 * W::of(st[0]) + b2 * W::of(st[1])
                - a1 * W::of(st[2])
                - a2 * W::of(st[3]);
            if EF == 1 {
                sum = sum + W::of(st[4]);
            } else if EF == 2 {
                sum = sum + W::of(2 * st[4] - st[5]);
            }
            let acc = fit_acc::<W, SAT>(sum, p, &mut count);
            let (q, y) = narrow::<W, SAT, EVEN>(acc, s, p, &mut count);
            let e = if EF > 0 { (acc - (q << s.r)).low() } else { 0 };
            *st = [x, st[0], y, st[2], e, st[4]];
            x = y;
        }
        // x fits the data word, which is at most 32 bits wide.
        *v = x as i32;
    }
    count
}

/// Transposed direct form II with accumulator-width states, over one channel.
fn df2t<W: Word, const SAT: bool, const EVEN: bool>(
    p: &Params,
    secs: &[SectionCoefs],
    state: &mut [[i64; 6]],
    samples: &mut [i32],
    ch: usize,
    n: usize,
) -> u64 {
    let mut count = 0;
    for v in samples.iter_mut().skip(ch).step_by(n) {
        let mut x = fit_input::<SAT>(*v, p, &mut count);
        for (s, st) in secs.iter().zip(state.iter_mut()) {
            let [b0, b1, b2, a1, a2] = s.c.map(W::of);
            let (wx, s1, s2) = (W::of(x), W::of(st[0]), W::of(st[1]));
            let acc = fit_acc::<W, SAT>(b0 * wx + s1, p, &mut count);
            let (_, y) = narrow::<W, SAT, EVEN>(acc, s, p, &mut count);
            let wy = W::of(y);
            st[0] = fit_acc::<W, SAT>(b1 * wx - a1 * wy + s2, p, &mut count).low();
            st[1] = fit_acc::<W, SAT>(b2 * wx - a2 * wy, p, &mut count).low();
            x = y;
        }
        *v = x as i32;
    }
    count
}

/// The kernel for a structure and error feedback order, given the other choices.
fn pick_structure<W: Word, const SAT: bool, const EVEN: bool>(
    structure: Structure,
    ef: u32,
) -> Kernel {
    match (structure, ef) {
        (Structure::Df1, 0) => df1::<W, SAT, EVEN, 0>,
        (Structure::Df1, 1) => df1::<W, SAT, EVEN, 1>,
        (Structure::Df1, _) => df1::<W, SAT, EVEN, 2>,
        (Structure::Df2t, _) => df2t::<W, SAT, EVEN>,
    }
}

/// The kernel for a word type, given overflow, rounding, structure and feedback.
fn pick_word<W: Word>(sat: bool, even: bool, structure: Structure, ef: u32) -> Kernel {
    match (sat, even) {
        (true, true) => pick_structure::<W, true, true>(structure, ef),
        (true, false) => pick_structure::<W, true, false>(structure, ef),
        (false, true) => pick_structure::<W, false, true>(structure, ef),
        (false, false) => pick_structure::<W, false, false>(structure, ef),
    }
}

impl FixedEngine {
    /// An engine for `fixed` with `channels` interleaved channels.
    ///
    /// # Errors
    /// A cascade refused by [`FixedCascade::validate`], or `channels` of 0.
    ///
    /// ```
    /// use tonewright::quantize::{quantize, FixedFormat, Structure};
    /// use tonewright::sections::{Cascade, Sos};
    /// use tonewright::simulate::{Engine, FixedEngine};
    /// let half = Sos { b: [0.5, 0.0, 0.0], a: [0.0, 0.0] };
    /// let c = Cascade { rate: 48000.0, sections: vec![half] };
    /// let q = quantize(&c, &FixedFormat::q15(), Structure::Df1).unwrap();
    /// let mut e = FixedEngine::new(&q, 1).unwrap();
    /// let mut x = [3, -3, 32767];
    /// e.process(&mut x).unwrap();
    /// assert_eq!(x, [2, -1, 16384]); // 1.5 → 2 and −1.5 → −1: nearest rounds half up
    /// ```
    pub fn new(fixed: &FixedCascade, channels: usize) -> Result<Self> {
        check_channels(channels)?;
        let frac = fixed.validate()?;
        let f = fixed.format;
        let word_limits = |bits: u32| (i64::MIN >> (64 - bits), i64::MAX >> (64 - bits));
        let (acc_lo, acc_hi) = word_limits(f.acc_bits);
        let (data_lo, data_hi) = word_limits(f.data_bits);
        let params = Params {
            acc_bits: f.acc_bits,
            acc_lo,
            acc_hi,
            data_bits: f.data_bits,
            data_lo,
            data_hi,
        };
        let sections: Vec<SectionCoefs> = fixed
            .sections
            .iter()
            .map(|s| {
                let r = frac - s.shift;
                let half_r = if r == 0 { 0 } else { 1i64 << (r - 1) };
                SectionCoefs {
                    c: [s.b[0], s.b[1], s.b[2], s.a[0], s.a[1]],
                    r,
                    half: if f.rounding == Rounding::Nearest { half_r } else { 0 },
                    even_thr: if r == 0 { 1 } else { half_r },
                }
            })
            .collect();
        let (sat, even) = (f.overflow == Overflow::Saturate, f.rounding == Rounding::Even);
        // Sums fit i64 while A ≤ 56 (then coef_bits + data_bits ≤ 56, see the doc).
        let kernel = if f.acc_bits <= 56 {
            pick_word::<i64>(sat, even, fixed.structure, f.error_feedback)
        } else {
            pick_word::<i128>(sat, even, fixed.structure, f.error_feedback)
        };
        let state = vec![[0; 6]; sections.len() * channels];
        Ok(Self { channels, params, sections, state, overflows: 0, kernel })
    }

    /// Overflow events (saturations or wraps that changed a value) since construction
    /// or the last [`Engine::reset`].
    pub fn overflows(&self) -> u64 {
        self.overflows
    }

    /// The states of one channel, section by section: df1 x1, x2, y1, y2, e1, e2
    /// (samples and narrowing errors); df2t s1, s2 at accumulator width, then zeros.
    /// Lets zero-input runs start from chosen states; `None` for a channel out of range.
    pub(crate) fn channel_state_mut(&mut self, channel: usize) -> Option<&mut [[i64; 6]]> {
        let ns = self.sections.len();
        (channel < self.channels).then(|| &mut self.state[channel * ns..(channel + 1) * ns])
    }
}

impl Engine for FixedEngine {
    type Sample = i32;

    fn channels(&self) -> usize {
        self.channels
    }

    fn process(&mut self, frames: &mut [i32]) -> Result<()> {
        check_frames(frames.len(), self.channels)?;
        let ns = self.sections.len();
        for ch in 0..self.channels {
            let state = &mut self.state[ch * ns..(ch + 1) * ns];
            self.overflows +=
                (self.kernel)(&self.params, &self.sections, state, frames, ch, self.channels);
        }
        Ok(())
    }

    fn reset(&mut self) {
        self.state.fill([0; 6]);
        self.overflows = 0;
    }
}
