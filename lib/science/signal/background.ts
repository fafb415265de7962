/** Options of {@link snipBackground}. */
export interface SnipOptions {
  /**
   * Estimate a background; when false a zero background is returned.
   * @default true
   */
  enabled?: boolean;
  /**
   * Clipping window m in points: about half the width (in points) of the broadest real peak.
   * @default 25
   */
  iterations?: number;
  /**
   * Apply the LLS (log-log-square-root) transform before clipping (Morháč et al. 1997), which keeps the clipping
   * well-behaved over orders of magnitude of intensity.
   * @default true
   */
  lls?: boolean;
  /**
   * Run the window from m down to 1 instead of 1 up to m (Morháč et al. 1997 note the decreasing order gives a
   * smoother estimate under broad features).
   * @default false
   */
  decreasing?: boolean;
}

/**
 * SNIP background (Ryan et al. 1988, Nucl. Instrum. Methods B 34, 396; Morháč et al. 1997, NIM A 401, 113):
 * `v = ln(ln(√(y+1)+1)+1)`; for p = 1…m: `v_i = min(v_i, (v_{i−p} + v_{i+p})/2)`; back-transform
 * `y = (exp(exp(v)−1)−1)² − 1`. O(n·m) on typed arrays. Negative input is clamped to 0 before the transform.
 * @param y - intensities (counts), evenly spaced
 * @returns background estimate, same length, never above the input
 */
export function snipBackground(y: ArrayLike<number>, options: SnipOptions = {}): Float64Array {
  const { enabled = true, iterations = 25, lls = true, decreasing = false } = options;
  const n = y.length;
  if (!enabled) return new Float64Array(n);
  if (!Number.isInteger(iterations) || iterations < 1) throw new RangeError(`iterations must be an integer ≥ 1, got ${iterations}`);
  let v = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    const yi = y[i] > 0 ? y[i] : 0;
    v[i] = lls ? Math.log(Math.log(Math.sqrt(yi + 1) + 1) + 1) : yi;
  }
  let w = new Float64Array(n);
  const m = Math.min(iterations, Math.floor((n - 1) / 2));
  for (let k = 1; k <= m; k++) {
    clipPass(v, w, decreasing ? m + 1 - k : k);
    const t = v;
    v = w;
    w = t;
  }
  const out = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    if (lls) {
      const a = Math.exp(Math.exp(v[i]) - 1) - 1;
      out[i] = a * a - 1;
    } else out[i] = v[i];
  }
  return out;
}

/** One SNIP pass with window p: `dst_i = min(src_i, (src_{i−p} + src_{i+p})/2)`, ends copied. */
function clipPass(src: Float64Array, dst: Float64Array, p: number): void {
  const n = src.length;
  dst.set(src.subarray(0, p), 0);
  dst.set(src.subarray(n - p), n - p);
  for (let i = p; i < n - p; i++) {
    const a = 0.5 * (src[i - p] + src[i + p]);
    const b = src[i];
    dst[i] = Math.min(a, b);
  }
}

/** Options of {@link correctClippingBias}. */
export interface ClippingBiasOptions {
  /**
   * Points whose residual exceeds the running median by more than this many σ are treated as peak and ignored.
   * @default 2.5
   */
  clipSigma?: number;
  /**
   * Clipping passes.
   * @default 3
   */
  passes?: number;
}

/**
 * Raise a clipping background (SNIP) by the median noise offset. On noisy data SNIP follows the lower envelope of
 * the noise, so it sits ~1–2 σ below the true background. The offset z = median((y − b)/σ) over background points
 * (points within `clipSigma` of the running median, iterated) is added back as `b + z·σ`. Own addition, not part
 * of the published SNIP algorithm; the original SNIP result is obtained with this step switched off.
 * @param y - the signal SNIP was run on
 * @param background - SNIP output
 * @param sigma - noise σ of `y` at each point
 * @returns corrected background (new array) and the offset in σ units
 */
export function correctClippingBias(
  y: ArrayLike<number>,
  background: ArrayLike<number>,
  sigma: ArrayLike<number>,
  options: ClippingBiasOptions = {},
): { background: Float64Array; offsetSigma: number } {
  const { clipSigma = 2.5, passes = 3 } = options;
  const n = y.length;
  const z = new Float64Array(n);
  for (let i = 0; i < n; i++) z[i] = (y[i] - background[i]) / (sigma[i] > 0 ? sigma[i] : 1);
  // Sort once; each clipped median is then the middle of a contiguous range found by binary search.
  const sorted = z.slice().sort();
  let center = sorted[n >> 1];
  for (let k = 0; k < passes; k++) center = clippedMedian(sorted, center - 10 * clipSigma, center + clipSigma);
  const offset = Number.isFinite(center) && center > 0 ? center : 0;
  const out = new Float64Array(n);
  for (let i = 0; i < n; i++) out[i] = background[i] + offset * (sigma[i] > 0 ? sigma[i] : 1);
  return { background: out, offsetSigma: offset };
}

/** First index whose value is ≥ v (`inclusive`) or > v (not inclusive) in a sorted array. */
function searchSorted(a: Float64Array, v: number, inclusive: boolean): number {
  let lo = 0;
  let hi = a.length;
  while (lo < hi) {
    const mid = (lo + hi) >>> 1;
    if (a[mid] < v || (!inclusive && a[mid] === v)) lo = mid + 1;
    else hi = mid;
  }
  return lo;
}

/** Median of the sorted values inside [lower, upper]. */
function clippedMedian(sorted: Float64Array, lower: number, upper: number): number {
  const a = searchSorted(sorted, lower, true);
  const b = searchSorted(sorted, upper, false) - 1;
  if (b < a) return NaN;
  return sorted[(a + b) >> 1];
}
