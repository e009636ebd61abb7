//! The df2t cascade of one or two channels as a wavefront: one section per lane.
//!
//! Lane k holds section k. At step t, lane k runs sample t − k: its input is what lane
//! k − 1 produced at step t − 1, so all lanes advance together in one vector
//! operation and the recursions of the sections overlap instead of waiting on each
//! other. One channel is then bound by one section's recursion per step (8 section-
//! samples per chain of 4 dependent operations) rather than by a chain per section.
//! This is the skewed ("systolic") schedule of H. T. Kung, "Why systolic
//! architectures?", IEEE Computer 15(1), 1982.
//!
//! Sections sit in the last lanes of a wave; the first lanes, when there are fewer
//! sections than lanes, pass their input on untouched. The first and last steps of a
//! pass run only the lanes that have a sample (the others keep their states); each
//! section still sees its samples in order, and each lane evaluates the plain loop's
//! expression with separate multiplies and adds (no FMA), so the output is bit for bit
//! the other kernels'. Written with AVX2 intrinsics ([`registers`]): the compiler does
//! not find the move to the next lane (one permute and one blend, or one `valignq` in
//! AVX-512 registers) on its own.

mod registers;

use registers::Register;

/// Frames per pass: each pass spends 2 (lanes − 1) masked steps filling and draining
/// the wavefront, under 0.5 % of the steps.
const PASS: usize = 4096;

/// Sections per wave: two f64 or one f32 register of lanes per state.
const WAVE: usize = 8;

/// The df2t cascade over `CH` adjacent channels (1 or 2) of the `n`-channel `frames`
/// from `first`, continuing from `state` (per section, four states, one value per
/// channel). Waves of at most [`WAVE`] sections, as equal in size as possible, each
/// over the frames pass by pass.
/// With `WIDE`, f64 waves run in AVX-512 registers (8 lanes, no spilled states for
/// two channels).
#[target_feature(enable = "avx2")]
pub(super) fn run<T: Lane, const CH: usize, const WIDE: bool>(
    coefs: &[[T; 5]],
    state: &mut [T],
    frames: &mut [T],
    first: usize,
    n: usize,
) {
    let ns = coefs.len();
    let waves = ns.div_ceil(WAVE);
    for pass in frames.chunks_mut(PASS * n) {
        let m = pass.len() / n;
        let mut k = 0;
        for w in 0..waves {
            // The first ns % waves waves take one section more.
            let size = ns / waves + usize::from(w < ns % waves);
            let lanes = Lanes { frames: &mut *pass, first, n, m };
            let (c, s) = (&coefs[k..k + size], &mut state[k * 4 * CH..(k + size) * 4 * CH]);
            // SAFETY: this function runs only on processors with AVX2, and with `WIDE`
            // AVX-512F and DQ (its caller checks).
            unsafe { T::wave::<CH, WIDE>(c, s, lanes) };
            k += size;
        }
    }
}

/// A float type with an AVX2 wavefront.
pub(super) trait Lane: Copy + Default {
    /// Runs one wave (at most [`WAVE`] sections) over a pass; with `WIDE` in AVX-512
    /// registers where the type has such a wave.
    ///
    /// # Safety
    /// The processor must support AVX2, and with `WIDE` AVX-512F and DQ.
    unsafe fn wave<const CH: usize, const WIDE: bool>(
        coefs: &[[Self; 5]],
        state: &mut [Self],
        lanes: Lanes<'_, Self>,
    );
}

impl Lane for f64 {
    #[target_feature(enable = "avx2")]
    unsafe fn wave<const CH: usize, const WIDE: bool>(
        coefs: &[[f64; 5]],
        state: &mut [f64],
        lanes: Lanes<'_, f64>,
    ) {
        use std::arch::x86_64::__m256d;
        if WIDE {
            // SAFETY: the caller checked AVX-512F and DQ.
            return unsafe { wave_avx512::<CH>(coefs, state, lanes) };
        }
        // Without passing lanes (4 or 8 sections) the blend that passes them is left out.
        match coefs.len() {
            4 => wave::<__m256d, 1, CH, false>(coefs, state, lanes),
            8 => wave::<__m256d, 2, CH, false>(coefs, state, lanes),
            1..=3 => wave::<__m256d, 1, CH, true>(coefs, state, lanes),
            _ => wave::<__m256d, 2, CH, true>(coefs, state, lanes),
        }
    }
}

/// An f64 wave in one AVX-512 register of 8 lanes.
#[target_feature(enable = "avx512f,avx512dq")]
fn wave_avx512<const CH: usize>(coefs: &[[f64; 5]], state: &mut [f64], lanes: Lanes<'_, f64>) {
    use std::arch::x86_64::__m512d;
    if coefs.len() == 8 {
        wave::<__m512d, 1, CH, false>(coefs, state, lanes)
    } else {
        wave::<__m512d, 1, CH, true>(coefs, state, lanes)
    }
}

impl Lane for f32 {
    #[target_feature(enable = "avx2")]
    unsafe fn wave<const CH: usize, const WIDE: bool>(
        coefs: &[[f32; 5]],
        state: &mut [f32],
        lanes: Lanes<'_, f32>,
    ) {
        use std::arch::x86_64::__m256;
        if coefs.len() == 8 {
            wave::<__m256, 1, CH, false>(coefs, state, lanes)
        } else {
            wave::<__m256, 1, CH, true>(coefs, state, lanes)
        }
    }
}

/// The frames of one pass and where the group's channels sit in them.
pub(super) struct Lanes<'a, T> {
    frames: &'a mut [T],
    first: usize,
    n: usize,
    /// Frames in the pass.
    m: usize,
}

impl<T> Lanes<'_, T> {
    /// Where channel `ch` of frame `t` sits.
    #[inline(always)]
    fn at(&self, t: usize, ch: usize) -> usize {
        t * self.n + self.first + ch
    }
}

/// What stays fixed over a pass of one wave of `V` registers: the sections sit in the
/// last lanes, the first `pad` lanes pass their input on untouched.
struct Wave<R, const V: usize> {
    pad: usize,
    /// Frames in the pass.
    m: usize,
    /// All ones in the passing lanes.
    passing: [R; V],
    /// b0, b1, b2, a1, a2 per lane (zero in the passing lanes).
    c: [[R; V]; 5],
}

/// Runs the sections `coefs` (as many as the lanes of `V` registers; fewer only when
/// `PASSING`) over every frame of the pass, from and back to `state`. Inlined, with
/// everything it calls, into the `Lane::wave` functions compiled for `R`'s
/// instruction set.
#[inline(always)]
fn wave<R: Register, const V: usize, const CH: usize, const PASSING: bool>(
    coefs: &[[R::Lane; 5]],
    state: &mut [R::Lane],
    mut lanes: Lanes<'_, R::Lane>,
) {
    let p = R::LANES * V;
    let pad = p - coefs.len();
    let m = lanes.m;
    // Lane values to registers, section k in lane pad + k.
    let regs = |value: &dyn Fn(usize) -> R::Lane| -> [R; V] {
        let mut a = [R::Lane::default(); WAVE];
        for (k, v) in a[pad..p].iter_mut().enumerate() {
            *v = value(k);
        }
        std::array::from_fn(|v| R::load(&a[R::LANES * v..]))
    };
    let wave = Wave::<R, V> {
        pad,
        m,
        passing: std::array::from_fn(|v| R::mask(|l| R::LANES * v + l < pad)),
        c: std::array::from_fn(|i| regs(&|k| coefs[k][i])),
    };
    let mut s: [[[R; V]; 2]; CH] =
        std::array::from_fn(|ch| std::array::from_fn(|j| regs(&|k| state[(k * 4 + j) * CH + ch])));
    let mut x = [[R::splat(R::Lane::default()); V]; CH];
    for (ch, x) in x.iter_mut().enumerate() {
        x[0] = R::splat(lanes.frames[lanes.at(0, ch)]);
    }
    let body = p - 1..(m - 1).max(p - 1);
    for t in 0..body.start {
        wave.step::<CH, true, PASSING>(&mut s, &mut x, &mut lanes, t);
    }
    for t in body.clone() {
        wave.step::<CH, false, PASSING>(&mut s, &mut x, &mut lanes, t);
    }
    for t in body.end..m + p - 1 {
        wave.step::<CH, true, PASSING>(&mut s, &mut x, &mut lanes, t);
    }
    for (ch, s) in s.iter().enumerate() {
        for (j, r) in s.iter().enumerate() {
            let mut a = [R::Lane::default(); WAVE];
            for (v, reg) in r.iter().enumerate() {
                reg.store(&mut a[R::LANES * v..]);
            }
            for k in 0..p - pad {
                state[(k * 4 + j) * CH + ch] = a[pad + k];
            }
        }
    }
}

impl<R: Register, const V: usize> Wave<R, V> {
    /// Step `t` of `CH` channels with states `s` (s1, s2) and inputs `x`: lane l runs
    /// sample t − l. `MASKED` outside the body: lanes without a sample keep their
    /// states. Writes the last lane's output and moves every lane's output (or passed
    /// input) to the next lane.
    #[inline(always)]
    fn step<const CH: usize, const MASKED: bool, const PASSING: bool>(
        &self,
        s: &mut [[[R; V]; 2]; CH],
        x: &mut [[R; V]; CH],
        lanes: &mut Lanes<'_, R::Lane>,
        t: usize,
    ) {
        let (p, m, pad) = (R::LANES * V, self.m, self.pad);
        let active: [R; V] = if MASKED {
            // Lane l has a sample when it holds a section and 0 <= t - l < m.
            std::array::from_fn(|v| {
                R::mask(|l| {
                    let l = R::LANES * v + l;
                    l >= pad && l <= t && t - l < m
                })
            })
        } else {
            [R::splat(R::Lane::default()); V]
        };
        let [b0, b1, b2, a1, a2] = &self.c;
        for ch in 0..CH {
            let [s1, s2] = &mut s[ch];
            let x = &mut x[ch];
            let mut out = [R::splat(R::Lane::default()); V];
            for v in 0..V {
                // The plain loop: y = b0 x + s1; s1 = b1 x - a1 y + s2; s2 = b2 x - a2 y.
                let y = b0[v].mul(x[v]).add(s1[v]);
                let n1 = b1[v].mul(x[v]).sub(a1[v].mul(y)).add(s2[v]);
                let n2 = b2[v].mul(x[v]).sub(a2[v].mul(y));
                if MASKED {
                    s1[v] = s1[v].select(n1, active[v]);
                    s2[v] = s2[v].select(n2, active[v]);
                } else {
                    s1[v] = n1;
                    s2[v] = n2;
                }
                out[v] = if PASSING { y.select(x[v], self.passing[v]) } else { y };
            }
            if !MASKED || t + 1 >= p {
                lanes.frames[lanes.at(t + 1 - p, ch)] = out[V - 1].last();
            }
            let next = if !MASKED || t + 1 < m {
                lanes.frames[lanes.at(t + 1, ch)]
            } else {
                R::Lane::default()
            };
            // Each lane takes the previous lane's output; lane 0 of a register the last
            // lane of the one before, or the next input.
            x[0] = out[0].shift_in(R::splat(next));
            for v in 1..V {
                x[v] = out[v].shift_in(out[v - 1]);
            }
        }
    }
}
