/**
 * Non-negative least squares from normal equations: minimise ‖y − A·x‖²_w subject to x ≥ 0, given only the Gram
 * matrix G = AᵀWA, b = AᵀWy and yᵀWy. The columns of A (calculated phase profiles) are long and sparse, so G is
 * built once and every subset of columns is solved from it: G = LLᵀ (Cholesky), then ‖Lᵀx − L⁻¹b‖² differs from
 * the original objective by a constant, and that small problem goes to the fast combinatorial active-set NNLS of
 * ml-fcnnls (Van Benthem & Keenan 2004, after Lawson & Hanson 1974, "Solving Least Squares Problems", ch. 23).
 */
import { fcnnlsVector } from "ml-fcnnls";
import { CholeskyDecomposition, Matrix } from "ml-matrix";

export interface NnlsSolution {
  /** Coefficients, one per selected column, ≥ 0. */
  x: Float64Array;
  /** Weighted residual sum of squares yᵀWy − 2bᵀx + xᵀGx (clamped at 0). */
  chi2: number;
}

/**
 * Solve the NNLS problem restricted to the columns `cols` of a Gram system.
 * @param G - full Gram matrix (n×n, row-major Float64Array)
 * @param n - its order
 * @param b - AᵀWy (length n)
 * @param yty - yᵀWy
 * @param cols - indices of the columns to use
 */
export function nnlsFromGram(G: Float64Array, n: number, b: Float64Array, yty: number, cols: readonly number[]): NnlsSolution {
  const m = cols.length;
  if (m === 0) return { x: new Float64Array(0), chi2: yty };
  const sub = new Matrix(m, m);
  let trace = 0;
  for (let i = 0; i < m; i++) trace += G[cols[i] * n + cols[i]];
  const ridge = 1e-10 * (trace / m || 1);
  for (let i = 0; i < m; i++)
    for (let j = 0; j < m; j++) sub.set(i, j, G[cols[i] * n + cols[j]] + (i === j ? ridge : 0));
  const chol = new CholeskyDecomposition(sub);
  const L = chol.lowerTriangularMatrix;
  // Forward substitution: z = L⁻¹ b
  const z = new Array<number>(m);
  for (let i = 0; i < m; i++) {
    let s = b[cols[i]];
    for (let k = 0; k < i; k++) s -= L.get(i, k) * z[k];
    z[i] = s / L.get(i, i);
  }
  const x = new Float64Array(m);
  const k = fcnnlsVector(L.transpose(), z, { maxIterations: 10 * m + 10 }).K;
  for (let i = 0; i < m; i++) x[i] = Math.max(0, k.get(i, 0));
  let chi2 = yty;
  for (let i = 0; i < m; i++) {
    chi2 -= 2 * b[cols[i]] * x[i];
    for (let j = 0; j < m; j++) chi2 += x[i] * G[cols[i] * n + cols[j]] * x[j];
  }
  return { x, chi2: Math.max(chi2, 0) };
}

/**
 * Gram system of dense columns: G = AᵀWA, b = AᵀWy, yᵀWy. Each column is scanned only over its non-zero span.
 */
export function gramSystem(columns: readonly Float64Array[], y: Float64Array, w: Float64Array): { G: Float64Array; b: Float64Array; yty: number } {
  const n = columns.length;
  const len = y.length;
  const spans = columns.map((c) => {
    let lo = 0;
    while (lo < len && c[lo] === 0) lo++;
    let hi = len - 1;
    while (hi >= lo && c[hi] === 0) hi--;
    return [lo, hi] as const;
  });
  const G = new Float64Array(n * n);
  const b = new Float64Array(n);
  let yty = 0;
  for (let i = 0; i < len; i++) yty += w[i] * y[i] * y[i];
  for (let p = 0; p < n; p++) {
    const cp = columns[p];
    const [lp, hp] = spans[p];
    let s = 0;
    for (let i = lp; i <= hp; i++) s += w[i] * cp[i] * y[i];
    b[p] = s;
    for (let q = p; q < n; q++) {
      const cq = columns[q];
      const lo = Math.max(lp, spans[q][0]);
      const hi = Math.min(hp, spans[q][1]);
      let t = 0;
      for (let i = lo; i <= hi; i++) t += w[i] * cp[i] * cq[i];
      G[p * n + q] = t;
      G[q * n + p] = t;
    }
  }
  return { G, b, yty };
}

/** Inverse of the Gram sub-matrix of `cols` (the unscaled covariance of their coefficients), or null if singular. */
export function gramInverse(G: Float64Array, n: number, cols: readonly number[]): Matrix | null {
  const m = cols.length;
  const sub = new Matrix(m, m);
  for (let i = 0; i < m; i++) for (let j = 0; j < m; j++) sub.set(i, j, G[cols[i] * n + cols[j]]);
  const chol = new CholeskyDecomposition(sub);
  if (!chol.isPositiveDefinite()) return null;
  return chol.solve(Matrix.eye(m));
}
