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
 * Products of columns that never change during a fit (background terms) with each other and with the data, kept
 * between Gram builds. Valid for one y and one w.
 */
export interface ProductCache {
  stable: Set<Float64Array>;
  products: Map<Float64Array, Map<Float64Array, number>>;
  yty: number;
}

/** Columns registered as the negation of another (background terms used with both signs). */
const mirrors = new WeakMap<Float64Array, Float64Array>();
/** Non-zero index segments of a column, cached (columns are rendered once and reused across many systems). */
const segmentCache = new WeakMap<Float64Array, Int32Array>();

/** A column holding −source, known to the Gram builder so its products are taken from the source's. */
export function mirroredColumn(source: Float64Array): Float64Array {
  const neg = source.map((v) => -v);
  mirrors.set(neg, source);
  return neg;
}

/** Forget the cached segments of a column whose values are about to be rewritten in place. */
export function forgetSegments(c: Float64Array): void {
  segmentCache.delete(c);
}

/** [lo₀, hi₀, lo₁, hi₁, …]: maximal runs of non-zero values (inclusive). */
function segments(c: Float64Array): Int32Array {
  let s = segmentCache.get(c);
  if (s) return s;
  const out: number[] = [];
  const n = c.length;
  let i = 0;
  while (i < n) {
    while (i < n && c[i] === 0) i++;
    if (i >= n) break;
    const lo = i;
    while (i < n && c[i] !== 0) i++;
    out.push(lo, i - 1);
  }
  s = Int32Array.from(out);
  segmentCache.set(c, s);
  return s;
}

function weightedDot(a: Float64Array, sa: Int32Array, b: Float64Array, sb: Int32Array, w: Float64Array): number {
  let t = 0;
  let i = 0;
  let j = 0;
  while (i < sa.length && j < sb.length) {
    const lo = Math.max(sa[i], sb[j]);
    const hi = Math.min(sa[i + 1], sb[j + 1]);
    for (let k = lo; k <= hi; k++) t += w[k] * a[k] * b[k];
    if (sa[i + 1] < sb[j + 1]) i += 2;
    else j += 2;
  }
  return t;
}

/**
 * Gram system of the columns: G = AᵀWA, b = AᵀWy, yᵀWy. Products run only over the columns' non-zero segments,
 * and a column made by {@link mirroredColumn} reuses its source's products with the sign flipped.
 */
export function gramSystem(
  columns: readonly Float64Array[],
  y: Float64Array,
  w: Float64Array,
  cache?: ProductCache,
): { G: Float64Array; b: Float64Array; yty: number } {
  const n = columns.length;
  const len = y.length;
  // Canonical (unique) columns and the sign of each input column.
  const uniq: Float64Array[] = [];
  const slot = new Map<Float64Array, number>();
  const of = new Int32Array(n);
  const sign = new Float64Array(n);
  columns.forEach((c, i) => {
    const src = mirrors.get(c);
    const base = src ?? c;
    let k = slot.get(base);
    if (k === undefined) {
      k = uniq.length;
      uniq.push(base);
      slot.set(base, k);
    }
    of[i] = k;
    sign[i] = src ? -1 : 1;
  });
  const u = uniq.length;
  const segs = uniq.map(segments);
  const Gu = new Float64Array(u * u);
  const bu = new Float64Array(u);
  const allY = Int32Array.of(0, len - 1);
  const dot = (a: number, bIdx: number | -1): number => {
    const A = uniq[a];
    const B = bIdx < 0 ? y : uniq[bIdx];
    const stable = cache && cache.stable.has(A) && (bIdx < 0 || cache.stable.has(B));
    if (stable) {
      const hit = cache.products.get(A)?.get(B);
      if (hit !== undefined) return hit;
    }
    const v = weightedDot(A, segs[a], B, bIdx < 0 ? allY : segs[bIdx], w);
    if (stable) {
      if (!cache.products.has(A)) cache.products.set(A, new Map());
      cache.products.get(A)!.set(B, v);
    }
    return v;
  };
  let yty = cache?.yty ?? -1;
  if (yty < 0) {
    yty = 0;
    for (let i = 0; i < len; i++) yty += w[i] * y[i] * y[i];
    if (cache) cache.yty = yty;
  }
  for (let p = 0; p < u; p++) {
    bu[p] = dot(p, -1);
    for (let q = p; q < u; q++) {
      const t = dot(p, q);
      Gu[p * u + q] = t;
      Gu[q * u + p] = t;
    }
  }
  const G = new Float64Array(n * n);
  const b = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    b[i] = sign[i] * bu[of[i]];
    for (let j = 0; j < n; j++) G[i * n + j] = sign[i] * sign[j] * Gu[of[i] * u + of[j]];
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
