"""Writes quantized_lowpass.json: a 100 Hz, Q 0.707 low-pass at 48 kHz (bilinear,
prewarped at f0 = the audio EQ cookbook formulas), its coefficients rounded to Q15
and Q31 integers, and the poles and DC gain of the rounded coefficients.

Run: python3 tests/reference/quantized_lowpass.py  (numpy, scipy)
"""
import json
import math
import os

import numpy as np
import scipy
import scipy.signal

RATE, F0, Q = 48000.0, 100.0, 0.707


def cookbook_lowpass(f0, q, rate):
    w0 = 2 * math.pi * f0 / rate
    alpha = math.sin(w0) / (2 * q)
    cw = math.cos(w0)
    a0 = 1 + alpha
    b = [(1 - cw) / 2 / a0, (1 - cw) / a0, (1 - cw) / 2 / a0]
    a = [-2 * cw / a0, (1 - alpha) / a0]
    return b, a


def describe(b, a):
    poles = np.roots([1.0, a[0], a[1]])
    p = poles[np.argmax(poles.imag)]
    w, h = scipy.signal.freqz(b, [1.0, a[0], a[1]], worN=[0.0, 2 * math.pi * F0 / RATE])
    return {
        "pole_radius": float(abs(p)),
        "pole_freq_hz": float(abs(np.angle(p)) * RATE / (2 * math.pi)),
        "dc_gain_db": float(20 * math.log10(abs(h[0]))),
    }


def rounded(values, frac):
    # numpy rounds half to even, like tonewright's coefficient rounding.
    return [int(v) for v in np.round(np.array(values) * 2.0**frac)]


b, a = cookbook_lowpass(F0, Q, RATE)
out = {
    "generated": "tests/reference/quantized_lowpass.py; scipy %s, numpy %s; do not edit"
    % (scipy.__version__, np.__version__),
    "rate": RATE, "f0": F0, "q": Q,
    "b": b, "a": a,
    "float": describe(b, a),
}
# Q15: a needs Q2.14 (|a1| close to 2). The textbook split stores b in Q1.15 and a in
# Q2.14; tonewright uses one scale per section, so b is also given in Q2.14.
# Q31: the same with 32-bit words (Q1.31 / Q2.30).
for name, bits in (("q15", 16), ("q31", 32)):
    fa = bits - 2
    a_int = rounded(a, fa)
    b_split = rounded(b, bits - 1)
    b_common = rounded(b, fa)
    common = describe([v / 2.0**fa for v in b_common], [v / 2.0**fa for v in a_int])
    split = describe([v / 2.0 ** (bits - 1) for v in b_split], [v / 2.0**fa for v in a_int])
    out[name] = {
        "a_frac": fa, "a": a_int,
        "b_split_frac": bits - 1, "b_split": b_split, "split": split,
        "b_common": b_common, "common": common,
    }

path = os.path.join(os.path.dirname(os.path.abspath(__file__)), "quantized_lowpass.json")
with open(path, "w") as f:
    json.dump(out, f, indent=1)
    f.write("\n")
