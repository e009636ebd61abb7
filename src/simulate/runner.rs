//! One engine of any number format behind a block interface over f64 frames.
//!
//! Samples come and go as fractions of full scale (as [`crate::audio`] reads and
//! writes them). An f32 engine converts each block to f32 and back; a fixed engine
//! converts to `data_bits` integers with [`SampleScale::to_int`] (exact for input words
//! no wider than `data_bits`, rounded and saturated otherwise) and back exactly.
//!
//! A fixed target runs one mono engine per channel, on as many cores as rayon has:
//! channels share no state, so the output is the same as one engine over the
//! interleaved frames (tests/fixed_point.rs checks it), and one channel at a time is
//! also the fixed kernels' fastest order.

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
    /// Bit-exact fixed-point engines, one per channel, and their sample scale.
    Fixed(Vec<FixedChannel>, SampleScale),
}

/// Converts each channel of `input` to integers and runs its engine, the channels in
/// parallel.
fn run_fixed(channels: &mut [FixedChannel], scale: SampleScale, input: &[f64]) -> Result<()> {
    let n = channels.len();
    check_frames(input.len(), n)?;
    channels.par_iter_mut().enumerate().try_for_each(|(c, channel)| {
        channel.samples.resize(input.len() / n, 0);
        let samples = &mut channel.samples[..];
        Isa::run_widest(
            #[inline(always)]
            || match n {
                1 => convert(samples, input, |x| scale.to_int(*x)),
                // A constant index, or the loop does not vectorise.
                2 if c == 0 => convert(samples, input.as_chunks::<2>().0, |f| scale.to_int(f[0])),
                2 => convert(samples, input.as_chunks::<2>().0, |f| scale.to_int(f[1])),
                _ => convert(samples, input.chunks_exact(n), |f| scale.to_int(f[c])),
            },
        );
        channel.engine.process(samples)
    })
}

/// Interleaves the channels' outputs into `output` as fractions of full scale.
fn write_fixed(channels: &[FixedChannel], scale: SampleScale, output: &mut [f64]) {
    Isa::run_widest(
        #[inline(always)]
        || match channels {
            [mono] => convert(output, &mono.samples, |&y| scale.to_f64(y)),
            [left, right] => convert(
                output.as_chunks_mut::<2>().0,
                left.samples.iter().zip(&right.samples),
                |(&l, &r)| [scale.to_f64(l), scale.to_f64(r)],
            ),
            _ => {
                for (i, frame) in output.chunks_exact_mut(channels.len()).enumerate() {
                    for (x, channel) in frame.iter_mut().zip(channels) {
                        *x = scale.to_f64(channel.samples[i]);
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

/// A mono fixed-point engine and its channel's samples as integers.
#[derive(Debug, Clone)]
pub struct FixedChannel {
    engine: FixedEngine,
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
                let engine = FixedEngine::new(f, 1)?;
                let channel = FixedChannel { engine, samples: Vec::new() };
                Runner::Fixed(vec![channel; channels], SampleScale::new(f.format.data_bits)?)
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
            Runner::Fixed(channels, scale) => {
                run_fixed(channels, *scale, block)?;
                write_fixed(channels, *scale, block);
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
            Runner::Fixed(channels, scale) => {
                run_fixed(channels, *scale, input)?;
                output.resize(input.len(), 0.0);
                write_fixed(channels, *scale, output);
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
            Runner::Fixed(channels, _) => channels.iter().map(|c| c.engine.overflows()).sum(),
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
