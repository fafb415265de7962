import { describe, expect, test } from "vitest";
import { pseudoVoigt, pseudoVoigtArea, pseudoVoigtHeight, pseudoVoigtWithGradient } from "@/lib/science/signal";

// Definitions: Thompson, Cox & Hastings (1987) J. Appl. Cryst. 20, 79 (pV = ηL + (1−η)G with common FWHM H, area-normalised G and L).
describe("pseudo-Voigt profile", () => {
  test.each([0, 0.3, 0.5, 1])("η = %f: unit area (numerical integral, ±1 %% for the Lorentzian tails beyond ±500 H)", (eta) => {
    const h = 0.1;
    let s = 0;
    const dx = h / 200;
    for (let x = -50; x <= 50; x += dx) s += pseudoVoigt(x, h, eta) * dx;
    expect(Math.abs(s - 1)).toBeLessThan(eta === 0 ? 1e-9 : 0.01 * eta + 1e-9);
  });
  test.each([0, 0.4, 1])("η = %f: the value at ±H/2 is half the maximum (definition of FWHM)", (eta) => {
    const h = 0.13;
    expect(pseudoVoigt(h / 2, h, eta)).toBeCloseTo(pseudoVoigt(0, h, eta) / 2, 12);
  });
  test("Gaussian peak height 2√(ln2/π)/H and Lorentzian 2/(πH) for unit area", () => {
    expect(pseudoVoigtHeight(1, 0.1, 0)).toBeCloseTo((2 * Math.sqrt(Math.LN2 / Math.PI)) / 0.1, 12);
    expect(pseudoVoigtHeight(1, 0.1, 1)).toBeCloseTo(2 / (Math.PI * 0.1), 12);
    expect(pseudoVoigtArea(pseudoVoigtHeight(7, 0.2, 0.3), 0.2, 0.3)).toBeCloseTo(7, 12);
  });
  test("analytic gradient matches central finite differences", () => {
    const out = new Float64Array(5);
    const p = [30.01, 120, 0.11, 0.4];
    const f = (q: number[]) => q[1] * pseudoVoigt(30.05 - q[0], q[2], q[3]);
    pseudoVoigtWithGradient(30.05, p[0], p[1], p[2], p[3], out);
    expect(out[0]).toBeCloseTo(f(p), 12);
    for (let k = 0; k < 4; k++) {
      const h = 1e-6 * Math.max(1, Math.abs(p[k]));
      const up = [...p];
      const dn = [...p];
      up[k] += h;
      dn[k] -= h;
      const num = (f(up) - f(dn)) / (2 * h);
      expect(Math.abs(out[k + 1] - num)).toBeLessThan(1e-4 * Math.max(1, Math.abs(num)));
    }
  });
});
