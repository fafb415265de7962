/**
 * Whole-pattern identification on scans synthesised from the library's calculated patterns with intensities
 * I ∝ W·RIR (Chung 1974; equivalent to Hill & Howard 1987 for structure-derived RIR), Caglioti widths, Kα1+Kα2,
 * curved background and Poisson noise. Test design, not measured data.
 */
import { describe, expect, test } from "vitest";
import { findReferencePattern, REFERENCE_LIBRARY } from "@/lib/science/minerals";
import { processScan } from "@/lib/science/signal";
import { synthesizeScan } from "@/lib/science/synthetic";
import { identifyWholePattern } from "@/lib/science/wholepattern";

const ref = (name: string) => findReferencePattern(name)!;

function mixture(parts: [string, number][], seed = 7, extra: Parameters<typeof synthesizeScan>[0] extends infer O ? Partial<O> : never = {}) {
  const scan = synthesizeScan({ phases: parts.map(([name, weight]) => ({ pattern: ref(name), weight })), range: [5, 75], maxCounts: 20000, seed, ...extra });
  return processScan(scan, { anode: "Cu" });
}

describe("identifyWholePattern", () => {
  test("quartz 50 + calcite 30 + albite 20 wt%: all three found, wt% within 3 of the design (Hill & Howard 1987)", () => {
    const r = identifyWholePattern(mixture([["quartz", 50], ["calcite", 30], ["albite", 20]]), REFERENCE_LIBRARY);
    const wt = Object.fromEntries(r.phases.map((p) => [p.referenceId, p.wtPercent]));
    expect(Object.keys(wt).sort()).toEqual(["albite", "calcite", "quartz"]);
    expect(Math.abs(wt.quartz! - 50)).toBeLessThan(3);
    expect(Math.abs(wt.calcite! - 30)).toBeLessThan(3);
    expect(Math.abs(wt.albite! - 20)).toBeLessThan(3);
    for (const p of r.phases) {
      expect(p.evidence.aloneLines.length).toBeGreaterThanOrEqual(2);
      expect(p.wtSigma).toBeGreaterThan(0);
    }
    expect(r.stats.gof).toBeLessThan(3);
    expect(r.quantification.semiQuantitative).toBe(true);
    // calculated + difference = observed, point by point
    for (let i = 0; i < r.observed.length; i += 97) expect(r.calculated[i] + r.difference[i]).toBeCloseTo(r.observed[i], 6);
  });

  test("quartz 50 + albite 30 + muscovite 20 wt% (albite's strongest lines crowd at 27.7–28.0° 2θ): all found, wt% within 3", () => {
    const r = identifyWholePattern(processScan(synthesizeScan({ phases: [["quartz", 50], ["albite", 30], ["muscovite", 20]].map(([m, w]) => ({ pattern: ref(m as string), weight: w as number })), zeroShift: 0.04, seed: 21 })), REFERENCE_LIBRARY);
    const wt = Object.fromEntries(r.phases.map((p) => [p.referenceId, p.wtPercent]));
    expect(Object.keys(wt).sort()).toEqual(["albite", "muscovite", "quartz"]);
    expect(Math.abs(wt.albite! - 30)).toBeLessThan(3);
  });

  test("a minor phase (hematite 8 wt%) next to a major one is found, and nothing else is added", () => {
    const r = identifyWholePattern(mixture([["quartz", 92], ["hematite", 8]], 11), REFERENCE_LIBRARY);
    expect(r.phases.map((p) => p.referenceId).sort()).toEqual(["hematite", "quartz"]);
    expect(Math.abs(r.phases.find((p) => p.referenceId === "hematite")!.wtPercent! - 8)).toBeLessThan(2);
  });

  test("an amorphous-only scan gives no confident match (nothing reported)", () => {
    const scan = synthesizeScan({ phases: [], amorphousHump: { center: 23, fwhm: 5, height: 900 }, range: [5, 75], seed: 3 });
    const r = identifyWholePattern(processScan(scan, { anode: "Cu" }), REFERENCE_LIBRARY);
    expect(r.noConfidentMatch).toBe(true);
    expect(r.phases).toEqual([]);
  });

  test("the analyst's own phase list is fitted as given (refit), and an unknown id is refused", () => {
    const processed = mixture([["quartz", 60], ["calcite", 40]], 5);
    const r = identifyWholePattern(processed, REFERENCE_LIBRARY, { phaseIds: ["quartz"] });
    expect(r.phases.map((p) => p.referenceId)).toEqual(["quartz"]);
    expect(r.phases[0].wtPercent).toBe(100);
    const both = identifyWholePattern(processed, REFERENCE_LIBRARY, { phaseIds: ["quartz", "calcite"] });
    expect(both.stats.rwp).toBeLessThan(r.stats.rwp);
    expect(() => identifyWholePattern(processed, REFERENCE_LIBRARY, { phaseIds: ["unobtainium"] })).toThrow(/unknown reference phase/);
  });

  test("calcite lines left out of the library show up as unexplained peaks with their d-spacings", () => {
    const processed = mixture([["quartz", 60], ["calcite", 40]], 5);
    const library = REFERENCE_LIBRARY.filter((p) => !["calcite", "aragonite", "dolomite", "magnesite", "siderite", "rhodochrosite", "smithsonite", "ankerite"].includes(p.id));
    const r = identifyWholePattern(processed, library);
    // calcite 104: d = 3.035 Å (Anthony et al., Handbook of Mineralogy)
    expect(r.unexplained.some((u) => Math.abs(u.d - 3.035) < 0.01)).toBe(true);
  });
});

describe("internal standard (Chung 1974, J. Appl. Cryst. 7, 526)", () => {
  test("quartz 40 + corundum 20 wt% with 40 wt% invisible amorphous: declaring corundum 20 wt% gives quartz 50 % and 50 % amorphous of the original specimen", () => {
    // The scan shows only the crystalline part, quartz:corundum = 2:1 by weight; with W_s = 0.2 of the spiked
    // specimen, quartz is 0.4 of it, i.e. 0.4/0.8 = 50 % of the original, and the rest (50 %) is amorphous.
    const processed = mixture([["quartz", 40], ["corundum", 20]], 9);
    const r = identifyWholePattern(processed, REFERENCE_LIBRARY, { internalStandard: { referenceId: "corundum", wtPercent: 20 } });
    const quartz = r.phases.find((p) => p.referenceId === "quartz")!;
    expect(Math.abs(quartz.wtPercent! - 50)).toBeLessThan(3);
    expect(r.quantification.semiQuantitative).toBe(false);
    expect(Math.abs(r.quantification.amorphousWtPercent! - 50)).toBeLessThan(3);
    expect(r.phases.find((p) => p.referenceId === "corundum")!.wtNote).toMatch(/internal standard/);
  });
});

describe("phases a pattern alone cannot tell apart", () => {
  test("magnetite (a = 8.396 Å) and chromite (a = 8.378 Å; Anthony et al., Handbook of Mineralogy) are listed as look-alikes, also for the analyst's own choice", () => {
    const processed = mixture([["quartz", 70], ["magnetite", 30]], 13);
    const auto = identifyWholePattern(processed, REFERENCE_LIBRARY);
    const spinel = auto.phases.find((p) => p.series === "spinel group" || p.referenceId === "magnetite")!;
    expect(spinel.referenceId).toBe("magnetite"); // the member whose own cell fits
    const refit = identifyWholePattern(processed, REFERENCE_LIBRARY, { phaseIds: ["quartz", "chromite"] });
    const chosen = refit.phases.find((p) => p.referenceId === "chromite")!;
    expect(chosen.alternatives.map((a) => a.referenceId)).toContain("magnetite"); // never swapped, only listed
  });
});
