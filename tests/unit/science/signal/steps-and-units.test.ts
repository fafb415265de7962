/**
 * Processing scans with uneven 2θ steps, very fine steps (the windows grow as 1/step, the cost must not) and
 * intensities in counts per second. Invented synthetic scans (pseudo-Voigt peaks with Kα2 at the Bragg angle of
 * λ2, ratio 0.5; Poisson noise from a seeded generator); the truth is known by construction.
 */
import { describe, expect, test } from "vitest";
import { parseScan } from "@/lib/science/scan";
import { processScan, windowForFwhm } from "@/lib/science/signal";
import type { Scan } from "@/lib/science/types";
import { kAlpha2Angle, mulberry32, poisson, pv, synthScan } from "./synthetic";

const TRUTH = [
  { twoTheta: 20.86, area: 60, fwhm: 0.1, eta: 0.5 },
  { twoTheta: 26.64, area: 300, fwhm: 0.1, eta: 0.5 },
  { twoTheta: 29.4, area: 150, fwhm: 0.12, eta: 0.4 },
  { twoTheta: 39.46, area: 50, fwhm: 0.11, eta: 0.5 },
  { twoTheta: 50.14, area: 45, fwhm: 0.13, eta: 0.5 },
  { twoTheta: 60.0, area: 60, fwhm: 0.14, eta: 0.5 },
];
const L1 = 1.540598;
const L2 = 1.544426;
const bg = (x: number) => 120 + 500 * Math.exp(-x / 8);

/** Scan on the given angles (Cu, Kα2 ratio 0.5). */
function scanAt(x: number[], seed: number): Scan {
  const rand = mulberry32(seed);
  const counts = x.map((t) => {
    let m = bg(t);
    for (const p of TRUTH) m += p.area * (pv(t - p.twoTheta, p.fwhm, p.eta) + 0.5 * pv(t - kAlpha2Angle(p.twoTheta, L1, L2), p.fwhm, p.eta));
    return poisson(m, rand);
  });
  return { twoTheta: Float64Array.from(x), counts: Float64Array.from(counts), meta: { format: "xy", settings: {}, anode: "Cu" } };
}

const nearest = <T extends { twoTheta: number }>(x: number, list: T[]): T => list.reduce((b, p) => (Math.abs(p.twoTheta - x) < Math.abs(b.twoTheta - x) ? p : b));

describe("uneven 2θ steps", () => {
  // 0.01° up to 40°, then 0.025° (a variable-step scan: finer where the peaks are dense, common practice).
  const x: number[] = [];
  for (let t = 15; t < 40 - 1e-9; t += 0.01) x.push(Math.round(t * 1e4) / 1e4);
  for (let t = 40; t <= 70 + 1e-9; t += 0.025) x.push(Math.round(t * 1e4) / 1e4);
  test("smoothing and background on an even grid, peaks fitted on the measured points, all near the truth", () => {
    const r = processScan(scanAt(x, 3));
    expect(r.params.resampledStepDeg).toBeCloseTo(0.01, 10);
    expect(r.warnings.join(" ")).toMatch(/2θ steps are uneven/);
    expect(r.twoTheta.length).toBe(x.length);
    expect(r.background.length).toBe(x.length);
    expect(r.peaks).toHaveLength(TRUTH.length);
    for (const t of TRUTH) {
      const p = nearest(t.twoTheta, r.peaks);
      expect(Math.abs(p.twoTheta - t.twoTheta)).toBeLessThan(0.01);
      expect(Math.abs(p.fwhm - t.fwhm) / t.fwhm).toBeLessThan(0.2);
    }
    // The background follows the true one (a smooth curve) within a few counting σ where there are no peaks.
    let worst = 0;
    x.forEach((t, i) => {
      if (TRUTH.some((p) => Math.abs(t - p.twoTheta) < 1)) return;
      worst = Math.max(worst, Math.abs(r.background[i] - bg(t)) / Math.sqrt(bg(t)));
    });
    expect(worst).toBeLessThan(4);
  });
  test("the same peaks as from an even 0.01° scan of the same pattern (within 0.006°)", () => {
    const even = Array.from({ length: 5501 }, (_, i) => Math.round((15 + i * 0.01) * 1e4) / 1e4);
    const a = processScan(scanAt(x, 5));
    const b = processScan(scanAt(even, 5));
    expect(b.params.resampledStepDeg).toBeNull();
    for (const p of b.peaks) expect(Math.abs(nearest(p.twoTheta, a.peaks).twoTheta - p.twoTheta)).toBeLessThan(0.006);
  });
  test("rounding jitter in the written angles is not an uneven step", () => {
    // Step 1/150° written with 3 decimals: steps of 0.006° and 0.007° alternate.
    const jitter = Array.from({ length: 3000 }, (_, i) => Math.round((20 + i / 150) * 1000) / 1000);
    const r = processScan(scanAt(jitter, 1));
    expect(r.params.resampledStepDeg).toBeNull();
  });
  test("steps too uneven to resample are refused with a clear message", () => {
    const odd = [...Array.from({ length: 200 }, (_, i) => 20 + i * 0.0005), ...Array.from({ length: 20 }, (_, i) => 25 + i * 5)];
    expect(() => processScan(scanAt(odd, 1))).toThrow(/2θ steps vary from .* split the file into its even-step parts/);
  });
});

describe("fine steps: windows in points grow as 1/step, the filters' cost does not", () => {
  test("0.00125° step (64 000 points over 80°): SNIP on block means, smoothing window capped, background and peaks right", () => {
    const { scan, background } = synthScan({ start: 15, step: 0.00125, points: 44000, ratio: 0.5, background: bg, peaks: TRUTH, seed: 4 });
    const r = processScan(scan);
    expect(r.params.background.iterations).toBe(480); // 0.6° half-width / 0.00125°
    expect(r.params.background.decimation).toBeGreaterThan(1);
    expect(r.params.smoothing.windowSize).toBeLessThanOrEqual(31);
    expect(r.peaks).toHaveLength(TRUTH.length);
    for (const t of TRUTH) expect(Math.abs(nearest(t.twoTheta, r.peaks).twoTheta - t.twoTheta)).toBeLessThan(0.006);
    let worst = 0;
    for (let i = 0; i < scan.twoTheta.length; i += 50) {
      const t = scan.twoTheta[i];
      if (TRUTH.some((p) => Math.abs(t - p.twoTheta) < 1)) continue;
      worst = Math.max(worst, Math.abs(r.background[i] - background[i]) / Math.sqrt(background[i]));
    }
    expect(worst).toBeLessThan(4);
  });
  test("a step that is 0.02° up to floating-point rounding still gives the 5-point window for a 0.1° FWHM", () => {
    expect(windowForFwhm(0.1 / 0.020000000000000018)).toBe(5);
    expect(windowForFwhm(0.1 / 0.019999999999999574)).toBe(5);
  });
  test("a 0.02° scan keeps the published SNIP on every point (no block means)", () => {
    const { scan } = synthScan({ start: 15, step: 0.02, points: 2600, ratio: 0.5, background: bg, peaks: TRUTH, seed: 4 });
    expect(processScan(scan).params.background).toMatchObject({ iterations: 30, decimation: 1 });
  });
});

describe("counts per second from the file to the processed result", () => {
  /** CSV text in cps of a synthetic scan measured for `time` s per step. */
  const cpsCsv = (time: number, header: string) => {
    const { scan } = synthScan({ start: 15, step: 0.02, points: 2600, ratio: 0.5, background: bg, peaks: TRUTH, seed: 8 });
    const lines = Array.from(scan.twoTheta, (t, i) => `${t.toFixed(2)},${(scan.counts[i] / time).toFixed(4)}`);
    return { text: `${header}\n${lines.join("\n")}\n`, counts: scan.counts };
  };
  test("with the time per step in the header: counts restored, Poisson noise model, peaks found", () => {
    const { text, counts } = cpsCsv(2, "# time per step: 2\n2theta,cps");
    const s = parseScan(text);
    expect(s.counts[100]).toBeCloseTo(counts[100], 6);
    const r = processScan(s);
    expect(r.params.noise.model).toBe("auto");
    expect(r.warnings.join(" ")).toMatch(/multiplied by the counting time/);
    expect(r.peaks).toHaveLength(TRUTH.length);
  });
  test("without a counting time: kept in cps, empirical noise model, and the parser's warning reaches the result", () => {
    const { text } = cpsCsv(2, "2theta,cps");
    const r = processScan(parseScan(text));
    expect(r.params.noise.model).toBe("empirical");
    expect(r.warnings.join(" ")).toMatch(/noise model is approximate/);
    expect(r.peaks).toHaveLength(TRUTH.length);
  });
});
