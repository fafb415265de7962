/**
 * Bragg's-law conversions between diffraction angle and d-spacing (first order, n = 1).
 * Angles in degrees 2θ, d-spacings and wavelengths in ångström.
 */

const RAD_PER_DEG = Math.PI / 180;

/** Degrees → radians. */
export function degToRad(deg: number): number {
  return deg * RAD_PER_DEG;
}

/** Radians → degrees. */
export function radToDeg(rad: number): number {
  return rad / RAD_PER_DEG;
}

/**
 * d-spacing from a diffraction angle, `d = λ / (2·sin(2θ/2))` (Bragg 1913, n = 1).
 * @param twoThetaDeg - diffraction angle, ° 2θ; must lie in (0, 180)
 * @param wavelengthA - wavelength, Å; must be > 0
 * @returns d in Å, or NaN when the input is impossible (angle outside (0, 180), λ ≤ 0, non-finite)
 */
export function dFromTwoTheta(twoThetaDeg: number, wavelengthA: number): number {
  if (!(twoThetaDeg > 0 && twoThetaDeg < 180) || !(wavelengthA > 0) || !Number.isFinite(wavelengthA)) return NaN;
  return wavelengthA / (2 * Math.sin(twoThetaDeg * RAD_PER_DEG * 0.5));
}

/**
 * Diffraction angle from a d-spacing, `2θ = 2·asin(λ / 2d)`.
 * @param dA - d-spacing, Å; must be > 0
 * @param wavelengthA - wavelength, Å; must be > 0
 * @returns 2θ in degrees, or NaN when no reflection is possible (λ / 2d > 1, d ≤ 0, λ ≤ 0, non-finite)
 */
export function twoThetaFromD(dA: number, wavelengthA: number): number {
  if (!(dA > 0) || !(wavelengthA > 0) || !Number.isFinite(dA) || !Number.isFinite(wavelengthA)) return NaN;
  const s = wavelengthA / (2 * dA);
  if (s > 1) return NaN;
  return (2 * Math.asin(s)) / RAD_PER_DEG;
}

/**
 * Standard uncertainty of d propagated from the uncertainty of 2θ: `|Δd| = d·cotθ·Δθ`, Δθ = Δ2θ/2 in radians
 * (differentiated Bragg law, Δd/d = −cotθ·Δθ).
 * @param dA - d-spacing, Å
 * @param twoThetaDeg - diffraction angle, ° 2θ
 * @param twoThetaEsdDeg - standard uncertainty of 2θ, ° 2θ
 * @returns σ(d) in Å (≥ 0), or NaN for impossible input
 */
export function dUncertainty(dA: number, twoThetaDeg: number, twoThetaEsdDeg: number): number {
  if (!(twoThetaDeg > 0 && twoThetaDeg < 180) || !(dA > 0) || !(twoThetaEsdDeg >= 0)) return NaN;
  const theta = twoThetaDeg * RAD_PER_DEG * 0.5;
  return Math.abs((dA * (twoThetaEsdDeg * RAD_PER_DEG * 0.5)) / Math.tan(theta));
}
