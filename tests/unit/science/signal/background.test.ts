import { describe, expect, test } from "vitest";
import { correctClippingBias, snipBackground } from "@/lib/science/signal";

import { pv, synthScan } from "./synthetic";

// SNIP as defined by Ryan et al. (1988, NIM B 34, 396) and Morháč et al. (1997, NIM A 401, 113).
describe("SNIP background", () => {
  test("hand-worked clipping without the LLS transform: a 1-point spike is removed at p = 1", () => {
    // p = 1: v2 = min(10, (0 + 0)/2) = 0; the others are already minima.
    expect(Array.from(snipBackground([0, 0, 10, 0, 0], { iterations: 1, lls: false }))).toEqual([0, 0, 0, 0, 0]);
    // Linear data are left unchanged: (v_{i−p} + v_{i+p})/2 = v_i.
    const line = Array.from({ length: 21 }, (_, i) => 5 + 2 * i);
    expect(Array.from(snipBackground(line, { iterations: 5, lls: false }))).toEqual(line);
  });
  test("LLS transform and its inverse are exact on a constant", () => {
    const y = new Float64Array(100).fill(1234);
    const b = snipBackground(y, { iterations: 10 });
    for (let i = 0; i < y.length; i++) expect(b[i]).toBeCloseTo(1234, 8);
  });
  test("never above the input; disabled gives zeros", () => {
    const { scan } = synthScan({ points: 800, peaks: [{ twoTheta: 15, area: 100, fwhm: 0.1, eta: 0.5 }], seed: 3 });
    const b = snipBackground(scan.counts, { iterations: 20 });
    for (let i = 0; i < b.length; i++) expect(b[i]).toBeLessThanOrEqual(Math.max(scan.counts[i], 0) + 1e-9);
    expect(Array.from(snipBackground(scan.counts, { enabled: false })).every((v) => v === 0)).toBe(true);
  });
  test("smooth curved background under narrow peaks: background within 1.5 % and peak heights within 3 %", () => {
    // Invented test case: decaying (convex) background 150 + 900·exp(−2θ/8) plus three narrow pseudo-Voigts, no noise.
    const bgFn = (x: number) => 150 + 900 * Math.exp(-x / 8);
    const peaks = [
      { twoTheta: 20, area: 400, fwhm: 0.1, eta: 0.3 },
      { twoTheta: 35, area: 200, fwhm: 0.12, eta: 0.3 },
      { twoTheta: 55, area: 100, fwhm: 0.15, eta: 0.3 },
    ];
    const { scan, background } = synthScan({ start: 10, step: 0.02, points: 3000, peaks, background: bgFn, noise: false });
    const b = snipBackground(scan.counts, { iterations: 30 });
    for (let i = 50; i < 2950; i++) expect(Math.abs(b[i] - background[i]) / background[i]).toBeLessThan(0.015);
    for (const p of peaks) {
      const i = Math.round((p.twoTheta - 10) / 0.02);
      const trueHeight = p.area * pv(0, p.fwhm, p.eta);
      const got = scan.counts[i] - b[i];
      expect(Math.abs(got - trueHeight) / trueHeight).toBeLessThan(0.03);
    }
  });
  test("bias correction moves the background back to the noise centre (Poisson noise, seeded)", () => {
    const { scan, background } = synthScan({ points: 2000, peaks: [], background: () => 400, seed: 5 });
    const snip = snipBackground(scan.counts, { iterations: 25 });
    const sigma = new Float64Array(2000).fill(20); // √400, counting statistics
    const { background: fixed, offsetSigma } = correctClippingBias(scan.counts, snip, sigma);
    const mean = (a: ArrayLike<number>) => Array.from(a).reduce((s, v) => s + v, 0) / a.length;
    // SNIP alone sits below the true level (follows the noise minima) …
    expect(mean(snip)).toBeLessThan(background[0] - 20);
    // … the corrected level is within 0.5 σ of the truth.
    expect(Math.abs(mean(fixed) - 400)).toBeLessThan(10);
    expect(offsetSigma).toBeGreaterThan(0);
  });
});
