//! Golden test vectors: a seeded input that exercises a kernel, and the simulator's
//! exact output for it.
//!
//! The input is mono and runs through five segments of about equal length: seeded
//! uniform noise at half scale, a full-scale sine at rate/48 (1 kHz at 48 kHz), steps
//! between +full scale, 0 and −full scale (to drive accumulators and outputs into
//! saturation or wrap), one full-scale impulse, and silence (where a kernel that
//! keeps ringing shows a zero-input limit cycle). Fixed targets get integers of the
//! data word; float targets fractions of full scale in the target's float type. The
//! output comes from [`FixedEngine`] or [`FloatEngine`], so a kernel that matches it
//! matches the simulator.

use super::context::{fmt_f32, fmt_f64, rows, VectorInfo};
use super::{Lang, Numbers};
use crate::error::{Error, Result};
use crate::quantize::Structure;
use crate::simulate::{Engine, FixedEngine, FloatEngine, SampleScale};
use std::f64::consts::PI;

/// Largest number of frames a vector may have.
pub const MAX_FRAMES: usize = 1 << 20;

/// Seed of the noise segment: vectors are the same on every run.
const SEED: u64 = 0x746f_6e65_7772_6974;

/// Largest difference the C check accepts for f32 and f64 kernels, as a fraction of
/// full scale. A C compiler may fuse a·b + c into one rounding (FMA contraction) or
/// keep x87 excess precision; each changes a step by about one ulp, and the feedback
/// of a resonant section amplifies it. The tests measure the difference under x87
/// (`gcc -m32`) against these limits; with `-ffp-contract=off` on an SSE2 target the
/// kernels are bit-exact and the check can demand 0.
const TOLERANCE_F32: &str = "1e-3";
/// See [`TOLERANCE_F32`].
const TOLERANCE_F64: &str = "1e-9";

/// Input and output of one vector run.
#[derive(Debug, Clone, PartialEq)]
pub enum Vectors {
    /// Integer samples of the data word.
    Fixed {
        /// Input.
        input: Vec<i32>,
        /// Simulator output.
        output: Vec<i32>,
    },
    /// f32 samples.
    F32 {
        /// Input.
        input: Vec<f32>,
        /// Simulator output.
        output: Vec<f32>,
    },
    /// f64 samples.
    F64 {
        /// Input.
        input: Vec<f64>,
        /// Simulator output.
        output: Vec<f64>,
    },
}

/// The input signal as fractions of full scale (1.0 = full scale), `frames` long.
///
/// ```
/// let x = tonewright::export::vectors::excitation(100);
/// assert_eq!(x.len(), 100);
/// assert!(x.iter().any(|&v| v == 1.0) && x.iter().any(|&v| v == -1.0));
/// assert!(x[95..].iter().all(|&v| v == 0.0)); // ends in silence
/// ```
pub fn excitation(frames: usize) -> Vec<f64> {
    let seg = frames.div_ceil(5).max(1);
    let mut state = SEED;
    let mut noise = move || {
        // 64-bit linear congruential generator (Knuth's MMIX constants), top 53 bits.
        state = state.wrapping_mul(6364136223846793005).wrapping_add(1442695040888963407);
        (state >> 11) as f64 / (1u64 << 53) as f64 - 0.5
    };
    let step_len = (seg / 8).max(1);
    (0..frames)
        .map(|n| {
            let (part, k) = (n / seg, n % seg);
            match part {
                0 => noise(),
                1 => (2.0 * PI * k as f64 / 48.0).sin(),
                2 => [1.0, 0.0, -1.0, 0.0][(k / step_len) % 4],
                3 => f64::from(u8::from(k == 0)),
                _ => 0.0,
            }
        })
        .collect()
}

/// What the input segments are, for the generated files.
fn segments(frames: usize) -> Vec<String> {
    let seg = frames.div_ceil(5).max(1);
    let names = [
        "uniform noise at half scale (seeded)",
        "full-scale sine at rate/48",
        "steps +full scale, 0, -full scale, 0",
        "one full-scale impulse",
        "silence (zero-input limit cycles)",
    ];
    names
        .iter()
        .enumerate()
        .filter(|(i, _)| i * seg < frames)
        .map(|(i, name)| format!("frames {}..{}: {name}", i * seg, ((i + 1) * seg).min(frames)))
        .collect()
}

/// Runs the simulator for `numbers` on [`excitation`] of `frames` frames.
///
/// # Errors
/// `frames` of 0 or above [`MAX_FRAMES`]; an engine that refuses the cascade.
pub(crate) fn golden(numbers: &Numbers, structure: Structure, frames: usize) -> Result<Vectors> {
    if frames == 0 || frames > MAX_FRAMES {
        return Err(Error::input(format!(
            "--vectors {frames}: must be from 1 to {MAX_FRAMES} frames"
        )));
    }
    let x = excitation(frames);
    Ok(match numbers {
        Numbers::Fixed(q) => {
            let scale = SampleScale::new(q.format.data_bits)?;
            let input: Vec<i32> = x.iter().map(|&v| scale.to_int(v)).collect();
            let mut output = input.clone();
            FixedEngine::new(q, 1)?.process(&mut output)?;
            Vectors::Fixed { input, output }
        }
        Numbers::F32(c) => {
            let input: Vec<f32> = x.iter().map(|&v| v as f32).collect();
            let mut output = input.clone();
            FloatEngine::<f32>::new(c, structure, 1)?.process(&mut output)?;
            Vectors::F32 { input, output }
        }
        Numbers::F64(c) => {
            let mut output = x.clone();
            FloatEngine::<f64>::new(c, structure, 1)?.process(&mut output)?;
            Vectors::F64 { input: x, output }
        }
    })
}

impl Vectors {
    /// Frames in the vectors.
    pub fn frames(&self) -> usize {
        match self {
            Vectors::Fixed { input, .. } => input.len(),
            Vectors::F32 { input, .. } => input.len(),
            Vectors::F64 { input, .. } => input.len(),
        }
    }

    /// The vectors as template values for `lang`.
    pub(crate) fn info(&self, lang: Lang) -> VectorInfo {
        let c_int = |v: &i32| {
            if lang == Lang::C && *v == i32::MIN {
                "(-2147483647 - 1)".to_string()
            } else {
                v.to_string()
            }
        };
        let c_f32 = |v: &f32| match lang {
            Lang::C => format!("{}f", fmt_f32(*v)),
            Lang::Rust => fmt_f32(*v),
        };
        let (input, output, tolerance) = match self {
            Vectors::Fixed { input, output } => (rows(input, c_int), rows(output, c_int), "0"),
            Vectors::F32 { input, output } => {
                (rows(input, c_f32), rows(output, c_f32), TOLERANCE_F32)
            }
            Vectors::F64 { input, output } => {
                let f = |v: &f64| fmt_f64(*v);
                (rows(input, f), rows(output, f), TOLERANCE_F64)
            }
        };
        VectorInfo {
            frames: self.frames(),
            input,
            output,
            tolerance: tolerance.into(),
            segments: segments(self.frames()),
        }
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn excitation_is_seeded_and_has_every_segment() {
        let x = excitation(1000);
        assert_eq!(x, excitation(1000));
        assert!(x[..200].iter().all(|v| v.abs() <= 0.5) && x[..200].iter().any(|&v| v != 0.0));
        assert!((x[212] - 1.0).abs() < 1e-12); // sine peak: 12 samples into the segment
        assert_eq!(x[600], 1.0);
        assert!(x[601..].iter().all(|&v| v == 0.0));
        assert_eq!(segments(1000).len(), 5);
        assert_eq!(segments(3).len(), 3);
    }
}
