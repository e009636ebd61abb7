/*
 * generated: do not edit
 * tool: tonewright 0.1.0
 * command: tonewright export audio-demos/lp-hp-bandpass.toml --lang c --vectors 64
 * design: Low-pass into high-pass band-pass, buffered RC stages (audio-demos/lp-hp-bandpass.toml, fnv1a-64 0b9a49ae9decb6fc)
 * format: q15: Q1.15 samples, Q2.14 coefficients (16 bits), 32-bit accumulator, rounding nearest, saturate on overflow, error feedback 0
 * structure: df1; rate: 48000 Hz; knobs: none
 *
 * The df1 kernel for lp_hp_bandpass.h. C99, no allocation, no libm.
 * It reproduces the tonewright simulator integer for integer:
 *   x = fit_D(input);  per section, with r = COEF_FRAC - shift:
 *   acc = fit_A(b0*x + b1*x1 + b2*x2 - a1*y1 - a2*y2)   (exact sum)
 *   q = round_r(acc);  y = fit_D(q)
 * fit_W saturates to W bits (D = 16, A = 32); round_r is
 * round half up of acc / 2^r. Sums are exact and fitted once, after the last term.
 * Relies on two's complement int64_t, as C99 7.18.1.1 requires of it, on arithmetic
 * right shift of negative values (checked below at compile time) and on conversion
 * of out-of-range values to signed types keeping the low bits (every two's
 * complement compiler does; C99 6.3.1.3 leaves it implementation-defined).
 */
#define LP_HP_BANDPASS_DEFINE_TABLES
#include "lp_hp_bandpass.h"

/* Arithmetic right shift of negative values, which the kernel relies on. */
typedef char lp_hp_bandpass_needs_arithmetic_shift[((-1) >> 1) == -1 ? 1 : -1];

#define DATA_MAX ((int64_t)((((uint64_t)1) << (LP_HP_BANDPASS_DATA_BITS - 1)) - 1))
#define DATA_MIN (-DATA_MAX - 1)
#define ACC_MAX ((int64_t)((((uint64_t)1) << (LP_HP_BANDPASS_ACC_BITS - 1)) - 1))
#define ACC_MIN (-ACC_MAX - 1)

/* fit_D: the value saturated to the data word; counts a change. */
static int64_t fit_data(int64_t v, uint32_t *overflows)
{
    int64_t f = v > DATA_MAX ? DATA_MAX : (v < DATA_MIN ? DATA_MIN : v);
    *overflows += (uint32_t)(f != v);
    return f;
}

/* fit_A of the exact sum of n terms (it fits int64_t: A <= 56). */
static int64_t fit_sum(const int64_t *t, int n, uint32_t *overflows)
{
    int64_t v = 0, f;
    int i;
    for (i = 0; i < n; ++i) {
        v += t[i];
    }
    f = v > ACC_MAX ? ACC_MAX : (v < ACC_MIN ? ACC_MIN : v);
    *overflows += (uint32_t)(f != v);
    return f;
}

/* round_r(acc) and the narrowing error acc - q*2^r, without overflow at any acc. */
static int64_t round_acc(int64_t acc, unsigned r, int64_t *err)
{
    int64_t q, m, up;
    if (r == 0) {
        *err = 0;
        return acc;
    }
    q = acc >> r;
    m = (int64_t)((uint64_t)acc & ((((uint64_t)1) << r) - 1));
    up = m >> (r - 1);
    *err = m - (up << r);
    return q + up;
}

void lp_hp_bandpass_reset(lp_hp_bandpass_state *st)
{
    int j;
    for (j = 0; j < LP_HP_BANDPASS_SECTIONS; ++j) {
        st->sec[j].x1 = st->sec[j].x2 = st->sec[j].y1 = st->sec[j].y2 = 0;
    }
    st->overflows = 0;
}

void lp_hp_bandpass_process(lp_hp_bandpass_state *st, const lp_hp_bandpass_coefs *k, int32_t *samples, size_t n)
{
    size_t i;
    int j;
    for (i = 0; i < n; ++i) {
        int64_t x = fit_data(samples[i], &st->overflows);
        for (j = 0; j < LP_HP_BANDPASS_SECTIONS; ++j) {
            lp_hp_bandpass_section_state *s = &st->sec[j];
            const int16_t *c = k->c[j];
            unsigned r = (unsigned)(LP_HP_BANDPASS_COEF_FRAC - k->shift[j]);
            int64_t t[6], acc, q, y, e;
            t[0] = (int64_t)c[0] * x;
            t[1] = (int64_t)c[1] * s->x1;
            t[2] = (int64_t)c[2] * s->x2;
            t[3] = -((int64_t)c[3] * s->y1);
            t[4] = -((int64_t)c[4] * s->y2);
            acc = fit_sum(t, 5, &st->overflows);
            q = round_acc(acc, r, &e);
            y = fit_data(q, &st->overflows);
            s->x2 = s->x1;
            s->x1 = (int32_t)x;
            s->y2 = s->y1;
            s->y1 = (int32_t)y;
            (void)e;
            x = y;
        }
        samples[i] = (int32_t)x;
    }
}
