/**
 * The shipped reference library (lib/science/minerals/library.json) against its sources: it must be exactly what
 * scripts/build-reference-library.ts computes from the CIFs today, and it must hold the minerals the product
 * promises (list from the library issue). Pattern correctness itself is checked against gemmi (crystal tests) and
 * handbook d-spacings (handbook.test.ts).
 */
import { readFileSync } from "node:fs";
import { join } from "node:path";
import { describe, expect, test } from "vitest";
import { LIBRARY_FILE, LIBRARY_PHASES, REFERENCE_LIBRARY, findReferencePattern } from "@/lib/science/minerals";
import { buildReferenceLibrary, CIF_FOLDER, LIBRARY_PATH, readCifFolder, serializeLibrary } from "@/scripts/build-reference-library";

// Minerals the library must contain (library issue; IMA names, Warr 2021 for spelling: baryte, celestine).
const REQUIRED = [
  "quartz", "cristobalite", "tridymite", "calcite", "aragonite", "dolomite", "siderite", "magnesite", "ankerite",
  "halite", "sylvite", "gypsum", "anhydrite", "baryte", "celestine", "fluorite", "fluorapatite", "hematite",
  "magnetite", "goethite", "rutile", "anatase", "ilmenite", "corundum", "spinel", "chromite", "pyrite", "marcasite",
  "pyrrhotite", "chalcopyrite", "galena", "sphalerite", "arsenopyrite", "molybdenite", "cassiterite", "zircon",
  "orthoclase", "microcline", "sanidine", "albite", "anorthite", "muscovite", "phlogopite", "kaolinite",
  "clinochlore", "talc", "lizardite", "chrysotile", "tremolite", "actinolite", "forsterite", "enstatite", "diopside",
  "augite", "almandine", "grossular", "epidote", "titanite", "alunite", "jarosite",
  // whole-pattern issue, library section: clays, chlorites, plagioclase members, epidote group, hornblende
  "illite", "montmorillonite", "chamosite", "vermiculite", "clinozoisite", "hornblende", "oligoclase", "andesine",
  "labradorite",
];
// Tourmaline-group members (IMA): any one of them satisfies "a tourmaline-group member".
const TOURMALINES = ["dravite", "schorl", "elbaite", "uvite", "foitite"];

describe("library.json", () => {
  test("is up to date with the CIFs (rebuilt in memory, byte-identical)", () => {
    const rebuilt = serializeLibrary(buildReferenceLibrary(readCifFolder(CIF_FOLDER)));
    const shipped = readFileSync(LIBRARY_PATH, "utf8");
    // Compare phase by phase first for a readable failure, then the bytes.
    const a = JSON.parse(rebuilt).phases.map((p: { id: string }) => p.id);
    const b = JSON.parse(shipped).phases.map((p: { id: string }) => p.id);
    expect(b).toEqual(a);
    expect(shipped === rebuilt, "run: npx tsx scripts/build-reference-library.ts").toBe(true);
  }, 60_000);

  test("has at least 80 phases and one per CIF", () => {
    const cifCount = readCifFolder(CIF_FOLDER).length;
    expect(LIBRARY_PHASES.length).toBe(cifCount);
    expect(LIBRARY_PHASES.length).toBeGreaterThanOrEqual(80);
  });

  test.each(REQUIRED)("contains %s", (mineral) => {
    expect(findReferencePattern(mineral), `${mineral} missing from lib/science/minerals/cif`).toBeDefined();
  });

  test("contains a tourmaline-group member", () => {
    expect(TOURMALINES.some((m) => findReferencePattern(m))).toBe(true);
  });

  test("every phase is complete: citation, cell, RIR, elements, lines d-descending, strongest = 100", () => {
    for (const p of LIBRARY_PHASES) {
      expect(p.mineral, p.id).toMatch(/^[a-z][a-z0-9 ()-]*$/);
      expect(p.citation.length, `${p.id} citation`).toBeGreaterThan(10);
      expect(p.citation, `${p.id} citation year`).toMatch(/\(\d{4}\)/);
      expect(p.rir, `${p.id} rir`).toBeGreaterThan(0);
      expect(p.elements.length, p.id).toBeGreaterThan(0);
      expect(p.crystalSystem, p.id).toMatch(/^(triclinic|monoclinic|orthorhombic|tetragonal|trigonal|hexagonal|cubic)$/);
      const ds = p.lines.map((l) => l[3]);
      expect([...ds].sort((x, y) => y - x), `${p.id} d order`).toEqual(ds);
      expect(Math.max(...p.lines.map((l) => l[4])), p.id).toBe(100);
      expect(Math.min(...p.lines.map((l) => l[4])), p.id).toBeGreaterThanOrEqual(LIBRARY_FILE.minIntensity);
    }
  });

  test("corundum's RIR is 1 by definition (Chung 1974: RIR = I/I_corundum)", () => {
    expect(findReferencePattern("corundum")?.rir).toBeCloseTo(1, 2);
  });

  test("hazard tags of the crystalline-silica and asbestos minerals (common practice: OSHA/IARC lists)", () => {
    const tags = (m: string) => LIBRARY_PHASES.find((p) => p.mineral === m)?.hazards ?? [];
    for (const m of ["quartz", "cristobalite", "tridymite"]) expect(tags(m), m).toContain("crystalline_silica");
    for (const m of ["chrysotile", "tremolite", "actinolite"]) expect(tags(m), m).toContain("asbestos");
    expect(findReferencePattern("quartz")?.hazard).toBe("crystalline_silica");
  });

  test("REFERENCE_LIBRARY carries 2θ for Cu Kα1 (Bragg's law, recomputed: quartz 101 d 3.3434 → 26.640°)", () => {
    const q = findReferencePattern("quartz")!;
    const strongest = q.lines.reduce((a, b) => (b.intensity > a.intensity ? b : a));
    expect(strongest.d).toBeCloseTo(3.343, 2);
    expect(strongest.twoTheta!).toBeCloseTo((2 * Math.asin(LIBRARY_FILE.wavelength / (2 * strongest.d)) * 180) / Math.PI, 10);
    expect(REFERENCE_LIBRARY.length).toBe(LIBRARY_PHASES.length);
  });

  test("aliases resolve (baryte/barite, celestine/celestite)", () => {
    expect(findReferencePattern("barite")?.mineral).toBe("baryte");
    expect(findReferencePattern("Celestite")?.mineral).toBe("celestine");
  });

  test("library.json stays small (< 1 MiB)", () => {
    expect(readFileSync(join(LIBRARY_PATH), "utf8").length).toBeLessThan(1 << 20);
  });
});
