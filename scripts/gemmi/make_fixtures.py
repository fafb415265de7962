#!/usr/bin/python3
"""Independent reference patterns computed with gemmi, for the crystal-module tests.

Rerun (from the repository root, with Debian's python3-gemmi 0.5.7 and python3-numpy, which gemmi needs for
make_miller_array but does not pull in; NOT a pyenv/venv python):

    /usr/bin/python3 scripts/gemmi/make_fixtures.py            # all CIFs
    /usr/bin/python3 scripts/gemmi/make_fixtures.py quartz     # only CIFs whose name contains "quartz"

Inputs: lib/science/minerals/cif/*.cif and tests/fixtures/gemmi/cif/*.cif.
Outputs: tests/fixtures/gemmi/<name>.json (mineral CIFs) and tests/fixtures/gemmi/own-<name>.json (test CIFs),
plus tests/fixtures/gemmi/index.json (what was written or skipped, and why).

What gemmi does here (and our TypeScript code does not share):
  * reads the CIF (gemmi.cif + gemmi.make_small_structure_from_block: cell, sites, type symbols/charges, U/B),
  * parses the operator strings (gemmi.Op) and finds the space group from them (gemmi.find_spacegroup_by_ops),
  * enumerates every reflection in the d shell (gemmi.make_miller_array, unique=False),
  * d-spacings (UnitCell.calculate_d) and structure factors (StructureFactorCalculatorX, IT92 coefficients,
    isotropic Debye-Waller factor, no anomalous addends).
Conventions matched to ours on purpose (so that differences mean bugs, not choices):
  * U_eq from the anisotropic U (UnitCell.calculate_u_eq) replaces U_iso, anisotropy dropped;
  * sites without any displacement parameter get B = 0.5 A^2;
  * occupancies divided by the number of coincident images within 0.05 A (change_occupancies_to_crystallographic);
  * Cu Ka1 = 1.540593 A, 2theta <= 90 deg, d <= 20 A; Lp = (1 + cos^2 2theta) / (sin^2 theta cos theta);
  * every hkl of the full sphere is one term, so multiplicity is simply the count of hkl at that d; reflections
    within 1e-5 relative in d form one line; |F|^2 < 1e-6 max is absent.
Each fixture keeps the strongest 15 lines (d, a representative hkl, I/I100, multiplicity) and
"complete_above": every line stronger than this is in the list; plus the cell volume (A^3), the cell-content
mass W (g/mol, gemmi's atomic weights) and the absolute m|F|^2 Lp of the strongest line, for the RIR check.
"""
import glob
import hashlib
import json
import math
import os
import sys

import gemmi

ROOT = os.path.abspath(os.path.join(os.path.dirname(__file__), "..", ".."))
OUT = os.path.join(ROOT, "tests/fixtures/gemmi")
WAVELENGTH = 1.540593
TWO_THETA_MAX = 90.0
D_MAX = 20.0
DEFAULT_B = 0.5
SITE_TOL = 0.05
COINCIDENCE = 1e-5
ABSENT = 1e-6
N_LINES = 15
SYMOP_TAGS = ["_space_group_symop_operation_xyz", "_symmetry_equiv_pos_as_xyz"]


def label_score(hkl):
    nn = sum(1 for v in hkl if v >= 0)
    return (nn, hkl[2] >= 0, hkl[1] >= 0, hkl[0] >= 0, hkl[0], hkl[1], hkl[2])


def pick_block(doc):
    for b in doc:
        if b.find_values("_atom_site_fract_x"):
            return b
    raise ValueError("no block with _atom_site_fract_x")


def is_null(v):
    return v in ("?", ".")


def ops_from_block(block):
    for tag in SYMOP_TAGS:
        vals = [gemmi.cif.as_string(v) for v in block.find_values(tag) if not is_null(v)]
        if vals:
            return [gemmi.Op(v) for v in vals]
    return None


def rows_without_adp(block):
    """Labels of sites with neither U_iso/B_iso value nor an aniso row."""
    labels = [gemmi.cif.as_string(v) for v in block.find_values("_atom_site_label")]
    u = list(block.find_values("_atom_site_U_iso_or_equiv"))
    b = list(block.find_values("_atom_site_B_iso_or_equiv"))
    aniso = {gemmi.cif.as_string(v) for v in block.find_values("_atom_site_aniso_label")}
    out = set()
    for i, lab in enumerate(labels):
        has_u = i < len(u) and not is_null(u[i])
        has_b = i < len(b) and not is_null(b[i])
        if not has_u and not has_b and lab not in aniso:
            out.add(lab)
    return out


def compute(path):
    text = open(path, "rb").read()
    doc = gemmi.cif.read(path)
    block = pick_block(doc)
    st = gemmi.make_small_structure_from_block(block)
    unknown = [site.label for site in st.sites if site.element.name == "X"]
    if unknown:  # gemmi would silently use its dummy-atom entry
        raise ValueError("no element recognised for site(s) %s" % ", ".join(unknown))
    ops = ops_from_block(block)
    if ops is None:
        if st.spacegroup_hm.replace(" ", "").upper() != "P1":
            raise ValueError("no symmetry operators")
        ops = [gemmi.Op("x,y,z")]
    sg = gemmi.find_spacegroup_by_ops(gemmi.GroupOps(ops))
    if sg is None:
        raise ValueError("gemmi finds no space group for the listed operators")
    st.spacegroup_hm = sg.xhm()
    st.setup_cell_images()

    no_adp = rows_without_adp(block)
    for i in range(len(st.sites)):
        site = st.sites[i]
        if site.aniso.nonzero():
            site.u_iso = st.cell.calculate_u_eq(site.aniso)
            site.aniso = gemmi.SMat33d(0, 0, 0, 0, 0, 0)
        elif site.label in no_adp:
            site.u_iso = DEFAULT_B / (8 * math.pi ** 2)
    st.change_occupancies_to_crystallographic(SITE_TOL)

    dmin = WAVELENGTH / (2 * math.sin(math.radians(TWO_THETA_MAX / 2)))
    hkls = gemmi.make_miller_array(st.cell, sg, dmin, D_MAX, False)
    calc = gemmi.StructureFactorCalculatorX(st.cell)
    refl = []
    for h in hkls:
        hkl = [int(h[0]), int(h[1]), int(h[2])]
        d = st.cell.calculate_d(hkl)
        if d < dmin * (1 - 1e-12) or d > D_MAX:
            continue
        f = calc.calculate_sf_from_small_structure(st, hkl)
        refl.append((d, hkl, abs(f) ** 2))
    f2max = max(r[2] for r in refl)
    refl = [r for r in refl if r[2] >= ABSENT * f2max]
    refl.sort(key=lambda r: -r[0])

    lines = []
    i = 0
    while i < len(refl):
        d0 = refl[i][0]
        j = i
        while j < len(refl) and (d0 - refl[j][0]) / d0 <= COINCIDENCE:
            j += 1
        group = refl[i:j]
        theta = math.asin(WAVELENGTH / (2 * d0))
        lp = (1 + math.cos(2 * theta) ** 2) / (math.sin(theta) ** 2 * math.cos(theta))
        inten = sum(r[2] for r in group) * lp
        rep = max(group, key=lambda r: label_score(r[1]))
        lines.append({"d": rep[0], "hkl": rep[1], "multiplicity": len(group), "I": inten})
        i = j
    imax = max(l["I"] for l in lines)
    # absolute scale for the RIR check: m|F|^2 Lp of the strongest line per (V * W), W = mass of the cell contents
    order = len(st.cell.images) + 1
    cell_mass = sum(site.occ * order * site.element.weight for site in st.sites)
    for l in lines:
        l["I"] = 100 * l["I"] / imax
    strongest = sorted(lines, key=lambda l: -l["I"])
    kept = strongest[:N_LINES]
    complete_above = strongest[N_LINES]["I"] if len(strongest) > N_LINES else 0.0
    return {
        "cif": os.path.relpath(path, ROOT),
        "cif_sha256": hashlib.sha256(text).hexdigest(),
        "block": block.name,
        "spacegroup": sg.xhm(),
        "generator": "gemmi %s via scripts/gemmi/make_fixtures.py" % gemmi.__version__,
        "wavelength": WAVELENGTH,
        "two_theta_max": TWO_THETA_MAX,
        "d_max": D_MAX,
        "line_count": len(lines),
        "complete_above": round(complete_above, 4),
        "volume": st.cell.volume,
        "cell_mass": cell_mass,
        "strongest_absolute": imax,
        "lines": [
            {"d": round(l["d"], 6), "hkl": l["hkl"], "I": round(l["I"], 3), "multiplicity": l["multiplicity"]}
            for l in sorted(kept, key=lambda l: -l["d"])
        ],
    }


def main():
    only = sys.argv[1] if len(sys.argv) > 1 else None
    sources = [(p, "") for p in sorted(glob.glob(os.path.join(ROOT, "lib/science/minerals/cif/*.cif")))]
    sources += [(p, "own-") for p in sorted(glob.glob(os.path.join(OUT, "cif/*.cif")))]
    index_path = os.path.join(OUT, "index.json")
    index = json.load(open(index_path)) if os.path.exists(index_path) and only else {"written": {}, "skipped": {}}
    for path, prefix in sources:
        name = prefix + os.path.splitext(os.path.basename(path))[0]
        if only and only not in name:
            continue
        try:
            fx = compute(path)
        except Exception as e:  # record and go on: one bad CIF must not stop the rest
            index["skipped"][name] = str(e)
            index["written"].pop(name, None)
            stale = os.path.join(OUT, name + ".json")
            if os.path.exists(stale):
                os.remove(stale)
            print("skip", name, "-", e)
            continue
        with open(os.path.join(OUT, name + ".json"), "w") as f:
            json.dump(fx, f, indent=1)
            f.write("\n")
        index["written"][name] = fx["cif"]
        index["skipped"].pop(name, None)
        print("wrote", name, fx["spacegroup"], fx["line_count"], "lines")
    if not only:  # drop fixtures whose mineral CIF was removed or renamed
        current = {prefix + os.path.splitext(os.path.basename(p))[0] for p, prefix in sources}
        for f in glob.glob(os.path.join(OUT, "*.json")):
            name = os.path.splitext(os.path.basename(f))[0]
            if name not in ("index", "elements") and name not in current:
                os.remove(f)
                print("removed stale", name)
    index["generator"] = "gemmi %s via scripts/gemmi/make_fixtures.py" % gemmi.__version__
    with open(index_path, "w") as f:
        json.dump(index, f, indent=1, sort_keys=True)
        f.write("\n")


if __name__ == "__main__":
    main()
