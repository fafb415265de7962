#!/usr/bin/python3
"""Crystal-chemical sanity check of a reference CIF with gemmi (Debian python3-gemmi and python3-numpy; NOT a
pyenv/venv python).

    /usr/bin/python3 scripts/gemmi/check_structure.py lib/science/minerals/cif/gypsum.cif [more.cif ...]

Prints, for each CIF: cell volume, cell contents per formula unit (from the sites, occupancy-weighted, after
symmetry expansion), calculated density, the cation-anion distances of every cation site up to 3.0 A (Si-O about
1.61-1.63 A, Al-O 1.74-1.76 A tetrahedral, 1.90-1.95 A octahedral, Mg/Fe-O 2.05-2.15 A, Ca-O 2.3-2.6 A, S-O 1.47 A in
sulfate: Baur 1974, Shannon 1976 radii), and the strongest powder lines for Cu Ka1 (2theta <= 100 deg) with d and
I/I100. It only reports: comparing with a handbook is the reader's job (the vitest files do it for the tests).
"""
import math
import sys

import gemmi

WAVELENGTH = 1.540593
ANIONS = {"O", "S", "As", "F", "Cl"}
TRANSLATIONS = [(i, j, k) for i in (-1, 0, 1) for j in (-1, 0, 1) for k in (-1, 0, 1)]
CATION_ANION = {("S", "O"), ("C", "O"), ("Fe", "S"), ("Fe", "As"), ("As", "S")}


def structure(path):
    doc = gemmi.cif.read(path)
    block = next(b for b in doc if b.find_values("_atom_site_fract_x"))
    st = gemmi.make_small_structure_from_block(block)
    ops = [gemmi.Op(gemmi.cif.as_string(v)) for v in block.find_values("_space_group_symop_operation_xyz")]
    if ops:
        sg = gemmi.find_spacegroup_by_ops(gemmi.GroupOps(ops))
        st.spacegroup_hm = sg.xhm()
    st.setup_cell_images()
    return block, st


def main(paths):
    for path in paths:
        block, st = structure(path)
        z = float(gemmi.cif.as_number(block.find_value("_cell_formula_units_Z") or "1"))
        print("==", path, st.spacegroup_hm, "V = %.2f A^3" % st.cell.volume, "Z =", z)
        counts = {}
        mass = 0.0
        for site in st.get_all_unit_cell_sites():
            counts[site.element.name] = counts.get(site.element.name, 0.0) + site.occ
            mass += site.occ * site.element.weight
        print("   per formula unit:", " ".join("%s%.3g" % (e, n / z) for e, n in sorted(counts.items())))
        print("   density (sites only) %.3f g/cm3" % (mass / (0.602214076 * st.cell.volume)))
        images = st.get_all_unit_cell_sites()
        for site in st.sites:
            el = site.element.name
            if (el in ANIONS and el not in ("As", "S")) or el == "H":
                continue
            dists = []
            for other in images:
                oel = other.element.name
                if not (oel == "O" or (el, oel) in CATION_ANION):
                    continue
                for t in TRANSLATIONS:
                    f = gemmi.Fractional(other.fract.x + t[0] - site.fract.x, other.fract.y + t[1] - site.fract.y, other.fract.z + t[2] - site.fract.z)
                    d = st.cell.orthogonalize(f).length()
                    if 0.1 < d <= 3.0:
                        dists.append(round(d, 3))
            dists.sort()
            if dists:
                short = [d for d in dists if d < (2.2 if el in ("Si", "Al", "S", "C", "P") else 2.9)]
                mean = sum(short) / len(short) if short else float("nan")
                print("   %-6s %-2s n=%d mean %.3f  %s" % (site.label, el, len(short), mean, " ".join("%.3f" % d for d in dists[:10])))
        calc = gemmi.StructureFactorCalculatorX(st.cell)
        dmin = WAVELENGTH / (2 * math.sin(math.radians(50)))
        hkls = gemmi.make_miller_array(st.cell, st.find_spacegroup(), dmin, 0, unique=False) if hasattr(gemmi, "make_miller_array") else []
        st.change_occupancies_to_crystallographic(0.05)
        lines = {}
        for h in hkls:
            hkl = [int(v) for v in h]
            d = st.cell.calculate_d(hkl)
            if d > 20:
                continue
            f = calc.calculate_sf_from_small_structure(st, hkl)
            th = math.asin(WAVELENGTH / (2 * d))
            lp = (1 + math.cos(2 * th) ** 2) / (math.sin(th) ** 2 * math.cos(th))
            key = round(d, 4)
            lines[key] = lines.get(key, 0.0) + abs(f) ** 2 * lp
        top = max(lines.values()) if lines else 1
        strong = sorted(((d, 100 * i / top) for d, i in lines.items() if 100 * i / top >= 8), key=lambda x: -x[1])[:14]
        print("   strongest lines:", ", ".join("%.3f(%d)" % (d, round(i)) for d, i in sorted(strong, key=lambda x: -x[0])))


if __name__ == "__main__":
    main(sys.argv[1:])
