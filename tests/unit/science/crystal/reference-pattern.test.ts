/** CIF text → ReferencePattern for the identifier (shared type in lib/science/types.ts). */
import { describe, expect, it } from "vitest";
import { CifError, referencePatternFromCif } from "@/lib/science/crystal";
import { testCif, testStructure } from "./helpers";

describe("referencePatternFromCif", () => {
  it("quartz: name, formula, elements from the sites, lines d-descending with I ≥ 0.5", () => {
    const p = referencePatternFromCif(testCif("quartz.cif"), { id: "ref-quartz" });
    expect(p).toMatchObject({ id: "ref-quartz", mineral: "quartz", formula: "O2 Si", elements: ["O", "Si"] });
    expect(p.rir).toBeUndefined();
    expect(p.lines.every((l) => l.intensity >= 0.5)).toBe(true);
    for (let i = 1; i < p.lines.length; i++) expect(p.lines[i].d).toBeLessThan(p.lines[i - 1].d);
    // strongest line: quartz 101, d ≈ 3.343 Å, 2θ ≈ 26.64° with Cu Kα1 (Bragg's law; handbook d from memory)
    const top = p.lines.find((l) => l.intensity === 100)!;
    expect([top.h, top.k, top.l, top.multiplicity]).toEqual([1, 0, 1, 12]);
    expect(top.twoTheta).toBeCloseTo(26.63, 1);
    expect(p.structure.citation.journal).toBe("American Mineralogist");
  });

  it("adds the RIR when a corundum structure is given; 2θ follows the wavelength, d does not", () => {
    const corundum = testStructure("corundum.cif");
    const cu = referencePatternFromCif(testCif("halite.cif"), { id: "h", corundum });
    expect(cu.rir).toBeGreaterThan(3);
    const mo = referencePatternFromCif(testCif("halite.cif"), { id: "h", wavelength: 0.709317, mineral: "Halite (Mo)" });
    expect(mo.mineral).toBe("halite (mo)");
    const d200 = (p: typeof cu) => p.lines.find((l) => l.h === 2 && l.k === 0 && l.l === 0)!;
    expect(d200(mo).d).toBeCloseTo(d200(cu).d, 12);
    expect(d200(mo).twoTheta!).toBeLessThan(d200(cu).twoTheta!);
  });

  it("passes CifErrors through", () => {
    expect(() => referencePatternFromCif("data_x\n_cell_length_a 5\n", { id: "x" })).toThrow(CifError);
  });
});
