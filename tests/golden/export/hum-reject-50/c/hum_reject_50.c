/*
 * generated: do not edit
 * tool: tonewright 0.1.0
 * command: tonewright export audio-demos/hum-reject-50.toml --lang c --vectors 64 --force
 * design: Bench recorder hum band-reject, 50 Hz mains (audio-demos/hum-reject-50.toml, fnv1a-64 ee62542a9dae04ef)
 * format: fixed: Q1.23 samples, Q2.30 coefficients (32 bits), 64-bit accumulator, rounding nearest, saturate on overflow, error feedback 2
 * structure: df1; rate: 48000 Hz; knobs: none
 *
 * The df1 kernel for hum_reject_50.h. C99, no allocation, no libm.
 * It reproduces the tonewright simulator integer for integer:
 *   x = fit_D(input);  per section, with r = COEF_FRAC - shift:
 *   acc = fit_A(b0*x + b1*x1 + b2*x2 - a1*y1 - a2*y2 + 2*e1 - e2)   (exact sum)
 *   q = round_r(acc);  y = fit_D(q);  e = acc - q*2^r
 * fit_W saturates to W bits (D = 24, A = 64); round_r is
 * round half up of acc / 2^r. Sums are exact and fitted once, after the last term.
 * A 64-bit accumulator's exact sum can need 67 bits: terms are split into high and
 * low 32-bit halves, summed separately and recombined, so no C99 integer overflows.
 * Relies on two's complement int64_t, as C99 7.18.1.1 requires of it, on arithmetic
 * right shift of negative values (checked below at compile time) and on conversion
 * of out-of-range values to signed types keeping the low bits (every two's
 * complement compiler does; C99 6.3.1.3 leaves it implementation-defined).
 */
#define HUM_REJECT_50_DEFINE_TABLES
#include "hum_reject_50.h"

/* Arithmetic right shift of negative values, which the kernel relies on. */
typedef char hum_reject_50_needs_arithmetic_shift[((-1) >> 1) == -1 ? 1 : -1];

#define DATA_MAX ((int64_t)((((uint64_t)1) << (HUM_REJECT_50_DATA_BITS - 1)) - 1))
#define DATA_MIN (-DATA_MAX - 1)

/* fit_D: the value saturated to the data word; counts a change. */
static int64_t fit_data(int64_t v, uint32_t *overflows)
{
    int64_t f = v > DATA_MAX ? DATA_MAX : (v < DATA_MIN ? DATA_MIN : v);
    *overflows += (uint32_t)(f != v);
    return f;
}

/* fit_A of the exact sum of n terms, A = 64. Each term t = hi*2^32 + lo with
 * 0 <= lo < 2^32; the halves are summed apart (no overflow for n <= 6) and the sum is
 * hi*2^32 + lo again, which fits int64_t exactly when -2^31 <= hi < 2^31. */
static int64_t fit_sum(const int64_t *t, int n, uint32_t *overflows)
{
    int64_t hi = 0, lo = 0;
    uint64_t bits;
    int i;
    for (i = 0; i < n; ++i) {
        hi += t[i] >> 32;
        lo += (int64_t)((uint64_t)t[i] & 0xffffffffu);
    }
    hi += lo >> 32;
    bits = ((uint64_t)hi << 32) | ((uint64_t)lo & 0xffffffffu);
    if (hi > INT32_MAX || hi < INT32_MIN) {
        ++*overflows;
        return hi > 0 ? INT64_MAX : INT64_MIN;
    }
    return (int64_t)bits;
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

void hum_reject_50_reset(hum_reject_50_state *st)
{
    int j;
    for (j = 0; j < HUM_REJECT_50_SECTIONS; ++j) {
        st->sec[j].x1 = st->sec[j].x2 = st->sec[j].y1 = st->sec[j].y2 = 0;
        st->sec[j].e1 = st->sec[j].e2 = 0;
    }
    st->overflows = 0;
}

void hum_reject_50_process(hum_reject_50_state *st, const hum_reject_50_coefs *k, int32_t *samples, size_t n)
{
    size_t i;
    int j;
    for (i = 0; i < n; ++i) {
        int64_t x = fit_data(samples[i], &st->overflows);
        for (j = 0; j < HUM_REJECT_50_SECTIONS; ++j) {
            hum_reject_50_section_state *s = &st->sec[j];
            const int32_t *c = k->c[j];
            unsigned r = (unsigned)(HUM_REJECT_50_COEF_FRAC - k->shift[j]);
            int64_t t[6], acc, q, y, e;
            t[0] = (int64_t)c[0] * x;
            t[1] = (int64_t)c[1] * s->x1;
            t[2] = (int64_t)c[2] * s->x2;
            t[3] = -((int64_t)c[3] * s->y1);
            t[4] = -((int64_t)c[4] * s->y2);
            t[5] = 2 * (int64_t)s->e1 - s->e2;
            acc = fit_sum(t, 6, &st->overflows);
            q = round_acc(acc, r, &e);
            y = fit_data(q, &st->overflows);
            s->x2 = s->x1;
            s->x1 = (int32_t)x;
            s->y2 = s->y1;
            s->y1 = (int32_t)y;
            s->e2 = s->e1;
            s->e1 = (int32_t)e;
            x = y;
        }
        samples[i] = (int32_t)x;
    }
}
