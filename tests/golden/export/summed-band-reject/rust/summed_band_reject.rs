// generated: do not edit
// tool: tonewright 0.1.0
// command: tonewright export audio-demos/summed-band-reject.toml --lang rust --vectors 64 --knobs
// design: Low-pass plus high-pass summed into a band-reject (audio-demos/summed-band-reject.toml, fnv1a-64 96df495b86b72f92)
// format: q15: Q1.15 samples, Q2.14 coefficients (16 bits), 32-bit accumulator, rounding nearest, saturate on overflow, error feedback 0
// structure: df1; rate: 48000 Hz; knobs: scoop=1

//! Low-pass plus high-pass summed into a band-reject: a cascade of 1 second-order section(s),
//! H_k(z) = (b0 + b1 z^-1 + b2 z^-2) / (1 + a1 z^-1 + a2 z^-2), a0 = 1, in df1.
//!
//! Stored integers: each effective coefficient is c * 2^shift / 2^COEF_FRAC. Samples are
//! `i32` holding 16-bit values. The kernel reproduces the tonewright simulator
//! integer for integer (exact sums fitted once to 32 bits, nearest rounding,
//! saturate on overflow, error feedback 0).
//! Uses `core` only: the module builds in a `#![no_std]` crate. One [`State`] per channel.
//!
//! [`KNOB_TABLE`]: 33 coefficient sets, row-major over
//! - `scoop`: 33 positions 0..1, stride 1
//!
//! Interpolate neighbouring sets coefficient by coefficient (shifts are shared).
//! knob scoop: 33 steps; linear interpolation half-way between neighbours deviates at most 1.942 dB from the exact design (worst between scoop=0 and scoop=0.03125); 697 steps keep it under 0.5 dB (0.322 dB measured along scoop with the other knobs at their exported positions)
//! stability: every stored set is stable, so every linear interpolation between neighbours is too (the stable (a1, a2) region |a2| < 1, |a1| < 1 + a2 is a convex triangle); the mid-steps were also checked

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

/// The coefficients at knobs `scoop=1`.
///
/// The float64 design, b0, b1, b2, a1, a2 per section:
/// `8.549807288614583e-1, -1.6328368409973648e0, 7.905277194665513e-1, -1.6328368409973648e0, 6.455084483280095e-1`
pub const TABLE: Coefs = Coefs {
    c: [
        [14008, -26752, 12952, -26752, 10576],
    ],
    shift: [0],
};

/// Coefficient sets in the table.
pub const KNOB_SETS: usize = 33;

/// Coefficient sets over the knobs' travel (see the module documentation).
pub static KNOB_TABLE: [Coefs; KNOB_SETS] = [
    // scoop=0
    Coefs {
        c: [
            [316, 316, 0, -15753, 0],
        ],
        shift: [0],
    },
    // scoop=0.03125
    Coefs {
        c: [
            [744, -735, 199, -26752, 10576],
        ],
        shift: [0],
    },
    // scoop=0.0625
    Coefs {
        c: [
            [1172, -1575, 611, -26752, 10576],
        ],
        shift: [0],
    },
    // scoop=0.09375
    Coefs {
        c: [
            [1600, -2414, 1022, -26752, 10576],
        ],
        shift: [0],
    },
    // scoop=0.125
    Coefs {
        c: [
            [2027, -3253, 1433, -26752, 10576],
        ],
        shift: [0],
    },
    // scoop=0.15625
    Coefs {
        c: [
            [2455, -4092, 1845, -26752, 10576],
        ],
        shift: [0],
    },
    // scoop=0.1875
    Coefs {
        c: [
            [2883, -4932, 2256, -26752, 10576],
        ],
        shift: [0],
    },
    // scoop=0.21875
    Coefs {
        c: [
            [3311, -5771, 2668, -26752, 10576],
        ],
        shift: [0],
    },
    // scoop=0.25
    Coefs {
        c: [
            [3739, -6610, 3079, -26752, 10576],
        ],
        shift: [0],
    },
    // scoop=0.28125
    Coefs {
        c: [
            [4167, -7450, 3490, -26752, 10576],
        ],
        shift: [0],
    },
    // scoop=0.3125
    Coefs {
        c: [
            [4595, -8289, 3902, -26752, 10576],
        ],
        shift: [0],
    },
    // scoop=0.34375
    Coefs {
        c: [
            [5023, -9128, 4313, -26752, 10576],
        ],
        shift: [0],
    },
    // scoop=0.375
    Coefs {
        c: [
            [5450, -9967, 4724, -26752, 10576],
        ],
        shift: [0],
    },
    // scoop=0.40625
    Coefs {
        c: [
            [5878, -10807, 5136, -26752, 10576],
        ],
        shift: [0],
    },
    // scoop=0.4375
    Coefs {
        c: [
            [6306, -11646, 5547, -26752, 10576],
        ],
        shift: [0],
    },
    // scoop=0.46875
    Coefs {
        c: [
            [6734, -12485, 5959, -26752, 10576],
        ],
        shift: [0],
    },
    // scoop=0.5
    Coefs {
        c: [
            [7162, -13324, 6370, -26752, 10576],
        ],
        shift: [0],
    },
    // scoop=0.53125
    Coefs {
        c: [
            [7590, -14164, 6781, -26752, 10576],
        ],
        shift: [0],
    },
    // scoop=0.5625
    Coefs {
        c: [
            [8018, -15003, 7193, -26752, 10576],
        ],
        shift: [0],
    },
    // scoop=0.59375
    Coefs {
        c: [
            [8446, -15842, 7604, -26752, 10576],
        ],
        shift: [0],
    },
    // scoop=0.625
    Coefs {
        c: [
            [8873, -16681, 8015, -26752, 10576],
        ],
        shift: [0],
    },
    // scoop=0.65625
    Coefs {
        c: [
            [9301, -17521, 8427, -26752, 10576],
        ],
        shift: [0],
    },
    // scoop=0.6875
    Coefs {
        c: [
            [9729, -18360, 8838, -26752, 10576],
        ],
        shift: [0],
    },
    // scoop=0.71875
    Coefs {
        c: [
            [10157, -19199, 9250, -26752, 10576],
        ],
        shift: [0],
    },
    // scoop=0.75
    Coefs {
        c: [
            [10585, -20038, 9661, -26752, 10576],
        ],
        shift: [0],
    },
    // scoop=0.78125
    Coefs {
        c: [
            [11013, -20878, 10072, -26752, 10576],
        ],
        shift: [0],
    },
    // scoop=0.8125
    Coefs {
        c: [
            [11441, -21717, 10484, -26752, 10576],
        ],
        shift: [0],
    },
    // scoop=0.84375
    Coefs {
        c: [
            [11869, -22556, 10895, -26752, 10576],
        ],
        shift: [0],
    },
    // scoop=0.875
    Coefs {
        c: [
            [12296, -23395, 11306, -26752, 10576],
        ],
        shift: [0],
    },
    // scoop=0.90625
    Coefs {
        c: [
            [12724, -24235, 11718, -26752, 10576],
        ],
        shift: [0],
    },
    // scoop=0.9375
    Coefs {
        c: [
            [13152, -25074, 12129, -26752, 10576],
        ],
        shift: [0],
    },
    // scoop=0.96875
    Coefs {
        c: [
            [13580, -25913, 12541, -26752, 10576],
        ],
        shift: [0],
    },
    // scoop=1
    Coefs {
        c: [
            [14008, -26752, 12952, -26752, 10576],
        ],
        shift: [0],
    },
];

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
