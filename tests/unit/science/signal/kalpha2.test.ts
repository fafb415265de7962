import { describe, expect, test } from "vitest";
import { kAlpha2Separation, kAlpha2SeparationApprox, stripKAlpha2 } from "@/lib/science/signal";
import { wavelengthsFor } from "@/lib/science/anodes";
import { kAlpha2Angle, pv } from "./synthetic";

const cu = wavelengthsFor("Cu");

describe("Kα1–Kα2 separation, Cu (Rachinger 1948; 2 tanθ (λ2−λ1)/λ1 recomputed: 0.076° at 30°, 0.165° at 60°, 0.285° at 90°)", () => {
  test.each([
    [30, 0.076],
    [60, 0.165],
    [90, 0.285],
  ])("at %f° 2θ ≈ %f°", (tt, sep) => {
    expect(Math.abs(kAlpha2SeparationApprox(tt, cu.kAlpha1, cu.kAlpha2) - sep)).toBeLessThan(0.001);
    expect(Math.abs(kAlpha2Separation(tt, cu.kAlpha1, cu.kAlpha2) - sep)).toBeLessThan(0.0015);
  });
  test("exact and differential forms agree to second order (< 0.2 % at 60°)", () => {
    const a = kAlpha2Separation(60, cu.kAlpha1, cu.kAlpha2);
    const b = kAlpha2SeparationApprox(60, cu.kAlpha1, cu.kAlpha2);
    expect(Math.abs(a - b) / b).toBeLessThan(0.002);
  });
});

describe("Rachinger stripping", () => {
  // Invented doublet: Kα1 at 2θ0 with area 100, Kα2 at the exact Bragg angle with ratio 0.5 (Kα2/Kα1 ≈ 0.5, common practice), no noise.
  function doublet(center: number, fwhm: number, eta: number, step = 0.005) {
    const n = Math.round(4 / step);
    const x = new Float64Array(n);
    const y = new Float64Array(n);
    const k1 = new Float64Array(n);
    const c2 = kAlpha2Angle(center, cu.kAlpha1, cu.kAlpha2);
    for (let i = 0; i < n; i++) {
      x[i] = center - 2 + i * step;
      k1[i] = 100 * pv(x[i] - center, fwhm, eta);
      y[i] = k1[i] + 50 * pv(x[i] - c2, fwhm, eta);
    }
    return { x, y, k1, c2 };
  }
  test.each([
    [40, 0.1, 0.5],
    [90, 0.12, 0.3],
    [120, 0.15, 0.7],
  ])("doublet at %f° (FWHM %f°, η %f) is stripped to the single Kα1 peak", (center, fwhm, eta) => {
    const { x, y, k1, c2 } = doublet(center, fwhm, eta);
    const s = stripKAlpha2(x, y, cu.kAlpha1, cu.kAlpha2, { ratio: 0.5 });
    const top = Math.max(...k1);
    let maxErr = 0;
    for (let i = 0; i < x.length; i++) maxErr = Math.max(maxErr, Math.abs(s[i] - k1[i]));
    expect(maxErr / top).toBeLessThan(0.01);
    // A single maximum remains, at the Kα1 position; nothing left at the Kα2 angle.
    let maxima = 0;
    for (let i = 1; i < x.length - 1; i++) if (s[i] > s[i - 1] && s[i] >= s[i + 1] && s[i] > 0.02 * top) maxima++;
    expect(maxima).toBe(1);
    const i2 = Math.round((c2 - x[0]) / (x[1] - x[0]));
    expect(Math.abs(s[i2] - k1[i2]) / top).toBeLessThan(0.01);
  });
  test("separation below one step is handled (implicit interpolation)", () => {
    const { x, y, k1 } = doublet(15, 0.1, 0.5, 0.05); // separation ≈ 0.038° < step 0.05°
    const s = stripKAlpha2(x, y, cu.kAlpha1, cu.kAlpha2);
    const top = Math.max(...k1);
    for (let i = 0; i < x.length; i++) expect(Math.abs(s[i] - k1[i]) / top).toBeLessThan(0.05);
  });
  test("disabled copies; bad wavelengths rejected", () => {
    const { x, y } = doublet(40, 0.1, 0.5);
    expect(Array.from(stripKAlpha2(x, y, cu.kAlpha1, cu.kAlpha2, { enabled: false }))).toEqual(Array.from(y));
    expect(() => stripKAlpha2(x, y, cu.kAlpha2, cu.kAlpha1)).toThrow(RangeError);
    expect(() => stripKAlpha2(x, y, cu.kAlpha1, cu.kAlpha2, { ratio: 1.2 })).toThrow(RangeError);
  });
});
