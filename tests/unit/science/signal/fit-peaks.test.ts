import { describe, expect, test } from "vitest";
import { fitPeaks } from "@/lib/science/signal";
import { wavelengthsFor } from "@/lib/science/anodes";
import { synthScan } from "./synthetic";

const cu = wavelengthsFor("Cu");

// Recovery test: a synthetic pseudo-Voigt (Thompson, Cox & Hastings 1987) of known position, FWHM, area and η with Poisson
// noise (seeded RNG) is fitted from rough starting values. Truth is known by construction.
describe("pseudo-Voigt fitting recovers a known peak", () => {
  const truth = { twoTheta: 30.0, area: 120, fwhm: 0.12, eta: 0.4 };
  const seeds = Array.from({ length: 30 }, (_, i) => i + 1);
  const runs = seeds.map((seed) => {
    const { scan, background } = synthScan({ start: 28, step: 0.01, points: 400, peaks: [truth], background: () => 200, seed });
    const net = scan.counts.map((v, i) => v - background[i]);
    const res = fitPeaks(scan.twoTheta, net, scan.counts, [{ twoTheta: 30.02, height: 700, fwhm: 0.09 }]);
    return res.peaks[0];
  });
  test("position, area, FWHM and η within tolerance in every seed", () => {
    for (const p of runs) {
      expect(p.converged).toBe(true);
      expect(Math.abs(p.twoTheta - truth.twoTheta)).toBeLessThan(0.005);
      expect(Math.abs(p.area - truth.area) / truth.area).toBeLessThan(0.1);
      expect(Math.abs(p.area - truth.area)).toBeLessThan(4 * p.areaEsd);
      expect(Math.abs(p.fwhm - truth.fwhm) / truth.fwhm).toBeLessThan(0.08);
      expect(Math.abs(p.eta - truth.eta)).toBeLessThan(0.3);
    }
  });
  test("the FWHM uncertainty covers the truth (±2σ) in most seeds, and is not absurdly large", () => {
    const covered = runs.filter((p) => Math.abs(p.fwhm - truth.fwhm) <= 2 * p.fwhmEsd).length;
    // For a correct σ about 95 % of seeds fall within 2σ; require ≥ 80 % (24 of 30).
    expect(covered).toBeGreaterThanOrEqual(24);
    for (const p of runs) expect(p.fwhmEsd).toBeLessThan(0.02);
    // Position and area uncertainties likewise.
    expect(runs.filter((p) => Math.abs(p.twoTheta - truth.twoTheta) <= 2 * p.twoThetaEsd).length).toBeGreaterThanOrEqual(24);
    expect(runs.filter((p) => Math.abs(p.area - truth.area) <= 2 * p.areaEsd).length).toBeGreaterThanOrEqual(24);
  });
  test("scatter of the fitted FWHM over seeds agrees with the reported σ within a factor of 2", () => {
    const mean = runs.reduce((s, p) => s + p.fwhm, 0) / runs.length;
    const sd = Math.sqrt(runs.reduce((s, p) => s + (p.fwhm - mean) ** 2, 0) / (runs.length - 1));
    const meanEsd = runs.reduce((s, p) => s + p.fwhmEsd, 0) / runs.length;
    expect(meanEsd / sd).toBeGreaterThan(0.5);
    expect(meanEsd / sd).toBeLessThan(2);
  });
  test("reduced χ² ≈ 1 for Poisson-weighted data (correct model)", () => {
    const chi = runs.reduce((s, p) => s + p.chi2Reduced, 0) / runs.length;
    expect(chi).toBeGreaterThan(0.8);
    expect(chi).toBeLessThan(1.25);
  });
});

describe("doublet model: Kα1 + Kα2 at ratio 0.5 fitted as one line", () => {
  test("area and position of Kα1 recovered; a single peak reported", () => {
    const truth = { twoTheta: 60.0, area: 200, fwhm: 0.14, eta: 0.5 };
    const { scan, background } = synthScan({ start: 58.5, step: 0.01, points: 300, peaks: [truth], ratio: 0.5, background: () => 150, seed: 9 });
    const net = scan.counts.map((v, i) => v - background[i]);
    const res = fitPeaks(scan.twoTheta, net, scan.counts, [{ twoTheta: 60.01, height: 900, fwhm: 0.12 }], {
      doublet: { lambda1: cu.kAlpha1, lambda2: cu.kAlpha2, ratio: 0.5 },
    });
    expect(res.peaks).toHaveLength(1);
    const p = res.peaks[0];
    expect(Math.abs(p.twoTheta - 60)).toBeLessThan(0.004);
    expect(Math.abs(p.area - 200) / 200).toBeLessThan(0.06);
    expect(Math.abs(p.fwhm - 0.14) / 0.14).toBeLessThan(0.06);
  });
  test("two overlapping peaks are fitted together in one group", () => {
    const peaks = [
      { twoTheta: 40.0, area: 100, fwhm: 0.1, eta: 0.5 },
      { twoTheta: 40.15, area: 60, fwhm: 0.1, eta: 0.5 },
    ];
    const { scan, background } = synthScan({ start: 39, step: 0.01, points: 250, peaks, background: () => 100, seed: 4 });
    const net = scan.counts.map((v, i) => v - background[i]);
    const res = fitPeaks(scan.twoTheta, net, scan.counts, [
      { twoTheta: 40.01, height: 700, fwhm: 0.1 },
      { twoTheta: 40.14, height: 400, fwhm: 0.1 },
    ]);
    expect(res.peaks).toHaveLength(2);
    expect(res.peaks[0].group).toBe(res.peaks[1].group);
    expect(Math.abs(res.peaks[0].area - 100) / 100).toBeLessThan(0.1);
    expect(Math.abs(res.peaks[1].area - 60) / 60).toBeLessThan(0.15);
  });
});
