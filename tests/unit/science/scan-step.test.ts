import { describe, expect, it } from "vitest";
import { medianStep, roundSignificant } from "@/lib/science/scan/step";

/** 2θ column as a file writes it: decimal text with the given decimals, read back as numbers. */
const column = (start: number, step: number, n: number, decimals: number) =>
  Float64Array.from({ length: n }, (_, i) => Number((start + i * step).toFixed(decimals)));

describe("stored 2θ step (median difference, 6 significant digits)", () => {
  it("a 0.02° scan written with 4 decimals stores 0.02, not 0.019999999999999574", () => {
    const x = column(5, 0.02, 3001, 4);
    // the raw median difference carries binary noise (IEEE 754 doubles: 5.02 − 5 ≠ 0.02)
    const raw = [...x.slice(1)].map((v, i) => v - x[i]).sort((a, b) => a - b)[1500];
    expect(raw).not.toBe(0.02);
    expect(medianStep(x)).toBe(0.02);
  });

  it("keeps a fine step with six significant digits (0.0131303°, a common step of position-sensitive detectors; from memory)", () => {
    expect(medianStep(column(3.0049, 0.0131303, 5000, 7))).toBe(0.0131303);
  });

  it("the median ignores a single gap or repeated point in the file", () => {
    const x = [10, 10.05, 10.1, 10.1, 10.15, 10.2, 11, 11.05, 11.1];
    expect(medianStep(x)).toBe(0.05);
  });

  it("roundSignificant follows Number.prototype.toPrecision (ECMA-262 §21.1.3.5)", () => {
    expect(roundSignificant(0.019999999999999574, 6)).toBe(0.02);
    expect(roundSignificant(123456.789, 6)).toBe(123457);
    expect(roundSignificant(0, 6)).toBe(0);
  });

  it("refuses a column of fewer than two points", () => {
    expect(() => medianStep([1])).toThrow(/at least two points/);
  });
});
