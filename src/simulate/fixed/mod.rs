//! The bit-exact fixed-point engine: direct form I (with optional error feedback) and
//! transposed direct form II, in the exact widths, rounding and overflow of a format.

use super::{check_channels, check_frames, Engine, Isa};
use crate::error::Result;
use crate::quantize::{FixedCascade, Overflow, Rounding, Structure};

#[cfg(target_arch = "x86_64")]
mod wavefront;

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
///
/// The implementation computes exactly this, faster: sums whose terms and total fit
/// 64 bits (every format with A ≤ 56, where coef_bits + data_bits ≤ 56) are formed in
/// i64 directly; with A = 64 each sum is formed in i64 with overflow detection and only
/// a sum that overflowed is formed again in i128. The cascade runs block by block with
/// groups of sections holding their states in registers, or on AVX2 as a wavefront
/// over the sections (`wavefront.rs`), channels in pairs; results are the same for any
/// block size, channel count and instruction set (tests/fixed_point.rs compares every
/// format, rounding, overflow and structure with a literal i128 evaluation of the
/// arithmetic above).
#[derive(Debug, Clone)]
pub struct FixedEngine {
    channels: usize,
    params: Params,
    sections: Vec<SectionCoefs>,
    /// Per channel, per section: df1 x1, x2, y1, y2, e1, e2; df2t s1, s2, then unused.
    state: Vec<[i64; 6]>,
    overflows: u64,
    choice: Choice,
    /// The instruction set of `kernels` (set only after run-time detection).
    isa: Isa,
    kernels: Kernels,
    /// The kernels' buffers.
    scratch: Vec<i64>,
}

/// The choices of arithmetic a kernel is compiled for, as constants: saturate (else
/// wrap), round half to even, error-feedback order, df2t (else df1), and a 64-bit
/// accumulator whose sums are checked for overflow. One type parameter stands for
/// all five.
trait Arith {
    const SAT: bool;
    const EVEN: bool;
    const EF: u32;
    const DF2T: bool;
    const WIDE: bool;
}

/// The [`Arith`] of the const parameters.
struct Flags<const SAT: bool, const EVEN: bool, const EF: u32, const DF2T: bool, const WIDE: bool>;

impl<const SAT: bool, const EVEN: bool, const EF: u32, const DF2T: bool, const WIDE: bool> Arith
    for Flags<SAT, EVEN, EF, DF2T, WIDE>
{
    const SAT: bool = SAT;
    const EVEN: bool = EVEN;
    const EF: u32 = EF;
    const DF2T: bool = DF2T;
    const WIDE: bool = WIDE;
}

/// Word limits of one format, shared by every section.
#[derive(Debug, Clone, Copy)]
struct Params {
    /// 64 − acc_bits: the shift pair that wraps an accumulator.
    acc_wrap: u32,
    acc_lo: i64,
    acc_hi: i64,
    /// acc_hi − acc_lo.
    acc_span: u64,
    /// 64 − data_bits.
    data_wrap: u32,
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
    /// 2^r − 1: the bits a narrowing drops.
    mask: i64,
    /// Added before the shift: 2^(r−1) for nearest, 0 for floor or r = 0.
    half: i64,
    /// Round-half-even threshold on m + (q & 1): 2^(r−1), or 1 when r = 0 (never up).
    even_thr: i64,
    /// Sums from `fast_lo` to `fast_lo + fast_span` narrow without any overflow
    /// (see [`narrow`]).
    fast_lo: i64,
    fast_span: u64,
}

/// A specialised loop over `C` adjacent channels of an interleaved buffer, given their
/// states; returns overflows. Its last argument is the engine's scratch space of
/// [`SCRATCH`] values, kept so that processing never allocates or clears large buffers.
type Kernel<const C: usize> =
    fn(&Params, &[SectionCoefs], [&mut [[i64; 6]]; C], Channels<'_>, &mut [i64]) -> u64;

/// The kernels of one format: a single channel, and a pair of adjacent channels run
/// side by side (two independent recursions, which the processor overlaps).
#[derive(Debug, Clone, Copy)]
struct Kernels {
    one: Kernel<1>,
    two: Kernel<2>,
}

/// What a kernel runs over: channels `ch`, `ch + 1`, … (as many as the kernel takes)
/// of the `n`-channel `samples`.
struct Channels<'a> {
    samples: &'a mut [i32],
    ch: usize,
    n: usize,
}

/// Scratch values per engine: two passes of the wavefront for each of two channels.
const SCRATCH: usize = 8192;

/// Frames of all channels processed before moving on (8 KiB of stereo q15 data, in
/// i32): two passes of the wavefront.
const STRETCH: usize = 4096;

/// Frames per block.
const BLOCK: usize = 64;

/// Sections per group (see [`sections`]). Measured on 8 q15 and q31 df1 sections
/// (benches/engines.rs): 2 beats 1 (waits on the recursion) and 4 (spills registers).
const GROUP: usize = 2;

/// The sum of `terms` (each fits i64) if it is exact in i64: always when A ≤ 56
/// (|sum| < 2^57), and with `F::WIDE` (A = 64) when no addition overflowed.
#[inline(always)]
fn exact_sum<F: Arith, const N: usize>(terms: [i64; N]) -> Option<i64> {
    if F::WIDE {
        let mut sum = terms[0];
        for &t in &terms[1..] {
            sum = sum.checked_add(t)?;
        }
        Some(sum)
    } else {
        Some(terms.iter().sum())
    }
}

/// Whether `lo ≤ v ≤ lo + span`, in one comparison.
#[inline(always)]
fn within(v: i64, lo: i64, span: u64) -> bool {
    (v.wrapping_sub(lo) as u64) <= span
}

/// fit_A of the exact sum of `terms`, counting a change.
#[inline(always)]
fn fit_sum<F: Arith, const N: usize>(terms: [i64; N], p: &Params, count: &mut u64) -> i64 {
    let (sum, a) = if F::WIDE {
        let sum: i128 = terms.iter().map(|&t| i128::from(t)).sum();
        let a =
            if F::SAT { sum.clamp(i64::MIN.into(), i64::MAX.into()) as i64 } else { sum as i64 };
        (sum, a)
    } else {
        let sum: i64 = terms.iter().sum();
        let a =
            if F::SAT { sum.clamp(p.acc_lo, p.acc_hi) } else { (sum << p.acc_wrap) >> p.acc_wrap };
        (i128::from(sum), a)
    };
    *count += u64::from(i128::from(a) != sum);
    a
}

/// round_r of the documentation. The nearest/floor form adds before shifting, so it
/// is used only where `v + 2^(r−1)` cannot pass i64; elsewhere the dropped bits are
/// rounded apart: ⌊(v + h)/2^r⌋ = (v >> r) + ((v & mask) + h) >> r.
#[inline(always)]
fn round<F: Arith, const SAFE: bool>(v: i64, s: &SectionCoefs) -> i64 {
    if F::EVEN {
        let q = v >> s.r;
        q + i64::from((v & s.mask) + (q & 1) > s.even_thr)
    } else if SAFE {
        (v >> s.r) + (((v & s.mask) + s.half) >> s.r)
    } else {
        (v + s.half) >> s.r
    }
}

/// fit_D with the overflow count.
#[inline(always)]
fn fit_data<F: Arith>(v: i64, p: &Params, count: &mut u64) -> i64 {
    // Not `clamp`, whose check of its bounds stays in loops.
    let y =
        if F::SAT { v.max(p.data_lo).min(p.data_hi) } else { (v << p.data_wrap) >> p.data_wrap };
    *count += u64::from(y != v);
    y
}

/// `G` sections over a block of one channel's samples (already fitted to the data
/// word) from `input` to `output`, states in local variables for the whole block.
/// Each sum's terms are products of a coefficient (≤ 32 bits) and a sample (≤ 32
/// bits), or states of the accumulator width, so each fits i64.
///
/// `EXACT`: the arithmetic of the documentation step by step, counting overflows;
/// always returns true. Otherwise the fast path, which returns false, leaving `state`
/// and `count` as they were, at the first sum that is not exact in i64 (`F::WIDE`) or
/// that leaves its overflow-free range: for a narrowing, the section's `fast` range
/// [data_lo·2^r, (data_hi − 1)·2^r], which lies inside the accumulator range
/// (A ≥ coef_bits + data_bits > data_bits + r) and which rounding cannot leave (it
/// moves a value by less than one step of 2^r); for a df2t state, the accumulator
/// range. Inside those ranges every fit is the identity, so both paths agree.
#[inline(always)]
fn sections<F: Arith, const G: usize, const EXACT: bool>(
    p: &Params,
    secs: &[SectionCoefs],
    state: &mut [[i64; 6]],
    input: &[i64],
    output: &mut [i64],
    count: &mut u64,
) -> bool {
    let sc: [SectionCoefs; G] = std::array::from_fn(|k| secs[k]);
    let mut st: [[i64; 6]; G] = std::array::from_fn(|k| state[k]);
    let mut n = 0;
    for (&v, out) in input.iter().zip(output.iter_mut()) {
        let mut x = v;
        for (s, t) in sc.iter().zip(st.iter_mut()) {
            let [b0, b1, b2, a1, a2] = s.c;
            x = if F::DF2T {
                let Some((_, _, y)) = narrow::<F, EXACT, 2>([b0 * x, t[0]], s, p, &mut n) else {
                    return false;
                };
                let Some(s1) = acc_of::<F, EXACT, 3>([b1 * x, -(a1 * y), t[1]], p, &mut n) else {
                    return false;
                };
                let Some(s2) = acc_of::<F, EXACT, 2>([b2 * x, -(a2 * y)], p, &mut n) else {
                    return false;
                };
                *t = [s1, s2, t[2], t[3], t[4], t[5]];
                y
            } else {
                let fb = match F::EF {
                    0 => 0,
                    1 => t[4],
                    _ => 2 * t[4] - t[5],
                };
                let terms = [b0 * x, b1 * t[0], b2 * t[1], -(a1 * t[2]), -(a2 * t[3]), fb];
                let Some((acc, q, y)) = narrow::<F, EXACT, 6>(terms, s, p, &mut n) else {
                    return false;
                };
                if F::EF > 0 {
                    // |e| ≤ 2^r: exact even where q·2^r alone would pass i64.
                    let e = acc.wrapping_sub(q.wrapping_shl(s.r));
                    *t = [x, t[0], y, t[2], e, t[4]];
                } else {
                    // e1, e2 are settled after the loop, sparing two registers.
                    *t = [x, t[0], y, t[2], t[4], t[5]];
                }
                y
            };
        }
        *out = x;
    }
    if !F::DF2T && F::EF == 0 && !input.is_empty() {
        // Without feedback each sample shifts e1 → e2 and stores e1 = 0.
        for t in &mut st {
            t[5] = if input.len() == 1 { t[4] } else { 0 };
            t[4] = 0;
        }
    }
    state[..G].copy_from_slice(&st);
    *count += n;
    true
}

/// fit_A of the sum of `terms`; `None` on the fast path when it is not the identity.
#[inline(always)]
fn acc_of<F: Arith, const EXACT: bool, const N: usize>(
    terms: [i64; N],
    p: &Params,
    count: &mut u64,
) -> Option<i64> {
    if EXACT {
        return Some(fit_sum::<F, N>(terms, p, count));
    }
    let sum = exact_sum::<F, N>(terms)?;
    (F::WIDE || within(sum, p.acc_lo, p.acc_span)).then_some(sum)
}

/// The narrowing y = fit_D(round_r(fit_A(sum of `terms`))) as (acc, round_r(acc), y);
/// `None` on the fast path when a fit would not be the identity.
#[inline(always)]
fn narrow<F: Arith, const EXACT: bool, const N: usize>(
    terms: [i64; N],
    s: &SectionCoefs,
    p: &Params,
    count: &mut u64,
) -> Option<(i64, i64, i64)> {
    if EXACT {
        let acc = fit_sum::<F, N>(terms, p, count);
        let q = round::<F, true>(acc, s);
        return Some((acc, q, fit_data::<F>(q, p, count)));
    }
    let sum = exact_sum::<F, N>(terms)?;
    if !within(sum, s.fast_lo, s.fast_span) {
        return None;
    }
    let q = round::<F, false>(sum, s);
    Some((sum, q, q))
}

/// A group of `size` sections (1 to [`GROUP`]) from `input` to `output`: the fast
/// path of [`sections`], and the exact one from the same state when it gives up.
#[inline(always)]
fn group<F: Arith>(
    size: usize,
    p: &Params,
    secs: &[SectionCoefs],
    state: &mut [[i64; 6]],
    io: (&[i64], &mut [i64]),
    count: &mut u64,
) {
    let (input, output) = io;
    let done = match size {
        1 => sections::<F, 1, false>(p, secs, state, input, output, count),
        _ => sections::<F, 2, false>(p, secs, state, input, output, count),
    };
    if !done {
        exact::<F>(p, secs, state, input, output, count);
    }
}

/// The exact path of [`sections`], one section at a time, kept out of the fast loop.
#[cold]
#[inline(never)]
fn exact<F: Arith>(
    p: &Params,
    secs: &[SectionCoefs],
    state: &mut [[i64; 6]],
    input: &[i64],
    output: &mut [i64],
    count: &mut u64,
) {
    output.copy_from_slice(input);
    for (k, state) in state.iter_mut().enumerate() {
        let (secs, state) = (&secs[k..=k], std::slice::from_mut(state));
        let mut tmp = [0i64; BLOCK];
        let tmp = &mut tmp[..output.len()];
        tmp.copy_from_slice(output);
        sections::<F, 1, true>(p, secs, state, tmp, output, count);
    }
}

/// The cascade over `C` channels, block by block, one channel after the other.
fn run<F: Arith, const C: usize>(
    p: &Params,
    secs: &[SectionCoefs],
    mut states: [&mut [[i64; 6]]; C],
    io: Channels<'_>,
    scratch: &mut [i64],
) -> u64 {
    through::<F, C>(p, io, split(scratch, BLOCK), |bufs, count| {
        for (buf, state) in bufs.into_iter().zip(states.each_mut()) {
            blocks::<F>(p, secs, state, buf, count);
        }
    })
}

/// The first `C` runs of `len` values of `scratch`.
fn split<const C: usize>(scratch: &mut [i64], len: usize) -> [&mut [i64]; C] {
    let mut rest = scratch;
    std::array::from_fn(|_| {
        let (run, after) = std::mem::take(&mut rest).split_at_mut(len);
        rest = after;
        run
    })
}

/// The samples of `io`'s `C` channels, `len` frames at a time (the length of each of
/// `bufs`): fitted to the data word into one buffer per channel, processed there by `f`
/// (which adds its overflow events to the count), and written back. Returns the
/// overflow events.
#[inline(always)]
fn through<F: Arith, const C: usize>(
    p: &Params,
    io: Channels<'_>,
    mut bufs: [&mut [i64]; C],
    mut f: impl FnMut([&mut [i64]; C], &mut u64),
) -> u64 {
    let Channels { samples, ch, n } = io;
    let len = bufs[0].len();
    let mut count = 0;
    for chunk in samples.chunks_mut(len * n) {
        let frames = chunk.len() / n;
        let mut bufs = bufs.each_mut().map(|b| &mut b[..frames]);
        // A local count: the one `f` is also handed would be kept in memory, a store
        // and a load on every sample.
        let mut fits = 0;
        let mut fit = |x: i32| fit_data::<F>(i64::from(x), p, &mut fits);
        // When the kernel takes every channel (mono, or stereo as a pair), frames of a
        // constant size, so the loops vectorise. Indices below `frames`, the length of
        // every buffer, need no bounds checks.
        if n == C {
            for (f, i) in chunk.as_chunks::<C>().0.iter().zip(0..frames) {
                for c in 0..C {
                    bufs[c][i] = fit(f[c]);
                }
            }
        } else {
            for (f, i) in chunk.chunks_exact(n).zip(0..frames) {
                for c in 0..C {
                    bufs[c][i] = fit(f[ch + c]);
                }
            }
        }
        count += fits;
        f(bufs.each_mut().map(|b| &mut **b), &mut count);
        // Every value fits the data word, which is at most 32 bits wide.
        if n == C {
            for (f, i) in chunk.as_chunks_mut::<C>().0.iter_mut().zip(0..frames) {
                for c in 0..C {
                    f[c] = bufs[c][i] as i32;
                }
            }
        } else {
            for (f, i) in chunk.chunks_exact_mut(n).zip(0..frames) {
                for c in 0..C {
                    f[ch + c] = bufs[c][i] as i32;
                }
            }
        }
    }
    count
}

/// The sections `secs` over samples already fitted to the data word, in place, block
/// by block; section groups as equal in size as possible pass each block between two
/// buffers.
fn blocks<F: Arith>(
    p: &Params,
    secs: &[SectionCoefs],
    state: &mut [[i64; 6]],
    samples: &mut [i64],
    count: &mut u64,
) {
    let mut other = [0i64; BLOCK];
    let ns = secs.len();
    let groups = ns.div_ceil(GROUP);
    for chunk in samples.chunks_mut(BLOCK) {
        let len = chunk.len();
        let (mut a, mut b) = (&mut *chunk, &mut other[..len]);
        let mut k = 0;
        for g in 0..groups {
            // The first ns % groups groups take one section more.
            let size = ns / groups + usize::from(g < ns % groups);
            let (secs, state) = (&secs[k..k + size], &mut state[k..k + size]);
            group::<F>(size, p, secs, state, (a, b), count);
            std::mem::swap(&mut a, &mut b);
            k += size;
        }
        if groups % 2 == 1 {
            chunk.copy_from_slice(&other[..len]);
        }
    }
}

/// [`wavefront::run`], or with `AVX512` [`wavefront::run_avx512`], behind a safe
/// signature; only [`build`] hands it out, and only for an [`Isa`] found by run-time
/// detection.
#[cfg(target_arch = "x86_64")]
fn wavefront_checked<F: Arith, const AVX512: bool, const C: usize>(
    p: &Params,
    secs: &[SectionCoefs],
    states: [&mut [[i64; 6]]; C],
    io: Channels<'_>,
    scratch: &mut [i64],
) -> u64 {
    // SAFETY: reachable only when the processor has AVX2, and AVX-512F and VL for
    // `AVX512` (above).
    unsafe {
        if AVX512 {
            wavefront::run_avx512::<F, C>(p, secs, states, io, scratch)
        } else {
            wavefront::run::<F, C>(p, secs, states, io, scratch)
        }
    }
}

/// The scalar kernel, or the wavefront on AVX2 (with 32 registers on AVX-512).
fn build<F: Arith, const C: usize>(isa: Isa) -> Kernel<C> {
    match isa {
        #[cfg(target_arch = "x86_64")]
        Isa::Avx2 => wavefront_checked::<F, false, C>,
        #[cfg(target_arch = "x86_64")]
        Isa::Avx512 => wavefront_checked::<F, true, C>,
        _ => run::<F, C>,
    }
}

/// The choices of a format that pick a kernel.
#[derive(Debug, Clone, Copy)]
struct Choice {
    sat: bool,
    even: bool,
    structure: Structure,
    error_feedback: u32,
    /// A 64-bit accumulator (sums checked for overflow).
    wide: bool,
}

impl Choice {
    /// The kernels for these choices on `isa`.
    fn kernels(self, isa: Isa) -> Kernels {
        Kernels { one: self.kernel(isa), two: self.kernel(isa) }
    }

    /// The kernel of `C` channels for these choices on `isa`.
    fn kernel<const C: usize>(self, isa: Isa) -> Kernel<C> {
        match (self.sat, self.even) {
            (true, true) => self.word::<true, true, C>(isa),
            (true, false) => self.word::<true, false, C>(isa),
            (false, true) => self.word::<false, true, C>(isa),
            (false, false) => self.word::<false, false, C>(isa),
        }
    }

    fn word<const SAT: bool, const EVEN: bool, const C: usize>(self, isa: Isa) -> Kernel<C> {
        if self.wide {
            self.structure::<SAT, EVEN, true, C>(isa)
        } else {
            self.structure::<SAT, EVEN, false, C>(isa)
        }
    }

    fn structure<const SAT: bool, const EVEN: bool, const WIDE: bool, const C: usize>(
        self,
        isa: Isa,
    ) -> Kernel<C> {
        match (self.structure, self.error_feedback) {
            (Structure::Df1, 0) => build::<Flags<SAT, EVEN, 0, false, WIDE>, C>(isa),
            (Structure::Df1, 1) => build::<Flags<SAT, EVEN, 1, false, WIDE>, C>(isa),
            (Structure::Df1, _) => build::<Flags<SAT, EVEN, 2, false, WIDE>, C>(isa),
            (Structure::Df2t, _) => build::<Flags<SAT, EVEN, 0, true, WIDE>, C>(isa),
        }
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
            acc_wrap: 64 - f.acc_bits,
            acc_lo,
            acc_hi,
            acc_span: acc_hi.abs_diff(acc_lo),
            data_wrap: 64 - f.data_bits,
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
                    mask: (1i64 << r) - 1,
                    half: if f.rounding == Rounding::Nearest { half_r } else { 0 },
                    even_thr: if r == 0 { 1 } else { half_r },
                    // Both fit i64: data_bits + r < acc_bits ≤ 64 (see `narrow`).
                    fast_lo: data_lo << r,
                    fast_span: ((data_hi - 1) << r).abs_diff(data_lo << r),
                }
            })
            .collect();
        let choice = Choice {
            sat: f.overflow == Overflow::Saturate,
            even: f.rounding == Rounding::Even,
            structure: fixed.structure,
            error_feedback: f.error_feedback,
            // Sums fit i64 while A ≤ 56 (then coef_bits + data_bits ≤ 56, see the doc).
            wide: f.acc_bits > 56,
        };
        let state = vec![[0; 6]; sections.len() * channels];
        let isa = Isa::detected();
        let kernels = choice.kernels(isa);
        let scratch = vec![0; SCRATCH];
        Ok(Self { channels, params, sections, state, overflows: 0, choice, isa, kernels, scratch })
    }

    /// The same engine with the scalar kernel only, even where AVX2 is available. The
    /// output and overflow count are identical; only the speed differs.
    pub fn baseline(mut self) -> Self {
        self.isa = Isa::Baseline;
        self.kernels = self.choice.kernels(self.isa);
        self
    }

    /// The same engine without its AVX-512 build (the AVX2 one where available). The
    /// output and overflow count are identical; only the speed differs.
    pub fn without_avx512(mut self) -> Self {
        self.isa = self.isa.min(Isa::Avx2);
        self.kernels = self.choice.kernels(self.isa);
        self
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
        let (ns, n) = (self.sections.len(), self.channels);
        let (p, secs, kernels) = (&self.params, &self.sections[..], self.kernels);
        // Every channel of a stretch while it is in the first-level cache, rather than
        // each channel through the whole buffer; channels in pairs, an odd one alone.
        for stretch in frames.chunks_mut(STRETCH * n) {
            for ch in (0..n).step_by(2) {
                let io = Channels { samples: &mut *stretch, ch, n };
                let states = &mut self.state[ch * ns..];
                self.overflows += if ch + 1 < n {
                    let (a, b) = states.split_at_mut(ns);
                    (kernels.two)(p, secs, [a, &mut b[..ns]], io, &mut self.scratch)
                } else {
                    (kernels.one)(p, secs, [&mut states[..ns]], io, &mut self.scratch)
                };
            }
        }
        Ok(())
    }

    fn reset(&mut self) {
        self.state.fill([0; 6]);
        self.overflows = 0;
    }
}
