import { describe, expect, test } from "vitest";
import { identifyProcessed, patternFromRow, processScanText } from "@/lib/jobs";
import { REFERENCE_LIBRARY } from "@/lib/science/minerals";
import { quartzCalciteXy } from "../../fixtures/lab/handbook-scans";

const bragg = (twoTheta: number, lambda: number) => lambda / (2 * Math.sin(((twoTheta / 2) * Math.PI) / 180)); // Bragg's law
const cuRow = { anode: "Cu" as const, wavelengthA: 1.540598, wavelength2A: 1.544426 };

describe("processScanText: the wavelength is the scan's unless the run overrides it", () => {
  const text = quartzCalciteXy({ header: false, seed: 2 });

  test("uses the stored wavelength; quartz 101 comes out at d ≈ 3.343 Å (handbook, from memory)", () => {
    const { processed } = processScanText(text, {}, cuRow);
    expect(processed.wavelength).toBe(1.540598);
    expect(processed.params.wavelengthSource).toBe("params");
    expect(processed.peaks.some((p) => Math.abs(p.d - 3.343) < 0.005)).toBe(true);
  });

  test("an anode override changes λ and every d by Bragg's law", () => {
    const { processed } = processScanText(text, { processing: { anode: "Co", kAlpha2: { enabled: false } } }, cuRow);
    expect(processed.params.anode).toBe("Co");
    // Co Kα1 ≈ 1.789 Å (ITC Vol. C 2006 §4.2.2; Hölzer et al. 1997; from memory).
    expect(processed.wavelength).toBeCloseTo(1.789, 3);
    const strongest = processed.peaks.reduce((a, b) => (b.height > a.height ? b : a));
    expect(strongest.d).toBeCloseTo(bragg(strongest.twoTheta, processed.wavelength), 10);
  });

  test("a scan row without any wavelength is an error, never a silent Cu default", () => {
    expect(() => processScanText(text, {}, { anode: null, wavelengthA: Number.NaN, wavelength2A: null })).toThrow(RangeError);
  });

  test("identification runs over the measured range and finds the handbook phases", () => {
    const { processed } = processScanText(text, {}, cuRow);
    const r = identifyProcessed(processed, {}, REFERENCE_LIBRARY);
    expect(r.params.twoThetaRange).toEqual([10, 70]);
    expect(r.phases.map((p) => p.mineral).sort()).toEqual(["calcite", "quartz"]);
  });
});

describe("patternFromRow", () => {
  test("maps a reference_phases row to an identifier pattern keyed by the row id", () => {
    const p = patternFromRow({ id: "row-1", mineral: "quartz", formula: "Si O2", elements: "O,Si", patternJson: [{ h: 1, k: 0, l: 1, d: 3.3435, intensity: 100, multiplicity: 6 }], rir: 4.3, hazard: "crystalline_silica", mineralGroup: "silica" });
    expect(p).toEqual({ id: "row-1", mineral: "quartz", formula: "Si O2", elements: ["O", "Si"], lines: [{ h: 1, k: 0, l: 1, d: 3.3435, intensity: 100, multiplicity: 6 }], rir: 4.3, hazard: "crystalline_silica", group: "silica" });
    const bare = patternFromRow({ id: "row-2", mineral: "x", formula: "", elements: "", patternJson: [], rir: null, hazard: null, mineralGroup: null });
    expect(bare).toEqual({ id: "row-2", mineral: "x", formula: "", elements: [], lines: [] });
  });
});
