// generated: do not edit
// tool: tonewright 0.1.0
// command: tonewright export audio-demos/two-knob-tone.toml --lang rust --vectors 64
// design: Two-knob passive tone stage, bench port (audio-demos/two-knob-tone.toml, fnv1a-64 eb1577a73018a044)
// format: q15: Q1.15 samples, Q2.14 coefficients (16 bits), 32-bit accumulator, rounding nearest, saturate on overflow, error feedback 0
// structure: df1; rate: 48000 Hz; knobs: bass=0.5, treble=0.5

//! Golden vectors for `two_knob_tone.rs`: 64 mono frames and the simulator's
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
    -55, -1409, 2312, -1805, -161, -1191, -711, 631,
    -1966, 68, -2211, -683, -1552, 513, 1110, 1656,
    2145, 2572, 2933, 3224, 3443, 3588, 3659, 3656,
    3581, 3436, 3269, -1918, -6735, -1139, 4047, -1216,
    -6102, -568, 4562, -752, -5684, -192, 4899, 4592,
    -722, -612, -513, -424, -344, -272, -208, -151,
    -100, -55, -15, 21, 53, 81, 106, 128,
    147, 164, 179, 192, 203, 212, 220, 227,
];
