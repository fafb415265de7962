import { describe, expect, test } from "vitest";
import { dFromTwoTheta, dUncertainty, twoThetaFromD } from "@/lib/science/units";

// Check values recomputed independently from Bragg's law (Cu Kα1 = 1.540593 Å; Co Kα1 = 1.78900 Å).
describe("Bragg conversions (check values recomputed from Bragg's law)", () => {
  const cu = 1.540593;
  test.each([
    [3.3434, 26.64],
    [3.0356, 29.4],
    [2.82, 31.704],
  ])("Cu Kα1: d %f Å → 2θ %f°", (d, tt) => {
    expect(twoThetaFromD(d, cu)).toBeCloseTo(tt, 3);
  });
  test("Cu Kα1: 2θ 26.640° → d 3.3435 Å", () => {
    expect(dFromTwoTheta(26.64, cu)).toBeCloseTo(3.3435, 4);
  });
  test("Co Kα1 1.78900 Å: quartz d 3.3434 → 31.036°", () => {
    expect(twoThetaFromD(3.3434, 1.789)).toBeCloseTo(31.036, 3);
  });
  test("round trip d → 2θ → d", () => {
    for (const d of [1.2, 2.5, 3.3434, 7.16, 14.2]) expect(dFromTwoTheta(twoThetaFromD(d, cu), cu)).toBeCloseTo(d, 10);
  });
});

describe("impossible input gives NaN", () => {
  test("λ/2d > 1 has no reflection", () => {
    expect(twoThetaFromD(0.7, 1.540593)).toBeNaN();
  });
  test.each([0, 180, -5, 200, NaN, Infinity])("2θ = %f", (tt) => {
    expect(dFromTwoTheta(tt, 1.540593)).toBeNaN();
  });
  test("non-positive wavelength or d", () => {
    expect(dFromTwoTheta(30, 0)).toBeNaN();
    expect(twoThetaFromD(0, 1.54)).toBeNaN();
    expect(twoThetaFromD(-3, 1.54)).toBeNaN();
  });
});

describe("dUncertainty: Δd/d = −cotθ·Δθ (differentiated Bragg law)", () => {
  test("matches a central finite difference of Bragg's law", () => {
    const cu = 1.540593;
    const tt = 26.64;
    const h = 1e-4;
    const numeric = Math.abs(dFromTwoTheta(tt + h, cu) - dFromTwoTheta(tt - h, cu)) / (2 * h);
    const d = dFromTwoTheta(tt, cu);
    expect(dUncertainty(d, tt, 0.01)).toBeCloseTo(numeric * 0.01, 8);
  });
  test("hand value: d 3.3435, 2θ 26.64°, σ 0.01° → σd = 3.3435·cot(13.32°)·(0.005·π/180) ≈ 0.001233 Å", () => {
    expect(dUncertainty(3.3435, 26.64, 0.01)).toBeCloseTo(0.001233, 5);
  });
});
