"""Exact H(jw) of small circuits by symbolic nodal analysis, as reference data.

Writes tests/reference/circuits.json next to this file. Every part value is used as
the exact rational number equal to the float stored in the JSON, so the Rust side
reads the same circuit that was solved here. H(s) is found with s symbolic and
rational arithmetic, then evaluated at s = j*2*pi*f with 30 significant digits.

This formulation is independent of the Rust solver: inductors are admittances
1/(sL), and wires (0-ohm resistors), op-amps, amps and the source are constraint rows.

Run: python3 tests/reference/circuits.py
"""

import hashlib
import json
import math
import os
import sys
from fractions import Fraction

import sympy as sp

S = sp.Symbol("s")
FREQS_HZ = [10.0 * 2400.0 ** (k / 59) for k in range(60)]  # 10 Hz .. 24 kHz, log-spaced


def exact(x):
    return sp.Rational(Fraction(x))


def audio_taper(pos):
    """Fraction of the track between end A and the wiper: 10 % at mid travel."""
    return (81.0**pos - 1.0) / 80.0


def pot(label, total, end_a, wiper, end_b, pos):
    """A pot as two resistors whose values sum to the total (0 is a wire)."""
    upper = total * audio_taper(pos)
    lower = total - upper
    return [
        {"label": f"{label} (a-w)", "kind": "r", "value": upper, "nodes": [end_a, wiper]},
        {"label": f"{label} (w-b)", "kind": "r", "value": lower, "nodes": [wiper, end_b]},
    ]


def part(label, kind, value, *nodes):
    return {"label": label, "kind": kind, "value": value, "nodes": list(nodes)}


def opamp(label, plus, minus, out):
    return {"label": label, "kind": "opamp", "value": None, "nodes": [plus, minus, out]}


def transfer(parts, inp, out):
    """H(s) = V(out)/V(inp) by modified nodal analysis, as a cancelled rational function."""
    names = []
    for p in parts:
        for n in p["nodes"]:
            if n != "gnd" and n not in names:
                names.append(n)
    index = {n: i for i, n in enumerate(names)}
    size = len(names)
    rows = {}

    def add(r, c, v):
        rows[(r, c)] = rows.get((r, c), 0) + v

    def admittance(a, b, y):
        for p_, q_, sign in ((a, a, 1), (b, b, 1), (a, b, -1), (b, a, -1)):
            if p_ != "gnd" and q_ != "gnd":
                add(index[p_], index[q_], sign * y)

    # Constraint rows, each with a current unknown: (node the current leaves, node it
    # enters, equation {node: coefficient} = rhs).
    extra = [(inp, "gnd", {inp: 1}, 1)]  # the source: v(inp) = 1
    for p in parts:
        kind, nodes = p["kind"], p["nodes"]
        if kind == "r" and p["value"] == 0:
            extra.append((nodes[0], nodes[1], {nodes[0]: 1, nodes[1]: -1}, 0))
        elif kind == "r":
            admittance(nodes[0], nodes[1], 1 / exact(p["value"]))
        elif kind == "c":
            admittance(nodes[0], nodes[1], S * exact(p["value"]))
        elif kind == "l":
            admittance(nodes[0], nodes[1], 1 / (S * exact(p["value"])))
        elif kind == "opamp":
            plus, minus, o = nodes
            extra.append((o, "gnd", {plus: 1, minus: -1}, 0))
        elif kind == "amp":
            i, o = nodes
            extra.append((o, "gnd", {o: 1, i: -exact(p["value"])}, 0))
        else:
            raise ValueError(kind)
    n = size + len(extra)
    b = sp.zeros(n, 1)
    for k, (leaves, enters, equation, rhs) in enumerate(extra):
        col = size + k
        if leaves != "gnd":
            add(index[leaves], col, 1)
        if enters != "gnd":
            add(index[enters], col, -1)
        for node, coef in equation.items():
            if node != "gnd":
                add(col, index[node], coef)
        b[col] = rhs
    m = sp.zeros(n, n)
    for (r, c), v in rows.items():
        m[r, c] = v
    x = m.LUsolve(b)
    return sp.cancel(sp.together(x[index[out]]))


def response(h):
    mags, phases = [], []
    for f in FREQS_HZ:
        v = complex(sp.N(h.subs(S, sp.I * 2 * sp.pi * exact(f)), 30))
        mags.append(abs(v))
        phases.append(math.degrees(math.atan2(v.imag, v.real)))
    return mags, phases


def circuits():
    out = []
    r, c = 15e3, 6.8e-9
    out.append(("rc_ladder_two_sections", [
        part("r1", "r", r, "in", "a"), part("c1", "c", c, "a", "gnd"),
        part("r2", "r", r, "a", "out"), part("c2", "c", c, "out", "gnd"),
    ]))
    out.append(("series_rlc_bandpass", [
        part("l1", "l", 33e-3, "in", "a"), part("c1", "c", 100e-9, "a", "out"),
        part("r1", "r", 220.0, "out", "gnd"),
    ]))
    r, c = 16e3, 10e-9
    out.append(("twin_t_notch", [
        part("r1", "r", r, "in", "a"), part("r2", "r", r, "a", "out"),
        part("c3", "c", 2 * c, "a", "gnd"),
        part("c1", "c", c, "in", "b"), part("c2", "c", c, "b", "out"),
        part("r3", "r", r / 2, "b", "gnd"),
    ]))
    out.append(("sallen_key_unity_lowpass", [
        part("r1", "r", 12e3, "in", "a"), part("r2", "r", 33e3, "a", "b"),
        part("c1 (feedback)", "c", 22e-9, "a", "out"),
        part("c2 (to ground)", "c", 4.7e-9, "b", "gnd"),
        opamp("u1", "b", "out", "out"),
    ]))
    out.append(("multiple_feedback_bandpass", [
        part("r1", "r", 22e3, "in", "a"), part("r2", "r", 1.5e3, "a", "gnd"),
        part("c1", "c", 6.8e-9, "a", "m"), part("c2", "c", 6.8e-9, "a", "out"),
        part("r3", "r", 180e3, "m", "out"), opamp("u1", "gnd", "m", "out"),
    ]))
    out.append(("inverting_summer_band_reject", [
        part("r_lp", "r", 10e3, "in", "a"), part("c_lp", "c", 47e-9, "a", "gnd"),
        part("c_hp", "c", 2.2e-9, "in", "b"), part("r_hp", "r", 15e3, "b", "gnd"),
        part("r_sum_a", "r", 22e3, "a", "m"), part("r_sum_b", "r", 22e3, "b", "m"),
        part("r_fb", "r", 22e3, "m", "out"), opamp("u1", "gnd", "m", "out"),
    ]))
    for tone, body in ((0.0, 0.5), (0.5, 1.0), (0.8, 0.25)):
        out.append((f"passive_two_knob_tone_{tone:.2f}_{body:.2f}", [
            part("c_hi", "c", 2.2e-9, "in", "hi"),
            part("r_lo", "r", 39e3, "in", "lo"), part("c_lo", "c", 56e-9, "lo", "gnd"),
            *pot("tone", 250e3, "hi", "out", "lo", tone),
            *pot("body", 50e3, "out", "bw", "gnd", body),
            part("c_body", "c", 10e-9, "bw", "gnd"),
            part("r_load", "r", 1e6, "out", "gnd"),
        ]))
    out.append(("negative_feedback_bass_treble", [
        part("r_in", "r", 10e3, "in", "b1"),
        *pot("bass", 100e3, "b1", "bw", "b2", 0.5),
        part("c_b1", "c", 47e-9, "b1", "bw"), part("c_b2", "c", 47e-9, "bw", "b2"),
        part("r_out", "r", 10e3, "b2", "out"), part("r_bw", "r", 3.3e3, "bw", "m"),
        part("c_t1", "c", 4.7e-9, "in", "t1"),
        *pot("treble", 100e3, "t1", "tw", "t2", 0.5),
        part("c_t2", "c", 4.7e-9, "t2", "out"), part("r_tw", "r", 1.5e3, "tw", "m"),
        opamp("u1", "gnd", "m", "out"),
    ]))
    out.append(("lc_lowpass_loaded", [
        part("r_src", "r", 600.0, "in", "a"), part("l1", "l", 82e-3, "a", "out"),
        part("c1", "c", 47e-9, "out", "gnd"), part("r_load", "r", 10e3, "out", "gnd"),
    ]))
    out.append(("amp_between_rc_sections_with_feedback", [
        part("r1", "r", 10e3, "in", "a"), part("c1", "c", 15e-9, "a", "gnd"),
        part("x1", "amp", 2.5, "a", "b"),
        part("c2", "c", 4.7e-9, "b", "out"), part("r2", "r", 47e3, "out", "gnd"),
        part("x2", "amp", -0.5, "out", "d"), part("r_fb", "r", 100e3, "d", "a"),
    ]))
    return out


def main():
    here = os.path.dirname(os.path.abspath(__file__))
    records = []
    for name, parts in circuits():
        h = transfer(parts, "in", "out")
        num, den = sp.fraction(h)
        poles = [complex(p) for p in sp.Poly(den, S).nroots(n=20)]
        mags, phases = response(h)
        records.append({
            "name": name,
            "input": "in",
            "output": "out",
            "parts": parts,
            "degree_num": int(sp.degree(num, S)),
            "degree_den": int(sp.degree(den, S)),
            "stable": all(p.real < 0 for p in poles),
            "frequencies_hz": FREQS_HZ,
            "magnitude": mags,
            "phase_deg": phases,
        })
        print(f"{name}: H(s) degree {sp.degree(num, S)}/{sp.degree(den, S)}", file=sys.stderr)
    doc = {
        "header": "generated: do not edit",
        "tool": f"sympy {sp.__version__}, python {sys.version.split()[0]}",
        "command": "python3 tests/reference/circuits.py",
        "script_sha256": hashlib.sha256(open(__file__, "rb").read()).hexdigest(),
        "method": "exact rational modified nodal analysis, H(j*2*pi*f) evaluated to 30 digits",
        "phase": "degrees, atan2 of H(j*2*pi*f), in (-180, 180]",
        "circuits": records,
    }
    with open(os.path.join(here, "circuits.json"), "w") as fh:
        json.dump(doc, fh, indent=1)
        fh.write("\n")


if __name__ == "__main__":
    main()
