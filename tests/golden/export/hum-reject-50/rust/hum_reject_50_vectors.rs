// generated: do not edit
// tool: tonewright 0.1.0
// command: tonewright export audio-demos/hum-reject-50.toml --lang rust --vectors 64 --force
// design: Bench recorder hum band-reject, 50 Hz mains (audio-demos/hum-reject-50.toml, fnv1a-64 ee62542a9dae04ef)
// format: fixed: Q1.23 samples, Q2.30 coefficients (32 bits), 64-bit accumulator, rounding nearest, saturate on overflow, error feedback 2
// structure: df1; rate: 48000 Hz; knobs: none

//! Golden vectors for `hum_reject_50.rs`: 64 mono frames and the simulator's
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
    -91160, -2350624, 3677770, -2897155, -374986, -2103122, -1437106, 723859,
    -3509584, -341612, -4104456, -1797268, -3290687, 0, 1094933, 2171132,
    3210181, 4194304, 5106661, 5931642, 6655130, 7264748, 7750063, 8102773,
    8316842, 8388607, 8388607, 0, -8388608, 0, 8388607, 0,
    -8388608, 0, 8388607, 0, -8388608, 0, 8388607, 8388607,
    0, 0, 0, 0, 0, 0, 0, 0,
    0, 0, 0, 0, 0, 0, 0, 0,
    0, 0, 0, 0, 0, 0, 0, 0,
];

/// The simulator's output.
pub static OUTPUT: [i32; FRAMES] = [
    -90710, -2338094, 3683657, -2895168, -356822, -2072810, -1389467, 774725,
    -3445258, -258644, -4000025, -1664310, -3133419, 172521, 1260894, 2319810,
    3331195, 4277797, 5143465, 5913437, 6574587, 7115658, 7527436, 7802933,
    7937484, 7928841, 7848615, -578161, -8388608, 574304, 8388607, -570468,
    -8388608, 566657, 8388607, -562865, -8388608, 559099, 8388607, 7791749,
    -1148167, -1654135, -2156489, -2655192, -3150211, -3641512, -4129060, -4612823,
    -5092769, -5568868, -6041088, -6509399, -6973772, -7434181, -7890594, -8342988,
    -8388608, -8388608, -8099157, -7700209, -7298857, -6895165, -6440671, -5717860,
];
