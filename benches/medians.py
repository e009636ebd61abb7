"""Prints the median time and throughput of every criterion benchmark, one line each.

criterion's summary line (`time: [low estimate high]`) gives the mean under the flat
sampling these benches use; we quote medians. criterion keeps them in
<target>/criterion/<id>/new/estimates.json (nanoseconds per iteration), beside
benchmark.json (the full id and the elements per iteration, if any). <target> is
$CARGO_TARGET_DIR when set, else the repository's target folder, as for `cargo bench`.
Each line is the latest run of that benchmark: a filtered run leaves the others'
older results in place.

Run: python3 benches/medians.py [FILTER]   (after `cargo bench --bench NAME`)
FILTER keeps the ids that contain it, e.g. `engines`, `wav/write` or `tonewright_q15`.
Standard library only.
"""
import json
import os
import sys
from pathlib import Path

TIME_UNITS = [(1, "ns"), (1e3, "µs"), (1e6, "ms"), (1e9, "s")]
RATE_UNITS = [(1, "elements/s"), (1e3, "K elements/s"), (1e6, "M elements/s"), (1e9, "G elements/s")]


def scaled(value, units):
    """`value` divided by the largest factor of `units` (ascending) that it reaches."""
    factor, unit = units[0]
    for f, u in units:
        if value >= f:
            factor, unit = f, u
    return f"{value / factor:.4g} {unit}"


def elements(throughput):
    """Elements per iteration, or None without a throughput or with one in bytes or bits."""
    throughput = throughput or {}
    if "ElementsAndBytes" in throughput:
        return throughput["ElementsAndBytes"]["elements"]
    return throughput.get("Elements")


def main():
    target = Path(os.environ.get("CARGO_TARGET_DIR") or Path(__file__).parent.parent / "target")
    wanted = sys.argv[1] if len(sys.argv) > 1 else ""
    rows = []
    for estimates in (target / "criterion").glob("**/new/estimates.json"):
        bench = json.loads((estimates.parent / "benchmark.json").read_text())
        if wanted in bench["full_id"]:
            median_ns = json.loads(estimates.read_text())["median"]["point_estimate"]
            rows.append((bench["full_id"], median_ns, elements(bench["throughput"])))
    if not rows:
        sys.exit(f"no criterion results matching {wanted!r} under {target / 'criterion'}")
    width = max(len(full_id) for full_id, _, _ in rows)
    for full_id, median_ns, count in sorted(rows):
        line = f"{full_id:<{width}}  median {scaled(median_ns, TIME_UNITS):>9}"
        if count is not None:
            line += f"  {scaled(count / median_ns * 1e9, RATE_UNITS)}"
        print(line)


if __name__ == "__main__":
    main()
