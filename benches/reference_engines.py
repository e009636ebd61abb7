"""Times scipy.signal.sosfilt (float64) on the sections and sizes of
benches/engines.rs and prints section-samples per second (median of 15 runs).

Run: env -u OPENBLAS_CORETYPE -u OPENBLAS_L2_SIZE python3 benches/reference_engines.py
(numpy, scipy; the same cascade: 8 resonant sections from 60 Hz to 12 kHz at 48 kHz,
2^21 samples of seeded noise per run, as 1, 2 and 8 interleaved channels).
"""
import math
import os
import statistics
import time

import numpy as np
import scipy
import scipy.signal

SECTIONS = 8
SAMPLES = 1 << 21
RATE = 48000.0


def cascade():
    rows = []
    for k in range(SECTIONS):
        f0 = 60.0 * 1.9 ** k
        r, th = 0.995 - 0.01 * k, 2.0 * math.pi * f0 / RATE
        g = 0.5 * (1.0 - r) * (1.0 + r)
        rows.append([g, 0.0, -g, 1.0, -2.0 * r * math.cos(th), r * r])
    return np.array(rows)


def main():
    sos = cascade()
    rng = np.random.default_rng(0x5EED)
    print("scipy %s, numpy %s, load average %.2f" % (
        scipy.__version__, np.__version__, os.getloadavg()[0]))
    for channels in (1, 2, 8):
        # Interleaved frames: shape (frames, channels), filtered along axis 0.
        x = rng.uniform(-0.25, 0.25, (SAMPLES // channels, channels))
        times = []
        for _ in range(15):
            t = time.perf_counter()
            scipy.signal.sosfilt(sos, x, axis=0)
            times.append(time.perf_counter() - t)
        med, best = statistics.median(times), min(times)
        items = x.size * SECTIONS
        print("scipy_sosfilt_f64 channels=%d  median %.1f M section-samples/s  fastest %.1f M"
              % (channels, items / med / 1e6, items / best / 1e6))


if __name__ == "__main__":
    main()
