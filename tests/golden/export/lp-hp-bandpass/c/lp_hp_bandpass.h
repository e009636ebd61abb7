/*
 * generated: do not edit
 * tool: tonewright 0.1.0
 * command: tonewright export audio-demos/lp-hp-bandpass.toml --lang c --vectors 64
 * design: Low-pass into high-pass band-pass, buffered RC stages (audio-demos/lp-hp-bandpass.toml, fnv1a-64 0b9a49ae9decb6fc)
 * format: q15: Q1.15 samples, Q2.14 coefficients (16 bits), 32-bit accumulator, rounding nearest, saturate on overflow, error feedback 0
 * structure: df1; rate: 48000 Hz; knobs: none
 *
 * Low-pass into high-pass band-pass, buffered RC stages: a cascade of 2 second-order section(s),
 * H_k(z) = (b0 + b1 z^-1 + b2 z^-2) / (1 + a1 z^-1 + a2 z^-2), a0 = 1.
 * Stored integers: each effective coefficient is c * 2^shift / 2^LP_HP_BANDPASS_COEF_FRAC.
 * Samples are int32_t holding 16-bit values (full scale 2^15).
 *
 * Use: lp_hp_bandpass_state s; lp_hp_bandpass_reset(&s);
 *      lp_hp_bandpass_process(&s, &lp_hp_bandpass_table, samples, n);   (in place, mono)
 * One state per channel. The tables are defined in lp_hp_bandpass.c
 * (LP_HP_BANDPASS_DEFINE_TABLES); every other file sees declarations only.
 */
#ifndef LP_HP_BANDPASS_H
#define LP_HP_BANDPASS_H

#include <stddef.h>
#include <stdint.h>

#define LP_HP_BANDPASS_SECTIONS 2
#define LP_HP_BANDPASS_RATE_HZ 48000
#define LP_HP_BANDPASS_COEF_BITS 16
#define LP_HP_BANDPASS_COEF_FRAC 14
#define LP_HP_BANDPASS_DATA_BITS 16
#define LP_HP_BANDPASS_ACC_BITS 32

/* One coefficient set: per section b0, b1, b2, a1, a2 and the accumulator shift. */
typedef struct {
    int16_t c[LP_HP_BANDPASS_SECTIONS][5];
    uint8_t shift[LP_HP_BANDPASS_SECTIONS];
} lp_hp_bandpass_coefs;

/* Per-section state: last inputs x1, x2 and outputs y1, y2. */
typedef struct {
    int32_t x1, x2, y1, y2;
} lp_hp_bandpass_section_state;

typedef struct {
    lp_hp_bandpass_section_state sec[LP_HP_BANDPASS_SECTIONS];
    uint32_t overflows; /* saturations or wraps that changed a value (wraps around) */
} lp_hp_bandpass_state;

void lp_hp_bandpass_reset(lp_hp_bandpass_state *st);
void lp_hp_bandpass_process(lp_hp_bandpass_state *st, const lp_hp_bandpass_coefs *k, int32_t *samples, size_t n);

extern const lp_hp_bandpass_coefs lp_hp_bandpass_table;

#ifdef LP_HP_BANDPASS_DEFINE_TABLES
/* The float64 design, b0, b1, b2, a1, a2 per section:
 *   3.38174441664805e-2, 6.7634888332961e-2, 3.38174441664805e-2, -1.264419204530401e0, 3.99688981196323e-1
 *   9.583004513325004e-1, -1.9166009026650008e0, 9.583004513325004e-1, -1.9157128624708961e0, 9.174889428591086e-1
 * Knobs: none. */
const lp_hp_bandpass_coefs lp_hp_bandpass_table = { {
        { 554, 1108, 554, -20716, 6549 },
        { 15701, -31402, 15701, -31387, 15032 },
    }, { 0, 0 } };
#endif

#endif
