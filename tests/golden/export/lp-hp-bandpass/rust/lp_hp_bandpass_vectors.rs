// generated: do not edit
// tool: tonewright 0.1.0
// command: tonewright export audio-demos/lp-hp-bandpass.toml --lang rust --vectors 64
// design: Low-pass into high-pass band-pass, buffered RC stages (audio-demos/lp-hp-bandpass.toml, fnv1a-64 0b9a49ae9decb6fc)
// format: q15: Q1.15 samples, Q2.14 coefficients (16 bits), 32-bit accumulator, rounding nearest, saturate on overflow, error feedback 0
// structure: df1; rate: 48000 Hz; knobs: none

//! Golden vectors for `lp_hp_bandpass.rs`: 64 mono frames and the simulator's
//! output for them, from a cleared state with `TABLE`.
//! - frames 0..13: uniform noise at half scale (seeded)
//! - frames 13..26: full-scale sine at rate/48
//! - frames 26..39: steps +full scale, 0, -full scale, 0
//! - frames 39..52: one full-scale impulse
//! - frames 52..64: silence (zero-input limit cycles)

/// Frames in the vectors.
pub const FRAMES: usize = 64;

/// The input.
pub static INPUT: [i32; FRAMES] = [
    -356, -9182, 14366, -11317, -1465, -8215, -5614, 2828,
    -13709, -1334, -16033, -7021, -12854, 0, 4277, 8481,
    12540, 16384, 19948, 23170, 25997, 28378, 30274, 31651,
    32488, 32767, 32767, 0, -32768, 0, 32767, 0,
    -32768, 0, 32767, 0, -32768, 0, 32767, 32767,
    0, 0, 0, 0, 0, 0, 0, 0,
    0, 0, 0, 0, 0, 0, 0, 0,
    0, 0, 0, 0, 0, 0, 0, 0,
];

/// The simulator's output.
pub static OUTPUT: [i32; FRAMES] = [
    -11, -333, -529, -230, -381, -1079, -1876, -2323,
    -2439, -2780, -3318, -4050, -4754, -4932, -4037, -2018,
    636, 3584, 6586, 9471, 12116, 14432, 16355, 17840,
    18858, 19393, 19450, 18011, 12844, 4901, -643, -2243,
    -4247, -8154, -9886, -8304, -7832, -9903, -10324, -6776,
    -2327, -436, -886, -2121, -3419, -4488, -5246, -5708,
    -5923, -5949, -5838, -5633, -5368, -5066, -4746, -4420,
    -4097, -3782, -3479, -3189, -2913, -2653, -2408, -2178,
];
