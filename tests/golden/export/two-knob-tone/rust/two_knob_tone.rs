// generated: do not edit
// tool: tonewright 0.1.0
// command: tonewright export audio-demos/two-knob-tone.toml --lang rust --vectors 64
// design: Two-knob passive tone stage, bench port (audio-demos/two-knob-tone.toml, fnv1a-64 eb1577a73018a044)
// format: q15: Q1.15 samples, Q2.14 coefficients (16 bits), 32-bit accumulator, rounding nearest, saturate on overflow, error feedback 0
// structure: df1; rate: 48000 Hz; knobs: bass=0.5, treble=0.5

//! Two-knob passive tone stage, bench port: a cascade of 1 second-order section(s),
//! H_k(z) = (b0 + b1 z^-1 + b2 z^-2) / (1 + a1 z^-1 + a2 z^-2), a0 = 1, in df1.
//!
//! Stored integers: each effective coefficient is c * 2^shift / 2^COEF_FRAC. Samples are
//! `i32` holding 16-bit values. The kernel reproduces the tonewright simulator
//! integer for integer (exact sums fitted once to 32 bits, nearest rounding,
//! saturate on overflow, error feedback 0).
//! Uses `core` only: the module builds in a `#![no_std]` crate. One [`State`] per channel.

/// Sections in the cascade.
pub const SECTIONS: usize = 1;
/// Sample rate the coefficients were made for, Hz.
pub const RATE_HZ: f64 = 48000_f64;
/// Coefficient word length.
pub const COEF_BITS: u32 = 16;
/// Fractional bits of the stored coefficients.
pub const COEF_FRAC: u32 = 14;
/// Sample word length.
pub const DATA_BITS: u32 = 16;
/// Accumulator width.
pub const ACC_BITS: u32 = 32;

/// One coefficient set: per section b0, b1, b2, a1, a2, and the accumulator shift.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub struct Coefs {
    /// b0, b1, b2, a1, a2 per section.
    pub c: [[i16; 5]; SECTIONS],
    /// Left shift of each section's accumulator before narrowing.
    pub shift: [u8; SECTIONS],
}

/// The coefficients at knobs `bass=0.5`, `treble=0.5`.
///
/// The float64 design, b0, b1, b2, a1, a2 per section:
/// `1.5387099149197375e-1, -3.0071614763168036e-1, 1.4713492121501673e-1, -1.8847816987925738e0, 8.869917372014191e-1`
pub const TABLE: Coefs = Coefs {
    c: [
        [2521, -4927, 2411, -30880, 14532],
    ],
    shift: [0],
};

/// Accumulator arithmetic: wide enough for every exact sum.
type Acc = i64;

/// One section's state: last inputs, last outputs.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
struct SectionState {
    x: [i64; 2],
    y: [i64; 2],
}

impl SectionState {
    const ZERO: Self = Self {
        x: [0; 2],
        y: [0; 2],
    };
}

/// Saturates `v` to `bits` bits; counts a change.
#[inline(always)]
fn fit(v: Acc, bits: u32, overflows: &mut u64) -> Acc {
    let hi: Acc = ((1 as Acc) << (bits - 1)) - 1;
    let f = v.clamp(-hi - 1, hi);
    *overflows += u64::from(f != v);
    f
}

/// Round half up of v / 2^r.
#[inline(always)]
fn round(v: Acc, r: u32) -> Acc {
    let half: Acc = if r == 0 { 0 } else { (1 as Acc) << (r - 1) };
    (v + half) >> r
}

/// The filter state of one channel, with its overflow count.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub struct State {
    sec: [SectionState; SECTIONS],
    overflows: u64,
}

impl Default for State {
    fn default() -> Self {
        Self::new()
    }
}

impl State {
    /// A cleared state.
    pub const fn new() -> Self {
        Self { sec: [SectionState::ZERO; SECTIONS], overflows: 0 }
    }

    /// Clears the state and the overflow count.
    pub fn reset(&mut self) {
        *self = Self::new();
    }

    /// Saturations or wraps that changed a value since the last reset.
    pub fn overflows(&self) -> u64 {
        self.overflows
    }

    /// Filters `samples` in place, continuing from the current state.
    pub fn process(&mut self, k: &Coefs, samples: &mut [i32]) {
        let ov = &mut self.overflows;
        for v in samples.iter_mut() {
            let mut x = fit(Acc::from(*v), DATA_BITS, ov);
            for (j, s) in self.sec.iter_mut().enumerate() {
                let c = k.c[j].map(Acc::from);
                let r = COEF_FRAC - u32::from(k.shift[j]);
                let sum = c[0] * x + c[1] * Acc::from(s.x[0]) + c[2] * Acc::from(s.x[1])
                    - c[3] * Acc::from(s.y[0])
                    - c[4] * Acc::from(s.y[1]);
                let acc = fit(sum, ACC_BITS, ov);
                let q = round(acc, r);
                let y = fit(q, DATA_BITS, ov);
                s.x = [x as i64, s.x[0]];
                s.y = [y as i64, s.y[0]];
                x = y;
            }
            // x fits the data word, at most 32 bits.
            *v = x as i32;
        }
    }
}
