/**
 * Small dense linear algebra for least-squares normal equations (p ≲ 50), on row-major Float64Arrays.
 */

/**
 * Cholesky factor L (lower triangle, row-major) of a symmetric positive-definite M: M = L·Lᵀ.
 * @param out - p×p workspace for L (allocated when omitted)
 * @returns L, or null when M is not positive definite (numerically)
 */
export function choleskyFactor(m: Float64Array, p: number, out?: Float64Array): Float64Array | null {
  const l = out ?? new Float64Array(p * p);
  for (let i = 0; i < p; i++) {
    for (let j = 0; j <= i; j++) {
      let s = m[i * p + j];
      for (let k = 0; k < j; k++) s -= l[i * p + k] * l[j * p + k];
      if (i === j) {
        if (!(s > 0) || !Number.isFinite(s)) return null;
        l[i * p + i] = Math.sqrt(s);
      } else l[i * p + j] = s / l[j * p + j];
    }
  }
  return l;
}

/**
 * Solve L·Lᵀ·x = b for a Cholesky factor from {@link choleskyFactor} (forward then back substitution).
 * @param out - length-p result (allocated when omitted); may be `b` itself
 */
export function choleskySolve(l: Float64Array, b: Float64Array, p: number, out?: Float64Array): Float64Array {
  const x = out ?? new Float64Array(p);
  for (let i = 0; i < p; i++) {
    let s = b[i];
    for (let k = 0; k < i; k++) s -= l[i * p + k] * x[k];
    x[i] = s / l[i * p + i];
  }
  for (let i = p - 1; i >= 0; i--) {
    let s = x[i];
    for (let k = i + 1; k < p; k++) s -= l[k * p + i] * x[k];
    x[i] = s / l[i * p + i];
  }
  return x;
}

/**
 * Solve `M·x = b` for a symmetric positive-definite M by Cholesky decomposition (M is not modified).
 * @returns x, or null when M is not positive definite (numerically)
 */
export function solveSpd(m: Float64Array, b: Float64Array, p: number): Float64Array | null {
  const l = choleskyFactor(m, p);
  return l ? choleskySolve(l, b, p) : null;
}

/**
 * Inverse of a symmetric positive-definite matrix: one Cholesky factorisation, then one solve per column.
 * @returns the inverse, or null when M is singular
 */
export function invertSpd(m: Float64Array, p: number): Float64Array | null {
  const l = choleskyFactor(m, p);
  if (!l) return null;
  const inv = new Float64Array(p * p);
  const e = new Float64Array(p);
  const x = new Float64Array(p);
  for (let c = 0; c < p; c++) {
    e.fill(0);
    e[c] = 1;
    choleskySolve(l, e, p, x);
    for (let r = 0; r < p; r++) inv[r * p + c] = x[r];
  }
  return inv;
}
