import { describe, expect, test } from "vitest";
import { findReferencePattern } from "@/lib/science/minerals";
import { fitCaglioti, phaseLines, renderPhase, type GlobalProfile } from "@/lib/science/wholepattern";
import type { Peak } from "@/lib/science/types";

const grid = (lo: number, hi: number, step: number) => Float64Array.from({ length: Math.round((hi - lo) / step) + 1 }, (_, i) => lo + i * step);
const g: GlobalProfile = {
  wavelength: 1.540593,
  wavelength2: null,
  ka2Ratio: 0.5,
  caglioti: { U: 0, V: 0, W: 0.01 },
  eta: 0.5,
  zeroShift: 0,
  displacementMm: 0,
  radiusMm: 240,
};

describe("calculated phase profile", () => {
  const quartz = findReferencePattern("quartz")!;

  test("quartz 101 (d 3.3434 Å) peaks at 26.64° 2θ with Cu Kα1, by Bragg's law (handbook d; Anthony et al., Handbook of Mineralogy)", () => {
    const x = grid(25, 28.5, 0.005);
    const lines = phaseLines(quartz, g.wavelength, [25, 28.5]);
    const out = new Float64Array(x.length);
    renderPhase(x, lines, g, { cellScale: 1, widthFactor: 1, marchR: null }, out);
    let at = 0;
    for (let i = 1; i < x.length; i++) if (out[i] > out[at]) at = i;
    expect(x[at]).toBeCloseTo(26.64, 1);
  });

  test("each line has the area of its relative intensity (area-normalised pseudo-Voigt; tails beyond ±8 FWHM cut ⇒ ≤ 3 % short)", () => {
    const x = grid(17, 34, 0.002);
    const lines = phaseLines(quartz, g.wavelength, [17, 34]);
    const out = new Float64Array(x.length);
    renderPhase(x, lines, g, { cellScale: 1, widthFactor: 1, marchR: null }, out);
    // 100 and 101 lie well inside the window: the integrated profile is the sum of their intensities.
    let area = 0;
    for (let i = 1; i < x.length; i++) area += 0.5 * (out[i] + out[i - 1]) * (x[i] - x[i - 1]);
    let expected = 0;
    for (let j = 0; j < lines.count; j++) {
      const tt = (2 * Math.asin(g.wavelength / (2 * lines.d[j])) * 180) / Math.PI;
      if (tt > 18.5 && tt < 32.5) expected += lines.intensity[j];
    }
    expect(area / expected).toBeGreaterThan(0.97);
    expect(area / expected).toBeLessThan(1.01);
  });

  test("Kα2 adds a second line at λ2 with half the area (Kα2/Kα1 = 0.5, common practice; Cu Kα2 1.544426 Å)", () => {
    const x = grid(25.5, 27.8, 0.002);
    const lines = phaseLines(quartz, g.wavelength, [25.5, 27.8]);
    const single = new Float64Array(x.length);
    const doublet = new Float64Array(x.length);
    renderPhase(x, lines, g, { cellScale: 1, widthFactor: 1, marchR: null }, single);
    renderPhase(x, lines, { ...g, wavelength2: 1.544426, caglioti: { U: 0, V: 0, W: 0.0004 } }, { cellScale: 1, widthFactor: 1, marchR: null }, doublet);
    const sum = (a: Float64Array) => a.reduce((s, v) => s + v, 0);
    expect(sum(doublet) / sum(single)).toBeCloseTo(1.5, 1);
  });

  test("March–Dollase r < 1 strengthens the 00l lines of a platy phase (Dollase 1986)", () => {
    const musc = findReferencePattern("muscovite")!;
    const x = grid(8, 10, 0.005);
    const lines = phaseLines(musc, g.wavelength, [8, 10]);
    const random = new Float64Array(x.length);
    const platy = new Float64Array(x.length);
    renderPhase(x, lines, g, { cellScale: 1, widthFactor: 1, marchR: 1 }, random);
    renderPhase(x, lines, g, { cellScale: 1, widthFactor: 1, marchR: 0.6 }, platy);
    // P(α = 0) = r^(−3) for the 002 line (cos α = 1): 0.6^(−3) = 4.63.
    expect(Math.max(...platy) / Math.max(...random)).toBeCloseTo(1 / 0.6 ** 3, 1);
  });
});

describe("Caglioti width function from the scan's peaks (Caglioti, Paoletti & Ricci 1958)", () => {
  test("recovers U, V, W from peak widths that follow H² = U tan²θ + V tanθ + W, and ignores broadened outliers", () => {
    const U = 0.01;
    const V = -0.004;
    const W = 0.006;
    const peaks: Peak[] = [];
    for (let tt = 10; tt <= 80; tt += 5) {
      const t = Math.tan((tt / 2) * (Math.PI / 180));
      const fwhm = Math.sqrt(U * t * t + V * t + W);
      peaks.push({ twoTheta: tt, d: 1, height: 1000, area: 100, fwhm, fwhmEsd: 0.002, intensity: 50, eta: 0.4 });
    }
    peaks.push({ twoTheta: 33, d: 1, height: 1000, area: 100, fwhm: 0.4, fwhmEsd: 0.002, intensity: 50 }); // overlap / broadened phase
    const c = fitCaglioti(peaks, [5, 85]);
    expect(c.form).toBe("quadratic");
    expect(c.U).toBeCloseTo(U, 4);
    expect(c.V).toBeCloseTo(V, 4);
    expect(c.W).toBeCloseTo(W, 4);
    expect(c.eta).toBeCloseTo(0.4, 6);
  });

  test("no usable peaks ⇒ a constant default width", () => {
    const c = fitCaglioti([], [5, 80], 0.12);
    expect(c.form).toBe("default");
    expect(Math.sqrt(c.W)).toBeCloseTo(0.12, 6);
  });
});
