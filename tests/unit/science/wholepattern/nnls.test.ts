import fc from "fast-check";
import { describe, expect, test } from "vitest";
import { gramSystem, nnlsFromGram } from "@/lib/science/wholepattern";

/** Columns of a small dense problem as Float64Arrays. */
function columns(rows: number[][]): Float64Array[] {
  return rows[0].map((_, j) => Float64Array.from(rows.map((r) => r[j])));
}

describe("NNLS from normal equations (Lawson & Hanson 1974, ch. 23)", () => {
  test("the textbook 4×2 example: x = [0, 0.6929] (MATLAB lsqnonneg documentation example; values from memory)", () => {
    const C = [
      [0.0372, 0.2869],
      [0.6861, 0.7071],
      [0.6233, 0.6245],
      [0.6344, 0.617],
    ];
    const d = Float64Array.of(0.8587, 0.1781, 0.0747, 0.8405);
    const { G, b, yty } = gramSystem(columns(C), d, new Float64Array(4).fill(1));
    const sol = nnlsFromGram(G, 2, b, yty, [0, 1]);
    expect(sol.x[0]).toBeCloseTo(0, 6);
    expect(sol.x[1]).toBeCloseTo(0.6929, 3);
    expect(sol.chi2).toBeCloseTo(0.8315, 3); // squared residual norm (resnorm) 0.8315 in the same example
  });

  test("the solution satisfies the Karush–Kuhn–Tucker conditions on random problems (x ≥ 0, w = Aᵀ(y − Ax) ≤ 0, x·w = 0)", () => {
    fc.assert(
      fc.property(
        fc.array(fc.array(fc.double({ min: 0, max: 10, noNaN: true }), { minLength: 4, maxLength: 4 }), { minLength: 12, maxLength: 12 }),
        fc.array(fc.double({ min: -5, max: 20, noNaN: true }), { minLength: 12, maxLength: 12 }),
        (rows, yv) => {
          const cols = columns(rows);
          const y = Float64Array.from(yv);
          const w = new Float64Array(12).fill(1);
          const { G, b, yty } = gramSystem(cols, y, w);
          const sol = nnlsFromGram(G, 4, b, yty, [0, 1, 2, 3]);
          const scale = Math.max(1, ...Array.from(b, Math.abs));
          for (let j = 0; j < 4; j++) {
            expect(sol.x[j]).toBeGreaterThanOrEqual(0);
            let grad = b[j];
            for (let k = 0; k < 4; k++) grad -= G[j * 4 + k] * sol.x[k];
            expect(grad).toBeLessThanOrEqual(1e-3 * scale); // ∂(−½χ²)/∂x_j ≤ 0 at the optimum (tolerance covers the 1e-10 ridge)
            if (sol.x[j] > 1e-6) expect(Math.abs(grad)).toBeLessThanOrEqual(1e-3 * scale);
          }
        },
      ),
      { numRuns: 300 },
    );
  });
});
