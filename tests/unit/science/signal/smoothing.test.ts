import { describe, expect, test } from "vitest";
import { savitzkyGolayNoiseGain, smoothSavitzkyGolay, windowForFwhm } from "@/lib/science/signal";

/** Impulse response of the centre filter = the convolution weights (read off the middle of the output). */
function centreWeights(windowSize: number, polynomial: number): number[] {
  const n = 4 * windowSize + 1;
  const out: number[] = [];
  const half = (windowSize - 1) / 2;
  for (let k = -half; k <= half; k++) {
    const y = new Float64Array(n);
    y[(n - 1) / 2 + k] = 1;
    out.push(smoothSavitzkyGolay(y, { windowSize, polynomial })[(n - 1) / 2]);
  }
  return out;
}

describe("Savitzky–Golay weights (Savitzky & Golay 1964, Anal. Chem. 36, 1627, Table I; corrected by Steinier et al. 1972)", () => {
  test("5-point quadratic: (−3, 12, 17, 12, −3)/35", () => {
    const w = centreWeights(5, 2);
    [-3, 12, 17, 12, -3].forEach((c, i) => expect(w[i]).toBeCloseTo(c / 35, 12));
  });
  test("7-point quadratic: (−2, 3, 6, 7, 6, 3, −2)/21", () => {
    const w = centreWeights(7, 2);
    [-2, 3, 6, 7, 6, 3, -2].forEach((c, i) => expect(w[i]).toBeCloseTo(c / 21, 12));
  });
  test("9-point quadratic: (−21, 14, 39, 54, 59, 54, 39, 14, −21)/231", () => {
    const w = centreWeights(9, 2);
    [-21, 14, 39, 54, 59, 54, 39, 14, -21].forEach((c, i) => expect(w[i]).toBeCloseTo(c / 231, 12));
  });
  test("noise gain √(Σw²) of the 5-point quadratic filter = √595/35", () => {
    expect(savitzkyGolayNoiseGain(5, 2)).toBeCloseTo(Math.sqrt(595) / 35, 12);
  });
});

describe("smoothSavitzkyGolay behaviour", () => {
  test("a quadratic is reproduced exactly, ends included (least-squares property)", () => {
    const y = Float64Array.from({ length: 40 }, (_, i) => 3 + 0.5 * i - 0.02 * i * i);
    const s = smoothSavitzkyGolay(y, { windowSize: 7, polynomial: 2 });
    for (let i = 0; i < y.length; i++) expect(s[i]).toBeCloseTo(y[i], 9);
  });
  test("input is not modified; disabled returns an equal copy", () => {
    const y = Float64Array.from([5, 1, 9, 2, 8, 3, 7, 4]);
    const copy = y.slice();
    const s = smoothSavitzkyGolay(y, { enabled: false });
    expect(Array.from(s)).toEqual(Array.from(copy));
    expect(s).not.toBe(y);
    smoothSavitzkyGolay(y);
    expect(Array.from(y)).toEqual(Array.from(copy));
  });
  test("invalid windows are rejected", () => {
    const y = new Float64Array(50);
    expect(() => smoothSavitzkyGolay(y, { windowSize: 6 })).toThrow(RangeError);
    expect(() => smoothSavitzkyGolay(y, { windowSize: 3 })).toThrow(RangeError);
    expect(() => smoothSavitzkyGolay(y, { windowSize: 5, polynomial: 4 })).toThrow(RangeError);
  });
  test("window ≤ FWHM in points (common practice): largest odd window ≥ 5, or 0 to skip", () => {
    expect(windowForFwhm(5)).toBe(5);
    expect(windowForFwhm(6.9)).toBe(5);
    expect(windowForFwhm(7.2)).toBe(7);
    expect(windowForFwhm(4.9)).toBe(0);
  });
});
