import { describe, expect, test } from "vitest";
import { expandSparse, fitOptionsOf, fitProcessed, identifyProcessed, phaseRowsOf, processScanText, runProfileOf, searchRows, sparseCurve } from "@/lib/jobs/analyse-scan";
import { REFERENCE_LIBRARY } from "@/lib/science/minerals";
import { quartzCalciteXy } from "../../fixtures/lab/handbook-scans";

const cuRow = { anode: "Cu", wavelengthA: 1.540598, wavelength2A: 1.544426 };

describe("sparse profiles (stored per phase as runs of grid points)", () => {
  // Two Lorentzian peaks on a 4001-point grid: most points are far below a count.
  const n = 4001;
  const curve = Float64Array.from({ length: n }, (_, i) => 5000 / (1 + ((i - 900) / 4) ** 2) + 800 / (1 + ((i - 2600) / 6) ** 2));

  test("round trip: every point at or above the threshold comes back to 0.1 count; the rest are zero", () => {
    const sparse = sparseCurve(curve);
    const back = expandSparse(sparse, n);
    const threshold = Math.max(0.5, 1e-3 * 5000);
    for (let i = 0; i < n; i++) {
      if (curve[i] >= threshold) expect(Math.abs(back[i] - curve[i])).toBeLessThanOrEqual(0.05 + 1e-9);
      else expect(back[i] === 0 || Math.abs(back[i] - curve[i]) <= 0.05 + 1e-9).toBe(true);
    }
    // Far fewer numbers than the grid (what keeps profile_json small).
    expect(sparse.reduce((s, [, v]) => s + v.length, 0)).toBeLessThan(n / 4);
    expect(sparse).toHaveLength(2);
  });

  test("a zero curve stores nothing", () => {
    expect(sparseCurve(new Float64Array(100))).toEqual([]);
  });
});

describe("a run's phase rows: the fit decides, the search ranks", () => {
  // Handbook quartz + calcite, 60 : 40 by weight (tests/fixtures/lab/handbook-scans.ts).
  const { processed } = processScanText(quartzCalciteXy({ seed: 5 }), {}, cuRow);
  const search = identifyProcessed(processed, {}, REFERENCE_LIBRARY);
  const fit = fitProcessed(processed, REFERENCE_LIBRARY, fitOptionsOf({}));
  const rows = phaseRowsOf(fit, searchRows(search, REFERENCE_LIBRARY));

  test("fitted rows come first with wt% ± σ and the fit's evidence; the search's rank, score and matched lines stay on them", () => {
    const fitted = rows.filter((r) => r.fitted);
    expect(fitted.map((r) => r.referencePhaseId).sort()).toEqual(["calcite", "quartz"]);
    expect(rows.slice(0, fitted.length).every((r) => r.fitted)).toBe(true);
    // Hill & Howard (1987) fractions are normalised to 100 %; semi-quantitative, so a wide window around 60 : 40.
    expect(fitted.reduce((s, r) => s + r.wtPercent!, 0)).toBeCloseTo(100, 0);
    expect(Math.abs(fitted.find((r) => r.referencePhaseId === "quartz")!.wtPercent! - 60)).toBeLessThan(10);
    for (const r of fitted) {
      expect(r.wtSigma).toBeGreaterThan(0);
      expect(r.fitJson!.evidence.deltaBic).toBeGreaterThan(10);
      expect(r.rank).not.toBeNull();
      expect(r.matchedJson!.length).toBeGreaterThan(0);
    }
  });

  test("the search's other candidates follow, unfitted and without wt%", () => {
    const others = rows.filter((r) => !r.fitted);
    expect(others.length).toBe(search.candidates.length - 2);
    for (const r of others) {
      expect(r.wtPercent).toBeNull();
      expect(r.fitJson).toBeNull();
      expect(r.rank).toBeGreaterThan(0);
    }
  });

  test("the stored profile keeps the curves on the scan grid and the fit's statistics", () => {
    const p = runProfileOf(processed, fit, search, "fit");
    expect(p.fit!.calculated).toHaveLength(processed.twoTheta.length);
    expect(p.fit!.stats).toEqual(fit.stats);
    expect(p.fit!.phases.map((x) => x.referencePhaseId)).toEqual(["quartz", "calcite"]);
    expect(p.quantification).toMatch(/semi-quantitative/);
    expect(p.mixture.map((m) => m.mineral).sort()).toEqual(["calcite", "quartz"]);
  });
});
