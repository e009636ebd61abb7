"""Writes tests/reference/families.json: analog zeros, poles and gain of the classic
filter families from scipy.signal, for tests/families.rs.

Run from the repository root:  python3 tests/reference/families.py
Frequencies are given in Hz in the JSON and passed to scipy in rad/s (2*pi*hz), the
form tonewright uses for s. Poles and zeros are unordered: tests match by nearest.
"""

import json
import math
import sys

import numpy
import scipy
import scipy.signal as signal

COMMAND = "python3 tests/reference/families.py"
OUT = "tests/reference/families.json"


def pairs(values):
    return [[float(v.real), float(v.imag)] for v in numpy.atleast_1d(values)]


def case(family, btype, order, hz, extra):
    wn = [2.0 * math.pi * f for f in hz]
    wn_arg = wn[0] if len(wn) == 1 else wn
    if family == "butter":
        z, p, k = signal.butter(order, wn_arg, btype, analog=True, output="zpk")
    elif family == "bessel":
        z, p, k = signal.bessel(order, wn_arg, btype, analog=True, output="zpk", norm=extra)
    elif family == "cheby1":
        z, p, k = signal.cheby1(order, extra, wn_arg, btype, analog=True, output="zpk")
    elif family == "cheby2":
        z, p, k = signal.cheby2(order, extra, wn_arg, btype, analog=True, output="zpk")
    else:
        raise ValueError(family)
    out = {"family": family, "btype": btype, "order": order, "hz": hz}
    if family == "bessel":
        out["norm"] = extra
    elif family == "cheby1":
        out["ripple_db"] = extra
    elif family == "cheby2":
        out["stop_db"] = extra
    out.update({"zeros": pairs(z), "poles": pairs(p), "gain": float(k)})
    return out


def main():
    cases = []
    designs = [
        ("butter", None),
        ("bessel", "phase"),
        ("bessel", "mag"),
        ("bessel", "delay"),
        ("cheby1", 0.5),
        ("cheby1", 3.0),
        ("cheby2", 40.0),
        ("cheby2", 80.0),
    ]
    for family, extra in designs:
        for order in range(1, 9):
            cases.append(case(family, "lowpass", order, [1000.0], extra))
        for order in (1, 2, 3, 4, 5):
            cases.append(case(family, "highpass", order, [250.0], extra))
            cases.append(case(family, "bandpass", order, [300.0, 3400.0], extra))
            cases.append(case(family, "bandstop", order, [45.0, 55.0], extra))
        # Narrow band and a band wide enough that some band poles are real.
        cases.append(case(family, "bandpass", 4, [950.0, 1050.0], extra))
        cases.append(case(family, "bandpass", 3, [20.0, 20000.0], extra))
    for order in (12, 16):
        for norm in ("phase", "mag", "delay"):
            cases.append(case("bessel", "lowpass", order, [1000.0], norm))
        cases.append(case("butter", "lowpass", order, [1000.0], None))
        cases.append(case("cheby1", "lowpass", order, [1000.0], 1.0))
        cases.append(case("cheby2", "lowpass", order, [1000.0], 60.0))
    header = {
        "generated": "do not edit; regenerate with the command",
        "command": COMMAND,
        "tool": f"scipy {scipy.__version__}, numpy {numpy.__version__}, "
        f"python {sys.version.split()[0]}",
        "form": "H(s) = gain * prod(s - zero) / prod(s - pole), s in rad/s, "
        "analog=True, output='zpk'",
    }
    with open(OUT, "w") as f:
        json.dump({"header": header, "cases": cases}, f, indent=1)
        f.write("\n")


if __name__ == "__main__":
    main()
