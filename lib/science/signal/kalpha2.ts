const DEG = Math.PI / 180;

/**
 * Kα1–Kα2 separation at a Kα1 angle, exact form `Δ2θ = 2·asin((λ2/λ1)·sinθ) − 2θ`.
 * @param twoThetaDeg - Kα1 angle, ° 2θ
 * @param lambda1 - Kα1 wavelength, Å
 * @param lambda2 - Kα2 wavelength, Å
 * @returns separation, ° 2θ (NaN where the Kα2 reflection cannot occur)
 */
export function kAlpha2Separation(twoThetaDeg: number, lambda1: number, lambda2: number): number {
  const s = (lambda2 / lambda1) * Math.sin(twoThetaDeg * DEG * 0.5);
  if (!(s <= 1)) return NaN;
  return (2 * Math.asin(s)) / DEG - twoThetaDeg;
}

/**
 * Kα1–Kα2 separation, differential form used by Rachinger (1948): `Δ2θ = 2·tanθ·(λ2 − λ1)/λ1` (radians → °).
 */
export function kAlpha2SeparationApprox(twoThetaDeg: number, lambda1: number, lambda2: number): number {
  return (2 * Math.tan(twoThetaDeg * DEG * 0.5) * (lambda2 - lambda1)) / lambda1 / DEG;
}

/** Options of {@link stripKAlpha2}. */
export interface KAlpha2Options {
  /**
   * Remove the Kα2 component; when false the input is copied.
   * @default true
   */
  enabled?: boolean;
  /**
   * Intensity ratio I(Kα2)/I(Kα1).
   * @default 0.5
   */
  ratio?: number;
}

/**
 * Rachinger (1948, J. Sci. Instrum. 25, 254) Kα2 stripping: assuming the Kα2 profile is the Kα1 profile scaled by
 * `ratio` and displaced to the Kα2 angle, from low to high angle `I1(2θ) = I(2θ) − R·I1(2θ₁)` where 2θ₁ is the Kα1
 * angle whose Kα2 line falls at 2θ (`sinθ₁ = (λ1/λ2)·sinθ`). I1 is interpolated linearly; linear time.
 * Apply to background-subtracted intensities.
 * @param twoTheta - angles, ° 2θ, strictly increasing
 * @param y - net intensities (background removed)
 * @param lambda1 - Kα1 wavelength, Å
 * @param lambda2 - Kα2 wavelength, Å
 * @returns Kα1-only intensities, same length
 */
export function stripKAlpha2(
  twoTheta: ArrayLike<number>,
  y: ArrayLike<number>,
  lambda1: number,
  lambda2: number,
  options: KAlpha2Options = {},
): Float64Array {
  const { enabled = true, ratio = 0.5 } = options;
  const n = y.length;
  const out = Float64Array.from(y);
  if (!enabled || ratio === 0) return out;
  if (!(ratio > 0 && ratio < 1)) throw new RangeError(`ratio must be in [0, 1), got ${ratio}`);
  if (!(lambda2 > lambda1 && lambda1 > 0)) throw new RangeError("need 0 < λ1 < λ2 for Kα2 stripping");
  const q = lambda1 / lambda2;
  let j = 0; // moving pointer: x1 increases with x
  for (let i = 0; i < n; i++) {
    const x1 = (2 * Math.asin(q * Math.sin(twoTheta[i] * DEG * 0.5))) / DEG;
    if (i === 0 || x1 < twoTheta[0]) continue;
    while (j + 1 < i && twoTheta[j + 1] <= x1) j++;
    if (j === i - 1) {
      // Separation below one step: I1(2θ₁) interpolates between I1[i−1] and the unknown I1[i]; solve for I1[i].
      const t = (x1 - twoTheta[j]) / (twoTheta[i] - twoTheta[j]);
      out[i] = (y[i] - ratio * (1 - t) * out[j]) / (1 + ratio * t);
    } else {
      const t = (x1 - twoTheta[j]) / (twoTheta[j + 1] - twoTheta[j]);
      out[i] = y[i] - ratio * (out[j] + t * (out[j + 1] - out[j]));
    }
  }
  return out;
}
