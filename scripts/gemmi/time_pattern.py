#!/usr/bin/python3
"""Time gemmi on the same powder-pattern computation as lib/science/crystal computePattern.

    /usr/bin/python3 scripts/gemmi/time_pattern.py path/to/structure.cif [repeats]

Prints one line: "<milliseconds> ms" — the best of `repeats` runs (default 5) of the steps of
scripts/gemmi/make_fixtures.py: reading and parsing the CIF (file in the OS cache after the warm-up run),
enumerating all reflections to 2theta = 90 deg (Cu Ka1), structure factors, Lp and merging lines. Compare with
parseCif + computePattern on the CIF text.
"""
import os
import sys
import time

sys.path.insert(0, os.path.dirname(os.path.abspath(__file__)))
import make_fixtures  # noqa: E402


def main():
    if len(sys.argv) < 2:
        sys.exit("usage: time_pattern.py <file.cif> [repeats]")
    path = sys.argv[1]
    repeats = int(sys.argv[2]) if len(sys.argv) > 2 else 5
    make_fixtures.compute(path)  # warm-up, and fail early on an unusable CIF
    best = float("inf")
    for _ in range(repeats):
        t0 = time.perf_counter()
        make_fixtures.compute(path)
        best = min(best, time.perf_counter() - t0)
    print("%.2f ms" % (best * 1000))


if __name__ == "__main__":
    main()
