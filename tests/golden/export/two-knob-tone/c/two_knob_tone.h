/*
 * generated: do not edit
 * tool: tonewright 0.1.0
 * command: tonewright export audio-demos/two-knob-tone.toml --lang c --vectors 64
 * design: Two-knob passive tone stage, bench port (audio-demos/two-knob-tone.toml, fnv1a-64 eb1577a73018a044)
 * format: q15: Q1.15 samples, Q2.14 coefficients (16 bits), 32-bit accumulator, rounding nearest, saturate on overflow, error feedback 0
 * structure: df1; rate: 48000 Hz; knobs: bass=0.5, treble=0.5
 *
 * Two-knob passive tone stage, bench port: a cascade of 1 second-order section(s),
 * H_k(z) = (b0 + b1 z^-1 + b2 z^-2) / (1 + a1 z^-1 + a2 z^-2), a0 = 1.
 * Stored integers: each effective coefficient is c * 2^shift / 2^TWO_KNOB_TONE_COEF_FRAC.
 * Samples are int32_t holding 16-bit values (full scale 2^15).
 *
 * Use: two_knob_tone_state s; two_knob_tone_reset(&s);
 *      two_knob_tone_process(&s, &two_knob_tone_table, samples, n);   (in place, mono)
 * One state per channel. The tables are defined in two_knob_tone.c
 * (TWO_KNOB_TONE_DEFINE_TABLES); every other file sees declarations only.
 */
#ifndef TWO_KNOB_TONE_H
#define TWO_KNOB_TONE_H

#include <stddef.h>
#include <stdint.h>

#define TWO_KNOB_TONE_SECTIONS 1
#define TWO_KNOB_TONE_RATE_HZ 48000
#define TWO_KNOB_TONE_COEF_BITS 16
#define TWO_KNOB_TONE_COEF_FRAC 14
#define TWO_KNOB_TONE_DATA_BITS 16
#define TWO_KNOB_TONE_ACC_BITS 32

/* One coefficient set: per section b0, b1, b2, a1, a2 and the accumulator shift. */
typedef struct {
    int16_t c[TWO_KNOB_TONE_SECTIONS][5];
    uint8_t shift[TWO_KNOB_TONE_SECTIONS];
} two_knob_tone_coefs;

/* Per-section state: last inputs x1, x2 and outputs y1, y2. */
typedef struct {
    int32_t x1, x2, y1, y2;
} two_knob_tone_section_state;

typedef struct {
    two_knob_tone_section_state sec[TWO_KNOB_TONE_SECTIONS];
    uint32_t overflows; /* saturations or wraps that changed a value (wraps around) */
} two_knob_tone_state;

void two_knob_tone_reset(two_knob_tone_state *st);
void two_knob_tone_process(two_knob_tone_state *st, const two_knob_tone_coefs *k, int32_t *samples, size_t n);

extern const two_knob_tone_coefs two_knob_tone_table;

#ifdef TWO_KNOB_TONE_DEFINE_TABLES
/* The float64 design, b0, b1, b2, a1, a2 per section:
 *   1.5387099149197375e-1, -3.0071614763168036e-1, 1.4713492121501673e-1, -1.8847816987925738e0, 8.869917372014191e-1
 * Knobs: bass=0.5, treble=0.5. */
const two_knob_tone_coefs two_knob_tone_table = { {
        { 2521, -4927, 2411, -30880, 14532 },
    }, { 0 } };
#endif

#endif
