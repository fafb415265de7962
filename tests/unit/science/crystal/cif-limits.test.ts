/**
 * CIF and pattern limits (issue 12: a 19 KB P 1 CIF with a = 60 Å and 600 atoms blocked the server for 12 s).
 * Every refusal names its limit. Volumes from V = a³ for a cubic cell (elementary geometry).
 */
import { describe, expect, test } from "vitest";
import { CIF_LIMITS, CifError, computePatternDetailed, parseCif } from "@/lib/science/crystal";
import { PATTERN_LIMITS, estimatedReflections } from "@/lib/science/crystal/pattern";

/** A P 1 (or listed-operator) CIF with `n` carbon sites spread over a cubic cell of edge a (invented test data). */
function cif(a: number, n: number, ops: string[] = ["x,y,z"]): string {
  const rows = Array.from({ length: n }, (_, i) => `C${i + 1} C ${((i * 0.618) % 1).toFixed(4)} ${((i * 0.414) % 1).toFixed(4)} ${((i * 0.732) % 1).toFixed(4)} 0.01`);
  return [
    "data_limits",
    `_cell_length_a ${a}`,
    `_cell_length_b ${a}`,
    `_cell_length_c ${a}`,
    "_cell_angle_alpha 90",
    "_cell_angle_beta 90",
    "_cell_angle_gamma 90",
    "loop_",
    "_space_group_symop_operation_xyz",
    ...ops.map((o) => `'${o}'`),
    "loop_",
    "_atom_site_label",
    "_atom_site_type_symbol",
    "_atom_site_fract_x",
    "_atom_site_fract_y",
    "_atom_site_fract_z",
    "_atom_site_U_iso_or_equiv",
    ...rows,
    "",
  ].join("\n");
}

function limitError(fn: () => unknown): CifError {
  try {
    fn();
  } catch (e) {
    if (e instanceof CifError) return e;
    throw e;
  }
  throw new Error("no CifError thrown");
}

describe("CIF limits", () => {
  test("the reported hostile file (P 1, a = 60 Å, 600 atoms) is refused on its cell volume (216 000 Å³ > maxCellVolume) at once", () => {
    const started = performance.now();
    const e = limitError(() => parseCif(cif(60, 600)));
    expect(e.code).toBe("limit");
    expect(e.message).toMatch(/216000 Å³.*maxCellVolume/);
    expect(performance.now() - started).toBeLessThan(2000); // parse only; the pattern would have taken ≈ 12 s
  });

  test("more atom sites than maxSites is refused with the count", () => {
    const e = limitError(() => parseCif(cif(20, CIF_LIMITS.maxSites + 1)));
    expect(e.code).toBe("limit");
    expect(e.message).toContain(`${CIF_LIMITS.maxSites + 1} atom sites`);
    expect(e.message).toContain("maxSites");
  });

  test("more symmetry operators than maxSymops (192, the order of F m -3 m) is refused", () => {
    const ops = Array.from({ length: CIF_LIMITS.maxSymops + 1 }, (_, i) => (i === 0 ? "x,y,z" : `x+${i}/${CIF_LIMITS.maxSymops + 1},y,z`));
    const e = limitError(() => parseCif(cif(10, 1, ops)));
    expect(e.message).toMatch(/193 symmetry operators.*maxSymops/);
  });

  test("a structure within the limits still parses (a = 27 Å, V = 19 683 Å³ ≤ 20 000)", () => {
    expect(parseCif(cif(27, 10)).sites).toHaveLength(10);
  });
});

describe("pattern work limits", () => {
  test("the reflection estimate follows (4π/3)·V/dMin³ (International Tables B §1.1.3)", () => {
    // a = 10 Å cubic, dMin = 1 Å: 4188.79 lattice points inside the sphere of radius 1/dMin.
    expect(estimatedReflections(1000, 1)).toBeCloseTo(4188.79, 1);
  });

  test("a large cell at Mo Kα (λ = 0.7093 Å) to 2θ = 100° is refused on maxReflections", () => {
    const s = parseCif(cif(27, 1));
    const e = limitError(() => computePatternDetailed(s, { wavelength: 0.7093, twoThetaMax: 100 }));
    expect(e.message).toContain("maxReflections");
  });

  test("many atoms × many reflections is refused on maxStructureFactorTerms before the sums start", () => {
    const s = parseCif(cif(27, 300, ["x,y,z", "-x,-y,-z"]));
    const started = performance.now();
    const e = limitError(() => computePatternDetailed(s, { wavelength: 1.540593, twoThetaMax: 100 }));
    expect(e.message).toContain("maxStructureFactorTerms");
    expect(performance.now() - started).toBeLessThan(2000);
    expect(PATTERN_LIMITS.maxStructureFactorTerms).toBeGreaterThan(0);
  });
});
