//! One engine of any number format behind a block interface over f64 frames.
//!
//! Samples come and go as fractions of full scale (as [`crate::audio`] reads and
//! writes them). An f32 engine converts each block to f32 and back; a fixed engine
//! converts to `data_bits` integers with [`SampleScale::to_int`] (exact for input words
//! no wider than `data_bits`, rounded and saturated otherwise) and back exactly.
//!
//! A fixed target runs one engine per pair of adjacent channels (the last alone when
//! their count is odd), the pairs in parallel on as many cores as rayon has: pairs
//! share no state, so the output is the same as one engine over the interleaved
//! frames (tests/fixed_point.rs checks it), and the fixed kernels run a pair's two
//! recursions side by side, faster than one channel after the other. A stereo block
//! goes to its engine as it is, with no de-interleaving.

use super::{check_frames, Engine, FixedEngine, FloatEngine, SampleScale};
use crate::error::Result;
use crate::isa::Isa;
use crate::pipeline::Realized;
use crate::quantize::Structure;
use rayon::prelude::*;

/// A realized cascade running over interleaved f64 frames.
#[derive(Debug, Clone)]
pub enum Runner {
    /// Float64 engine.
    F64(FloatEngine<f64>),
    /// Float32 engine with its conversion buffer.
    F32(FloatEngine<f32>, Vec<f32>),
    /// Bit-exact fixed-point engines, one per pair of channels, and their sample scale.
    Fixed(Vec<FixedGroup>, SampleScale),
}

/// Converts each group's channels of `input` to integers and runs its engine, the
/// groups in parallel.
fn run_fixed(groups: &mut [FixedGroup], scale: SampleScale, input: &[f64]) -> Result<()> {
    let n = channel_count(groups);
    check_frames(input.len(), n)?;
    groups.par_iter_mut().try_for_each(|group| {
        let (first, width) = (group.first, group.width);
        group.samples.resize(input.len() / n * width, 0);
        let samples = &mut group.samples[..];
        Isa::run_widest(
            #[inline(always)]
            || {
                if width == n {
                    convert(samples, input, |x| scale.to_int(*x));
                } else if width == 2 {
                    let pairs = samples.as_chunks_mut::<2>().0;
                    convert(pairs, input.chunks_exact(n), |f| {
                        [scale.to_int(f[first]), scale.to_int(f[first + 1])]
                    });
                } else {
                    convert(samples, input.chunks_exact(n), |f| scale.to_int(f[first]));
                }
            },
        );
        group.engine.process(samples)
    })
}

/// The channels of all `groups` together.
fn channel_count(groups: &[FixedGroup]) -> usize {
    groups.iter().map(|g| g.width).sum()
}

/// Interleaves the groups' outputs into `output` as fractions of full scale.
fn write_fixed(groups: &[FixedGroup], scale: SampleScale, output: &mut [f64]) {
    Isa::run_widest(
        #[inline(always)]
        || match groups {
            [all] => convert(output, &all.samples, |&y| scale.to_f64(y)),
            _ => {
                let n = channel_count(groups);
                for group in groups {
                    let frames = group.samples.chunks_exact(group.width);
                    for (frame, ys) in output.chunks_exact_mut(n).zip(frames) {
                        for (x, &y) in frame[group.first..].iter_mut().zip(ys) {
                            *x = scale.to_f64(y);
                        }
                    }
                }
            }
        },
    );
}

/// Writes `f` of each item of `from` to `to`, as far as both go.
#[inline(always)]
fn convert<'a, T: 'a, U>(to: &mut [T], from: impl IntoIterator<Item = U>, f: impl Fn(U) -> T) {
    for (y, x) in to.iter_mut().zip(from) {
        *y = f(x);
    }
}

/// A fixed-point engine over `width` (1 or 2) adjacent channels from `first`, and
/// their samples as interleaved integers.
#[derive(Debug, Clone)]
pub struct FixedGroup {
    engine: FixedEngine,
    first: usize,
    width: usize,
    samples: Vec<i32>,
}

impl Runner {
    /// An engine for `realized` in `structure` (float targets; a fixed cascade carries
    /// its own) over `channels` interleaved channels.
    ///
    /// # Errors
    /// Zero channels, or a fixed cascade the engine refuses.
    pub fn new(realized: &Realized, structure: Structure, channels: usize) -> Result<Self> {
        Ok(match realized {
            Realized::F64(c) => Runner::F64(FloatEngine::new(c, structure, channels)?),
            Realized::F32(c) => Runner::F32(FloatEngine::new(c, structure, channels)?, Vec::new()),
            Realized::Fixed(f) => {
                super::check_channels(channels)?;
                let groups = (0..channels)
                    .step_by(2)
                    .map(|first| {
                        let width = (channels - first).min(2);
                        let engine = FixedEngine::new(f, width)?;
                        Ok(FixedGroup { engine, first, width, samples: Vec::new() })
                    })
                    .collect::<Result<_>>()?;
                Runner::Fixed(groups, SampleScale::new(f.format.data_bits)?)
            }
        })
    }

    /// Filters whole interleaved frames in place.
    ///
    /// # Errors
    /// A block that is not whole frames.
    pub fn process(&mut self, block: &mut [f64]) -> Result<()> {
        match self {
            Runner::F64(e) => e.process(block),
            Runner::F32(e, buf) => {
                buf.resize(block.len(), 0.0);
                convert(buf, &*block, |&x| x as f32);
                e.process(buf)?;
                convert(block, &*buf, |&y| f64::from(y));
                Ok(())
            }
            Runner::Fixed(groups, scale) => {
                run_fixed(groups, *scale, block)?;
                write_fixed(groups, *scale, block);
                Ok(())
            }
        }
    }

    /// Filters whole interleaved frames of `input` into `output` (resized to match);
    /// the same result as [`Runner::process`], without a copy for fixed targets.
    ///
    /// # Errors
    /// A block that is not whole frames.
    pub fn process_from(&mut self, input: &[f64], output: &mut Vec<f64>) -> Result<()> {
        match self {
            Runner::Fixed(groups, scale) => {
                run_fixed(groups, *scale, input)?;
                output.resize(input.len(), 0.0);
                write_fixed(groups, *scale, output);
                Ok(())
            }
            _ => {
                output.clear();
                output.extend_from_slice(input);
                self.process(output)
            }
        }
    }

    /// Internal overflow events so far (saturations or wraps; 0 for float engines).
    pub fn overflows(&self) -> u64 {
        match self {
            Runner::Fixed(groups, _) => groups.iter().map(|g| g.engine.overflows()).sum(),
            _ => 0,
        }
    }

    /// Bits of the word the engine keeps samples in (53 for f64's mantissa, 24 for
    /// f32's, `data_bits` for fixed): an output word shorter than this needs dither.
    pub fn word_bits(&self) -> u32 {
        match self {
            Runner::F64(_) => 53,
            Runner::F32(..) => 24,
            Runner::Fixed(_, scale) => scale.bits(),
        }
    }
}
