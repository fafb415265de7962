/**
 * Kα2 present or not, decided from the profile shape. Scans are synthesised here (invented peaks, Poisson noise from a
 * seeded generator) with and without the Kα2 companion: Cu Kα1 1.540598 Å and Kα2 1.544426 Å, Mo Kα1 0.709319 Å
 * and Kα2 0.713609 Å (the anode table's values, which agree with Hölzer et al. 1997, Phys. Rev. A 56, 4554, to a
 * few 10⁻⁵ Å — from memory there), companion at the Bragg angle of λ2 with I(Kα2)/I(Kα1) = 0.5 (common practice).
 * The truth is known by construction.
 */
import { describe, expect, test } from "vitest";
import { processScan, type ProcessedScan } from "@/lib/science/signal";
import { synthScan } from "./synthetic";

const TRUTH = [
  { twoTheta: 20.86, area: 60, fwhm: 0.1, eta: 0.5 },
  { twoTheta: 26.64, area: 300, fwhm: 0.1, eta: 0.5 },
  { twoTheta: 29.4, area: 150, fwhm: 0.12, eta: 0.4 },
  { twoTheta: 39.46, area: 50, fwhm: 0.11, eta: 0.5 },
  { twoTheta: 50.14, area: 45, fwhm: 0.13, eta: 0.5 },
  { twoTheta: 60.0, area: 60, fwhm: 0.14, eta: 0.5 },
];
const make = (ratio: number, seed: number) =>
  synthScan({ start: 15, step: 0.02, points: 2600, ratio, background: (x) => 120 + 500 * Math.exp(-x / 8), peaks: TRUTH, seed }).scan;

/** Largest distance of a reported peak from the nearest true Kα1 position, ° 2θ. */
const worstShift = (r: ProcessedScan) => Math.max(...r.peaks.map((p) => Math.min(...TRUTH.map((t) => Math.abs(t.twoTheta - p.twoTheta)))));

describe("Kα2 decided from the peak shapes (doublet vs singlet fits, BIC: Schwarz 1978)", () => {
  const seeds = [1, 2, 3, 4, 5];
  test.each(seeds)("Cu Kα1+Kα2 doublets (λ2/λ1 = 1.544426/1.540598, Hölzer et al. 1997; ratio 0.5), seed %i: present", (seed) => {
    const r = processScan(make(0.5, seed));
    expect(r.params.kAlpha2).toMatchObject({ mode: "auto", present: true, enabled: true, decidedBy: "profile" });
    expect(r.params.kAlpha2.evidence?.peaks).toBeGreaterThanOrEqual(2);
    expect(r.params.kAlpha2.evidence?.deltaBic).toBeGreaterThan(10);
    expect(r.peaks).toHaveLength(TRUTH.length);
    expect(worstShift(r)).toBeLessThan(0.01);
  });
  test.each(seeds)("Cu Kα1 only (no Kα2 line, e.g. a primary monochromator), seed %i: absent, nothing stripped, no peak lost or moved", (seed) => {
    const scan = make(0, seed);
    const r = processScan(scan);
    expect(r.params.kAlpha2).toMatchObject({ mode: "auto", present: false, enabled: false, decidedBy: "profile" });
    expect(r.params.kAlpha2.evidence?.deltaBic).toBeLessThan(-10);
    // Rachinger not applied: the processed curve is the smoothed one (up to rounding of background + net).
    expect(Math.max(...r.stripped.map((v, i) => Math.abs(v - r.smoothed[i])))).toBeLessThan(1e-9);
    expect(r.peaks).toHaveLength(TRUTH.length);
    expect(worstShift(r)).toBeLessThan(0.006);
    expect(r.warnings.join(" ")).toMatch(/Kα1-only scan/);
  });
  test("the damage avoided: stripping Kα2 from those Kα1-only scans loses or moves peaks (what 'yes' would do)", () => {
    let worse = 0;
    for (const seed of seeds) {
      const forced = processScan(make(0, seed), { kAlpha2: { mode: "yes" } });
      if (forced.peaks.length !== TRUTH.length || worstShift(forced) > 0.02) worse++;
    }
    expect(worse).toBeGreaterThanOrEqual(4);
  });
  test("Mo Kα1+Kα2 doublets (0.709319/0.713609 Å; Hölzer et al. 1997 covers Cr–Cu, Mo from the ITC table) are found too", () => {
    const { scan } = synthScan({
      start: 8,
      step: 0.01,
      points: 3600,
      ratio: 0.5,
      lambda1: 0.709319,
      lambda2: 0.713609,
      background: () => 150,
      peaks: [
        { twoTheta: 12.1, area: 80, fwhm: 0.08, eta: 0.5 },
        { twoTheta: 19.3, area: 150, fwhm: 0.08, eta: 0.5 },
        { twoTheta: 27.5, area: 90, fwhm: 0.09, eta: 0.5 },
        { twoTheta: 36.2, area: 70, fwhm: 0.1, eta: 0.5 },
      ],
      seed: 3,
    });
    const r = processScan({ ...scan, meta: { format: "xy", settings: {}, anode: "Mo" } });
    expect(r.params.kAlpha2).toMatchObject({ present: true, decidedBy: "profile" });
    expect(r.peaks).toHaveLength(4);
  });
});

describe("Kα2 set by the caller", () => {
  test('mode "no" on a doublet scan: not stripped, single lines fitted (decidedBy "mode")', () => {
    const r = processScan(make(0.5, 7), { kAlpha2: { mode: "no" } });
    expect(r.params.kAlpha2).toMatchObject({ mode: "no", present: false, enabled: false, decidedBy: "mode" });
    expect(r.params.kAlpha2.evidence).toBeUndefined();
    // Without Kα2 in the model the unresolved doublet pulls each fitted line towards Kα2 (≥ 0.02° at these angles).
    expect(worstShift(r)).toBeGreaterThan(0.02);
  });
  test('mode "yes" on a doublet scan: stripped without running the test', () => {
    const r = processScan(make(0.5, 7), { kAlpha2: { mode: "yes" } });
    expect(r.params.kAlpha2).toMatchObject({ mode: "yes", present: true, enabled: true, decidedBy: "mode" });
  });
  test("the older switch kAlpha2.enabled = false means mode no", () => {
    const r = processScan(make(0.5, 7), { kAlpha2: { enabled: false } });
    expect(r.params.kAlpha2).toMatchObject({ mode: "no", present: false });
  });
  test("an unknown mode is a RangeError", () => {
    expect(() => processScan(make(0.5, 7), { kAlpha2: { mode: "maybe" as "yes" } })).toThrow(RangeError);
  });
  test("no Kα2 wavelength for a custom λ: nothing to decide (decidedBy no-wavelength)", () => {
    const r = processScan(make(0.5, 7), { wavelength: 0.8 });
    expect(r.params.kAlpha2).toMatchObject({ present: null, enabled: false, decidedBy: "no-wavelength" });
  });
  test("no peaks at all (an amorphous-only scan): the shapes cannot tell; assumed present, said in a warning", () => {
    const { scan } = synthScan({ start: 10, step: 0.02, points: 2000, peaks: [], background: (x) => 300 + 200 * Math.exp(-((x - 25) ** 2) / 40), seed: 2 });
    const r = processScan(scan);
    expect(r.params.kAlpha2).toMatchObject({ present: true, decidedBy: "default" });
    expect(r.warnings.join(" ")).toMatch(/assumed present/);
  });
});
