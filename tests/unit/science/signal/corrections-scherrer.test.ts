import { describe, expect, test } from "vitest";
import { correctTwoTheta, displacementShift, scherrer } from "@/lib/science/signal";
import { wavelengthsFor } from "@/lib/science/anodes";

describe("specimen displacement Δ2θ = −2·s·cosθ/R (Klug & Alexander 1974, from memory)", () => {
  test("worked example: s = 0.1 mm, R = 240 mm ⇒ −0.046° at 30° 2θ", () => {
    expect(displacementShift(30, 0.1, 240)).toBeCloseTo(-0.046, 3);
  });
  test("shift shrinks toward high angle (cosθ) and changes sign with s", () => {
    expect(Math.abs(displacementShift(120, 0.1, 240))).toBeLessThan(Math.abs(displacementShift(30, 0.1, 240)));
    expect(displacementShift(30, -0.1, 240)).toBeCloseTo(0.046, 3);
  });
  test("correction removes zero error and displacement", () => {
    // A peak at true 30.000° seen with zero error +0.020° and s = 0.1 mm (R 240): observed = 30 + 0.020 − 0.046.
    const observed = 30 + 0.02 + displacementShift(30, 0.1, 240);
    expect(correctTwoTheta(observed, { zeroShiftDeg: 0.02, displacementMm: 0.1, radiusMm: 240 })).toBeCloseTo(30, 4);
    expect(correctTwoTheta(26.64)).toBe(26.64);
  });
});

describe("Scherrer size τ = Kλ/(β cosθ) (Scherrer 1918)", () => {
  const cu = wavelengthsFor("Cu").kAlpha1;
  test("worked example: β = 0.20° at 30° 2θ, Cu ⇒ ≈ 41 nm", () => {
    const r = scherrer({ fwhmDeg: 0.2, twoThetaDeg: 30, wavelengthA: cu });
    expect(r.sizeNm).toBeGreaterThan(40.5);
    expect(r.sizeNm).toBeLessThan(41.5);
    expect(r.valid).toBe(true);
  });
  test("instrumental breadth: Gaussian in quadrature, Lorentzian linearly", () => {
    // 0.25° observed, 0.15° instrumental: Gaussian β = √(0.25² − 0.15²) = 0.20°; Lorentzian β = 0.10°.
    const g = scherrer({ fwhmDeg: 0.25, twoThetaDeg: 30, wavelengthA: cu, instrumentalFwhmDeg: 0.15 });
    expect(g.betaDeg).toBeCloseTo(0.2, 12);
    expect(g.sizeNm).toBeCloseTo(scherrer({ fwhmDeg: 0.2, twoThetaDeg: 30, wavelengthA: cu }).sizeNm, 9);
    const l = scherrer({ fwhmDeg: 0.25, twoThetaDeg: 30, wavelengthA: cu, instrumentalFwhmDeg: 0.15, broadening: "lorentzian" });
    expect(l.betaDeg).toBeCloseTo(0.1, 12);
    expect(l.sizeNm).toBeCloseTo(2 * g.sizeNm, 6);
  });
  test("the assumptions say K, how instrumental breadth was removed, the validity range and what τ means", () => {
    const r = scherrer({ fwhmDeg: 0.2, twoThetaDeg: 30, wavelengthA: cu, instrumentalFwhmDeg: 0.05 });
    expect(r.assumptions).toMatch(/K = 0\.9/);
    expect(r.assumptions).toMatch(/quadrature/);
    expect(r.assumptions).toMatch(/100–200 nm/);
    expect(r.assumptions).toMatch(/column length/);
    expect(r.assumptions).toMatch(/not a particle/);
  });
  test("peak not broader than the instrument: no size; very narrow peak: flagged invalid (> 200 nm)", () => {
    const r = scherrer({ fwhmDeg: 0.05, twoThetaDeg: 30, wavelengthA: cu, instrumentalFwhmDeg: 0.06 });
    expect(r.sizeNm).toBeNaN();
    expect(r.valid).toBe(false);
    expect(scherrer({ fwhmDeg: 0.03, twoThetaDeg: 30, wavelengthA: cu }).valid).toBe(false);
  });
});
