const DEG = Math.PI / 180;

/** Input of {@link scherrer}. */
export interface ScherrerInput {
  /** Observed FWHM, ° 2θ. */
  fwhmDeg: number;
  /** Peak position, ° 2θ. */
  twoThetaDeg: number;
  /** Wavelength, Å (Kα1 when Kα2 was stripped or modelled). */
  wavelengthA: number;
  /**
   * Instrumental FWHM at this angle (from a line-broadening standard), ° 2θ.
   * @default 0
   */
  instrumentalFwhmDeg?: number;
  /**
   * Scherrer constant (≈ 0.9 for FWHM of spherical crystallites; ≈ 1 for integral breadth).
   * @default 0.9
   */
  K?: number;
  /**
   * How the instrumental breadth is removed: "gaussian" β² = β_obs² − β_inst², "lorentzian" β = β_obs − β_inst.
   * @default "gaussian"
   */
  broadening?: "gaussian" | "lorentzian";
}

/** Result of {@link scherrer}. */
export interface ScherrerResult {
  /** Mean crystallite (column) size, nm; NaN when the peak is not broader than the instrument. */
  sizeNm: number;
  /** Sample breadth used, ° 2θ. */
  betaDeg: number;
  /** False when the estimate falls outside the range where the method is meaningful (> 200 nm) or is undefined. */
  valid: boolean;
  /** Plain statement of the assumptions behind the number. */
  assumptions: string;
}

/**
 * Scherrer (1918, Nachr. Ges. Wiss. Göttingen, 98) crystallite size `τ = K·λ / (β·cosθ)` with β the sample breadth
 * in radians after removing the instrumental breadth. Example (computed, K 0.9): β = 0.20° at 30° 2θ, Cu ⇒ ≈ 41 nm.
 * @returns size in nm with the assumptions that go with it
 */
export function scherrer(input: ScherrerInput): ScherrerResult {
  const { fwhmDeg, twoThetaDeg, wavelengthA, instrumentalFwhmDeg = 0, K = 0.9, broadening = "gaussian" } = input;
  const removed =
    instrumentalFwhmDeg > 0
      ? broadening === "gaussian"
        ? `instrumental FWHM ${instrumentalFwhmDeg}° removed in quadrature (Gaussian: β² = β_obs² − β_inst²)`
        : `instrumental FWHM ${instrumentalFwhmDeg}° subtracted linearly (Lorentzian: β = β_obs − β_inst)`
      : "no instrumental breadth removed (size is a lower bound)";
  const assumptions =
    `Scherrer equation τ = Kλ/(β cosθ) with K = ${K} (FWHM), λ = ${wavelengthA} Å; ${removed}; ` +
    "all remaining broadening attributed to size (no microstrain); meaningful only below ~100–200 nm; " +
    "τ is a volume-weighted mean column length of coherent domains, not a particle or grain size.";
  let beta: number;
  if (broadening === "gaussian") beta = Math.sqrt(Math.max(0, fwhmDeg * fwhmDeg - instrumentalFwhmDeg * instrumentalFwhmDeg));
  else beta = fwhmDeg - instrumentalFwhmDeg;
  if (!(beta > 0) || !(twoThetaDeg > 0 && twoThetaDeg < 180) || !(wavelengthA > 0)) {
    return { sizeNm: NaN, betaDeg: beta, valid: false, assumptions: `${assumptions} Peak not broader than the instrument: size not determinable.` };
  }
  const tauA = (K * wavelengthA) / (beta * DEG * Math.cos(twoThetaDeg * DEG * 0.5));
  const sizeNm = tauA / 10;
  return { sizeNm, betaDeg: beta, valid: sizeNm <= 200, assumptions };
}
