/** Options of {@link detectPeaks}. */
export interface DetectPeaksOptions {
  /**
   * Significance: a peak must rise k·σ above the background (σ from counting statistics).
   * @default 3
   */
  k?: number;
  /**
   * Minimum prominence (height above the higher of the two flanking minima), in units of σ.
   * @default 3
   */
  minProminenceSigma?: number;
  /**
   * Minimum FWHM in points (rejects one-point spikes).
   * @default 1.5
   */
  minFwhmPoints?: number;
  /**
   * Keep at most this many peaks (the most prominent).
   * @default 300
   */
  maxPeaks?: number;
  /**
   * How far (points) to search for flanking minima and half-height crossings.
   * @default 200
   */
  maxSearchPoints?: number;
}

/** A detected (unfitted) peak. */
export interface DetectedPeak {
  /** Index of the local maximum. */
  index: number;
  /** Position refined by a parabola through the top three points, ° 2θ. */
  twoTheta: number;
  /** Height above background, counts. */
  height: number;
  /** FWHM from interpolated half-height crossings, ° 2θ. */
  fwhm: number;
  prominence: number;
  /** Height / σ at the peak. */
  snr: number;
}

/**
 * Find peaks as local maxima of a background-subtracted (and usually smoothed, Kα2-stripped) signal that exceed
 * k·σ (common practice, k ≈ 3), have a prominence ≥ `minProminenceSigma`·σ and an FWHM of at
 * least `minFwhmPoints` points. Linear in the number of points times `maxSearchPoints` at most.
 * @param twoTheta - angles, ° 2θ, increasing
 * @param net - signal above background
 * @param sigma - noise σ of `net` at each point
 */
export function detectPeaks(
  twoTheta: ArrayLike<number>,
  net: ArrayLike<number>,
  sigma: ArrayLike<number>,
  options: DetectPeaksOptions = {},
): DetectedPeak[] {
  const { k = 3, minProminenceSigma = 3, minFwhmPoints = 1.5, maxPeaks = 300, maxSearchPoints = 200 } = options;
  const n = net.length;
  const found: DetectedPeak[] = [];
  for (let i = 1; i < n - 1; i++) {
    const s = net[i];
    if (!(s > net[i - 1] && s >= net[i + 1])) continue;
    // Plateau: take its middle.
    let r = i;
    while (r + 1 < n && net[r + 1] === s) r++;
    if (r + 1 >= n || net[r + 1] > s) {
      i = r;
      continue;
    }
    const top = (i + r) >> 1;
    const sg = sigma[top] > 0 ? sigma[top] : 1;
    if (s <= k * sg) {
      i = r;
      continue;
    }
    // Flanking minima (stop at a higher point or the search limit).
    let minL = s;
    for (let j = i - 1; j >= 0 && i - j <= maxSearchPoints; j--) {
      if (net[j] > s) break;
      if (net[j] < minL) minL = net[j];
    }
    let minR = s;
    for (let j = r + 1; j < n && j - r <= maxSearchPoints; j++) {
      if (net[j] > s) break;
      if (net[j] < minR) minR = net[j];
    }
    const prominence = s - Math.max(minL, minR);
    if (prominence < minProminenceSigma * sg) {
      i = r;
      continue;
    }
    // Half-height crossings, linearly interpolated.
    const half = s / 2;
    let xl = NaN;
    for (let j = i - 1; j >= 0 && i - j <= maxSearchPoints; j--) {
      if (net[j] <= half) {
        xl = twoTheta[j] + ((half - net[j]) / (net[j + 1] - net[j])) * (twoTheta[j + 1] - twoTheta[j]);
        break;
      }
    }
    let xr = NaN;
    for (let j = r + 1; j < n && j - r <= maxSearchPoints; j++) {
      if (net[j] <= half) {
        xr = twoTheta[j - 1] + ((net[j - 1] - half) / (net[j - 1] - net[j])) * (twoTheta[j] - twoTheta[j - 1]);
        break;
      }
    }
    const step = (twoTheta[Math.min(n - 1, r + 1)] - twoTheta[Math.max(0, i - 1)]) / (Math.min(n - 1, r + 1) - Math.max(0, i - 1));
    let fwhm: number;
    if (Number.isFinite(xl) && Number.isFinite(xr)) fwhm = xr - xl;
    else if (Number.isFinite(xl)) fwhm = 2 * (twoTheta[top] - xl);
    else if (Number.isFinite(xr)) fwhm = 2 * (xr - twoTheta[top]);
    else fwhm = NaN;
    if (!(fwhm >= minFwhmPoints * step)) {
      i = r;
      continue;
    }
    // Parabolic vertex through the top three points (only for a single-point maximum).
    let x0 = twoTheta[top];
    if (r === i && i > 0 && i < n - 1) {
      const a = net[i - 1];
      const c = net[i + 1];
      const den = a - 2 * s + c;
      if (den < 0) {
        const off = (0.5 * (a - c)) / den;
        if (Math.abs(off) < 1) x0 = twoTheta[i] + off * (off > 0 ? twoTheta[i + 1] - twoTheta[i] : twoTheta[i] - twoTheta[i - 1]);
      }
    }
    found.push({ index: top, twoTheta: x0, height: s, fwhm, prominence, snr: s / sg });
    i = r;
  }
  if (found.length > maxPeaks) {
    found.sort((a, b) => b.prominence - a.prominence);
    found.length = maxPeaks;
    found.sort((a, b) => a.twoTheta - b.twoTheta);
  }
  return found;
}
