import fc from "fast-check";
import { describe, expect, test } from "vitest";
import type { Scan } from "@/lib/science/types";
import { processScan } from "@/lib/science/signal";
import { synthScan } from "./synthetic";

// Robustness (common practice: the pipeline must not crash on odd but valid scans): random shapes of valid scans —
// flat, zero, spiky, tiny, huge counts, scaled (counts/s) — must give finite curves and well-formed peaks.
const scanArb = fc
  .record({
    n: fc.integer({ min: 50, max: 1500 }),
    start: fc.double({ min: 1, max: 100, noNaN: true }),
    step: fc.double({ min: 0.002, max: 0.05, noNaN: true }),
    kind: fc.constantFrom("zero", "flat", "random", "spikes", "peaks", "huge", "scaled"),
    seed: fc.integer({ min: 1, max: 1e9 }),
  })
  .filter(({ n, start, step }) => start + n * step < 179)
  .map(({ n, start, step, kind, seed }): Scan => {
    let a = seed;
    const rand = () => ((a = (Math.imul(a, 48271) + 12345) % 2147483647) >>> 0) / 2147483647;
    if (kind === "peaks") {
      const mid = start + (n * step) / 2;
      return synthScan({ start, step, points: n, seed, ratio: 0.5, peaks: [{ twoTheta: mid, area: 50, fwhm: 0.1, eta: 0.5 }] }).scan;
    }
    const x = new Float64Array(n);
    const y = new Float64Array(n);
    for (let i = 0; i < n; i++) {
      x[i] = start + i * step;
      y[i] =
        kind === "zero" ? 0
        : kind === "flat" ? 500
        : kind === "random" ? Math.floor(rand() * 1000)
        : kind === "spikes" ? (rand() < 0.02 ? 1e5 : 10)
        : kind === "huge" ? 1e12 * rand()
        : (100 + 50 * rand()) / 2.5;
    }
    return { twoTheta: x, counts: y, meta: { format: "xy", settings: {}, anode: "Cu" } };
  });

describe("property: processScan never crashes on a valid scan and returns finite, consistent output", () => {
  test("random scans", () => {
    fc.assert(
      fc.property(scanArb, (scan) => {
        const r = processScan(scan);
        const n = scan.twoTheta.length;
        for (const arr of [r.smoothed, r.background, r.stripped, r.fitted]) {
          expect(arr.length).toBe(n);
          for (let i = 0; i < n; i++) if (!Number.isFinite(arr[i])) throw new Error(`non-finite value at ${i}`);
        }
        for (const p of r.peaks) {
          expect(Number.isFinite(p.twoTheta) && p.twoTheta > 0 && p.twoTheta < 180).toBe(true);
          expect(p.d).toBeGreaterThan(0);
          expect(p.fwhm).toBeGreaterThan(0);
          expect(p.area).toBeGreaterThan(0);
          expect(p.intensity).toBeGreaterThanOrEqual(0);
          expect(p.intensity).toBeLessThanOrEqual(100);
        }
        for (let i = 1; i < r.peaks.length; i++) expect(r.peaks[i].twoTheta).toBeGreaterThan(r.peaks[i - 1].twoTheta);
      }),
      { numRuns: 150, seed: 321 },
    );
  }, 60_000);
});

describe("noise models", () => {
  const truth = [{ twoTheta: 30, area: 100, fwhm: 0.1, eta: 0.5 }];
  test("scaled data (counts/s, non-integer): empirical noise model, the peak is still found", () => {
    const { scan } = synthScan({ start: 25, step: 0.02, points: 500, peaks: truth, ratio: 0.5, background: () => 300, seed: 3 });
    const cps = { ...scan, counts: scan.counts.map((v) => v / 2.5) };
    const r = processScan(cps);
    expect(r.peaks).toHaveLength(1);
    expect(Math.abs(r.peaks[0].twoTheta - 30)).toBeLessThan(0.01);
    expect(Math.abs(r.peaks[0].area - 40) / 40).toBeLessThan(0.15);
  });
  test("esd from the file is used for the weights", () => {
    const { scan } = synthScan({ start: 25, step: 0.02, points: 500, peaks: truth, ratio: 0.5, background: () => 300, seed: 4 });
    const withEsd = { ...scan, esd: scan.counts.map((v) => Math.sqrt(Math.max(v, 1))) };
    const a = processScan(scan).peaks[0];
    const b = processScan(withEsd).peaks[0];
    // esd = √N reproduces Poisson weights; only the background-level σ differs slightly (raw vs background counts).
    expect(b.twoTheta).toBeCloseTo(a.twoTheta, 3);
    expect(Math.abs((b.fwhmEsd as number) / (a.fwhmEsd as number) - 1)).toBeLessThan(0.1);
    // Doubling the file's esd doubles the reported σ (covariance ∝ esd²; the χ²ν scale is floored at 1).
    const doubled = processScan({ ...withEsd, esd: withEsd.esd.map((v) => 2 * v) }).peaks[0];
    expect(doubled.fwhmEsd as number).toBeGreaterThan(1.5 * (a.fwhmEsd as number));
  });
});
