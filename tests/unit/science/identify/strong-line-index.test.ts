/**
 * Strong-line index (after Hanawalt, Rinn & Frevel 1938): the right reference is always shortlisted, and the number
 * of references scored grows far slower than the library (the index's purpose; expected behaviour, common practice).
 */
import { describe, expect, test } from "vitest";
import { buildStrongLineIndex, identifyPhases, lookupStrongLines } from "@/lib/science/identify";
import { REFERENCE_LIBRARY } from "@/lib/science/minerals";
import { randomReferenceLibrary } from "@/lib/science/synthetic";
import type { Peak, ReferencePattern } from "@/lib/science/types";

const CU = 1.540593;
const deg = (d: number) => (2 * Math.asin(CU / (2 * d)) * 180) / Math.PI;

function idealPeaks(p: ReferencePattern, shift = 0): Peak[] {
  return p.lines
    .filter((l) => l.intensity >= 1 && deg(l.d) >= 5 && deg(l.d) <= 80)
    .map((l) => ({ twoTheta: deg(l.d) + shift, d: l.d, height: l.intensity, area: l.intensity, fwhm: 0.08, intensity: l.intensity }));
}

describe("buildStrongLineIndex / lookupStrongLines", () => {
  const index = buildStrongLineIndex(REFERENCE_LIBRARY);

  test("files the 5 strongest lines of every reference", () => {
    expect(index.size).toBe(REFERENCE_LIBRARY.length);
    expect(index.entries.length).toBe(REFERENCE_LIBRARY.reduce((s, p) => s + Math.min(5, p.lines.length), 0));
    const q = REFERENCE_LIBRARY.findIndex((p) => p.mineral === "quartz");
    // Quartz 101 (3.343 Å, handbook, from memory) is its strongest line, filed first.
    expect(index.lineD[q * 5]).toBeCloseTo(3.343, 2);
  });

  test("quartz's three strongest lines, shifted by 0.1°, shortlist quartz; a shift beyond the window does not", () => {
    const q = REFERENCE_LIBRARY.findIndex((p) => p.mineral === "quartz");
    // Handbook values from memory (NBS Monograph 25): quartz 3.343, 4.255, 1.818 Å.
    const tt = [3.343, 4.255, 1.818].map(deg);
    const look = (shift: number) =>
      lookupStrongLines(index, { twoTheta: tt.map((t) => t + shift), wavelength: CU, tolerance: [0.1, 0.1, 0.1], maxZeroShift: 0.15, minShared: 3, dRange: [1.2, 17] });
    expect(look(0.1)).toContain(q);
    expect(look(0.6)).not.toContain(q);
  });

  test("scored references grow far slower than the library (library ×20 ⇒ scored < 5 % of it), answer unchanged", () => {
    const quartz = REFERENCE_LIBRARY.find((p) => p.mineral === "quartz")!;
    const peaks = idealPeaks(quartz, 0.05);
    const big = [...REFERENCE_LIBRARY, ...randomReferenceLibrary({ count: 2000, seed: 3 })];
    const small = identifyPhases(peaks, REFERENCE_LIBRARY, { wavelength: CU, twoThetaRange: [5, 80] });
    const large = identifyPhases(peaks, big, { wavelength: CU, twoThetaRange: [5, 80] });
    expect(small.phases.map((p) => p.mineral)).toEqual(["quartz"]);
    expect(large.phases.map((p) => p.mineral)).toEqual(["quartz"]);
    expect(large.params.referencesSearched).toBe(big.length);
    expect(large.params.candidatesScored).toBeLessThan(0.05 * big.length);
  }, 30_000);

  test("a prebuilt index for another library is refused", () => {
    expect(() => identifyPhases([], REFERENCE_LIBRARY.slice(0, 3), { index })).toThrow(/different library/);
  });
});
