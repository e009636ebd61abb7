"""Writes sosfilt.json: seeded noise filtered by scipy.signal.sosfilt through a
6th-order Butterworth low-pass (1 kHz) and a peaking section (cookbook, 3 kHz, Q 2,
+6 dB) at 48 kHz, to check tonewright's float64 engine.

Run: python3 tests/reference/sosfilt.py  (numpy, scipy)
"""
import json
import math
import os

import numpy as np
import scipy
import scipy.signal

RATE = 48000.0
sos = scipy.signal.butter(6, 1000.0, fs=RATE, output="sos")
A = 10 ** (6.0 / 40)
w0 = 2 * math.pi * 3000.0 / RATE
alpha = math.sin(w0) / (2 * 2.0)
a0 = 1 + alpha / A
peak = [(1 + alpha * A) / a0, -2 * math.cos(w0) / a0, (1 - alpha * A) / a0,
        1.0, -2 * math.cos(w0) / a0, (1 - alpha / A) / a0]
sos = np.vstack([sos, peak])
x = np.random.default_rng(20260101).uniform(-0.5, 0.5, 3000)
y = scipy.signal.sosfilt(sos, x)
out = {
    "generated": "tests/reference/sosfilt.py; scipy %s, numpy %s; do not edit"
    % (scipy.__version__, np.__version__),
    "rate": RATE,
    "sections": [{"b": [float(v) for v in s[:3]], "a": [float(s[4]), float(s[5])]} for s in sos],
    "input": [float(v) for v in x],
    "output": [float(v) for v in y],
}
path = os.path.join(os.path.dirname(os.path.abspath(__file__)), "sosfilt.json")
with open(path, "w") as f:
    json.dump(out, f)
    f.write("\n")
