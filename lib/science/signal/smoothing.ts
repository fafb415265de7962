import { sgg } from "ml-savitzky-golay-generalized";

/** Options of {@link smoothSavitzkyGolay}. */
export interface SmoothingOptions {
  /**
   * Apply smoothing; when false the input is copied unchanged.
   * @default true
   */
  enabled?: boolean;
  /**
   * Odd window length in points (≥ 5, the minimum of the underlying implementation). Keep it ≤ the FWHM in points
   * so peaks are not flattened.
   * @default 5
   */
  windowSize?: number;
  /**
   * Polynomial order fitted in each window.
   * @default 2
   */
  polynomial?: number;
}

/**
 * Savitzky–Golay smoothing (Savitzky & Golay 1964, Anal. Chem. 36, 1627; tables corrected by Steinier, Termonia &
 * Deltour 1972): a least-squares polynomial is fitted in a moving window and its centre value taken; the ends use
 * the off-centre values of the same fits. Uses `ml-savitzky-golay-generalized` on an evenly spaced grid.
 * The input is never modified.
 * @param y - intensities (counts), evenly spaced in 2θ
 * @returns smoothed intensities, same length (a copy when disabled or when the scan is shorter than the window)
 */
export function smoothSavitzkyGolay(y: ArrayLike<number>, options: SmoothingOptions = {}): Float64Array {
  const { enabled = true, windowSize = 5, polynomial = 2 } = options;
  if (!enabled || y.length < windowSize) return Float64Array.from(y);
  if (!Number.isInteger(windowSize) || windowSize < 5 || windowSize % 2 === 0) {
    throw new RangeError(`windowSize must be an odd integer ≥ 5, got ${windowSize}`);
  }
  if (!Number.isInteger(polynomial) || polynomial < 1 || polynomial >= windowSize - 1) {
    throw new RangeError(`polynomial must be an integer in [1, windowSize − 2], got ${polynomial}`);
  }
  return sgg(y as number[], 1, { windowSize, polynomial, derivative: 0 });
}

/**
 * Noise gain of the centre Savitzky–Golay filter: σ_out/σ_in = √(Σ wᵢ²) for white noise. For the 5-point quadratic
 * filter (−3, 12, 17, 12, −3)/35 this is √(595)/35 ≈ 0.697.
 */
export function savitzkyGolayNoiseGain(windowSize = 5, polynomial = 2): number {
  const impulse = new Float64Array(2 * windowSize + 1);
  impulse[windowSize] = 1;
  const w = sgg(impulse as unknown as number[], 1, { windowSize, polynomial, derivative: 0 });
  let s = 0;
  for (let i = 0; i < w.length; i++) s += w[i] * w[i];
  return Math.sqrt(s);
}

/**
 * Largest odd window (≥ 5) not exceeding `fwhmPoints`, or 0 when even 5 points would be wider than the peaks
 * (then smoothing should be skipped).
 */
export function windowForFwhm(fwhmPoints: number): number {
  // A ratio like 0.1° / 0.019999999999999574° is 5 points, not 4.99…: rounding of the step must not drop a point.
  let w = Math.floor(fwhmPoints + 1e-9);
  if (w % 2 === 0) w -= 1;
  return w >= 5 ? w : 0;
}
