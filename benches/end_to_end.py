#!/usr/bin/env python3
"""End to end, side by side: a 10-minute 48 kHz stereo 16-bit file through the eight
sections of benches/eight-sections.toml.

- tonewright apply: q15 output plus the f64 run (--float-out), both written as 16-bit;
- tonewright apply --compare: both engines, only the q15 output written;
- tonewright apply of a one-section pass-through (gain 0 dB) in f64: reading and
  writing with (almost) no filtering, the baseline of the 1.5x target;
- numpy + scipy.signal.sosfilt (float64): read with the wave module, filter the same
  float64 sections (taken from `tonewright inspect --json`), write 16-bit;
- a batch: tonewright apply of the q15 output alone (one core per file) for one file
  and for two, to show a batch of two files using both cores.

Run from the crate root after `cargo build --release`:
    env -u OPENBLAS_CORETYPE -u OPENBLAS_L2_SIZE python3 benches/end_to_end.py
Prints median wall-clock and CPU seconds of 5 runs each, and the ratios.
"""
import json
import os
import resource
import statistics
import subprocess
import sys
import tempfile
import time
import wave

import numpy as np
import scipy
import scipy.signal

TOOL = os.path.join("target", "release", "tonewright")
DESIGN = os.path.join("benches", "eight-sections.toml")
RATE, SECONDS, RUNS = 48000, 600, 5


def make_input(path):
    rng = np.random.default_rng(1)
    with wave.open(path, "wb") as w:
        w.setnchannels(2)
        w.setsampwidth(2)
        w.setframerate(RATE)
        for _ in range(SECONDS // 10):
            block = (rng.standard_normal((RATE * 10, 2)) * 0.1 * 32767).astype("<i2")
            w.writeframes(block.tobytes())


def cpu_seconds():
    """User + system seconds of this process (numpy, scipy) and its children (tonewright)."""
    return sum(u.ru_utime + u.ru_stime for u in (resource.getrusage(resource.RUSAGE_SELF),
                                                  resource.getrusage(resource.RUSAGE_CHILDREN)))


def timed(fn):
    """Median wall-clock and median CPU seconds of `RUNS` runs of `fn`."""
    walls, cpus = [], []
    for _ in range(RUNS):
        before = cpu_seconds()
        start = time.perf_counter()
        fn()
        walls.append(time.perf_counter() - start)
        cpus.append(cpu_seconds() - before)
    return statistics.median(walls), statistics.median(cpus)


def main():
    report = json.loads(subprocess.run([TOOL, "inspect", DESIGN, "--json", "--number", "f64"],
                                       check=True, capture_output=True, text=True).stdout)
    sos = np.array([s["b"] + s["a"] for s in report["sections"]])
    with tempfile.TemporaryDirectory() as tmp:
        src = os.path.join(tmp, "in.wav")
        make_input(src)
        passthrough = os.path.join(tmp, "pass.toml")
        with open(passthrough, "w") as f:
            f.write('[[stage]]\nkind = "gain"\ndb = 0\n')
        out, flt = os.path.join(tmp, "q15.wav"), os.path.join(tmp, "f64.wav")

        def tool():
            subprocess.run([TOOL, "apply", DESIGN, src, "-o", out, "--float-out", flt],
                           check=True, capture_output=True)

        def compare():
            subprocess.run([TOOL, "apply", DESIGN, src, "-o", out, "--compare"],
                           check=True, capture_output=True)

        def baseline():
            subprocess.run([TOOL, "apply", passthrough, src, "-o", out, "--number", "f64",
                            "--no-dither"], check=True, capture_output=True)

        def numpy_scipy():
            with wave.open(src, "rb") as r:
                x = np.frombuffer(r.readframes(r.getnframes()), dtype="<i2").reshape(-1, 2) / 32768.0
            y = scipy.signal.sosfilt(sos, x, axis=0)
            with wave.open(os.path.join(tmp, "scipy.wav"), "wb") as w:
                w.setnchannels(2)
                w.setsampwidth(2)
                w.setframerate(RATE)
                w.writeframes(np.clip(np.round(y * 32768.0), -32768, 32767).astype("<i2").tobytes())

        second = os.path.join(tmp, "in2.wav")
        with open(src, "rb") as a, open(second, "wb") as b:
            b.write(a.read())
        folder = os.path.join(tmp, "batch")
        os.mkdir(folder)

        def one_file():
            subprocess.run([TOOL, "apply", DESIGN, src, "-o", out], check=True, capture_output=True)

        def two_files():
            subprocess.run([TOOL, "apply", DESIGN, src, second, "-o", folder],
                           check=True, capture_output=True)

        (t_tool, c_tool), (t_compare, c_compare) = timed(tool), timed(compare)
        (t_base, c_base), (t_py, c_py) = timed(baseline), timed(numpy_scipy)
        (t_one, c_one), (t_two, c_two) = timed(one_file), timed(two_files)
    print(f"scipy {scipy.__version__}, numpy {np.__version__}, load {os.getloadavg()[0]:.2f}")
    print("                                        wall       CPU")
    print(f"tonewright apply, q15 + f64 outputs  : {t_tool:5.2f} s  {c_tool:5.2f} s")
    print(f"tonewright apply --compare (q15 file): {t_compare:5.2f} s  {c_compare:5.2f} s")
    print(f"tonewright apply, pass-through       : {t_base:5.2f} s  {c_base:5.2f} s  (ratios "
          f"{t_tool / t_base:.2f} and {t_compare / t_base:.2f}, target <= 1.5)")
    print(f"numpy + scipy.signal.sosfilt (f64)   : {t_py:5.2f} s  {c_py:5.2f} s  "
          f"(tonewright / scipy {t_tool / t_py:.2f}, target < 0.5)")
    print(f"tonewright apply, q15 only, one file : {t_one:5.2f} s  {c_one:5.2f} s")
    print(f"tonewright apply, q15 only, two files: {t_two:5.2f} s  {c_two:5.2f} s  "
          f"(throughput {2 * t_one / t_two:.2f}x one file, target close to 2)")


if __name__ == "__main__":
    sys.exit(main())
