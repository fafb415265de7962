/**
 * Peak-shape functions for synthetic scans: area-normalised pseudo-Voigt `pV = η·L + (1−η)·G` with common FWHM H
 * (Thompson, Cox & Hastings 1987, J. Appl. Cryst. 20, 79), and the Caglioti, Paoletti & Ricci
 * (1958, Nucl. Instrum. 3, 223) width law `H² = U·tan²θ + V·tanθ + W`.
 */

const DEG = Math.PI / 180;
const G0 = 2 * Math.sqrt(Math.LN2 / Math.PI);
const FOUR_LN2 = 4 * Math.LN2;

/**
 * Area-normalised pseudo-Voigt value (1/° 2θ).
 * @param x - offset from the peak centre, ° 2θ
 * @param fwhm - full width at half maximum H, ° 2θ
 * @param eta - Lorentzian fraction η, 0–1
 */
export function pseudoVoigt(x: number, fwhm: number, eta: number): number {
  const q = (x * x) / (fwhm * fwhm);
  const g = (G0 / fwhm) * Math.exp(-FOUR_LN2 * q);
  const l = 2 / (Math.PI * fwhm) / (1 + 4 * q);
  return eta * l + (1 - eta) * g;
}

/** Caglioti parameters, °² (2θ). */
export interface Caglioti {
  U: number;
  V: number;
  W: number;
}

/**
 * FWHM from the Caglioti law.
 * @param twoThetaDeg - peak position, ° 2θ
 * @returns H in ° 2θ (a floor of 0.005° guards against negative H² from odd parameters)
 */
export function cagliotiFwhm(twoThetaDeg: number, { U, V, W }: Caglioti): number {
  const t = Math.tan((twoThetaDeg * DEG) / 2);
  return Math.sqrt(Math.max(U * t * t + V * t + W, 2.5e-5));
}
