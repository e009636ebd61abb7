//! Float engines (f64 and f32), direct form I and transposed direct form II.

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

/// A cascade running in float type `T`; coefficients are rounded to `T` once.
#[derive(Debug, Clone)]
pub struct FloatEngine<T> {
    structure: Structure,
    channels: usize,
    /// b0, b1, b2, a1, a2 per section.
    coefs: Vec<[T; 5]>,
    /// Per channel, per section: df1 x1, x2, y1, y2; df2t s1, s2, unused, unused.
    state: Vec<[T; 4]>,
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
        let state = vec![[T::default(); 4]; coefs.len() * channels];
        Ok(Self { structure, channels, coefs, state })
    }
}

/// Direct form I over one channel of an interleaved buffer.
fn run_df1<T: FloatSample>(
    coefs: &[[T; 5]],
    state: &mut [[T; 4]],
    samples: &mut [T],
    ch: usize,
    n: usize,
) {
    for v in samples.iter_mut().skip(ch).step_by(n) {
        let mut x = *v;
        for (c, s) in coefs.iter().zip(state.iter_mut()) {
            let y = c[0] * x + c[1] * s[0] + c[2] * s[1] - c[3] * s[2] - c[4] * s[3];
            *s = [x, s[0], y, s[2]];
            x = y;
        }
        *v = x;
    }
}

/// Transposed direct form II over one channel of an interleaved buffer.
fn run_df2t<T: FloatSample>(
    coefs: &[[T; 5]],
    state: &mut [[T; 4]],
    samples: &mut [T],
    ch: usize,
    n: usize,
) {
    for v in samples.iter_mut().skip(ch).step_by(n) {
        let mut x = *v;
        for (c, s) in coefs.iter().zip(state.iter_mut()) {
            let y = c[0] * x + s[0];
            s[0] = c[1] * x - c[3] * y + s[1];
            s[1] = c[2] * x - c[4] * y;
            x = y;
        }
        *v = x;
    }
}

impl<T: FloatSample> Engine for FloatEngine<T> {
    type Sample = T;

    fn channels(&self) -> usize {
        self.channels
    }

    fn process(&mut self, frames: &mut [T]) -> Result<()> {
        check_frames(frames.len(), self.channels)?;
        let run = match self.structure {
            Structure::Df1 => run_df1::<T>,
            Structure::Df2t => run_df2t::<T>,
        };
        let ns = self.coefs.len();
        for ch in 0..self.channels {
            run(&self.coefs, &mut self.state[ch * ns..(ch + 1) * ns], frames, ch, self.channels);
        }
        Ok(())
    }

    fn reset(&mut self) {
        self.state.fill([T::default(); 4]);
    }
}
