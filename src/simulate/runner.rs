//! One engine of any number format behind a block interface over f64 frames.
//!
//! Samples come and go as fractions of full scale (as [`crate::audio`] reads and
//! writes them). An f32 engine converts each block to f32 and back; a fixed engine
//! converts to `data_bits` integers with [`SampleScale::to_int`] (exact for input words
//! no wider than `data_bits`, rounded and saturated otherwise) and back exactly.

use super::{Engine, FixedEngine, FloatEngine, SampleScale};
use crate::error::Result;
use crate::pipeline::Realized;
use crate::quantize::Structure;

/// A realized cascade running over interleaved f64 frames.
#[derive(Debug, Clone)]
pub enum Runner {
    /// Float64 engine.
    F64(FloatEngine<f64>),
    /// Float32 engine with its conversion buffer.
    F32(FloatEngine<f32>, Vec<f32>),
    /// Bit-exact fixed-point engine, its sample scale and conversion buffer.
    Fixed(FixedEngine, SampleScale, Vec<i32>),
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
            Realized::Fixed(f) => Runner::Fixed(
                FixedEngine::new(f, channels)?,
                SampleScale::new(f.format.data_bits)?,
                Vec::new(),
            ),
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
                for (y, &x) in buf.iter_mut().zip(block.iter()) {
                    *y = x as f32;
                }
                e.process(buf)?;
                for (x, &y) in block.iter_mut().zip(buf.iter()) {
                    *x = f64::from(y);
                }
                Ok(())
            }
            Runner::Fixed(e, scale, buf) => {
                // A local copy: the compiler cannot tell the scale from the buffers it
                // writes, and would reload it on every sample instead of vectorising.
                let scale = *scale;
                buf.resize(block.len(), 0);
                for (y, &x) in buf.iter_mut().zip(block.iter()) {
                    *y = scale.to_int(x);
                }
                e.process(buf)?;
                for (x, &y) in block.iter_mut().zip(buf.iter()) {
                    *x = scale.to_f64(y);
                }
                Ok(())
            }
        }
    }

    /// Internal overflow events so far (saturations or wraps; 0 for float engines).
    pub fn overflows(&self) -> u64 {
        match self {
            Runner::Fixed(e, _, _) => e.overflows(),
            _ => 0,
        }
    }

    /// Bits of the word the engine keeps samples in (53 for f64's mantissa, 24 for
    /// f32's, `data_bits` for fixed): an output word shorter than this needs dither.
    pub fn word_bits(&self) -> u32 {
        match self {
            Runner::F64(_) => 53,
            Runner::F32(..) => 24,
            Runner::Fixed(_, scale, _) => scale.bits(),
        }
    }
}
