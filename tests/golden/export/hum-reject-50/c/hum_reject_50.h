/*
 * generated: do not edit
 * tool: tonewright 0.1.0
 * command: tonewright export audio-demos/hum-reject-50.toml --lang c --vectors 64 --force
 * design: Bench recorder hum band-reject, 50 Hz mains (audio-demos/hum-reject-50.toml, fnv1a-64 ee62542a9dae04ef)
 * format: fixed: Q1.23 samples, Q2.30 coefficients (32 bits), 64-bit accumulator, rounding nearest, saturate on overflow, error feedback 2
 * structure: df1; rate: 48000 Hz; knobs: none
 *
 * Bench recorder hum band-reject, 50 Hz mains: a cascade of 4 second-order section(s),
 * H_k(z) = (b0 + b1 z^-1 + b2 z^-2) / (1 + a1 z^-1 + a2 z^-2), a0 = 1.
 * Stored integers: each effective coefficient is c * 2^shift / 2^HUM_REJECT_50_COEF_FRAC.
 * Samples are int32_t holding 24-bit values (full scale 2^23).
 *
 * Use: hum_reject_50_state s; hum_reject_50_reset(&s);
 *      hum_reject_50_process(&s, &hum_reject_50_table, samples, n);   (in place, mono)
 * One state per channel. The tables are defined in hum_reject_50.c
 * (HUM_REJECT_50_DEFINE_TABLES); every other file sees declarations only.
 */
#ifndef HUM_REJECT_50_H
#define HUM_REJECT_50_H

#include <stddef.h>
#include <stdint.h>

#define HUM_REJECT_50_SECTIONS 4
#define HUM_REJECT_50_RATE_HZ 48000
#define HUM_REJECT_50_COEF_BITS 32
#define HUM_REJECT_50_COEF_FRAC 30
#define HUM_REJECT_50_DATA_BITS 24
#define HUM_REJECT_50_ACC_BITS 64

/* One coefficient set: per section b0, b1, b2, a1, a2 and the accumulator shift. */
typedef struct {
    int32_t c[HUM_REJECT_50_SECTIONS][5];
    uint8_t shift[HUM_REJECT_50_SECTIONS];
} hum_reject_50_coefs;

/* Per-section state: last inputs x1, x2 and outputs y1, y2, narrowing errors e1, e2. */
typedef struct {
    int32_t x1, x2, y1, y2;
    int32_t e1, e2;
} hum_reject_50_section_state;

typedef struct {
    hum_reject_50_section_state sec[HUM_REJECT_50_SECTIONS];
    uint32_t overflows; /* saturations or wraps that changed a value (wraps around) */
} hum_reject_50_state;

void hum_reject_50_reset(hum_reject_50_state *st);
void hum_reject_50_process(hum_reject_50_state *st, const hum_reject_50_coefs *k, int32_t *samples, size_t n);

extern const hum_reject_50_coefs hum_reject_50_table;

#ifdef HUM_REJECT_50_DEFINE_TABLES
/* The float64 design, b0, b1, b2, a1, a2 per section:
 *   9.973871360944692e-1, -1.9947742721889383e0, 9.973871360944692e-1, -1.9947708541932045e0, 9.947776901846718e-1
 *   9.990192781365411e-1, -1.9976534153241596e0, 9.990192781365416e-1, -1.99765341532416e0, 9.98038556273083e-1
 *   9.991825690168523e-1, -1.9981939332443093e0, 9.99182569016852e-1, -1.998193933244309e0, 9.983651380337042e-1
 *   9.994548858142649e-1, -1.998866958307666e0, 9.994548858142651e-1, -1.9988669583076664e0, 9.989097716285305e-1
 * Knobs: none. */
const hum_reject_50_coefs hum_reject_50_table = { {
        { 1070936283, -2141872565, 1070936283, -2141868895, 1068134412 },
        { 1072688782, -2144964022, 1072688782, -2144964022, 1071635740 },
        { 1072864114, -2145544399, 1072864114, -2145544399, 1071986404 },
        { 1073156512, -2146267054, 1073156512, -2146267054, 1072571200 },
    }, { 0, 0, 0, 0 } };
#endif

#endif
