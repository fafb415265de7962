const DEG = Math.PI / 180;

/**
 * Peak shift from specimen displacement in Bragg–Brentano geometry: `Δ2θ = −2·s·cosθ / R` (radians), returned in
 * degrees. Sign as in the formula: s > 0 (specimen surface below the goniometer axis, common practice convention)
 * moves peaks to lower 2θ.
 * @param twoThetaDeg - angle, ° 2θ
 * @param displacementMm - specimen displacement s, mm
 * @param radiusMm - goniometer radius R, mm
 * @returns Δ2θ, degrees (observed − true)
 */
export function displacementShift(twoThetaDeg: number, displacementMm: number, radiusMm: number): number {
  if (!(radiusMm > 0)) throw new RangeError(`radiusMm must be > 0, got ${radiusMm}`);
  return ((-2 * displacementMm * Math.cos(twoThetaDeg * DEG * 0.5)) / radiusMm) / DEG;
}

/** Options of {@link correctTwoTheta}. */
export interface TwoThetaCorrection {
  /**
   * Constant zero error Δ2θ₀ (observed − true), ° 2θ.
   * @default 0
   */
  zeroShiftDeg?: number;
  /**
   * Specimen displacement s, mm (0 = none).
   * @default 0
   */
  displacementMm?: number;
  /**
   * Goniometer radius R, mm (a common Bragg–Brentano radius; use your instrument's).
   * @default 240
   */
  radiusMm?: number;
}

/**
 * Remove zero error and specimen displacement from an observed angle: `2θ_true = 2θ_obs − Δ2θ₀ − Δ2θ_disp(2θ_obs)`
 * (the displacement term is evaluated at the observed angle; the difference is second order).
 * @returns corrected angle, ° 2θ
 */
export function correctTwoTheta(twoThetaDeg: number, correction: TwoThetaCorrection = {}): number {
  const { zeroShiftDeg = 0, displacementMm = 0, radiusMm = 240 } = correction;
  let x = twoThetaDeg - zeroShiftDeg;
  if (displacementMm !== 0) x -= displacementShift(twoThetaDeg, displacementMm, radiusMm);
  return x;
}
