/*
 * generated: do not edit
 * tool: tonewright 0.1.0
 * command: tonewright export audio-demos/hum-reject-50.toml --lang c --vectors 64 --force
 * design: Bench recorder hum band-reject, 50 Hz mains (audio-demos/hum-reject-50.toml, fnv1a-64 8092afcff5dcb0e6)
 * format: q15: Q1.15 samples, Q2.14 coefficients (16 bits), 32-bit accumulator, rounding nearest, saturate on overflow, error feedback 0
 * structure: df1; rate: 48000 Hz; knobs: none
 *
 * Golden vectors for hum_reject_50.h: 64 mono frames and the
 * simulator's output for them, starting from a reset state with hum_reject_50_table.
 *   frames 0..13: uniform noise at half scale (seeded)
 *   frames 13..26: full-scale sine at rate/48
 *   frames 26..39: steps +full scale, 0, -full scale, 0
 *   frames 39..52: one full-scale impulse
 *   frames 52..64: silence (zero-input limit cycles)
 */
#ifndef HUM_REJECT_50_VECTORS_H
#define HUM_REJECT_50_VECTORS_H

#define HUM_REJECT_50_VECTOR_FRAMES 64

static const int32_t hum_reject_50_vector_input[HUM_REJECT_50_VECTOR_FRAMES] = {
    -356, -9182, 14366, -11317, -1465, -8215, -5614, 2828,
    -13709, -1334, -16033, -7021, -12854, 0, 4277, 8481,
    12540, 16384, 19948, 23170, 25997, 28378, 30274, 31651,
    32488, 32767, 32767, 0, -32768, 0, 32767, 0,
    -32768, 0, 32767, 0, -32768, 0, 32767, 32767,
    0, 0, 0, 0, 0, 0, 0, 0,
    0, 0, 0, 0, 0, 0, 0, 0,
    0, 0, 0, 0, 0, 0, 0, 0,
};

static const int32_t hum_reject_50_vector_output[HUM_REJECT_50_VECTOR_FRAMES] = {
    -355, -9135, 14386, -11314, -1400, -8104, -5437, 3016,
    -13471, -1026, -15645, -6526, -12270, 637, 4882, 9012,
    12957, 16649, 20026, 23030, 25612, 27725, 29336, 30416,
    30949, 30922, 30618, -2287, -32768, 2272, 32767, -2258,
    -32768, 2244, 32767, -2230, -32768, 2216, 32767, 30404,
    -4547, -6553, -8546, -10526, -12492, -14444, -16382, -18306,
    -20216, -22113, -23997, -25868, -27725, -29568, -31397, -32768,
    -32768, -32756, -31383, -29790, -28190, -26582, -24901, -22052,
};

#endif
