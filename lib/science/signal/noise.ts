/** Options of {@link countingVariance}. */
export interface NoiseOptions {
  /**
   * "poisson": variance = counts (σ = √N, valid for raw counts); "empirical": variance = c²·expected with c from the
   * median absolute second difference of the data (for scaled data such as counts/s); "auto": Poisson when every
   * value is an integer, else empirical.
   * @default "auto"
   */
  model?: "auto" | "poisson" | "empirical";
}

/** Result of {@link countingVariance}. */
export interface NoiseEstimate {
  /** Variance of each raw point, counts². */
  variance: Float64Array;
  /** The model actually used. */
  model: "poisson" | "poisson-esd" | "empirical";
  /** Scale c in variance = c²·expected (1 for Poisson). */
  scale: number;
}

/**
 * Variance of each raw point from counting statistics (σ² = N; common practice for raw detector counts), from the
 * file's esd when present, or — for scaled data — from a robust empirical scale: the median of
 * |yᵢ − (yᵢ₋₁ + yᵢ₊₁)/2| / √(1.5·expectedᵢ) divided by 0.6745 (normal MAD constant).
 * @param raw - measured intensities
 * @param expected - smooth estimate of the expected intensity (e.g. the smoothed scan), same length
 * @param esd - per-point standard uncertainty from the file, if any (wins when given)
 */
export function countingVariance(
  raw: ArrayLike<number>,
  expected: ArrayLike<number>,
  esd: ArrayLike<number> | undefined,
  options: NoiseOptions = {},
): NoiseEstimate {
  const { model = "auto" } = options;
  const n = raw.length;
  const variance = new Float64Array(n);
  if (esd && esd.length === n) {
    for (let i = 0; i < n; i++) variance[i] = Math.max(esd[i] * esd[i], 1e-12);
    return { variance, model: "poisson-esd", scale: 1 };
  }
  let integers = true;
  if (model === "auto") {
    for (let i = 0; i < n && integers; i++) if (!Number.isInteger(raw[i])) integers = false;
  }
  if (model === "poisson" || (model === "auto" && integers) || n < 5) {
    for (let i = 0; i < n; i++) variance[i] = Math.max(raw[i], 1);
    return { variance, model: "poisson", scale: 1 };
  }
  const r = new Float64Array(n - 2);
  for (let i = 1; i < n - 1; i++) {
    const e = Math.max(expected[i], 1e-12);
    r[i - 1] = Math.abs(raw[i] - 0.5 * (raw[i - 1] + raw[i + 1])) / Math.sqrt(1.5 * e);
  }
  r.sort();
  const c = r[r.length >> 1] / 0.6745 || 1;
  let floor = Infinity;
  for (let i = 0; i < n; i++) if (expected[i] > 0 && expected[i] < floor) floor = expected[i];
  if (!Number.isFinite(floor)) floor = 1;
  for (let i = 0; i < n; i++) variance[i] = c * c * Math.max(expected[i], floor);
  return { variance, model: "empirical", scale: c };
}
