/**
 * Whole-pattern fit data of the shipped library (cellVolume, cellMass, absoluteScale, texture, broadening,
 * variable001): exported by scripts/build-reference-library.ts, carried into ReferencePattern and into the
 * reference_phases rows. Oracles: gemmi (Debian python3-gemmi 0.5.7) fixtures for V and the absolute m|F|²Lp of the
 * strongest line; Chung (1974, J. Appl. Cryst. 7, 519) for the RIR relation between the absolute scale and V·ZM;
 * handbook formula weights × Z (Anthony et al., Handbook of Mineralogy) for ZM.
 */
import { existsSync, readFileSync, readdirSync } from "node:fs";
import { createHash } from "node:crypto";
import { join } from "node:path";
import { describe, expect, test } from "vitest";
import { libraryPhaseRow } from "@/db/seed/reference-library";
import { patternFromRow } from "@/lib/jobs/reference-library";
import { parseCif, unitCellMass } from "@/lib/science/crystal";
import { LIBRARY_FILE, LIBRARY_PHASES, findLibraryPhase, findReferencePattern } from "@/lib/science/minerals";
import { fitDataOf, lithodexComments, omittedHydrogenMass } from "@/lib/science/minerals/cif-metadata";

const GEMMI = join(process.cwd(), "tests/fixtures/gemmi");
interface Fixture {
  cif: string;
  cif_sha256: string;
  volume: number;
  cell_mass: number;
  strongest_absolute: number;
  two_theta_max: number;
}

describe("lithodex fit tags in CIF headers", () => {
  test("texture, broadening and variable001 are parsed; bad values are reported with their line", () => {
    const meta = lithodexComments(
      ["#\\#CIF_1.1", "# lithodex-group: clay", "# lithodex-texture: 0 0 1", "# lithodex-broadening: 3", "# lithodex-variable001: 12.4-15.5 A (hydration)"].join("\n"),
    );
    expect(meta.texture).toEqual([0, 0, 1]);
    expect(meta.broadening).toBe(3);
    expect(meta.variable001).toBe(true);
    expect(meta.d001Range).toEqual([12.4, 15.5]);
    expect(meta.problems).toEqual([]);
    const bad = lithodexComments("data_x\n# lithodex-texture: 0 0\n# lithodex-broadening: wide\n# lithodex-variable001: maybe");
    expect(bad.texture).toBeUndefined();
    expect(bad.problems).toHaveLength(3);
    expect(bad.problems[0]).toMatch(/^line 2: lithodex-texture needs three integers/);
    expect(bad.problems[1]).toMatch(/^line 3: lithodex-broadening/);
    expect(bad.problems[2]).toMatch(/^line 4: lithodex-variable001/);
  });

  test("hydrogen listed in the formula sum but absent from the sites is added to ZM (Z × n(H) × 1.008)", () => {
    const base = ["data_t", "_chemical_formula_sum 'Al2 Si2 O9 H4'", "_cell_formula_units_Z 2", "_cell_length_a 5", "_cell_length_b 5", "_cell_length_c 5",
      "_cell_angle_alpha 90", "_cell_angle_beta 90", "_cell_angle_gamma 90", "_symmetry_space_group_name_H-M 'P 1'", "loop_", "_atom_site_label", "_atom_site_fract_x", "_atom_site_fract_y", "_atom_site_fract_z", "Si1 0 0 0"];
    expect(omittedHydrogenMass(parseCif(base.join("\n")))).toBeCloseTo(2 * 4 * 1.008, 9);
    expect(omittedHydrogenMass(parseCif([...base, "H1 0.5 0.5 0.5"].join("\n")))).toBe(0);
    expect(omittedHydrogenMass(parseCif(base.join("\n").replace(" H4'", "'")))).toBe(0);
  });
});

describe("library.json fit data", () => {
  test("every phase has V, ZM and a positive absolute scale; V agrees with the cell", () => {
    for (const p of LIBRARY_PHASES) {
      const { a, b, c, alpha, beta, gamma } = p.cell;
      const r = Math.PI / 180;
      const [ca, cb, cg] = [Math.cos(alpha * r), Math.cos(beta * r), Math.cos(gamma * r)];
      const v = a * b * c * Math.sqrt(1 - ca * ca - cb * cb - cg * cg + 2 * ca * cb * cg);
      expect(p.cellVolume / v, `${p.id} V`).toBeCloseTo(1, 4);
      expect(p.cellMass, `${p.id} ZM`).toBeGreaterThan(0);
      expect(p.absoluteScale, `${p.id} absoluteScale`).toBeGreaterThan(0);
    }
  });

  // gemmi fixtures store V, W and the absolute m|F|²Lp of the strongest line for 2θ ≤ 90° (same Lp and λ as ours)
  const fixtures = readdirSync(GEMMI)
    .filter((f) => f.endsWith(".json") && !f.startsWith("own-") && f !== "index.json" && f !== "elements.json")
    .map((f) => ({ id: f.replace(/\.json$/, ""), fx: JSON.parse(readFileSync(join(GEMMI, f), "utf8")) as Fixture }))
    .filter(({ id, fx }) => {
      const path = join(process.cwd(), fx.cif);
      return findLibraryPhase(id) && existsSync(path) && createHash("sha256").update(readFileSync(path, "utf8")).digest("hex") === fx.cif_sha256;
    });

  test("the gemmi fixtures cover most of the library", () => {
    expect(fixtures.length).toBeGreaterThanOrEqual(LIBRARY_PHASES.length * 0.9);
  });

  test.each(fixtures.map((f) => [f.id, f.fx] as const))("%s: V and absoluteScale agree with gemmi (1e-3)", (id, fx) => {
    const p = LIBRARY_PHASES.find((q) => q.id === id)!;
    expect(p.cellVolume / fx.volume).toBeCloseTo(1, 5);
    const strongest = p.lines.find((l) => l[4] === 100)!;
    const twoTheta = (2 * Math.asin(LIBRARY_FILE.wavelength / (2 * strongest[3])) * 180) / Math.PI;
    // our library runs to 100° 2θ; a 100-line between 90° and 100° would be outside gemmi's range
    if (twoTheta <= fx.two_theta_max) expect(Math.abs(p.absoluteScale / fx.strongest_absolute - 1)).toBeLessThan(1e-3);
    // sites-only mass against gemmi's; cellMass adds the formula-sum H the sites omit
    const structure = parseCif(readFileSync(join(process.cwd(), fx.cif), "utf8"));
    expect((p.cellMass - omittedHydrogenMass(structure)) / fx.cell_mass).toBeCloseTo(1, 3);
  });

  test("absoluteScale / (V·W) relative to corundum is the RIR (Chung 1974)", () => {
    const cor = LIBRARY_PHASES.find((p) => p.id === "corundum")!;
    const sitesMass = (id: string) => unitCellMass(parseCif(readFileSync(join(process.cwd(), LIBRARY_PHASES.find((p) => p.id === id)!.source), "utf8")));
    // RIR is against corundum 113 (hexagonal setting), which need not be corundum's own 100-line
    const i113 = cor.lines.find((l) => l[0] === 1 && l[1] === 1 && l[2] === 3)![4];
    const k = ((i113 / 100) * cor.absoluteScale) / (cor.cellVolume * sitesMass("corundum"));
    for (const p of LIBRARY_PHASES) {
      const rir = p.absoluteScale / (p.cellVolume * sitesMass(p.id)) / k;
      // rir is stored to 3 decimals, corundum 113 intensity to 2
      expect(Math.abs(rir - p.rir), p.id).toBeLessThan(0.0005 + 2e-4 * p.rir);
    }
  });

  test("fitDataOf gives the absolute intensity of the 100-line: intensity/100 × absoluteScale", () => {
    const p = LIBRARY_PHASES.find((q) => q.id === "quartz")!;
    const text = readFileSync(join(process.cwd(), p.source), "utf8");
    const lines = [{ absoluteIntensity: 10 }, { absoluteIntensity: 250 }, { absoluteIntensity: 40 }];
    const fit = fitDataOf(parseCif(text), lines, lithodexComments(text));
    expect(fit.absoluteScale).toBe(250);
    expect(() => fitDataOf(parseCif(text), [], lithodexComments(text))).toThrow(RangeError);
  });

  test("texture planes of platy and prismatic phases (common practice, March–Dollase direction per Dollase 1986)", () => {
    const tex = (id: string) => findLibraryPhase(id)?.texture;
    for (const id of ["muscovite", "phlogopite", "kaolinite", "clinochlore", "talc", "montmorillonite", "molybdenite", "graphite"]) expect(tex(id), id).toEqual([0, 0, 1]);
    for (const id of ["calcite", "dolomite", "magnesite", "siderite", "rhodochrosite"]) expect(tex(id), id).toEqual([1, 0, 4]);
    for (const id of ["tremolite", "actinolite"]) expect(tex(id), id).toEqual([1, 1, 0]);
    expect(tex("gypsum")).toEqual([0, 1, 0]);
    // orthoamphibole (Pnma, a doubled): {210} is the amphibole {110} cleavage, d ≈ 8.26 Å
    expect(tex("anthophyllite")).toEqual([2, 1, 0]);
    expect(findLibraryPhase("anthophyllite")!.lines.find((l) => l[0] === 2 && l[1] === 1 && l[2] === 0)![3]).toBeCloseTo(8.26, 1);
    // feldspars: cleavage-plane orientation is weak in powders; no texture given (common practice)
    for (const id of ["albite", "orthoclase", "microcline", "quartz"]) expect(tex(id), id).toBeUndefined();
    // the texture plane is a strong-enough reflection of the phase's own pattern where it is a basal/cleavage line
    const calcite = findLibraryPhase("calcite")!;
    expect(calcite.lines.find((l) => l[0] === 1 && l[1] === 0 && l[2] === 4)?.[4]).toBe(100);
  });
});

describe("fit data flows to the identifier and the database", () => {
  test("toReferencePattern carries the fields; phases without them stay valid", () => {
    const p = findReferencePattern("calcite")!;
    const lp = findLibraryPhase("calcite")!;
    expect(p.cellVolume).toBe(lp.cellVolume);
    expect(p.cellMass).toBe(lp.cellMass);
    expect(p.absoluteScale).toBe(lp.absoluteScale);
    expect(p.texture).toEqual([1, 0, 4]);
    expect(findReferencePattern("quartz")!.texture).toBeUndefined();
  });

  test("the seed row stores them in fit_json and patternFromRow reads them back", () => {
    const lp = findLibraryPhase("muscovite")!;
    const row = libraryPhaseRow(lp);
    expect(row.fitJson).toMatchObject({ cellVolume: lp.cellVolume, cellMass: lp.cellMass, absoluteScale: lp.absoluteScale, texture: [0, 0, 1] });
    const pattern = patternFromRow({ id: "r1", mineral: lp.mineral, formula: lp.formula, elements: lp.elements.join(","), patternJson: row.patternJson as unknown[], rir: lp.rir, hazard: null, mineralGroup: lp.group, fitJson: row.fitJson });
    expect(pattern.absoluteScale).toBe(lp.absoluteScale);
    expect(pattern.texture).toEqual([0, 0, 1]);
    const old = patternFromRow({ id: "r2", mineral: "x", formula: "", elements: "", patternJson: [], rir: null, hazard: null, mineralGroup: null, fitJson: null });
    expect(old.cellMass).toBeUndefined();
    expect(old.absoluteScale).toBeUndefined();
  });
});

// IUPAC 2021 abridged standard atomic weights (Prohaska et al. 2022, Pure Appl. Chem. 94, 573), typed here so the
// check does not lean on lib/science/crystal/atomic-weights.ts.
const W: Record<string, number> = { H: 1.008, C: 12.011, O: 15.999, Na: 22.99, Mg: 24.305, Al: 26.982, Si: 28.085, S: 32.06, K: 39.098, Ca: 40.078, Cr: 51.996, Fe: 55.845, As: 74.922 };
const formulaWeight = (f: Record<string, number>) => Object.entries(f).reduce((s, [e, n]) => s + n * W[e], 0);

describe("cellMass against handbook formula weight × Z, density against handbook ranges", () => {
  // Ideal formulas and Z as given by Anthony et al., Handbook of Mineralogy (and Deer, Howie & Zussman for the
  // feldspars); the cell mass of a model must be Z × FW of its formula (H included, also where the sites omit it).
  const ideal: [string, Record<string, number>, number][] = [
    ["quartz", { Si: 1, O: 2 }, 3],
    ["calcite", { Ca: 1, C: 1, O: 3 }, 6],
    ["corundum", { Al: 2, O: 3 }, 6],
    ["gypsum", { Ca: 1, S: 1, O: 6, H: 4 }, 4],
    ["arsenopyrite", { Fe: 1, As: 1, S: 1 }, 4],
    ["chromite", { Fe: 1, Cr: 2, O: 4 }, 8],
    ["clinozoisite", { Ca: 2, Al: 3, Si: 3, O: 13, H: 1 }, 2],
    ["kaolinite", { Al: 2, Si: 2, O: 9, H: 4 }, 2],
    ["goethite", { Fe: 1, O: 2, H: 1 }, 4],
    ["albite", { Na: 1, Al: 1, Si: 3, O: 8 }, 4],
  ];
  test.each(ideal)("%s: ZM = Z × FW (Handbook of Mineralogy formula)", (id, formula, z) => {
    expect(findLibraryPhase(id)!.cellMass / (z * formulaWeight(formula))).toBeCloseTo(1, 3);
  });

  // Solid solutions: the model's composition is one member, so compare the density with the handbook range
  // (Anthony et al., Handbook of Mineralogy, D(meas); plagioclase after Deer, Howie & Zussman 2001; from memory).
  const density: [string, number, number][] = [
    ["oligoclase", 2.63, 2.67],
    ["andesine", 2.66, 2.69],
    ["labradorite", 2.69, 2.72],
    ["chamosite", 3.0, 3.4],
    ["illite", 2.6, 2.9],
    ["montmorillonite", 2.0, 3.0],
    ["magnesio-hornblende", 3.0, 3.45],
    ["clinozoisite", 3.21, 3.38],
    ["chromite", 4.5, 5.09],
  ];
  test.each(density)("%s: calculated density within %s–%s g/cm³", (id, lo, hi) => {
    const p = findLibraryPhase(id)!;
    const rho = p.cellMass / (0.602214076 * p.cellVolume);
    expect(rho).toBeGreaterThanOrEqual(lo);
    expect(rho).toBeLessThanOrEqual(hi);
  });

  test("new clay phases carry their fit tags; plagioclase members are a series (An up → γ up, density up)", () => {
    expect(findLibraryPhase("illite")).toMatchObject({ texture: [0, 0, 1], broadening: 3 });
    expect(findLibraryPhase("montmorillonite")).toMatchObject({ texture: [0, 0, 1], variable001: true, d001Range: [12, 15.5] });
    for (const id of ["chamosite", "vermiculite"]) expect(findLibraryPhase(id)?.texture, id).toEqual([0, 0, 1]);
    // Hornblende is not among the regulated asbestos minerals (chrysotile; the amphiboles riebeckite/crocidolite,
    // grunerite/amosite, anthophyllite, tremolite, actinolite — e.g. US 29 CFR 1910.1001, EU Directive 2009/148/EC).
    expect(findLibraryPhase("hornblende")?.hazards).not.toContain("asbestos");
    const series = ["albite", "oligoclase", "andesine", "labradorite"].map((id) => findLibraryPhase(id)!);
    for (let i = 1; i < series.length; i++) {
      expect(series[i].cell.gamma, series[i].id).toBeGreaterThan(series[i - 1].cell.gamma);
      expect(series[i].cellMass / series[i].cellVolume, series[i].id).toBeGreaterThan(series[i - 1].cellMass / series[i - 1].cellVolume);
    }
  });
});
