#!/usr/bin/python3
"""Export IT92 four-Gaussian X-ray scattering-factor coefficients to JSON.

Rerun (from the repository root, with Debian's python3-gemmi):

    /usr/bin/python3 scripts/gemmi/export_it92.py

Writes lib/science/crystal/data/it92.json (neutral atoms H..Cf) and
tests/fixtures/gemmi/elements.json (gemmi's atomic weights, used only as an
independent cross-check of our own atomic-weight table).

Source of the numbers: International Tables for Crystallography Vol. C,
Table 6.1.1.4 (1992 and later editions; Cromer-Mann style
f(s) = sum_i a_i exp(-b_i s^2) + c, s = sin(theta)/lambda, valid to s ~ 2 1/A),
as distributed with gemmi (gemmi/it92.hpp; same data as CCP4 atomsf.lib and
cctbx "it1992"). gemmi keeps one entry per element (neutral atoms); the ions of
the original table are not in gemmi 0.5.x, so none are exported.
"""
import json
import os

import gemmi

ROOT = os.path.abspath(os.path.join(os.path.dirname(__file__), "..", ".."))


def dump_one_line_per_key(out: dict) -> str:
    """JSON with one element per line, so diffs stay readable."""
    head = {k: v for k, v in out.items() if k != "elements"}
    lines = ["{"]
    for k, v in head.items():
        lines.append("  %s: %s," % (json.dumps(k), json.dumps(v)))
    lines.append('  "elements": {')
    items = list(out["elements"].items())
    for i, (sym, row) in enumerate(items):
        comma = "," if i < len(items) - 1 else ""
        lines.append("    %s: %s%s" % (json.dumps(sym), json.dumps(row), comma))
    lines.append("  }")
    lines.append("}")
    return "\n".join(lines) + "\n"


def main() -> None:
    coefs = {}
    weights = {}
    for z in range(1, 99):  # H .. Cf: the elements gemmi's IT92 table covers
        el = gemmi.Element(z)
        c = el.it92.get_coefs()
        coefs[el.name] = [z] + list(c)
        weights[el.name] = el.weight
    out = {
        "source": "International Tables for Crystallography Vol. C, Table 6.1.1.4 (IT92), "
        "four Gaussians + constant, neutral atoms; taken through gemmi %s (gemmi/it92.hpp) "
        "by scripts/gemmi/export_it92.py" % gemmi.__version__,
        "layout": "symbol: [Z, a1, a2, a3, a4, b1, b2, b3, b4, c]",
        "formula": "f(s) = a1 exp(-b1 s^2) + a2 exp(-b2 s^2) + a3 exp(-b3 s^2) + a4 exp(-b4 s^2) + c, "
        "s = sin(theta)/lambda in 1/angstrom, valid for s < 2",
        "elements": coefs,
    }
    path = os.path.join(ROOT, "lib/science/crystal/data/it92.json")
    with open(path, "w") as f:
        f.write(dump_one_line_per_key(out))
    wpath = os.path.join(ROOT, "tests/fixtures/gemmi/elements.json")
    with open(wpath, "w") as f:
        json.dump(
            {"source": "gemmi %s Element.weight (gemmi/elem.hpp)" % gemmi.__version__, "weights": weights},
            f,
            indent=1,
        )
        f.write("\n")
    print("wrote", len(coefs), "elements")


if __name__ == "__main__":
    main()
