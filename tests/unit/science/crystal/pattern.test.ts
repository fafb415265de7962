/** Calculated powder patterns: check values and rules from ITC Vol. C (2006) ch. 6.1/6.2, handbook values and textbook crystallography. */
import { describe, expect, it } from "vitest";
import {
  computePattern,
  computePatternDetailed,
  CU_KA1,
  type CifStructure,
  type PatternLine,
} from "@/lib/science/crystal";
import { build, GENERAL_SITES, m3mOperators, testStructure, withCentring } from "./helpers";

const byHkl = (lines: PatternLine[], h: number, k: number, l: number) => {
  const line = lines.find((x) => x.reflections.some((r) => r.h === h && r.k === k && r.l === l));
  if (!line) throw new Error(`no line with ${h} ${k} ${l}`);
  return line;
};
const allReflections = (lines: PatternLine[]) => lines.flatMap((l) => l.reflections);

describe("computed sanity values, not published ones (gemmi's own-halite/own-quartz fixtures agree; Cu Kα1, no monochromator; test B Na 1.6, Cl 1.2, Si 0.6, O 1.0 Å²)", () => {
  it("halite: I(220)/I(200) ≈ 0.60, I(222) ≈ 0.18, I(111) ≈ 0.09", () => {
    const lines = computePattern(testStructure("halite.cif"));
    const i200 = byHkl(lines, 2, 0, 0).intensity;
    expect(i200).toBe(100);
    expect(byHkl(lines, 2, 2, 0).intensity / i200).toBeCloseTo(0.6, 1);
    expect(Math.abs(byHkl(lines, 2, 2, 2).intensity / i200 - 0.18)).toBeLessThan(0.015);
    expect(Math.abs(byHkl(lines, 1, 1, 1).intensity / i200 - 0.09)).toBeLessThan(0.015);
    // Handbook values from memory (NBS Circular 539): d 2.820 (200), 1.994 (220), 1.628 (222)
    expect(byHkl(lines, 2, 0, 0).d).toBeCloseTo(2.82, 2);
    expect(byHkl(lines, 2, 2, 0).d).toBeCloseTo(1.994, 2);
    expect(byHkl(lines, 2, 2, 2).d).toBeCloseTo(1.628, 2);
  });

  it("quartz: I(100)/I(101) ≈ 0.20, I(112) ≈ 0.13; strongest line 101 at d ≈ 3.343 (handbook, from memory)", () => {
    const lines = computePattern(testStructure("quartz.cif"));
    const strongest = lines.reduce((a, b) => (b.intensity > a.intensity ? b : a));
    expect([strongest.h, strongest.k, strongest.l]).toEqual([1, 0, 1]);
    expect(strongest.d).toBeCloseTo(3.343, 2);
    expect(Math.abs(byHkl(lines, 1, 0, 0).intensity / 100 - 0.2)).toBeLessThan(0.015);
    expect(Math.abs(byHkl(lines, 1, 1, 2).intensity / 100 - 0.13)).toBeLessThan(0.015);
  });

  it("corundum: 113, 104, 116 are the three strongest lines, each ≥ 80 (handbook, from memory; order varies)", () => {
    const lines = computePattern(testStructure("corundum.cif"));
    const top3 = [...lines].sort((a, b) => b.intensity - a.intensity).slice(0, 3);
    expect(top3.map((l) => `${l.h}${l.k}${l.l}`).sort()).toEqual(["104", "113", "116"]);
    for (const l of top3) expect(l.intensity).toBeGreaterThanOrEqual(80);
  });

  it("fluorite: calculated 220 ≥ 111 (computed, not a published value); rutile 110 100, 211 ≈ 60, 101 ≈ 50 within ±15 (handbook, from memory)", () => {
    const f = computePattern(testStructure("fluorite.cif"));
    expect(byHkl(f, 2, 2, 0).intensity).toBeGreaterThanOrEqual(byHkl(f, 1, 1, 1).intensity);
    const r = computePattern(testStructure("rutile.cif"));
    expect(byHkl(r, 1, 1, 0).intensity).toBe(100);
    expect(Math.abs(byHkl(r, 2, 1, 1).intensity - 60)).toBeLessThan(15);
    expect(Math.abs(byHkl(r, 1, 0, 1).intensity - 50)).toBeLessThan(15);
  });
});

describe("multiplicities (International Tables Vol. A: m-3m {100} 6, {110} 12, {111} 8, {hk0} 24, {hhl} 24, {hkl} 48; 2/m {hkl} 4, {h0l} 2, {0k0} 2)", () => {
  // CsCl type (Pm-3m), a ≈ 4.12 Å (from memory); 48 operators of m-3m built in the test
  const cscl = build([4.12, 4.12, 4.12, 90, 90, 90], m3mOperators(), [
    { label: "Cs1", x: 0, y: 0, z: 0 },
    { label: "Cl1", x: 0.5, y: 0.5, z: 0.5 },
  ]);
  const lines = computePattern(cscl, { dMin: 0.78 });
  it.each([
    [1, 0, 0, 6],
    [1, 1, 0, 12],
    [1, 1, 1, 8],
    [2, 1, 0, 24],
    [2, 1, 1, 24],
    [3, 2, 1, 48],
  ])("m-3m {%i%i%i} has m = %i", (h, k, l, m) => {
    const line = byHkl(lines, h, k, l);
    expect(line.reflections).toHaveLength(1);
    expect(line.multiplicity).toBe(m);
  });

  it("non-equivalent reflections at the same d form one line: cubic 333 + 511 (m 8 + 24), 300 + 221 (6 + 24)", () => {
    const l511 = byHkl(lines, 5, 1, 1);
    expect(l511.reflections.map((r) => r.multiplicity).sort((a, b) => a - b)).toEqual([8, 24]);
    expect(l511.multiplicity).toBe(32);
    expect(l511.absoluteIntensity).toBeCloseTo(l511.reflections.reduce((s, r) => s + r.intensity, 0), 6);
    expect(byHkl(lines, 3, 0, 0).multiplicity).toBe(30);
  });

  it("monoclinic 2/m (unique axis b)", () => {
    const mono = build([9.7, 8.9, 5.25, 90, 105.8, 90], ["x,y,z", "-x,y,-z", "-x,-y,-z", "x,-y,z"], GENERAL_SITES);
    const ml = computePattern(mono);
    expect(byHkl(ml, 1, 1, 1).multiplicity).toBe(4);
    expect(byHkl(ml, 1, 0, 1).multiplicity).toBe(2);
    expect(byHkl(ml, 0, 1, 0).multiplicity).toBe(2);
    // h0l and -h0l are not equivalent in 2/m: separate lines with different d (β ≠ 90°)
    expect(byHkl(ml, -1, 0, 1).multiplicity).toBe(2);
    expect(byHkl(ml, -1, 0, 1).d).not.toBeCloseTo(byHkl(ml, 1, 0, 1).d, 3);
  });
});

describe("systematic absences emerge from F (centring rules of International Tables Vol. A)", () => {
  const ortho: [number, number, number, number, number, number] = [5.1, 6.3, 7.2, 90, 90, 90];
  const cases: [string, string[], (h: number, k: number, l: number) => boolean, [number, number, number, number, number, number]][] = [
    ["I: h+k+l even", withCentring(["x,y,z"], [["1/2", "1/2", "1/2"]]), (h, k, l) => (h + k + l) % 2 === 0, ortho],
    [
      "F: h, k, l all even or all odd",
      withCentring(["x,y,z"], [["0", "1/2", "1/2"], ["1/2", "0", "1/2"], ["1/2", "1/2", "0"]]),
      (h, k, l) => Math.abs(h % 2) === Math.abs(k % 2) && Math.abs(k % 2) === Math.abs(l % 2),
      ortho,
    ],
    ["C: h+k even", withCentring(["x,y,z"], [["1/2", "1/2", "0"]]), (h, k) => (h + k) % 2 === 0, ortho],
    [
      "R obverse (hexagonal axes): −h+k+l = 3n",
      withCentring(["x,y,z"], [["2/3", "1/3", "1/3"], ["1/3", "2/3", "2/3"]]),
      (h, k, l) => (((-h + k + l) % 3) + 3) % 3 === 0,
      [5.0, 5.0, 13.7, 90, 90, 120],
    ],
  ];
  it.each(cases)("%s", (_name, ops, allowed, cell) => {
    const s = build(cell, ops, GENERAL_SITES);
    const r = computePatternDetailed(s);
    const present = allReflections(r.lines);
    expect(present.length).toBeGreaterThan(20);
    for (const x of present) expect(allowed(x.h, x.k, x.l), `${x.h} ${x.k} ${x.l} should be absent`).toBe(true);
    // the same reflections with the centring removed are present: absences come from F, not from a rule table
    const p1 = computePatternDetailed(build(cell, ["x,y,z"], GENERAL_SITES), { dMin: r.dMin });
    expect(allReflections(p1.lines).length).toBeGreaterThan(present.length);
    expect(r.reflectionClassCount).toBe(p1.reflectionClassCount);
  });

  it("2₁ screw along c: 00l present only for l even", () => {
    const s = build([5.1, 6.3, 7.2, 90, 90, 90], ["x,y,z", "-x,-y,z+1/2"], GENERAL_SITES);
    const refl = allReflections(computePattern(s)).filter((x) => x.h === 0 && x.k === 0);
    expect(refl.map((x) => Math.abs(x.l)).sort((a, b) => a - b)).toEqual([2, 4, 6]);
  });
});

describe("symmetry expansion", () => {
  it("a P1 2×2×2 supercell of halite gives the same lines as the Fm-3m cell (same d, I, m)", () => {
    const halite = testStructure("halite.cif");
    const p1Sites = [];
    for (const base of [
      { label: "Na", x: 0, y: 0, z: 0, b: 1.6 },
      { label: "Cl", x: 0.5, y: 0.5, z: 0.5, b: 1.2 },
    ]) {
      for (const [fx, fy, fz] of [[0, 0, 0], [0, 0.5, 0.5], [0.5, 0, 0.5], [0.5, 0.5, 0]]) {
        for (let i = 0; i < 8; i++) {
          const x = ((base.x + fx) % 1) / 2 + (i & 1 ? 0.5 : 0);
          const y = ((base.y + fy) % 1) / 2 + (i & 2 ? 0.5 : 0);
          const z = ((base.z + fz) % 1) / 2 + (i & 4 ? 0.5 : 0);
          p1Sites.push({ label: `${base.label}${p1Sites.length}`, x, y, z, b: base.b });
        }
      }
    }
    const a = 2 * halite.cell.a;
    const big = build([a, a, a, 90, 90, 90], ["x,y,z"], p1Sites);
    expect(big.sites).toHaveLength(64);
    const ref = computePattern(halite);
    const sup = computePattern(big);
    expect(sup.map((l) => l.d.toFixed(6))).toEqual(ref.map((l) => l.d.toFixed(6)));
    sup.forEach((l, i) => {
      expect(l.intensity).toBeCloseTo(ref[i].intensity, 6);
      expect(l.multiplicity).toBe(ref[i].multiplicity);
      expect([l.h / 2, l.k / 2, l.l / 2].map(Math.abs).sort()).toEqual([ref[i].h, ref[i].k, ref[i].l].map(Math.abs).sort());
    });
  });

  it("mixed occupancy: two sites on one position are both kept; half-occupied sites scale F", () => {
    const ops = ["x,y,z", "-x,-y,-z"];
    const full = computePatternDetailed(build([5, 6, 7, 80, 95, 100], ops, [{ label: "Fe1", x: 0.1, y: 0.2, z: 0.3 }]));
    const split = computePatternDetailed(
      build([5, 6, 7, 80, 95, 100], ops, [
        { label: "Fe1", x: 0.1, y: 0.2, z: 0.3, occ: 0.5 },
        { label: "Fe2", x: 0.1, y: 0.2, z: 0.3, occ: 0.5 },
      ]),
    );
    expect(split.atomCount).toBe(4);
    split.lines.forEach((l, i) => expect(l.absoluteIntensity / full.lines[i].absoluteIntensity).toBeCloseTo(1, 9));
  });
});

describe("geometry and options", () => {
  it("2θ from Bragg's law: d 3.3434 → 26.640° (Cu Kα1), 31.036° (Co Kα1 1.78900) — recomputed from Bragg's law", () => {
    const cube = build([3.3434, 3.3434, 3.3434, 90, 90, 90], ["x,y,z"], [{ label: "Si1", x: 0, y: 0, z: 0 }]);
    expect(byHkl(computePattern(cube), 1, 0, 0).twoTheta).toBeCloseTo(26.64, 3);
    expect(byHkl(computePattern(cube, { wavelength: 1.789 }), 1, 0, 0).twoTheta).toBeCloseTo(31.036, 3);
    expect(CU_KA1).toBe(1.540593);
  });

  it("range: default dMin = λ/(2 sin 45°) for 2θ ≤ 90°, dMax 20 Å; Mo Kα reaches further out in 1/d", () => {
    const q = testStructure("quartz.cif");
    const cu = computePatternDetailed(q);
    expect(cu.dMin).toBeCloseTo(CU_KA1 / (2 * Math.sin(Math.PI / 4)), 12);
    expect(Math.max(...cu.lines.map((l) => l.twoTheta))).toBeLessThanOrEqual(90);
    const mo = computePatternDetailed(q, { wavelength: 0.709317 });
    expect(mo.lines.length).toBeGreaterThan(cu.lines.length);
    const onlyBig = computePattern(q, { dMin: 2, dMax: 4 });
    expect(onlyBig.every((l) => l.d >= 2 && l.d <= 4)).toBe(true);
    expect(onlyBig.map((l) => `${l.h}${l.k}${l.l}`)).toEqual(["101", "110", "102", "111", "200"]);
  });

  it("monochromator changes relative intensities by the polarisation term only", () => {
    const s = testStructure("halite.cif");
    const none = computePattern(s);
    const mono = computePattern(s, { monochromatorTwoTheta: 26.6 });
    const RAD = Math.PI / 180;
    const pol = (tt: number, m?: number) => {
      const c2 = Math.cos(tt * RAD) ** 2;
      if (m === undefined) return 1 + c2;
      const cm = Math.cos(m * RAD) ** 2;
      return (1 + cm * c2) / (1 + cm);
    };
    const ref = none.find((l) => l.intensity === 100)!;
    for (const [i, l] of mono.entries()) {
      const expected = (none[i].intensity / pol(none[i].twoTheta)) * pol(l.twoTheta, 26.6) / (pol(ref.twoTheta, 26.6) / pol(ref.twoTheta));
      expect(l.intensity).toBeCloseTo(expected, 6);
    }
  });

  it("March–Dollase along 001: a line parallel to the direction scales by r⁻³ (Dollase 1986)", () => {
    const s = testStructure("rutile.cif");
    const random = computePattern(s);
    const platy = computePattern(s, { preferredOrientation: { h: 0, k: 0, l: 1, r: 0.8 } });
    const abs = (lines: PatternLine[], h: number, k: number, l: number) => byHkl(lines, h, k, l).absoluteIntensity;
    expect(abs(platy, 0, 0, 2) / abs(random, 0, 0, 2)).toBeCloseTo(0.8 ** -3, 9);
    // lines perpendicular to 001 scale by r^(3/2)
    expect(abs(platy, 1, 1, 0) / abs(random, 1, 1, 0)).toBeCloseTo(0.8 ** 1.5, 9);
    const none = computePattern(s, { preferredOrientation: { h: 0, k: 0, l: 1, r: 1 } });
    expect(none.map((l) => l.intensity)).toEqual(random.map((l) => l.intensity));
  });

  it("rejects invalid options with RangeError", () => {
    const s = testStructure("quartz.cif");
    expect(() => computePattern(s, { wavelength: 0 })).toThrow(RangeError);
    expect(() => computePattern(s, { twoThetaMax: 190 })).toThrow(/twoThetaMax/);
    expect(() => computePattern(s, { dMin: 3, dMax: 2 })).toThrow(/dMax/);
    expect(() => computePattern(s, { preferredOrientation: { h: 0, k: 0, l: 0, r: 0.8 } })).toThrow(/not all zero/);
    expect(() => computePattern(s, { preferredOrientation: { h: 0, k: 0, l: 1, r: -1 } })).toThrow(/r must be > 0/);
    const warned = computePatternDetailed(s, { dMin: 0.1 });
    expect(warned.dMin).toBeCloseTo(CU_KA1 / 2, 12);
    expect(warned.warnings.join(" ")).toMatch(/below λ\/2/);
  });

  it("flags a cell that does not fit the operators", () => {
    const bad: CifStructure = { ...testStructure("halite.cif") };
    bad.cell = { ...bad.cell, b: bad.cell.a * 1.01 };
    expect(computePatternDetailed(bad).warnings.join(" ")).toMatch(/not consistent with the symmetry operators/);
  });

  it("lines are sorted by d descending, strongest = 100, minIntensity filters", () => {
    const lines = computePattern(testStructure("corundum.cif"), { minIntensity: 5 });
    for (let i = 1; i < lines.length; i++) expect(lines[i].d).toBeLessThan(lines[i - 1].d);
    expect(Math.max(...lines.map((l) => l.intensity))).toBe(100);
    expect(Math.min(...lines.map((l) => l.intensity))).toBeGreaterThanOrEqual(5);
  });
});
