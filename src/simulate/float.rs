//! Float engines (f64 and f32), direct form I and transposed direct form II.
//!
//! How they are fast without changing a result: channels are split into lane groups of
//! 8, 4, 2 or 1 adjacent channels, and every operation is written once per lane, so
//! the compiler computes a lane group in vector registers (one section's recursion per
//! lane). Frames are copied block by block into an aligned buffer; then groups of
//! sections run over the block with their states held in registers, so the recursions
//! of the sections of a group overlap in the processor instead of waiting on each
//! other. Each lane evaluates exactly the expression of the plain per-sample loop, in
//! the same order and without fused multiply-add, so the output does not depend on the
//! block size, the channel count or the instruction set: on x86-64 the same code is
//! compiled a second time for AVX and chosen at run time when the processor has it.

use super::{check_channels, check_frames, Engine};
use crate::error::Result;
use crate::quantize::Structure;
use crate::sections::Cascade;
use std::ops::{Add, Mul, Sub};

/// A float type an engine can compute in (f32 or f64).
pub trait FloatSample:
    Copy + Default + Add<Output = Self> + Sub<Output = Self> + Mul<Output = Self>
{
    /// The nearest value of this type.
    fn from_f64(v: f64) -> Self;
}

impl FloatSample for f64 {
    fn from_f64(v: f64) -> Self {
        v
    }
}

impl FloatSample for f32 {
    fn from_f64(v: f64) -> Self {
        v as f32
    }
}

/// Frames per block: small enough that a block of 8 f64 lanes (4 KiB) stays in the
/// first-level cache, large enough that loading a group's states is rare.
const BLOCK: usize = 64;

/// A cascade running in float type `T`; coefficients are rounded to `T` once.
#[derive(Debug, Clone)]
pub struct FloatEngine<T> {
    structure: Structure,
    channels: usize,
    /// b0, b1, b2, a1, a2 per section.
    coefs: Vec<[T; 5]>,
    /// Per lane group (in channel order), per section, four states (df1 x1, x2, y1,
    /// y2; df2t s1, s2, unused, unused), each with one value per lane.
    state: Vec<T>,
    /// Widths of the lane groups, adding up to `channels`.
    lanes: Vec<usize>,
    /// Whether the AVX build of the kernels runs (set only after run-time detection).
    avx: bool,
}

impl<T: FloatSample> FloatEngine<T> {
    /// An engine for `cascade` in `structure` with `channels` interleaved channels.
    ///
    /// # Errors
    /// `channels` of 0.
    ///
    /// ```
    /// use tonewright::quantize::Structure;
    /// use tonewright::sections::{Cascade, Sos};
    /// use tonewright::simulate::{Engine, FloatEngine};
    /// let avg = Sos { b: [0.5, 0.5, 0.0], a: [0.0, 0.0] };
    /// let c = Cascade { rate: 48000.0, sections: vec![avg] };
    /// let mut e = FloatEngine::<f64>::new(&c, Structure::Df2t, 1).unwrap();
    /// let mut x = [1.0, 1.0, 0.0];
    /// e.process(&mut x).unwrap();
    /// assert!((x[1] - 1.0).abs() < 1e-15 && (x[2] - 0.5).abs() < 1e-15);
    /// ```
    pub fn new(cascade: &Cascade, structure: Structure, channels: usize) -> Result<Self> {
        check_channels(channels)?;
        let coefs: Vec<[T; 5]> = cascade
            .sections
            .iter()
            .map(|s| [s.b[0], s.b[1], s.b[2], s.a[0], s.a[1]].map(T::from_f64))
            .collect();
        let state = vec![T::default(); coefs.len() * 4 * channels];
        let mut lanes = Vec::new();
        let mut left = channels;
        while left > 0 {
            let width = [8, 4, 2, 1].into_iter().find(|&w| w <= left).unwrap_or(1);
            lanes.push(width);
            left -= width;
        }
        Ok(Self { structure, channels, coefs, state, lanes, avx: avx_detected() })
    }

    /// The same engine restricted to the baseline instruction set (SSE2 on x86-64),
    /// even where AVX is available. The output is identical; only the speed differs.
    /// Lets tests and users compare the two builds of the kernels.
    ///
    /// ```
    /// use tonewright::quantize::Structure;
    /// use tonewright::sections::{Cascade, Sos};
    /// use tonewright::simulate::{Engine, FloatEngine};
    /// let s = Sos { b: [0.2, 0.4, 0.2], a: [-0.5, 0.25] };
    /// let c = Cascade { rate: 48000.0, sections: vec![s; 3] };
    /// let x: Vec<f64> = (0..64).map(|i| ((i * 7919) % 13) as f64 / 13.0 - 0.5).collect();
    /// let (mut a, mut b) = (x.clone(), x);
    /// FloatEngine::<f64>::new(&c, Structure::Df2t, 8).unwrap().process(&mut a).unwrap();
    /// let mut base = FloatEngine::<f64>::new(&c, Structure::Df2t, 8).unwrap().baseline();
    /// base.process(&mut b).unwrap();
    /// assert_eq!(a, b); // bit for bit, within 0 ulp
    /// ```
    pub fn baseline(mut self) -> Self {
        self.avx = false;
        self
    }
}

/// Whether this x86-64 processor runs AVX instructions.
#[cfg(target_arch = "x86_64")]
fn avx_detected() -> bool {
    std::is_x86_feature_detected!("avx")
}

/// No AVX build off x86-64.
#[cfg(not(target_arch = "x86_64"))]
fn avx_detected() -> bool {
    false
}

/// A kernel over one lane group of an interleaved buffer: coefficients, the group's
/// states, the buffer, the group's first channel and the channel count.
type Run<T> = fn(&[[T; 5]], &mut [T], &mut [T], usize, usize);

/// One block of frames of `L` lanes, aligned for the widest vector loads.
#[repr(C, align(64))]
struct Block<T, const L: usize>([[T; L]; BLOCK]);

/// `G` sections (df2t when `DF2T`, else df1) over a block of `L`-lane frames, with
/// the states in local variables for the whole block.
#[inline(always)]
// Lane loops index several arrays at once; iterator chains would hide the per-lane
// expression that must stay identical to the plain loop.
#[allow(clippy::needless_range_loop)]
fn sections<T: FloatSample, const L: usize, const G: usize, const DF2T: bool>(
    coefs: &[[T; 5]],
    state: &mut [T],
    block: &mut [[T; L]],
) {
    let c: [[T; 5]; G] = std::array::from_fn(|k| coefs[k]);
    let mut s: [[[T; L]; 4]; G] = std::array::from_fn(|k| {
        std::array::from_fn(|j| std::array::from_fn(|l| state[(k * 4 + j) * L + l]))
    });
    for v in block.iter_mut() {
        let mut x = *v;
        for k in 0..G {
            let [b0, b1, b2, a1, a2] = c[k];
            let st = &mut s[k];
            let mut y = [T::default(); L];
            if DF2T {
                for l in 0..L {
                    y[l] = b0 * x[l] + st[0][l];
                    st[0][l] = b1 * x[l] - a1 * y[l] + st[1][l];
                    st[1][l] = b2 * x[l] - a2 * y[l];
                }
            } else {
                for l in 0..L {
                    y[l] =
                        b0 * x[l] + b1 * st[0][l] + b2 * st[1][l] - a1 * st[2][l] - a2 * st[3][l];
                }
                *st = [x, st[0], y, st[2]];
            }
            x = y;
        }
        *v = x;
    }
    for k in 0..G {
        for j in 0..4 {
            state[(k * 4 + j) * L..(k * 4 + j + 1) * L].copy_from_slice(&s[k][j]);
        }
    }
}

/// Sections per group. The recursion of one df2t section is a chain of a multiply and
/// three adds per sample (about 12 cycles); four sections in flight cover it while
/// their 8 to 16 states and temporaries still fit the 16 vector registers of x86-64.
/// Measured on 8 sections (benches/engines.rs): groups of 8 spill and run at less than
/// half the speed for one channel; groups of 1 or 2 wait on the chain.
const GROUP: usize = 4;

/// [`sections`] for a group of `size` sections (1 to [`GROUP`]).
#[inline(always)]
fn group<T: FloatSample, const L: usize, const DF2T: bool>(
    size: usize,
    coefs: &[[T; 5]],
    state: &mut [T],
    block: &mut [[T; L]],
) {
    match size {
        1 => sections::<T, L, 1, DF2T>(coefs, state, block),
        2 => sections::<T, L, 2, DF2T>(coefs, state, block),
        3 => sections::<T, L, 3, DF2T>(coefs, state, block),
        _ => sections::<T, L, 4, DF2T>(coefs, state, block),
    }
}

/// The cascade over the `L` channels from `first` of an `n`-channel buffer, block by
/// block, sections in groups of at most [`GROUP`], as equal in size as possible.
#[inline(always)]
fn run_lanes<T: FloatSample, const L: usize, const DF2T: bool>(
    coefs: &[[T; 5]],
    state: &mut [T],
    frames: &mut [T],
    first: usize,
    n: usize,
) {
    let mut block = Block([[T::default(); L]; BLOCK]);
    let ns = coefs.len();
    let groups = ns.div_ceil(GROUP);
    for chunk in frames.chunks_mut(BLOCK * n) {
        let b = &mut block.0[..chunk.len() / n];
        for (v, frame) in b.iter_mut().zip(chunk.chunks_exact(n)) {
            v.copy_from_slice(&frame[first..first + L]);
        }
        let mut k = 0;
        for g in 0..groups {
            // The first ns % groups groups take one section more.
            let size = ns / groups + usize::from(g < ns % groups);
            group::<T, L, DF2T>(
                size,
                &coefs[k..k + size],
                &mut state[k * 4 * L..(k + size) * 4 * L],
                b,
            );
            k += size;
        }
        for (v, frame) in b.iter().zip(chunk.chunks_exact_mut(n)) {
            frame[first..first + L].copy_from_slice(v);
        }
    }
}

/// [`run_lanes`] compiled for AVX.
///
/// # Safety
/// The processor must support AVX.
#[cfg(target_arch = "x86_64")]
#[target_feature(enable = "avx")]
unsafe fn run_lanes_avx<T: FloatSample, const L: usize, const DF2T: bool>(
    coefs: &[[T; 5]],
    state: &mut [T],
    frames: &mut [T],
    first: usize,
    n: usize,
) {
    run_lanes::<T, L, DF2T>(coefs, state, frames, first, n);
}

/// [`run_lanes_avx`] behind a safe signature; only [`kernel`] hands it out, and only
/// when `avx` is true, which [`FloatEngine`] sets only after run-time detection.
#[cfg(target_arch = "x86_64")]
fn run_lanes_avx_checked<T: FloatSample, const L: usize, const DF2T: bool>(
    coefs: &[[T; 5]],
    state: &mut [T],
    frames: &mut [T],
    first: usize,
    n: usize,
) {
    // SAFETY: reachable only through `kernel` with `avx` set after detection (above).
    unsafe { run_lanes_avx::<T, L, DF2T>(coefs, state, frames, first, n) }
}

/// The build of one kernel for the instruction set.
fn build<T: FloatSample, const L: usize, const DF2T: bool>(avx: bool) -> Run<T> {
    #[cfg(target_arch = "x86_64")]
    if avx {
        return run_lanes_avx_checked::<T, L, DF2T>;
    }
    let _ = avx;
    run_lanes::<T, L, DF2T>
}

/// The kernel for a structure and lane width.
fn kernel<T: FloatSample>(structure: Structure, lanes: usize, avx: bool) -> Run<T> {
    match (structure, lanes) {
        (Structure::Df2t, 1) => build::<T, 1, true>(avx),
        (Structure::Df2t, 2) => build::<T, 2, true>(avx),
        (Structure::Df2t, 4) => build::<T, 4, true>(avx),
        (Structure::Df2t, _) => build::<T, 8, true>(avx),
        (Structure::Df1, 1) => build::<T, 1, false>(avx),
        (Structure::Df1, 2) => build::<T, 2, false>(avx),
        (Structure::Df1, 4) => build::<T, 4, false>(avx),
        (Structure::Df1, _) => build::<T, 8, false>(avx),
    }
}

impl<T: FloatSample> Engine for FloatEngine<T> {
    type Sample = T;

    fn channels(&self) -> usize {
        self.channels
    }

    fn process(&mut self, frames: &mut [T]) -> Result<()> {
        check_frames(frames.len(), self.channels)?;
        let per_channel = self.coefs.len() * 4;
        let mut first = 0;
        for &width in &self.lanes {
            let run = kernel::<T>(self.structure, width, self.avx);
            let state = &mut self.state[first * per_channel..(first + width) * per_channel];
            run(&self.coefs, state, frames, first, self.channels);
            first += width;
        }
        Ok(())
    }

    fn reset(&mut self) {
        self.state.fill(T::default());
    }
}
