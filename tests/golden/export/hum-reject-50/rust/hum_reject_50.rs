// generated: do not edit
// tool: tonewright 0.1.0
// command: tonewright export audio-demos/hum-reject-50.toml --lang rust --vectors 64 --force
// design: Bench recorder hum band-reject, 50 Hz mains (audio-demos/hum-reject-50.toml, fnv1a-64 ee62542a9dae04ef)
// format: fixed: Q1.23 samples, Q2.30 coefficients (32 bits), 64-bit accumulator, rounding nearest, saturate on overflow, error feedback 2
// structure: df1; rate: 48000 Hz; knobs: none

//! Bench recorder hum band-reject, 50 Hz mains: a cascade of 4 second-order section(s),
//! H_k(z) = (b0 + b1 z^-1 + b2 z^-2) / (1 + a1 z^-1 + a2 z^-2), a0 = 1, in df1.
//!
//! Stored integers: each effective coefficient is c * 2^shift / 2^COEF_FRAC. Samples are
//! `i32` holding 24-bit values. The kernel reproduces the tonewright simulator
//! integer for integer (exact sums fitted once to 64 bits, nearest rounding,
//! saturate on overflow, error feedback 2).
//! Uses `core` only: the module builds in a `#![no_std]` crate. One [`State`] per channel.

/// Sections in the cascade.
pub const SECTIONS: usize = 4;
/// Sample rate the coefficients were made for, Hz.
pub const RATE_HZ: f64 = 48000_f64;
/// Coefficient word length.
pub const COEF_BITS: u32 = 32;
/// Fractional bits of the stored coefficients.
pub const COEF_FRAC: u32 = 30;
/// Sample word length.
pub const DATA_BITS: u32 = 24;
/// Accumulator width.
pub const ACC_BITS: u32 = 64;

/// One coefficient set: per section b0, b1, b2, a1, a2, and the accumulator shift.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub struct Coefs {
    /// b0, b1, b2, a1, a2 per section.
    pub c: [[i32; 5]; SECTIONS],
    /// Left shift of each section's accumulator before narrowing.
    pub shift: [u8; SECTIONS],
}

/// The coefficients at knobs (none).
///
/// The float64 design, b0, b1, b2, a1, a2 per section:
/// `9.973871360944692e-1, -1.9947742721889383e0, 9.973871360944692e-1, -1.9947708541932045e0, 9.947776901846718e-1`
/// `9.990192781365411e-1, -1.9976534153241596e0, 9.990192781365416e-1, -1.99765341532416e0, 9.98038556273083e-1`
/// `9.991825690168523e-1, -1.9981939332443093e0, 9.99182569016852e-1, -1.998193933244309e0, 9.983651380337042e-1`
/// `9.994548858142649e-1, -1.998866958307666e0, 9.994548858142651e-1, -1.9988669583076664e0, 9.989097716285305e-1`
pub const TABLE: Coefs = Coefs {
    c: [
        [1070936283, -2141872565, 1070936283, -2141868895, 1068134412],
        [1072688782, -2144964022, 1072688782, -2144964022, 1071635740],
        [1072864114, -2145544399, 1072864114, -2145544399, 1071986404],
        [1073156512, -2146267054, 1073156512, -2146267054, 1072571200],
    ],
    shift: [0, 0, 0, 0],
};

/// Accumulator arithmetic: wide enough for every exact sum.
type Acc = i128;

/// One section's state: last inputs, last outputs, narrowing errors.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
struct SectionState {
    x: [i64; 2],
    y: [i64; 2],
    e: [i64; 2],
}

impl SectionState {
    const ZERO: Self = Self {
        x: [0; 2],
        y: [0; 2],
        e: [0; 2],
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
                let sum = sum + Acc::from(2 * s.e[0] - s.e[1]);
                let acc = fit(sum, ACC_BITS, ov);
                let q = round(acc, r);
                let y = fit(q, DATA_BITS, ov);
                s.e = [(acc - (q << r)) as i64, s.e[0]];
                s.x = [x as i64, s.x[0]];
                s.y = [y as i64, s.y[0]];
                x = y;
            }
            // x fits the data word, at most 32 bits.
            *v = x as i32;
        }
    }
}
