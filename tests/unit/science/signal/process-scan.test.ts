import { describe, expect, test } from "vitest";
import { parseScan, writeXy } from "@/lib/science/scan";
import { processScan, resolveProcessParams } from "@/lib/science/signal";
import { wavelengthsFor } from "@/lib/science/anodes";
import { dFromTwoTheta } from "@/lib/science/units";
import { synthScan } from "./synthetic";

const cu = wavelengthsFor("Cu");
// Invented multi-peak Cu scan with Kα2 (ratio 0.5), curved background and Poisson noise. Positions chosen near
// quartz 100/101 and calcite 104 (handbook d, from memory) for realism only; the checks use the known synthetic truth.
const TRUTH = [
  { twoTheta: 20.86, area: 60, fwhm: 0.1, eta: 0.5 },
  { twoTheta: 26.64, area: 300, fwhm: 0.1, eta: 0.5 },
  { twoTheta: 29.4, area: 150, fwhm: 0.12, eta: 0.4 },
  { twoTheta: 39.46, area: 50, fwhm: 0.11, eta: 0.5 },
  { twoTheta: 50.14, area: 45, fwhm: 0.13, eta: 0.5 },
];
const make = (seed = 1) =>
  synthScan({ start: 15, step: 0.02, points: 2000, ratio: 0.5, background: (x) => 120 + 500 * Math.exp(-x / 8), peaks: TRUTH, seed });

describe("processScan on a synthetic Cu scan", () => {
  const { scan } = make();
  const r = processScan(scan);
  test("finds exactly the Kα1 peaks (no Kα2 duplicates, no noise peaks)", () => {
    expect(r.peaks.map((p) => Math.round(p.twoTheta * 10) / 10)).toEqual(TRUTH.map((t) => Math.round(t.twoTheta * 10) / 10));
  });
  test("positions, widths and areas near the truth; d from Bragg's law with Kα1", () => {
    r.peaks.forEach((p, i) => {
      const t = TRUTH[i];
      expect(Math.abs(p.twoTheta - t.twoTheta)).toBeLessThan(0.01);
      expect(Math.abs(p.fwhm - t.fwhm) / t.fwhm).toBeLessThan(0.15);
      expect(Math.abs(p.area - t.area) / t.area).toBeLessThan(0.15);
      expect(p.d).toBeCloseTo(dFromTwoTheta(p.twoTheta, cu.kAlpha1), 12);
      expect(p.fwhmEsd).toBeGreaterThan(0);
      expect(p.dEsd).toBeGreaterThan(0);
    });
  });
  test("relative intensity: strongest = 100", () => {
    const strongest = r.peaks.reduce((a, b) => (b.height > a.height ? b : a));
    expect(strongest.intensity).toBe(100);
    expect(Math.abs(strongest.twoTheta - 26.64)).toBeLessThan(0.01);
    for (const p of r.peaks) expect(p.intensity).toBeLessThanOrEqual(100);
  });
  test("curves have the scan's length; raw equals the input and the input is untouched", () => {
    for (const a of [r.twoTheta, r.raw, r.smoothed, r.background, r.stripped, r.fitted]) expect(a.length).toBe(scan.counts.length);
    expect(Array.from(r.raw)).toEqual(Array.from(scan.counts));
    expect(r.raw).not.toBe(scan.counts);
  });
  test("fitted profile follows the raw data (reduced χ² of the residual near 1 where peaks are)", () => {
    let chi = 0;
    let n = 0;
    for (let i = 0; i < r.raw.length; i++) {
      if (r.fitted[i] - r.background[i] < 5) continue;
      chi += (r.raw[i] - r.fitted[i]) ** 2 / Math.max(r.raw[i], 1);
      n++;
    }
    expect(n).toBeGreaterThan(50);
    expect(chi / n).toBeLessThan(1.6);
  });
  test("params report every value used, with the wavelength from the file's anode", () => {
    expect(r.wavelength).toBe(cu.kAlpha1);
    expect(r.params).toMatchObject({
      anode: "Cu",
      wavelength: cu.kAlpha1,
      wavelength2: cu.kAlpha2,
      wavelengthSource: "file",
      smoothing: { enabled: true, windowSize: 5, polynomial: 2 },
      background: { enabled: true, iterations: 30, lls: true },
      kAlpha2: { enabled: true, ratio: 0.5 },
      peaks: { k: 3 },
      fitting: { enabled: true },
      scherrer: { enabled: false },
    });
    expect(r.params.stepDeg).toBeCloseTo(0.02, 10);
    expect(r.warnings).toEqual([]);
  });
});

describe("processScan options", () => {
  const { scan } = make(2);
  test("no wavelength anywhere: Cu assumed with a warning; fallbackAnode null is an error", () => {
    const bare = { ...scan, meta: { format: "xy" as const, settings: {} } };
    const r = processScan(bare);
    expect(r.params.wavelengthSource).toBe("default");
    expect(r.warnings.join(" ")).toMatch(/assumed Cu/);
    expect(() => processScan(bare, { fallbackAnode: null })).toThrow(RangeError);
  });
  test("parameters override the file: Co anode changes d but not 2θ", () => {
    const r = processScan(scan, { anode: "Co" });
    expect(r.params.wavelengthSource).toBe("params");
    expect(r.wavelength).toBe(wavelengthsFor("Co").kAlpha1);
    expect(r.peaks[1].d).toBeCloseTo(dFromTwoTheta(r.peaks[1].twoTheta, wavelengthsFor("Co").kAlpha1), 12);
  });
  test("zero shift and displacement move every peak by the expected amount", () => {
    const a = processScan(scan);
    const b = processScan(scan, { correction: { zeroShiftDeg: 0.05 } });
    a.peaks.forEach((p, i) => expect(b.peaks[i].twoTheta).toBeCloseTo(p.twoTheta - 0.05, 10));
  });
  test("every step can be switched off", () => {
    const r = processScan(scan, {
      smoothing: { enabled: false },
      background: { enabled: false },
      kAlpha2: { enabled: false },
      fitting: { enabled: false },
    });
    expect(Array.from(r.smoothed)).toEqual(Array.from(scan.counts));
    expect(r.background.every((v) => v === 0)).toBe(true);
    expect(Array.from(r.stripped)).toEqual(Array.from(r.smoothed));
    expect(Array.from(r.fitted)).toEqual(Array.from(r.background));
    expect(r.params.smoothing.enabled).toBe(false);
    expect(r.peaks.length).toBeGreaterThan(0);
  });
  test("Scherrer sizes on request, with the assumptions", () => {
    const r = processScan(scan, { scherrer: { enabled: true, instrumentalFwhmDeg: 0.05 } });
    for (const p of r.peaks) expect(p.crystalliteNm).toBeGreaterThan(30);
    expect(r.scherrerAssumptions).toMatch(/column length/);
  });
  test("custom wavelength without Kα2: stripping switched off with a warning", () => {
    const r = processScan(scan, { wavelength: 0.8 });
    expect(r.params.kAlpha2.enabled).toBe(false);
    expect(r.warnings.join(" ")).toMatch(/Kα2/);
  });
  test("coarse step: smoothing skipped with a warning", () => {
    const { params, warnings } = resolveProcessParams(scan, { expectedFwhmDeg: 0.05 });
    expect(params.smoothing.enabled).toBe(false);
    expect(warnings.join(" ")).toMatch(/smoothing skipped/);
  });
  test("works from text end to end (parseScan → processScan)", () => {
    const r = processScan(parseScan(writeXy(scan)));
    expect(r.peaks.length).toBe(TRUTH.length);
  });
});

describe("noise robustness over seeds", () => {
  test("10 seeds: the five true peaks and no false ones", () => {
    for (let seed = 10; seed < 20; seed++) {
      const r = processScan(make(seed).scan);
      expect(r.peaks.length).toBe(TRUTH.length);
    }
  });
});
