//! The fixed-point fast path of one channel, or of a pair of channels side by side,
//! as an AVX2 wavefront: one section per 64-bit lane.
//!
//! The schedule of the float wavefront (lane k holds section k and runs sample t − k
//! at step t; H. T. Kung, "Why systolic architectures?", IEEE Computer 15(1), 1982)
//! applied to the fast path of [`super::sections`]: every sum is formed exactly in
//! 64-bit lanes (products of a coefficient and a sample of at most 32 bits each, by
//! `vpmuldq`; with a 64-bit accumulator every addition is checked for overflow), and
//! a lane whose sum leaves its overflow-free range marks the wave. A marked wave is
//! run again from its saved states and input by the scalar path, which is exact; an
//! unmarked one has done only fits that are the identity, so both paths agree bit
//! for bit (tests/fixed_point.rs compares them with the literal arithmetic).
//!
//! One channel's wave is one chain of dependent steps: each lane waits on the
//! previous lane's output of the step before (a multiply, an add and a shift), so the
//! processor idles on latency. A pair of channels runs two chains in the same step
//! loop, which the out-of-order core overlaps; each channel keeps its own marks, and
//! only a marked channel's wave is redone. On 8 q15 sections this took stereo from
//! about 1.4 to 1.7 G section-samples/s and 8 channels from 1.2 to 1.8 (AVX-512
//! build, benches/engines.rs).

use super::{blocks, split, through, Arith, Channels, Params, SectionCoefs};
use std::arch::x86_64::{
    __m256i, _mm256_add_epi64, _mm256_alignr_epi64, _mm256_and_si256, _mm256_blend_epi32,
    _mm256_blendv_epi8, _mm256_castsi256_pd, _mm256_cmpgt_epi64, _mm256_extract_epi64,
    _mm256_loadu_si256, _mm256_movemask_pd, _mm256_mul_epi32, _mm256_or_si256,
    _mm256_permute4x64_epi64, _mm256_set1_epi64x, _mm256_setzero_si256, _mm256_sllv_epi64,
    _mm256_srav_epi64, _mm256_srlv_epi64, _mm256_storeu_si256, _mm256_sub_epi64,
    _mm256_testz_si256, _mm256_xor_si256,
};

/// Frames per pass: a marked wave redoes one pass; the 2 (lanes − 1) masked steps that
/// fill and drain it are under 3 % of the steps for 8 sections.
const PASS: usize = 2048;
const _: () = assert!(4 * PASS <= super::SCRATCH, "two passes of two channels fit the scratch");

/// Sections per wave: two registers of four 64-bit lanes per state.
const WAVE: usize = 8;

/// Passes shorter than this run the scalar path: filling and draining the wavefront
/// (2 (lanes − 1) steps) would cost more than the samples (the limit-cycle search runs
/// one frame at a time).
const SHORT: usize = 64;

/// The cascade over `C` adjacent channels (one, or a pair) of an `n`-channel buffer,
/// pass by pass and wave by wave, the channels' waves side by side; returns the
/// overflow events (only the scalar path meets any).
#[target_feature(enable = "avx2")]
pub(super) fn run<F: Arith, const C: usize>(
    p: &Params,
    secs: &[SectionCoefs],
    states: [&mut [[i64; 6]]; C],
    io: Channels<'_>,
    scratch: &mut [i64],
) -> u64 {
    // SAFETY: this function has AVX2, all the body needs without `X512`.
    unsafe { run_body::<F, false, C>(p, secs, states, io, scratch) }
}

/// The body of [`run`] and [`run_avx512`], inlined into each; `X512` when compiled
/// with AVX-512F and VL.
#[inline(always)]
unsafe fn run_body<F: Arith, const X512: bool, const C: usize>(
    p: &Params,
    secs: &[SectionCoefs],
    mut states: [&mut [[i64; 6]]; C],
    io: Channels<'_>,
    scratch: &mut [i64],
) -> u64 {
    let (bufs, before) = scratch[..2 * C * PASS].split_at_mut(C * PASS);
    let mut before: [&mut [i64]; C] = split(before, PASS);
    let ns = secs.len();
    let waves = ns.div_ceil(WAVE);
    through::<F, C>(
        p,
        io,
        split(bufs, PASS),
        // Inlined so the waves compile in the caller's instruction set, not the
        // closure's own (baseline) one.
        #[inline(always)]
        |mut bufs, count| {
            let m = bufs[0].len();
            if m < SHORT {
                for (buf, state) in bufs.into_iter().zip(states.each_mut()) {
                    blocks::<F>(p, secs, state, buf, count);
                }
                return;
            }
            let mut k = 0;
            for w in 0..waves {
                // The first ns % waves waves take one section more.
                let size = ns / waves + usize::from(w < ns % waves);
                let secs = &secs[k..k + size];
                let mut states = states.each_mut().map(|s| &mut s[k..k + size]);
                let saved: [[[i64; 6]; WAVE]; C] = std::array::from_fn(|c| {
                    std::array::from_fn(|i| states[c].get(i).copied().unwrap_or_default())
                });
                for (before, buf) in before.iter_mut().zip(&bufs) {
                    before[..m].copy_from_slice(buf);
                }
                let (st, io) =
                    (states.each_mut().map(|s| &mut **s), bufs.each_mut().map(|b| &mut **b));
                let done = match size {
                    4 => wave::<F, 1, false, X512, C>(p, secs, st, io),
                    8 => wave::<F, 2, false, X512, C>(p, secs, st, io),
                    1..=3 => wave::<F, 1, true, X512, C>(p, secs, st, io),
                    _ => wave::<F, 2, true, X512, C>(p, secs, st, io),
                };
                // Only a marked channel is redone, from its own saved states and input.
                for c in (0..C).filter(|&c| !done[c]) {
                    states[c].copy_from_slice(&saved[c][..size]);
                    bufs[c].copy_from_slice(&before[c][..m]);
                    blocks::<F>(p, secs, states[c], bufs[c], count);
                }
                k += size;
            }
        },
    )
}

/// [`run`] compiled where AVX-512F and VL are available: the same 256-bit code, which
/// then has 32 vector registers instead of 16 for the states and constants of a wave
/// (or a pair of waves), and two shorter steps on the path from one lane to the next:
/// an arithmetic 64-bit shift rounds (df1 nearest and floor add the rounding addend
/// before the sample's own product), and one `valignq` moves the outputs on. The
/// exact shift also lets the check of a step be that of its output (see
/// [`Wave::check`]).
#[target_feature(enable = "avx2,avx512f,avx512vl")]
pub(super) fn run_avx512<F: Arith, const C: usize>(
    p: &Params,
    secs: &[SectionCoefs],
    states: [&mut [[i64; 6]]; C],
    io: Channels<'_>,
    scratch: &mut [i64],
) -> u64 {
    // SAFETY: this function has AVX2, AVX-512F and VL, all the body needs with `X512`.
    unsafe { run_body::<F, true, C>(p, secs, states, io, scratch) }
}

// Every `unsafe fn` below uses AVX2 instructions: it is safe to call only from code
// compiled with AVX2, which is where [`run`] and [`run_avx512`] inline all of them.

/// Registers of one wave: `V` registers of four 64-bit lanes.
type Regs<const V: usize> = [__m256i; V];

/// What stays fixed over a pass of one wave: per lane the section's integers and
/// narrowing constants (sections in the last lanes, the first `pad` lanes passing
/// their input on untouched), and the accumulator's limits.
struct Wave<const V: usize> {
    pad: usize,
    /// Frames in the pass.
    m: usize,
    /// All ones in the passing lanes; in the section lanes.
    passing: Regs<V>,
    holding: Regs<V>,
    /// b0, b1, b2, a1, a2.
    c: [Regs<V>; 5],
    /// r, 2^r − 1, the rounding addend (plus the bias of [`Wave::round`] unless
    /// `X512`), the half-even threshold, the fast range (of the sum plus the addend
    /// where [`Wave::halved`]).
    r: Regs<V>,
    mask: Regs<V>,
    addend: Regs<V>,
    even_thr: Regs<V>,
    fast_lo: Regs<V>,
    fast_hi: Regs<V>,
    acc_lo: __m256i,
    acc_hi: __m256i,
    /// The bias after the shift: 2^(D−1) = −data_lo.
    unbias: __m256i,
    /// D.
    data_bits: __m256i,
}

/// What marks a wave to be redone: the sign bits of `marks` (a sum out of range, an
/// overflowed addition), and with AVX-512 the bits of every output's offset
/// y − data_lo of the steps outside the masked ones, ORed (see [`Wave::check`]).
struct Bad {
    marks: __m256i,
    offsets: __m256i,
}

/// States per lane: df1 x1, x2, y1, y2, e1, e2; df2t s1, s2 and four unused.
type States<const V: usize> = [Regs<V>; 6];

/// One channel's recursion through a wave: its states, each lane's next input, its
/// marks, and its pass (input, then output, in place).
struct Chain<'a, const V: usize> {
    s: States<V>,
    x: Regs<V>,
    bad: Bad,
    buf: &'a mut [i64],
}

/// Runs the sections `secs` (as many as the lanes of `V` registers; fewer only when
/// `PASSING`) over the passes in `bufs` (of equal length), one channel each, in place.
/// The channels' steps alternate: their recursions are independent, so the processor
/// overlaps them. Returns per channel false, with its state and buffer to be restored
/// by the caller, when one of its sums left its overflow-free range.
#[inline(always)]
unsafe fn wave<F: Arith, const V: usize, const PASSING: bool, const X512: bool, const C: usize>(
    p: &Params,
    secs: &[SectionCoefs],
    states: [&mut [[i64; 6]]; C],
    bufs: [&mut [i64]; C],
) -> [bool; C] {
    let lanes = 4 * V;
    let pad = lanes - secs.len();
    let m = bufs[0].len();
    // Lane values to registers, section k in lane pad + k.
    let regs = |value: &dyn Fn(usize) -> i64| -> Regs<V> {
        let mut a = [0i64; WAVE];
        for (k, v) in a[pad..lanes].iter_mut().enumerate() {
            *v = value(k);
        }
        std::array::from_fn(|v| load(&a[4 * v..]))
    };
    let lane_mask = |set: &dyn Fn(usize) -> bool| -> Regs<V> {
        std::array::from_fn(|v| {
            load(&std::array::from_fn::<i64, 4, _>(|l| -i64::from(set(4 * v + l))))
        })
    };
    let halve = Wave::<V>::halved::<F, X512>();
    let addend = |k: usize| if halve { secs[k].half } else { 0 };
    let wave = Wave::<V> {
        pad,
        m,
        passing: lane_mask(&|l| l < pad),
        holding: lane_mask(&|l| l >= pad),
        c: std::array::from_fn(|i| regs(&|k| secs[k].c[i])),
        r: regs(&|k| i64::from(secs[k].r)),
        mask: regs(&|k| secs[k].mask),
        addend: regs(&|k| secs[k].half - if X512 { 0 } else { secs[k].fast_lo }),
        even_thr: regs(&|k| secs[k].even_thr),
        // Within i64: data_lo·2^r and (data_hi − 1)·2^r, plus at most 2^(r−1) (see
        // `SectionCoefs`).
        fast_lo: regs(&|k| secs[k].fast_lo + addend(k)),
        fast_hi: regs(&|k| secs[k].fast_lo.wrapping_add(secs[k].fast_span as i64) + addend(k)),
        acc_lo: _mm256_set1_epi64x(p.acc_lo),
        acc_hi: _mm256_set1_epi64x(p.acc_hi),
        unbias: _mm256_set1_epi64x(-p.data_lo),
        data_bits: _mm256_set1_epi64x(i64::from(64 - p.data_wrap)),
    };
    let mut c = 0;
    let mut chains = bufs.map(|buf| {
        let s = std::array::from_fn(|j| regs(&|k| states[c][k][j]));
        c += 1;
        let bad = Bad { marks: _mm256_setzero_si256(), offsets: _mm256_setzero_si256() };
        Chain { s, x: [_mm256_set1_epi64x(buf[0]); V], bad, buf }
    });
    let body = lanes - 1..(m - 1).max(lanes - 1);
    for t in 0..body.start {
        wave.steps::<F, true, PASSING, X512>(&mut chains, t);
    }
    // Two steps an iteration: the states' move from one sample to the next is then a
    // renaming of registers rather than copies between them.
    let pairs = body.start..body.end - body.len() % 2;
    for t in pairs.clone().step_by(2) {
        wave.steps::<F, false, PASSING, X512>(&mut chains, t);
        wave.steps::<F, false, PASSING, X512>(&mut chains, t + 1);
    }
    for t in pairs.end..body.end {
        wave.steps::<F, false, PASSING, X512>(&mut chains, t);
    }
    for t in body.end..m + lanes - 1 {
        wave.steps::<F, true, PASSING, X512>(&mut chains, t);
    }
    let mut done = [false; C];
    for ((chain, state), done) in chains.iter_mut().zip(states).zip(&mut done) {
        *done = wave.finish::<F>(chain, state);
    }
    done
}

impl<const V: usize> Wave<V> {
    /// [`Wave::step`] `t` of each chain, the pair written out: a loop over it is not
    /// unrolled (its body is a whole step), which would leave the chains' registers in
    /// memory.
    #[inline(always)]
    unsafe fn steps<F: Arith, const MASKED: bool, const PASSING: bool, const X512: bool>(
        &self,
        chains: &mut [Chain<V>],
        t: usize,
    ) {
        match chains {
            [a, b] => {
                self.step::<F, MASKED, PASSING, X512>(a, t);
                self.step::<F, MASKED, PASSING, X512>(b, t);
            }
            _ => {
                // A loop rather than a closure, which would not be inlined.
                for chain in chains {
                    self.step::<F, MASKED, PASSING, X512>(chain, t);
                }
            }
        }
    }

    /// Whether `chain` stayed in its overflow-free range; if so, its states to
    /// `state`.
    #[inline(always)]
    unsafe fn finish<F: Arith>(&self, chain: &mut Chain<V>, state: &mut [[i64; 6]]) -> bool {
        let bad = &chain.bad;
        // An offset of 2^D or more, or a negative one, has bits from D up.
        let wide = _mm256_srlv_epi64(bad.offsets, self.data_bits);
        if _mm256_movemask_pd(_mm256_castsi256_pd(bad.marks)) != 0
            || _mm256_testz_si256(wide, wide) == 0
        {
            return false;
        }
        for (j, r) in chain.s.iter().enumerate() {
            let mut a = [0i64; WAVE];
            for (v, reg) in r.iter().enumerate() {
                store(&mut a[4 * v..], *reg);
            }
            for (k, st) in state.iter_mut().enumerate() {
                st[j] = a[self.pad + k];
            }
        }
        if !F::DF2T && F::EF == 0 {
            // As the scalar path: without feedback each sample shifts e1 to e2 and
            // stores e1 = 0.
            for st in state.iter_mut() {
                st[5] = if self.m == 1 { st[4] } else { 0 };
                st[4] = 0;
            }
        }
        true
    }

    /// Step `t`: lane l runs sample t − l. `MASKED` outside the body: lanes without a
    /// sample keep their states and mark nothing. Writes the last lane's output and
    /// moves every lane's output (or passed input) to the next lane. Marks `bad` (sign
    /// bit) where a sum left its range or an addition overflowed.
    #[inline(always)]
    unsafe fn step<F: Arith, const MASKED: bool, const PASSING: bool, const X512: bool>(
        &self,
        chain: &mut Chain<V>,
        t: usize,
    ) {
        let Chain { s, x, bad, buf } = chain;
        let (lanes, m, pad) = (4 * V, self.m, self.pad);
        let [b0, b1, b2, a1, a2] = &self.c;
        let mut out = [_mm256_setzero_si256(); V];
        for v in 0..V {
            // Lanes that may mark: those with a sample, or outside the passing ones.
            let (counted, active) = if MASKED {
                let a = load(&std::array::from_fn::<i64, 4, _>(|l| {
                    let l = 4 * v + l;
                    -i64::from(l >= pad && l <= t && t - l < m)
                }));
                (a, a)
            } else {
                (self.holding[v], _mm256_set1_epi64x(-1))
            };
            let mut marks = _mm256_setzero_si256();
            let xv = x[v];
            let y;
            if F::DF2T {
                let acc = add::<F>(mul(b0[v], xv), s[0][v], &mut marks);
                y = self.round::<F, X512>(acc, v, false);
                self.check::<MASKED, X512>(&mut marks, bad, acc, y, v);
                let n1 = add::<F>(sub(mul(b1[v], xv), mul(a1[v], y)), s[1][v], &mut marks);
                let n2 = sub(mul(b2[v], xv), mul(a2[v], y));
                if !F::WIDE {
                    marks = _mm256_or_si256(marks, outside(n1, self.acc_lo, self.acc_hi));
                    marks = _mm256_or_si256(marks, outside(n2, self.acc_lo, self.acc_hi));
                }
                s[0][v] = keep::<MASKED>(s[0][v], n1, active);
                s[1][v] = keep::<MASKED>(s[1][v], n2, active);
            } else {
                // The sample's own product last (it waits on the previous lane), and
                // before it the product of y1 (the lane's own output of the step
                // before); [`opaque`] keeps the compiler from regrouping the sum.
                let mut sum = add::<F>(mul(b1[v], s[0][v]), mul(b2[v], s[1][v]), &mut marks);
                sum = subtract::<F>(sum, mul(a2[v], s[3][v]), &mut marks);
                match F::EF {
                    0 => {}
                    1 => sum = add::<F>(sum, s[4][v], &mut marks),
                    _ => {
                        // |e| ≤ 2^r: 2·e1 − e2 is exact.
                        let fb = sub(_mm256_add_epi64(s[4][v], s[4][v]), s[5][v]);
                        sum = add::<F>(sum, fb, &mut marks);
                    }
                }
                let halve = Self::halved::<F, X512>();
                if halve {
                    // The addend before the sample's product, off its path.
                    sum = add::<F>(sum, self.addend[v], &mut marks);
                }
                sum = subtract::<F>(opaque(sum), mul(a1[v], s[2][v]), &mut marks);
                sum = add::<F>(opaque(sum), mul(b0[v], xv), &mut marks);
                y = self.round::<F, X512>(sum, v, halve);
                self.check::<MASKED, X512>(&mut marks, bad, sum, y, v);
                let mut next = [xv, s[0][v], y, s[2][v], s[4][v], s[5][v]];
                if F::EF > 0 {
                    let sum = if halve { sub(sum, self.addend[v]) } else { sum };
                    next[4] = sub(sum, _mm256_sllv_epi64(y, self.r[v]));
                    next[5] = s[4][v];
                }
                for (st, nx) in s.iter_mut().zip(next) {
                    st[v] = keep::<MASKED>(st[v], nx, active);
                }
            }
            bad.marks = _mm256_or_si256(bad.marks, _mm256_and_si256(marks, counted));
            out[v] = if PASSING { _mm256_blendv_epi8(y, xv, self.passing[v]) } else { y };
        }
        if !MASKED || t + 1 >= lanes {
            buf[t + 1 - lanes] = _mm256_extract_epi64::<3>(out[V - 1]);
        }
        let next = _mm256_set1_epi64x(if !MASKED || t + 1 < m { buf[t + 1] } else { 0 });
        // Every lane takes the previous lane's output; lane 0 of a register the last lane
        // of the one before, or the next input: [p3, o0, o1, o2].
        let shift = |o: __m256i, p: __m256i| {
            if X512 {
                _mm256_alignr_epi64::<3>(o, p)
            } else {
                // [o0, o1, o2, o3] -> [o3, o0, o1, o2], then lane 0 (two 32-bit halves).
                _mm256_blend_epi32::<0b11>(_mm256_permute4x64_epi64::<0b10_01_00_11>(o), p)
            }
        };
        x[0] = shift(out[0], next);
        for v in 1..V {
            x[v] = shift(
                out[v],
                if X512 {
                    out[v - 1]
                } else {
                    _mm256_permute4x64_epi64::<0b10_01_00_11>(out[v - 1])
                },
            );
        }
    }

    /// Checks a narrowing of lane `v`, from `sum` to `y`. With AVX-512, outside the
    /// masked steps, `y` is exact for any sum (the arithmetic shift floors every
    /// value), so it checks what the exact path would do: that y fits the data word,
    /// by ORing y − data_lo into one register per chain (two operations, checked once
    /// at the end of the pass, [`Wave::finish`]). Then the accumulator's fit is the
    /// identity too: |sum| < 2^(D−1+r) + 2^r ≤ 2^(A−1), as D + r < A (see
    /// `SectionCoefs`). Otherwise it sets `marks` where `sum` leaves the fast range,
    /// inside which the AVX2 rounding is exact.
    #[inline(always)]
    unsafe fn check<const MASKED: bool, const X512: bool>(
        &self,
        marks: &mut __m256i,
        bad: &mut Bad,
        sum: __m256i,
        y: __m256i,
        v: usize,
    ) {
        if X512 && !MASKED {
            bad.offsets = _mm256_or_si256(bad.offsets, _mm256_add_epi64(y, self.unbias));
        } else {
            *marks = _mm256_or_si256(*marks, outside(sum, self.fast_lo[v], self.fast_hi[v]));
        }
    }

    /// Whether a df1 step adds the rounding addend before the sample's product and
    /// rounds with an arithmetic shift (nearest and floor where AVX-512 has one).
    #[inline(always)]
    fn halved<F: Arith, const X512: bool>() -> bool {
        X512 && !F::EVEN && !F::DF2T
    }

    /// round_r of lane `v`'s sums (which already hold the addend when `halved`).
    /// With `X512` an arithmetic shift floors them. Without, where a sum lies in the
    /// fast range, adding the bias −fast_lo = 2^(D−1+r) makes it non-negative (and
    /// keeps it below 2^63), so a logical shift floors it; the bias comes off after the
    /// shift as 2^(D−1). Nearest and floor add their addend first; even rounds the
    /// dropped bits apart. Lanes outside the fast range get values nobody keeps.
    #[inline(always)]
    unsafe fn round<F: Arith, const X512: bool>(
        &self,
        sum: __m256i,
        v: usize,
        halved: bool,
    ) -> __m256i {
        let floor = |biased: __m256i| {
            if X512 {
                _mm256_srav_epi64(biased, self.r[v])
            } else {
                sub(_mm256_srlv_epi64(biased, self.r[v]), self.unbias)
            }
        };
        if halved {
            floor(sum)
        } else if F::EVEN {
            let q = floor(if X512 { sum } else { sub(sum, self.fast_lo[v]) });
            let odd = _mm256_and_si256(q, _mm256_set1_epi64x(1));
            let dropped = _mm256_add_epi64(_mm256_and_si256(sum, self.mask[v]), odd);
            // The comparison is −1 where the quotient rounds up.
            sub(q, _mm256_cmpgt_epi64(dropped, self.even_thr[v]))
        } else {
            floor(_mm256_add_epi64(sum, self.addend[v]))
        }
    }
}

/// `new` in the `active` lanes, `old` elsewhere; `new` everywhere unless `MASKED`.
#[inline(always)]
unsafe fn keep<const MASKED: bool>(old: __m256i, new: __m256i, active: __m256i) -> __m256i {
    if MASKED {
        _mm256_blendv_epi8(old, new, active)
    } else {
        new
    }
}

/// The first four values of `a`.
#[inline(always)]
unsafe fn load(a: &[i64]) -> __m256i {
    // SAFETY: the slice holds at least four values (checked by indexing).
    unsafe { _mm256_loadu_si256(a[..4].as_ptr().cast()) }
}

/// Writes the lanes to the first four values of `a`.
#[inline(always)]
unsafe fn store(a: &mut [i64], r: __m256i) {
    // SAFETY: the slice holds at least four values (checked by indexing).
    unsafe { _mm256_storeu_si256(a[..4].as_mut_ptr().cast(), r) }
}

/// Products of the low 32 bits of each lane, signed, exact in 64 bits.
#[inline(always)]
unsafe fn mul(a: __m256i, b: __m256i) -> __m256i {
    _mm256_mul_epi32(a, b)
}

/// `v`, unseen by the optimiser, which therefore cannot regroup a sum formed before it
/// with the terms added after. LLVM reassociates integer sums freely, and put the
/// sample's product first and three additions after it, on the path from one lane to
/// the next. Emits no instruction.
#[inline]
#[target_feature(enable = "avx")]
unsafe fn opaque(mut v: __m256i) -> __m256i {
    // SAFETY: the template is empty: no instruction, no memory, no flags, no stack.
    unsafe {
        std::arch::asm!(
            "/* {0} */",
            inout(ymm_reg) v,
            options(pure, nomem, nostack, preserves_flags),
        );
    }
    v
}

/// a − b, wrapping; used where it cannot overflow.
#[inline(always)]
unsafe fn sub(a: __m256i, b: __m256i) -> __m256i {
    _mm256_sub_epi64(a, b)
}

/// a + b; with `F::WIDE` the sign bit of `marks` is set where it overflowed.
#[inline(always)]
unsafe fn add<F: Arith>(a: __m256i, b: __m256i, marks: &mut __m256i) -> __m256i {
    let r = _mm256_add_epi64(a, b);
    if F::WIDE {
        // Overflow: a and b of one sign, r of the other.
        let o = _mm256_and_si256(_mm256_xor_si256(a, r), _mm256_xor_si256(b, r));
        *marks = _mm256_or_si256(*marks, o);
    }
    r
}

/// a − b; with `F::WIDE` the sign bit of `marks` is set where it overflowed.
#[inline(always)]
unsafe fn subtract<F: Arith>(a: __m256i, b: __m256i, marks: &mut __m256i) -> __m256i {
    let r = _mm256_sub_epi64(a, b);
    if F::WIDE {
        // Overflow: a and b of different signs, r of b's sign.
        let o = _mm256_and_si256(_mm256_xor_si256(a, b), _mm256_xor_si256(a, r));
        *marks = _mm256_or_si256(*marks, o);
    }
    r
}

/// All ones where `v` is below `lo` or above `hi`.
#[inline(always)]
unsafe fn outside(v: __m256i, lo: __m256i, hi: __m256i) -> __m256i {
    _mm256_or_si256(_mm256_cmpgt_epi64(lo, v), _mm256_cmpgt_epi64(v, hi))
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::audio::dither::SplitMix64;

    /// Wrapping q31 with a checked 64-bit accumulator.
    type Wide = super::super::Flags<false, false, 0, false, true>;

    /// The overflow marks of the 64-bit sums, which only a sum that wraps back into
    /// the fast range would otherwise let through, against `i64::checked_add` and
    /// `checked_sub`: the ends of the range, and random values of every magnitude.
    #[test]
    fn wide_sums_mark_exactly_the_additions_that_overflow() {
        if !std::is_x86_feature_detected!("avx2") {
            return;
        }
        let ends = [i64::MIN, i64::MIN + 1, -1, 0, 1, i64::MAX - 1, i64::MAX, 1 << 62, -(1 << 62)];
        let mut rng = SplitMix64::new(3);
        let random = (0..4000).map(|_| (rng.next_u64() as i64) >> (rng.next_u64() % 4));
        let values: Vec<i64> = ends.into_iter().chain(random).collect();
        for (pair, b) in
            values.chunks_exact(4).zip(values.iter().rev().collect::<Vec<_>>().chunks_exact(4))
        {
            let b: [i64; 4] = std::array::from_fn(|l| *b[l]);
            // SAFETY: AVX2 was detected above.
            let (sums, differences) = unsafe { marked(pair, &b) };
            for l in 0..4 {
                assert_eq!(sums[l], pair[l].checked_add(b[l]).is_none(), "{} + {}", pair[l], b[l]);
                assert_eq!(
                    differences[l],
                    pair[l].checked_sub(b[l]).is_none(),
                    "{} - {}",
                    pair[l],
                    b[l]
                );
            }
        }
    }

    /// Whether [`add`] and [`subtract`] mark each lane of `a` and `b`.
    #[target_feature(enable = "avx2")]
    fn marked(a: &[i64], b: &[i64; 4]) -> ([bool; 4], [bool; 4]) {
        // SAFETY: this function has AVX2.
        let (a, b) = unsafe { (load(a), load(b)) };
        let lanes = |marks: __m256i| {
            let mut m = [0i64; 4];
            // SAFETY: this function has AVX2.
            unsafe { store(&mut m, marks) };
            m.map(|v| v < 0)
        };
        let (mut plus, mut minus) = (_mm256_setzero_si256(), _mm256_setzero_si256());
        // SAFETY: this function has AVX2.
        unsafe {
            add::<Wide>(a, b, &mut plus);
            subtract::<Wide>(a, b, &mut minus);
        }
        (lanes(plus), lanes(minus))
    }
}
