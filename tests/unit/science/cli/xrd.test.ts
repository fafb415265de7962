/**
 * The `xrd` command line, spawned as a user would run it (tsx scripts/xrd.ts), on synthetic files written to a
 * temporary folder. Scans are synthesized from library patterns (this checks the command and its JSON contract,
 * not the patterns); the CIF is a textbook rock-salt structure (NaCl, Fm-3m, a = 5.640 Å, handbook value from memory).
 */
import { spawnSync } from "node:child_process";
import { mkdtempSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterAll, beforeAll, describe, expect, test } from "vitest";
import { findReferencePattern } from "@/lib/science/minerals";
import { writeXy } from "@/lib/science/scan";
import { synthesizeScan } from "@/lib/science/synthetic";

const root = process.cwd();
const tsx = join(root, "node_modules/.bin/tsx");
let dir = "";

function xrd(...args: string[]): { code: number | null; stdout: string; stderr: string } {
  const r = spawnSync(tsx, [join(root, "scripts/xrd.ts"), ...args], { cwd: root, encoding: "utf8", timeout: 60_000 });
  return { code: r.status, stdout: r.stdout, stderr: r.stderr };
}

// Rock salt: Na at 0,0,0 and Cl at ½,½,½ with the F-centring translations (textbook structure); B: typical isotropic values chosen for the test (common practice range 0.3–1.5 Å²).
const NACL_CIF = `data_nacl
_chemical_name_mineral halite
_chemical_formula_sum 'Na Cl'
_cell_length_a 5.640
_cell_length_b 5.640
_cell_length_c 5.640
_cell_angle_alpha 90
_cell_angle_beta 90
_cell_angle_gamma 90
_space_group_name_H-M_alt 'F m -3 m'
_space_group_IT_number 225
loop_
_space_group_symop_operation_xyz
x,y,z
x,y+1/2,z+1/2
x+1/2,y,z+1/2
x+1/2,y+1/2,z
loop_
_atom_site_label
_atom_site_type_symbol
_atom_site_fract_x
_atom_site_fract_y
_atom_site_fract_z
_atom_site_B_iso_or_equiv
Na1 Na 0 0 0 1.6
Cl1 Cl 0.5 0.5 0.5 1.2
`;

beforeAll(() => {
  dir = mkdtempSync(join(tmpdir(), "xrd-cli-"));
  const qc = synthesizeScan({
    phases: [
      { pattern: findReferencePattern("quartz")!, weight: 60 },
      { pattern: findReferencePattern("calcite")!, weight: 40 },
    ],
    zeroShift: 0.04,
    seed: 3,
  });
  writeFileSync(join(dir, "quartz-calcite.xy"), writeXy(qc));
  writeFileSync(join(dir, "no-header.xy"), writeXy(qc, { header: false }));
  writeFileSync(join(dir, "bad.xy"), "# wavelength: 1.540593\n10.00 120\n10.02 abc\n10.04 130\n");
  writeFileSync(join(dir, "nacl.cif"), NACL_CIF);
  writeFileSync(join(dir, "broken.cif"), NACL_CIF.replace("_cell_length_b 5.640\n", "_cell_length_b five\n"));
});
afterAll(() => rmSync(dir, { recursive: true, force: true }));

describe("xrd identify", () => {
  test("--json follows the contract and finds both phases (test design: quartz 60 + calcite 40 wt%)", () => {
    const r = xrd("identify", join(dir, "quartz-calcite.xy"), "--json");
    expect(r.stderr).toBe("");
    expect(r.code).toBe(0);
    const out = JSON.parse(r.stdout);
    expect(Object.keys(out).sort()).toEqual(["candidates", "gof", "peaks", "phases", "quantification", "rexp", "rwp", "unexplained", "wavelength"]);
    expect(out.wavelength).toBe(1.540593); // from the file header
    expect(Object.keys(out.peaks[0]).sort()).toEqual(["d", "fwhm", "intensity", "twoTheta"]);
    expect(Object.keys(out.candidates[0]).sort()).toEqual(["confident", "formula", "mineral", "score"]);
    expect(out.phases.map((p: { mineral: string }) => p.mineral).sort()).toEqual(["calcite", "quartz"]);
    const wt = Object.fromEntries(out.phases.map((p: { mineral: string; wtPercent: number }) => [p.mineral, p.wtPercent]));
    expect(Math.abs(wt.quartz - 60)).toBeLessThanOrEqual(5); // whole-pattern fit, Hill & Howard (1987) fractions
    const quartz = out.phases.find((p: { mineral: string }) => p.mineral === "quartz");
    expect(quartz.wtSigma).toBeGreaterThan(0);
    expect(quartz.evidence.aloneLines.length).toBeGreaterThanOrEqual(2);
    expect(out.rwp).toBeGreaterThan(0);
    // Bragg's law: quartz 101 d 3.3434 Å ↔ 26.640° with Cu Kα1, plus the 0.04° zero shift put in.
    const q101 = out.peaks.find((p: { d: number }) => Math.abs(p.d - 3.343) < 0.01);
    expect(q101.twoTheta).toBeCloseTo(26.68, 1);
  }, 60_000);

  test("the table carries the caveat and the crystalline-silica caution", () => {
    const r = xrd("identify", join(dir, "quartz-calcite.xy"));
    expect(r.code).toBe(0);
    expect(r.stdout).toMatch(/suggestions, not an identification/);
    expect(r.stdout).toMatch(/semi-quantitative/);
    expect(r.stdout).toMatch(/caution: quartz is crystalline silica/);
  }, 60_000);

  test("--elements restricts the search (no Si allowed ⇒ no quartz); --anode supplies λ for a bare file", () => {
    const r = xrd("identify", join(dir, "no-header.xy"), "--anode", "Cu", "--elements", "Ca,C,O", "--json");
    expect(r.code).toBe(0);
    const out = JSON.parse(r.stdout);
    const minerals = out.phases.map((p: { mineral: string }) => p.mineral);
    expect(minerals).toContain("calcite");
    expect(minerals).not.toContain("quartz");
    expect(out.wavelength).toBeCloseTo(1.5406, 3);
  }, 60_000);

  test("bad scan input ⇒ exit 2 and one line naming the file line", () => {
    const r = xrd("identify", join(dir, "bad.xy"));
    expect(r.code).toBe(2);
    expect(r.stdout).toBe("");
    expect(r.stderr.trim().split("\n")).toHaveLength(1);
    expect(r.stderr).toMatch(/bad\.xy: line 3\b/);
  }, 60_000);

  test("bad options and missing files ⇒ exit 2 with the reason", () => {
    const a = xrd("identify", join(dir, "quartz-calcite.xy"), "--anode", "Xx");
    expect(a.code).toBe(2);
    expect(a.stderr).toMatch(/--anode "Xx" is not one of Cu, Co, Fe, Cr, Mo, Ag/);
    const b = xrd("identify", join(dir, "missing.xy"));
    expect(b.code).toBe(2);
    expect(b.stderr).toMatch(/cannot read file \(ENOENT\)/);
  }, 60_000);
});

describe("xrd pattern", () => {
  test("--json lines of rock salt: d(200) = a/2, I(220)/I(200) ≈ 0.60, I(222) ≈ 0.18 (Bragg's law and the rock-salt intensity ratios of the calculated pattern)", () => {
    const r = xrd("pattern", join(dir, "nacl.cif"), "--json");
    expect(r.code).toBe(0);
    const { lines } = JSON.parse(r.stdout);
    expect(Object.keys(lines[0]).sort()).toEqual(["d", "h", "intensity", "k", "l", "multiplicity", "twoTheta"]);
    const find = (h: number, k: number, l: number) => lines.find((x: { h: number; k: number; l: number }) => x.h === h && x.k === k && x.l === l);
    expect(find(2, 0, 0).d).toBeCloseTo(2.82, 3);
    expect(find(2, 0, 0).intensity).toBe(100);
    expect(find(2, 2, 0).intensity / 100).toBeCloseTo(0.6, 1);
    expect(find(2, 2, 2).intensity / 100).toBeCloseTo(0.18, 1);
    expect(find(2, 0, 0).multiplicity).toBe(6); // {100} family of m-3m (International Tables Vol. A)
  }, 60_000);

  test("a broken CIF ⇒ exit 2 and one line with the CIF line number", () => {
    const r = xrd("pattern", join(dir, "broken.cif"));
    expect(r.code).toBe(2);
    expect(r.stderr.trim().split("\n")).toHaveLength(1);
    expect(r.stderr).toMatch(/broken\.cif: CIF line \d+/);
  }, 60_000);
});

describe("usage", () => {
  test("unknown command ⇒ exit 2 and the usage", () => {
    const r = xrd("frobnicate");
    expect(r.code).toBe(2);
    expect(r.stderr).toMatch(/unknown command "frobnicate"/);
    expect(r.stderr).toMatch(/usage:/);
  }, 60_000);
});
