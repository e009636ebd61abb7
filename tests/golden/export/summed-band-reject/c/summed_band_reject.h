/*
 * generated: do not edit
 * tool: tonewright 0.1.0
 * command: tonewright export audio-demos/summed-band-reject.toml --lang c --vectors 64 --knobs
 * design: Low-pass plus high-pass summed into a band-reject (audio-demos/summed-band-reject.toml, fnv1a-64 96df495b86b72f92)
 * format: q15: Q1.15 samples, Q2.14 coefficients (16 bits), 32-bit accumulator, rounding nearest, saturate on overflow, error feedback 0
 * structure: df1; rate: 48000 Hz; knobs: scoop=1
 *
 * Low-pass plus high-pass summed into a band-reject: a cascade of 1 second-order section(s),
 * H_k(z) = (b0 + b1 z^-1 + b2 z^-2) / (1 + a1 z^-1 + a2 z^-2), a0 = 1.
 * Stored integers: each effective coefficient is c * 2^shift / 2^SUMMED_BAND_REJECT_COEF_FRAC.
 * Samples are int32_t holding 16-bit values (full scale 2^15).
 *
 * Use: summed_band_reject_state s; summed_band_reject_reset(&s);
 *      summed_band_reject_process(&s, &summed_band_reject_table, samples, n);   (in place, mono)
 * One state per channel. The tables are defined in summed_band_reject.c
 * (SUMMED_BAND_REJECT_DEFINE_TABLES); every other file sees declarations only.
 *
 * Knob table: 33 coefficient sets, row-major over
 *   scoop: 33 positions 0..1, stride 1
 * Interpolate neighbouring sets coefficient by coefficient (shifts are shared).
 * knob scoop: 33 steps; linear interpolation half-way between neighbours deviates at most 1.942 dB from the exact design (worst between scoop=0 and scoop=0.03125); 697 steps keep it under 0.5 dB (0.322 dB measured along scoop with the other knobs at their exported positions)
 * stability: every stored set is stable, so every linear interpolation between neighbours is too (the stable (a1, a2) region |a2| < 1, |a1| < 1 + a2 is a convex triangle); the mid-steps were also checked
 */
#ifndef SUMMED_BAND_REJECT_H
#define SUMMED_BAND_REJECT_H

#include <stddef.h>
#include <stdint.h>

#define SUMMED_BAND_REJECT_SECTIONS 1
#define SUMMED_BAND_REJECT_RATE_HZ 48000
#define SUMMED_BAND_REJECT_COEF_BITS 16
#define SUMMED_BAND_REJECT_COEF_FRAC 14
#define SUMMED_BAND_REJECT_DATA_BITS 16
#define SUMMED_BAND_REJECT_ACC_BITS 32

/* One coefficient set: per section b0, b1, b2, a1, a2 and the accumulator shift. */
typedef struct {
    int16_t c[SUMMED_BAND_REJECT_SECTIONS][5];
    uint8_t shift[SUMMED_BAND_REJECT_SECTIONS];
} summed_band_reject_coefs;

/* Per-section state: last inputs x1, x2 and outputs y1, y2. */
typedef struct {
    int32_t x1, x2, y1, y2;
} summed_band_reject_section_state;

typedef struct {
    summed_band_reject_section_state sec[SUMMED_BAND_REJECT_SECTIONS];
    uint32_t overflows; /* saturations or wraps that changed a value (wraps around) */
} summed_band_reject_state;

void summed_band_reject_reset(summed_band_reject_state *st);
void summed_band_reject_process(summed_band_reject_state *st, const summed_band_reject_coefs *k, int32_t *samples, size_t n);

extern const summed_band_reject_coefs summed_band_reject_table;
#define SUMMED_BAND_REJECT_KNOB_SETS 33
extern const summed_band_reject_coefs summed_band_reject_knob_table[SUMMED_BAND_REJECT_KNOB_SETS];

#ifdef SUMMED_BAND_REJECT_DEFINE_TABLES
/* The float64 design, b0, b1, b2, a1, a2 per section:
 *   8.549807288614583e-1, -1.6328368409973648e0, 7.905277194665513e-1, -1.6328368409973648e0, 6.455084483280095e-1
 * Knobs: scoop=1. */
const summed_band_reject_coefs summed_band_reject_table = { {
        { 14008, -26752, 12952, -26752, 10576 },
    }, { 0 } };

const summed_band_reject_coefs summed_band_reject_knob_table[SUMMED_BAND_REJECT_KNOB_SETS] = {
    /* scoop=0 */
    { {
        { 316, 316, 0, -15753, 0 },
    }, { 0 } },
    /* scoop=0.03125 */
    { {
        { 744, -735, 199, -26752, 10576 },
    }, { 0 } },
    /* scoop=0.0625 */
    { {
        { 1172, -1575, 611, -26752, 10576 },
    }, { 0 } },
    /* scoop=0.09375 */
    { {
        { 1600, -2414, 1022, -26752, 10576 },
    }, { 0 } },
    /* scoop=0.125 */
    { {
        { 2027, -3253, 1433, -26752, 10576 },
    }, { 0 } },
    /* scoop=0.15625 */
    { {
        { 2455, -4092, 1845, -26752, 10576 },
    }, { 0 } },
    /* scoop=0.1875 */
    { {
        { 2883, -4932, 2256, -26752, 10576 },
    }, { 0 } },
    /* scoop=0.21875 */
    { {
        { 3311, -5771, 2668, -26752, 10576 },
    }, { 0 } },
    /* scoop=0.25 */
    { {
        { 3739, -6610, 3079, -26752, 10576 },
    }, { 0 } },
    /* scoop=0.28125 */
    { {
        { 4167, -7450, 3490, -26752, 10576 },
    }, { 0 } },
    /* scoop=0.3125 */
    { {
        { 4595, -8289, 3902, -26752, 10576 },
    }, { 0 } },
    /* scoop=0.34375 */
    { {
        { 5023, -9128, 4313, -26752, 10576 },
    }, { 0 } },
    /* scoop=0.375 */
    { {
        { 5450, -9967, 4724, -26752, 10576 },
    }, { 0 } },
    /* scoop=0.40625 */
    { {
        { 5878, -10807, 5136, -26752, 10576 },
    }, { 0 } },
    /* scoop=0.4375 */
    { {
        { 6306, -11646, 5547, -26752, 10576 },
    }, { 0 } },
    /* scoop=0.46875 */
    { {
        { 6734, -12485, 5959, -26752, 10576 },
    }, { 0 } },
    /* scoop=0.5 */
    { {
        { 7162, -13324, 6370, -26752, 10576 },
    }, { 0 } },
    /* scoop=0.53125 */
    { {
        { 7590, -14164, 6781, -26752, 10576 },
    }, { 0 } },
    /* scoop=0.5625 */
    { {
        { 8018, -15003, 7193, -26752, 10576 },
    }, { 0 } },
    /* scoop=0.59375 */
    { {
        { 8446, -15842, 7604, -26752, 10576 },
    }, { 0 } },
    /* scoop=0.625 */
    { {
        { 8873, -16681, 8015, -26752, 10576 },
    }, { 0 } },
    /* scoop=0.65625 */
    { {
        { 9301, -17521, 8427, -26752, 10576 },
    }, { 0 } },
    /* scoop=0.6875 */
    { {
        { 9729, -18360, 8838, -26752, 10576 },
    }, { 0 } },
    /* scoop=0.71875 */
    { {
        { 10157, -19199, 9250, -26752, 10576 },
    }, { 0 } },
    /* scoop=0.75 */
    { {
        { 10585, -20038, 9661, -26752, 10576 },
    }, { 0 } },
    /* scoop=0.78125 */
    { {
        { 11013, -20878, 10072, -26752, 10576 },
    }, { 0 } },
    /* scoop=0.8125 */
    { {
        { 11441, -21717, 10484, -26752, 10576 },
    }, { 0 } },
    /* scoop=0.84375 */
    { {
        { 11869, -22556, 10895, -26752, 10576 },
    }, { 0 } },
    /* scoop=0.875 */
    { {
        { 12296, -23395, 11306, -26752, 10576 },
    }, { 0 } },
    /* scoop=0.90625 */
    { {
        { 12724, -24235, 11718, -26752, 10576 },
    }, { 0 } },
    /* scoop=0.9375 */
    { {
        { 13152, -25074, 12129, -26752, 10576 },
    }, { 0 } },
    /* scoop=0.96875 */
    { {
        { 13580, -25913, 12541, -26752, 10576 },
    }, { 0 } },
    /* scoop=1 */
    { {
        { 14008, -26752, 12952, -26752, 10576 },
    }, { 0 } },
};
#endif

#endif
