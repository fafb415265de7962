/**
 * The synthetic-scan generator used by the identification tests and the benchmark, against Bragg's law, the Kα2
 * separations (Rachinger 1948; Δ2θ = 2 tanθ (λ2−λ1)/λ1, recomputed), Poisson counting statistics (σ² = N) and the RIR intensity relation.
 */
import { describe, expect, test } from "vitest";
import { cagliotiFwhm, createRandom, marchDollase, poissonDeviate, pseudoVoigt, reciprocalMetric, synthesizeScan } from "@/lib/science/synthetic";
import type { ReferencePattern } from "@/lib/science/types";

const line = (d: number, intensity: number, hkl: [number, number, number] = [1, 0, 0]) => ({ h: hkl[0], k: hkl[1], l: hkl[2], d, intensity, multiplicity: 1 });
const phase = (lines: ReturnType<typeof line>[], rir = 1): ReferencePattern => ({ id: "t", mineral: "test", formula: "X", elements: ["O"], lines, rir });

function argmaxIn(x: Float64Array, y: Float64Array, lo: number, hi: number): number {
  let best = -1;
  for (let i = 0; i < x.length; i++) if (x[i] >= lo && x[i] <= hi && (best < 0 || y[i] > y[best])) best = i;
  return x[best];
}

describe("synthesizeScan", () => {
  test("a line at d 3.3434 Å peaks at 26.640° 2θ with Cu Kα1 (Bragg's law, recomputed), shifted by the zero shift", () => {
    for (const zeroShift of [0, 0.1]) {
      const s = synthesizeScan({ phases: [{ pattern: phase([line(3.3434, 100)]), weight: 1 }], step: 0.002, range: [25, 28], noise: false, background: false, kalpha2Ratio: 0, zeroShift });
      expect(argmaxIn(s.twoTheta, s.counts, 25, 28)).toBeCloseTo(26.64 + zeroShift, 2);
    }
  });

  test("Kα2 sits 0.165° above Kα1 at 60° 2θ (Rachinger 1948; recomputed) with half the area", () => {
    const d = 1.540593 / (2 * Math.sin((30 * Math.PI) / 180)); // Kα1 at exactly 60°
    const s = synthesizeScan({ phases: [{ pattern: phase([line(d, 100)]), weight: 1 }], step: 0.001, range: [59, 61], noise: false, background: false, fwhm: { U: 0, V: 0, W: 0.0016 }, eta: 0 });
    const p1 = argmaxIn(s.twoTheta, s.counts, 59.9, 60.08);
    const p2 = argmaxIn(s.twoTheta, s.counts, 60.1, 60.3);
    expect(p1).toBeCloseTo(60, 2);
    expect(p2 - p1).toBeCloseTo(0.165, 2);
  });

  test("RIR weighting: 50:50 by weight of RIR 3 and RIR 1 ⇒ integrated intensities 3:1 (Chung 1974)", () => {
    const a = phase([line(4.0, 100)], 3);
    const b = phase([line(2.5, 100)], 1);
    const s = synthesizeScan({ phases: [{ pattern: a, weight: 1 }, { pattern: b, weight: 1 }], step: 0.005, range: [15, 45], noise: false, background: false, kalpha2Ratio: 0, referenceWavelength: 1.540593 });
    const area = (lo: number, hi: number) => s.twoTheta.reduce((acc, x, i) => (x >= lo && x <= hi ? acc + s.counts[i] * 0.005 : acc), 0);
    // Same Lp correction for both (reference wavelength = scan wavelength), so the ratio is RIR·X.
    expect(area(20, 24.4) / area(34, 38)).toBeCloseTo(3, 1);
  });

  test("Poisson noise: variance ≈ mean on a flat background (σ = √N, Poisson statistics), seeded and reproducible", () => {
    const opts = { phases: [], range: [10, 90] as [number, number], step: 0.01, background: { a0: 400, a1: 0, a2: 0, lowAngle: 0 }, seed: 7 };
    const s = synthesizeScan(opts);
    const mean = s.counts.reduce((a, b) => a + b, 0) / s.counts.length;
    const v = s.counts.reduce((a, b) => a + (b - mean) ** 2, 0) / (s.counts.length - 1);
    expect(mean).toBeCloseTo(400, -1);
    expect(v / mean).toBeGreaterThan(0.9);
    expect(v / mean).toBeLessThan(1.1);
    expect(synthesizeScan(opts).counts).toEqual(s.counts);
  });

  test("curved background rises toward low angle (1/2θ term) and an amorphous hump adds a broad maximum", () => {
    const s = synthesizeScan({ phases: [], noise: false, amorphousHump: { center: 22, fwhm: 8, height: 500 } });
    const at = (x: number) => s.counts[Math.round((x - 5) / 0.02)];
    expect(at(5)).toBeGreaterThan(at(12));
    expect(at(22)).toBeGreaterThan(at(12) + 300);
  });

  test("bad input is refused with the reason", () => {
    expect(() => synthesizeScan({ phases: [{ pattern: { ...phase([line(3, 100)]), rir: undefined }, weight: 1 }] })).toThrow(/no RIR/);
    expect(() => synthesizeScan({ phases: [], range: [80, 5] })).toThrow(/range/);
  });
});

describe("profile helpers", () => {
  test("pseudo-Voigt is area-normalised (Thompson, Cox & Hastings 1987) and has half maximum at ±H/2", () => {
    let area = 0;
    for (let x = -200; x <= 200; x += 0.001) area += pseudoVoigt(x, 0.1, 0.5) * 0.001;
    expect(area).toBeCloseTo(1, 2); // Lorentzian tails beyond ±200° hold ~0.02 % of the area
    expect(pseudoVoigt(0.05, 0.1, 0.3) / pseudoVoigt(0, 0.1, 0.3)).toBeCloseTo(0.5, 10);
  });
  test("Caglioti: H² = U·tan²θ + V·tanθ + W (Caglioti, Paoletti & Ricci 1958)", () => {
    const t = Math.tan((30 * Math.PI) / 180);
    expect(cagliotiFwhm(60, { U: 0.01, V: -0.003, W: 0.005 })).toBeCloseTo(Math.sqrt(0.01 * t * t - 0.003 * t + 0.005), 12);
  });
  test("March–Dollase: P(α = 0) = r⁻³ and P(α = 90°) = r^(3/2) (Dollase 1986, J. Appl. Cryst. 19, 267)", () => {
    const g = reciprocalMetric({ a: 5, b: 5, c: 5, alpha: 90, beta: 90, gamma: 90 });
    expect(marchDollase([0, 0, 2], [0, 0, 1], 0.7, g)).toBeCloseTo(0.7 ** -3, 10);
    expect(marchDollase([2, 0, 0], [0, 0, 1], 0.7, g)).toBeCloseTo(0.7 ** 1.5, 10);
    expect(marchDollase([1, 1, 1], [0, 0, 1], 1, g)).toBeCloseTo(1, 12);
  });
  test("Poisson deviates for a small mean have mean ≈ variance ≈ λ", () => {
    const r = createRandom(1);
    const xs = Array.from({ length: 20000 }, () => poissonDeviate(r, 4));
    const m = xs.reduce((a, b) => a + b, 0) / xs.length;
    const v = xs.reduce((a, b) => a + (b - m) ** 2, 0) / xs.length;
    expect(m).toBeCloseTo(4, 1);
    expect(v).toBeCloseTo(4, 0);
  });
});
