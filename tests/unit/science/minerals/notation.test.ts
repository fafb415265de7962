import { describe, expect, test } from "vitest";
import { formulaSearchKey, hermannMauguin, mineralFormula, MINERAL_FORMULAS } from "@/lib/science/minerals/notation";
import { LIBRARY_PHASES } from "@/lib/science/minerals";

describe("mineral formulas (issue 11 §6)", () => {
  test("structural groups and hydrogen are kept: goethite FeO(OH), gypsum CaSO4·2H2O, kaolinite Al2Si2O5(OH)4", () => {
    // Ideal formulas as the IMA list of minerals writes them (from memory).
    expect(mineralFormula("goethite", "Fe O2 H")).toBe("FeO(OH)");
    expect(mineralFormula("Gypsum", "Ca O6 S H4")).toBe("CaSO4·2H2O");
    expect(mineralFormula("kaolinite", "Al2 Si2 O9 H4")).toBe("Al2Si2O5(OH)4");
    expect(mineralFormula("calcite", "C Ca O3")).toBe("CaCO3");
  });
  test("every shipped phase has a formula in mineral notation whose hydrogen agrees with its CIF sum", () => {
    for (const p of LIBRARY_PHASES) {
      const f = MINERAL_FORMULAS[p.mineral];
      expect(f, p.mineral).toBeDefined();
      // A phase with H in its structure shows H (as OH or H2O) in the formula, and one without shows none.
      expect(/H/.test(f.replace(/Hg/g, "")), p.mineral).toBe(/\bH[\d.]*\b/.test(p.formula));
    }
  });
  test("an unknown (imported) phase shows its sum formula compacted, hydrogen included", () => {
    expect(mineralFormula("halite test", "Cl Na")).toBe("ClNa");
    expect(mineralFormula("odd", "Fe O2 H")).toBe("FeO2H");
  });
  test("search keys agree for FeS2 and Fe S2, FeO(OH) and feooh", () => {
    expect(formulaSearchKey("Fe S2")).toBe(formulaSearchKey("FeS2"));
    expect(formulaSearchKey("FeO(OH)")).toBe("feooh");
  });
});

describe("Hermann–Mauguin symbols (International Tables Vol. A)", () => {
  test.each([
    ["P 1 21/c 1", "P2₁/c"],
    ["C 1 2/m 1", "C2/m"],
    ["R -3 c :H", "R3̄c"],
    ["I a -3 d", "Ia3̄d"],
    ["F d -3 m :2", "Fd3̄m"],
    ["I 41/a m d :2", "I4₁/amd"],
    ["P 31 2 1", "P3₁21"],
    ["P 63/m m c", "P6₃/mmc"],
    ["P b n m", "Pbnm"],
    ["C -1", "C1̄"],
    ["F m -3 m", "Fm3̄m"],
  ])("%s → %s", (cif, hm) => {
    expect(hermannMauguin(cif)).toBe(hm);
  });
});
