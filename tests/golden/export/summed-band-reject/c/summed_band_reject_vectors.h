/*
 * generated: do not edit
 * tool: tonewright 0.1.0
 * command: tonewright export audio-demos/summed-band-reject.toml --lang c --vectors 64 --knobs
 * design: Low-pass plus high-pass summed into a band-reject (audio-demos/summed-band-reject.toml, fnv1a-64 96df495b86b72f92)
 * format: q15: Q1.15 samples, Q2.14 coefficients (16 bits), 32-bit accumulator, rounding nearest, saturate on overflow, error feedback 0
 * structure: df1; rate: 48000 Hz; knobs: scoop=1
 *
 * Golden vectors for summed_band_reject.h: 64 mono frames and the
 * simulator's output for them, starting from a reset state with summed_band_reject_table.
 *   frames 0..13: uniform noise at half scale (seeded)
 *   frames 13..26: full-scale sine at rate/48
 *   frames 26..39: steps +full scale, 0, -full scale, 0
 *   frames 39..52: one full-scale impulse
 *   frames 52..64: silence (zero-input limit cycles)
 */
#ifndef SUMMED_BAND_REJECT_VECTORS_H
#define SUMMED_BAND_REJECT_VECTORS_H

#define SUMMED_BAND_REJECT_VECTOR_FRAMES 64

static const int32_t summed_band_reject_vector_input[SUMMED_BAND_REJECT_VECTOR_FRAMES] = {
    -356, -9182, 14366, -11317, -1465, -8215, -5614, 2828,
    -13709, -1334, -16033, -7021, -12854, 0, 4277, 8481,
    12540, 16384, 19948, 23170, 25997, 28378, 30274, 31651,
    32488, 32767, 32767, 0, -32768, 0, 32767, 0,
    -32768, 0, 32767, 0, -32768, 0, 32767, 32767,
    0, 0, 0, 0, 0, 0, 0, 0,
    0, 0, 0, 0, 0, 0, 0, 0,
    0, 0, 0, 0, 0, 0, 0, 0,
};

static const int32_t summed_band_reject_vector_output[SUMMED_BAND_REJECT_VECTOR_FRAMES] = {
    -304, -7766, 14510, -11686, 135, -5814, -2125, 5374,
    -10630, 2654, -11172, -833, -6349, 5609, 6752, 7672,
    8423, 9038, 9537, 9929, 10220, 10409, 10498, 10485,
    10372, 10157, 10085, -17689, -32768, 11418, 32767, -7370,
    -32768, 4757, 31030, -5907, -31788, 5413, 31469, 22402,
    -11334, -7064, -4218, -2327, -1077, -256, 277, 618,
    830, 956, 1025, 1057, 1064, 1055, 1036, 1011,
    982, 951, 919, 887, 855, 823, 792, 762,
};

#endif
