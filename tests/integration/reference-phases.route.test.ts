import { readFileSync } from "node:fs";
import { count, eq } from "drizzle-orm";
import { beforeAll, describe, expect, test } from "vitest";
import { GET as cifRoute } from "@/app/api/reference-phases/[referenceId]/cif/route";
import { GET as getRoute } from "@/app/api/reference-phases/[referenceId]/route";
import { POST as importRoute } from "@/app/api/reference-phases/import/route";
import { GET as listRoute } from "@/app/api/reference-phases/route";
import { getDb } from "@/db";
import { seedReferenceLibrary } from "@/db/seed/reference-library";
import { auditLog, referencePhases } from "@/db/schema";
import { loadReferenceLibrary } from "@/lib/jobs";
import { LIBRARY_PHASES } from "@/lib/science/minerals";
import { call, makeWorld, type World } from "../helpers/app";

let w: World;
beforeAll(async () => {
  w = await makeWorld();
  await seedReferenceLibrary();
});

const HALITE = readFileSync("lib/science/minerals/cif/halite.cif", "utf8");
const SYLVITE = readFileSync("lib/science/minerals/cif/sylvite.cif", "utf8");
/** Independent reference: gemmi 0.5.7 (Debian python3-gemmi), see tests/fixtures/gemmi/README.md. */
const gemmi = (name: string) => JSON.parse(readFileSync(`tests/fixtures/gemmi/${name}.json`, "utf8")) as { wavelength: number; lines: { d: number; I: number }[]; complete_above: number };

const bragg2theta = (d: number, lambda: number) => (2 * Math.asin(lambda / (2 * d)) * 180) / Math.PI; // Bragg's law

function cifForm(files: { name: string; text: string }[]): FormData {
  const f = new FormData();
  for (const file of files) f.append("files", new Blob([file.text]), file.name);
  return f;
}
const importAs = (cookie: string, files: { name: string; text: string }[]) => call(importRoute, { method: "POST", cookie, rawBody: cifForm(files) });

describe("reference library", () => {
  test("the seed loads every shipped phase once, and again without duplicates", async () => {
    const again = await seedReferenceLibrary();
    expect(again.inserted).toBe(0);
    expect(again.updated).toBe(LIBRARY_PHASES.length);
    const [{ n }] = await getDb().select({ n: count() }).from(referencePhases).where(eq(referencePhases.builtin, true));
    expect(n).toBe(LIBRARY_PHASES.length);
  });

  test("any signed-in user can list and search; filters by hazard and element", async () => {
    const all = await call(listRoute, { cookie: w.cookies.consultant });
    expect(all.status).toBe(200);
    expect(all.json.total).toBe(LIBRARY_PHASES.length);
    expect(all.json.canImport).toBe(false);
    const q = await call(listRoute, { cookie: w.cookies.field_geologist, path: "/?q=quartz" });
    expect(q.json.items.map((i: { mineral: string }) => i.mineral)).toContain("quartz");
    const quartz = q.json.items.find((i: { mineral: string }) => i.mineral === "quartz");
    // Strongest calculated line of quartz is 101 at d ≈ 3.343 Å (handbook, from memory).
    expect(quartz.strongLines[0].d).toBeCloseTo(3.343, 2);
    expect(quartz.hazard).toBe("crystalline_silica");
    const asb = await call(listRoute, { cookie: w.cookies.lab_analyst, path: "/?hazard=asbestos" });
    // Common practice: chrysotile and the amphiboles that occur in asbestos form.
    expect(asb.json.items.map((i: { mineral: string }) => i.mineral).sort()).toEqual(expect.arrayContaining(["actinolite", "anthophyllite", "chrysotile", "grunerite", "riebeckite", "tremolite"]));
    expect(asb.json.canImport).toBe(true);
    // Formula search ignores spacing and brackets (issue 11 §6): "FeS2" and "Fe S2" find pyrite and marcasite.
    for (const query of ["FeS2", "Fe%20S2"]) {
      const f = await call(listRoute, { cookie: w.cookies.lead, path: `/?q=${query}` });
      expect(f.json.items.map((r: { mineral: string }) => r.mineral), query).toEqual(expect.arrayContaining(["pyrite", "marcasite"]));
    }
    const goethite = await call(listRoute, { cookie: w.cookies.lead, path: "/?q=FeO(OH)" });
    expect(goethite.json.items.find((r: { mineral: string }) => r.mineral === "goethite")).toMatchObject({ formula: "FeO(OH)", spaceGroup: "Pnma" });
    const s = await call(listRoute, { cookie: w.cookies.lead, path: "/?element=S&q=pyr" });
    expect(s.json.items.map((i: { mineral: string }) => i.mineral)).toEqual(expect.arrayContaining(["pyrite", "pyrrhotite"]));
    expect(s.json.items.every((i: { elements: string[] }) => i.elements.includes("S"))).toBe(true);
    const bad = await call(listRoute, { cookie: w.cookies.lead, path: "/?hazard=lava" });
    expect(bad.status).toBe(422);
    const anon = await call(listRoute, {});
    expect(anon.status).toBe(401);
  });

  test("one phase: Cu Kα1 pattern agrees with gemmi; the Co pattern moves by Bragg's law", async () => {
    const [row] = await getDb().select({ id: referencePhases.id }).from(referencePhases).where(eq(referencePhases.mineral, "quartz"));
    const cu = await call(getRoute, { params: { referenceId: row.id }, path: "/?twoThetaMax=90", cookie: w.cookies.consultant });
    expect(cu.status).toBe(200);
    expect(cu.json.pattern.anode).toBe("Cu");
    const ref = gemmi("quartz");
    for (const g of ref.lines.filter((l) => l.I >= 5)) {
      const ours = cu.json.pattern.lines.find((l: { d: number }) => Math.abs(l.d - g.d) < 1e-3);
      expect(ours, `line d=${g.d}`).toBeDefined();
      expect(ours.intensity).toBeCloseTo(g.I, 0);
    }
    const co = await call(getRoute, { params: { referenceId: row.id }, path: "/?anode=Co", cookie: w.cookies.consultant });
    const l101 = co.json.pattern.lines.find((l: { d: number }) => Math.abs(l.d - 3.3434) < 0.002);
    // Bragg's law, recomputed: Co Kα1 1.78900 Å, quartz d 3.3434 → 31.036° 2θ.
    expect(l101.twoTheta).toBeCloseTo(31.036, 1);
    expect(l101.twoTheta).toBeCloseTo(bragg2theta(l101.d, co.json.pattern.wavelength), 6);
    const mo = await call(getRoute, { params: { referenceId: row.id }, path: "/?wavelength=0.709319", cookie: w.cookies.consultant });
    expect(mo.json.pattern.lines.find((l: { d: number }) => Math.abs(l.d - 3.3434) < 0.002).twoTheta).toBeCloseTo(bragg2theta(3.3434, 0.709319), 1);
    const missing = await call(getRoute, { params: { referenceId: "nope" }, cookie: w.cookies.consultant });
    expect(missing.status).toBe(404);
    const cif = await call(cifRoute, { params: { referenceId: row.id }, cookie: w.cookies.consultant });
    expect(cif.json).toContain("data_");
  });
});

describe("CIF import", () => {
  const renamed = (text: string, name: string) => text.replace(/_chemical_name_mineral .*/, `_chemical_name_mineral '${name}'`);

  test("who may import: lab analysts and site admins only", async () => {
    const files = [{ name: "halite-test.cif", text: renamed(HALITE, "halite test") }];
    for (const who of ["consultant", "field_geologist", "lead", "outsider"] as const) {
      const r = await importAs(w.cookies[who], files);
      expect(r.status, who).toBe(403);
    }
    const [{ n }] = await getDb().select({ n: count() }).from(referencePhases).where(eq(referencePhases.builtin, false));
    expect(n).toBe(0);
  });

  test("good files are imported with pattern and RIR; unusable ones get their own error with the CIF line", async () => {
    const noCell = renamed(HALITE, "halite nocell").replace(/^_cell_length_a .*$/m, "");
    const shortRow = renamed(HALITE, "halite short").replace(/^Cl1 .*$/m, "Cl1   Cl   0.5       0.5       0.5       1");
    const hot = renamed(HALITE, "halite hot").replace("_cell_formula_units_Z 4", "_cell_formula_units_Z 4\n_diffrn_ambient_temperature 873");
    const r = await importAs(w.cookies.lab_analyst, [
      { name: "halite-test.cif", text: renamed(HALITE, "halite test") },
      { name: "no-cell.cif", text: noCell },
      { name: "short-row.cif", text: shortRow },
      { name: "hot.cif", text: hot },
      { name: "notes.txt", text: "This is not a crystal structure." },
      { name: "empty.cif", text: "" },
    ]);
    expect(r.status).toBe(201);
    expect(r.json.imported).toHaveLength(1);
    const imp = r.json.imported[0];
    expect(imp).toMatchObject({ fileName: "halite-test.cif", mineral: "halite test", formula: "ClNa" });
    expect(imp.rir).toBeGreaterThan(0);
    const errs: Record<string, { message: string; line?: number; code?: string }> = Object.fromEntries(r.json.errors.map((e: { fileName: string }) => [e.fileName, e]));
    expect(Object.keys(errs).sort()).toEqual(["empty.cif", "hot.cif", "no-cell.cif", "notes.txt", "short-row.cif"]);
    expect(errs["no-cell.cif"].code).toBe("missing-cell");
    expect(errs["no-cell.cif"].message).toMatch(/_cell_length_a/);
    expect(errs["short-row.cif"].code).toBe("loop-shape");
    expect(errs["short-row.cif"].line).toBeGreaterThan(200);
    expect(errs["hot.cif"].message).toMatch(/873 K/);
    expect(errs["notes.txt"].code).toMatch(/^(syntax|no-data-block)$/);
    expect(errs["notes.txt"].message).toMatch(/^CIF (line 1|file)/);
    expect(errs["empty.cif"].message).toMatch(/empty/);

    // The stored pattern agrees with gemmi's halite pattern (Cu Kα1, lines ≤ 90° 2θ); these ratios
    // for these B values are checked against gemmi: I(220)/I(200) ≈ 0.60, I(222) ≈ 0.18, I(111) ≈ 0.09.
    const got = await call(getRoute, { params: { referenceId: imp.id }, path: "/?twoThetaMax=90", cookie: w.cookies.lab_analyst });
    expect(got.json.phase.builtin).toBe(false);
    for (const g of gemmi("halite").lines) {
      const ours = got.json.pattern.lines.find((l: { d: number }) => Math.abs(l.d - g.d) < 1e-3);
      expect(ours, `d=${g.d}`).toBeDefined();
      expect(ours.intensity).toBeCloseTo(g.I, 0);
    }
    const I = (d: number) => got.json.pattern.lines.find((l: { d: number }) => Math.abs(l.d - d) < 0.005).intensity / 100;
    expect(I(1.994)).toBeCloseTo(0.6, 1);
    expect(I(1.628)).toBeCloseTo(0.18, 1);
    expect(I(3.256)).toBeCloseTo(0.09, 1);

    // Audited, and the identifier's library now contains it.
    const [{ n }] = await getDb().select({ n: count() }).from(auditLog).where(eq(auditLog.entityId, imp.id));
    expect(n).toBe(1);
    expect((await loadReferenceLibrary()).some((p) => p.id === imp.id)).toBe(true);
  });

  test("fit data (V, ZM, absolute scale, texture) is stored at import and by the seed, and reaches the identifier's library", async () => {
    // gemmi fixture of sylvite: V, W and the absolute m|F|²Lp of the strongest line (Cu Kα1, same Lp as ours)
    const fx = JSON.parse(readFileSync("tests/fixtures/gemmi/sylvite.json", "utf8")) as { volume: number; cell_mass: number; strongest_absolute: number };
    const text = renamed(SYLVITE, "sylvite fit").replace("data_", "# lithodex-texture: 1 0 0\n# lithodex-broadening: none\ndata_");
    const r = await importAs(w.cookies.lab_analyst, [{ name: "sylvite-fit.cif", text }]);
    expect(r.status).toBe(201);
    const imp = r.json.imported[0];
    // the bad tag is reported, not fatal
    expect(imp.warnings.join(" ")).toMatch(/lithodex-broadening/);
    const [row] = await getDb().select({ fit: referencePhases.fitJson }).from(referencePhases).where(eq(referencePhases.id, imp.id));
    expect(row.fit!.cellVolume / fx.volume).toBeCloseTo(1, 5);
    expect(row.fit!.cellMass / fx.cell_mass).toBeCloseTo(1, 3);
    expect(Math.abs(row.fit!.absoluteScale / fx.strongest_absolute - 1)).toBeLessThan(1e-3);
    expect(row.fit!.texture).toEqual([1, 0, 0]);
    const pattern = (await loadReferenceLibrary()).find((p) => p.id === imp.id)!;
    expect(pattern.absoluteScale).toBe(row.fit!.absoluteScale);
    expect(pattern.texture).toEqual([1, 0, 0]);
    // shipped rows: the seed writes library.json's values
    const shipped = LIBRARY_PHASES.find((p) => p.id === "muscovite")!;
    const [m] = await getDb().select({ fit: referencePhases.fitJson }).from(referencePhases).where(eq(referencePhases.mineral, "muscovite"));
    expect(m.fit).toMatchObject({ cellVolume: shipped.cellVolume, cellMass: shipped.cellMass, absoluteScale: shipped.absoluteScale, texture: [0, 0, 1] });
    await getDb().delete(referencePhases).where(eq(referencePhases.id, imp.id)); // the later tests count imported rows
  });

  test("importing the same structure twice is a per-file error; nothing usable is a 422", async () => {
    const r = await importAs(w.cookies.lab_analyst, [{ name: "again.cif", text: renamed(HALITE, "halite test") }]);
    expect(r.status).toBe(422);
    expect(r.json.error.details.errors[0]).toMatchObject({ fileName: "again.cif", code: "duplicate" });
    expect(r.json.error.fields.files[0]).toMatch(/already in the library/);
  });

  test("a site admin can import; a hazard is derived from the mineral name (common practice)", async () => {
    const r = await importAs(w.cookies.admin, [{ name: "tremolite-like.cif", text: renamed(SYLVITE, "tremolite (test)") }]);
    expect(r.status).toBe(201);
    expect(r.json.imported[0].hazard).toBe("asbestos");
    const list = await call(listRoute, { cookie: w.cookies.lead, path: "/?source=imported" });
    expect(list.json.items.map((i: { mineral: string }) => i.mineral).sort()).toEqual(["halite test", "tremolite (test)"]);
  });
});
