/**
 * The scan's 2θ step as stored and shown. The median of successive differences of the file's 2θ column,
 * rounded to 6 significant digits: differences of decimal coordinates carry binary rounding noise
 * (0.02 → 0.019999999999999574), and no goniometer steps finer than about 1e-4° (common practice), so six
 * significant digits keep every real step (0.0131303°, 0.02°, 0.05°) and drop only the noise.
 */
export const STEP_SIGNIFICANT_DIGITS = 6;

export function roundSignificant(x: number, digits: number): number {
  if (x === 0 || !Number.isFinite(x)) return x;
  return Number(x.toPrecision(digits));
}

/** Median 2θ step of an ascending 2θ column (at least two points), rounded to 6 significant digits. */
export function medianStep(x: ArrayLike<number>): number {
  if (x.length < 2) throw new RangeError("A scan needs at least two points to have a step.");
  const d = new Float64Array(x.length - 1);
  for (let i = 1; i < x.length; i++) d[i - 1] = x[i] - x[i - 1];
  d.sort();
  return roundSignificant(d[d.length >> 1], STEP_SIGNIFICANT_DIGITS);
}
