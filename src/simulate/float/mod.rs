//! Float engines (f64 and f32), direct form I and transposed direct form II.
//!
//! How they are fast without changing a result: channels are split into lane groups of
//! 8, 4, 2 or 1 adjacent channels. On AVX2, groups of 1 and 2 in df2t run as a
//! wavefront, one section per vector lane ([`wavefront`]); every other group runs one
//! channel per lane ([`channel_lanes`]). Every kernel evaluates, per lane, exactly the
//! expression of the plain per-sample loop, in the same order and without fused
//! multiply-add, so the output does not depend on the block size, the channel count or
//! the instruction set: on x86-64 the channel-lane kernels are compiled a second time
//! for AVX2, and the AVX2 kernels are chosen at run time when the processor has it.

use super::{check_channels, check_frames, Engine, Isa};
use crate::error::Result;
use crate::quantize::Structure;
use crate::sections::Cascade;
use channel_lanes::ChannelLanes;
use std::ops::{Add, Mul, Sub};

mod channel_lanes;
#[cfg(target_arch = "x86_64")]
mod wavefront;

/// A float type an engine can compute in (f32 or f64).
pub trait FloatSample:
    Copy + Default + Add<Output = Self> + Sub<Output = Self> + Mul<Output = Self> + Kernels
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
    /// The instruction set of the kernels (set only after run-time detection).
    isa: Isa,
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
        Ok(Self { structure, channels, coefs, state, lanes, isa: Isa::detected() })
    }

    /// The same engine restricted to the baseline instruction set (SSE2 on x86-64),
    /// even where AVX2 is available. The output is identical; only the speed differs.
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
        self.isa = Isa::Baseline;
        self
    }

    /// The same engine without its AVX-512 kernel (the f64 wavefront then runs in
    /// AVX2 registers). The output is identical; only the speed differs.
    pub fn without_avx512(mut self) -> Self {
        self.isa = self.isa.min(Isa::Avx2);
        self
    }
}

/// The kernels of one float type; sealed (the module is private), so only f32 and
/// f64 are float samples.
mod sealed {
    /// The fastest kernel a type has for a structure and lane group width.
    pub trait Kernels: Sized {
        /// See [`super::kernel`]; `isa` only as wide as the processor runs.
        fn kernel(structure: super::Structure, lanes: usize, isa: super::Isa) -> super::Run<Self>;
    }
}
use sealed::Kernels;

impl Kernels for f64 {
    fn kernel(structure: Structure, lanes: usize, isa: Isa) -> Run<f64> {
        fastest::<f64>(structure, lanes, isa)
    }
}

impl Kernels for f32 {
    fn kernel(structure: Structure, lanes: usize, isa: Isa) -> Run<f32> {
        fastest::<f32>(structure, lanes, isa)
    }
}

/// On AVX2, one or two channels in df2t run the wavefront (two channels of f64 in
/// AVX-512 registers on AVX-512); everything else runs [`kernel`].
#[cfg(target_arch = "x86_64")]
fn fastest<T: FloatSample + wavefront::Lane>(
    structure: Structure,
    lanes: usize,
    isa: Isa,
) -> Run<T> {
    if isa >= Isa::Avx2 && structure == Structure::Df2t && lanes <= 2 {
        // One channel waits on the recursion, where AVX-512's longer lane permute
        // costs more than its registers save (measured); two channels gain.
        return match (lanes, isa == Isa::Avx512) {
            (1, _) => wavefront_checked::<T, 1, false>,
            (_, false) => wavefront_checked::<T, 2, false>,
            (_, true) => wavefront_checked::<T, 2, true>,
        };
    }
    kernel::<T>(structure, lanes, isa >= Isa::Avx2)
}

/// Off x86-64, [`kernel`].
#[cfg(not(target_arch = "x86_64"))]
fn fastest<T: FloatSample>(structure: Structure, lanes: usize, _: Isa) -> Run<T> {
    kernel::<T>(structure, lanes, false)
}

/// [`wavefront::run`] behind a safe signature; only [`fastest`] hands it out, and only
/// for AVX2 (and with `WIDE`, AVX-512), which [`FloatEngine`] records only after
/// run-time detection.
#[cfg(target_arch = "x86_64")]
fn wavefront_checked<T: wavefront::Lane, const CH: usize, const WIDE: bool>(
    coefs: &[[T; 5]],
    state: &mut [T],
    frames: &mut [T],
    first: usize,
    n: usize,
) {
    // SAFETY: reachable only with the instruction sets detected (above).
    unsafe { wavefront::run::<T, CH, WIDE>(coefs, state, frames, first, n) }
}

/// A kernel over one lane group of an interleaved buffer: coefficients, the group's
/// states, the buffer, the group's first channel and the channel count.
type Run<T> = fn(&[[T; 5]], &mut [T], &mut [T], usize, usize);

/// A way to run the cascade over a group of adjacent channels.
trait Kernel<T> {
    /// Filters channels `first..` of the `n`-channel `frames` in place, continuing
    /// from `state` (per section, four states, one value per channel of the group).
    fn run(coefs: &[[T; 5]], state: &mut [T], frames: &mut [T], first: usize, n: usize);
}

/// `K` compiled for AVX2 (without FMA, so every result is the baseline build's).
///
/// # Safety
/// The processor must support AVX2.
#[cfg(target_arch = "x86_64")]
#[target_feature(enable = "avx2")]
unsafe fn run_avx2<T, K: Kernel<T>>(
    coefs: &[[T; 5]],
    state: &mut [T],
    frames: &mut [T],
    first: usize,
    n: usize,
) {
    K::run(coefs, state, frames, first, n);
}

/// [`run_avx2`] behind a safe signature; only [`build`] hands it out, and only when
/// `avx2` is true, which follows [`FloatEngine`]'s run-time detection.
#[cfg(target_arch = "x86_64")]
fn run_avx2_checked<T, K: Kernel<T>>(
    coefs: &[[T; 5]],
    state: &mut [T],
    frames: &mut [T],
    first: usize,
    n: usize,
) {
    // SAFETY: reachable only through `build` with `avx2` set after detection (above).
    unsafe { run_avx2::<T, K>(coefs, state, frames, first, n) }
}

/// The build of kernel `K` for the instruction set.
fn build<T, K: Kernel<T>>(avx2: bool) -> Run<T> {
    #[cfg(target_arch = "x86_64")]
    if avx2 {
        return run_avx2_checked::<T, K>;
    }
    let _ = avx2;
    K::run
}

/// The channel-lane kernel for a structure and lane group width, built for AVX2 when
/// `avx2`.
fn kernel<T: FloatSample>(structure: Structure, lanes: usize, avx2: bool) -> Run<T> {
    match (structure, lanes) {
        (Structure::Df2t, 1) => build::<T, ChannelLanes<1, true>>(avx2),
        (Structure::Df2t, 2) => build::<T, ChannelLanes<2, true>>(avx2),
        (Structure::Df2t, 4) => build::<T, ChannelLanes<4, true>>(avx2),
        (Structure::Df2t, _) => build::<T, ChannelLanes<8, true>>(avx2),
        (Structure::Df1, 1) => build::<T, ChannelLanes<1, false>>(avx2),
        (Structure::Df1, 2) => build::<T, ChannelLanes<2, false>>(avx2),
        (Structure::Df1, 4) => build::<T, ChannelLanes<4, false>>(avx2),
        (Structure::Df1, _) => build::<T, ChannelLanes<8, false>>(avx2),
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
            let run = T::kernel(self.structure, width, self.isa);
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
