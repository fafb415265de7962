/**
 * Area-normalised pseudo-Voigt profile `pV = η·L + (1−η)·G` with common FWHM H (Thompson, Cox & Hastings
 * 1987 for the mixing idea): `G = (2/H)·√(ln2/π)·exp(−4·ln2·x²/H²)`, `L = (2/(πH)) / (1 + 4x²/H²)`, x = 2θ − 2θ₀.
 */

const LN2 = Math.LN2;
const CG = 2 * Math.sqrt(LN2 / Math.PI);
const CL = 2 / Math.PI;

/** Unit-area pseudo-Voigt at offset `x` (° 2θ) for FWHM `h` (° 2θ) and mixing `eta` (0 Gaussian … 1 Lorentzian). */
export function pseudoVoigt(x: number, h: number, eta: number): number {
  const z = (x * x) / (h * h);
  return (eta * CL) / (h * (1 + 4 * z)) + ((1 - eta) * CG * Math.exp(-4 * LN2 * z)) / h;
}

/** Peak maximum of a pseudo-Voigt of area `area`: `area·(η·2/(πH) + (1−η)·2√(ln2/π)/H)`. */
export function pseudoVoigtHeight(area: number, h: number, eta: number): number {
  return (area * (eta * CL + (1 - eta) * CG)) / h;
}

/** Area of a pseudo-Voigt with maximum `height` (inverse of {@link pseudoVoigtHeight}). */
export function pseudoVoigtArea(height: number, h: number, eta: number): number {
  return (height * h) / (eta * CL + (1 - eta) * CG);
}

/**
 * Value and partial derivatives of `area·pV(x − x0)` with respect to x0, area, H and η, written into `out[0..4]`
 * (value, ∂/∂x0, ∂/∂area, ∂/∂H, ∂/∂η). Allocation-free for use in fitting loops.
 */
export function pseudoVoigtWithGradient(x: number, x0: number, area: number, h: number, eta: number, out: Float64Array): void {
  const u = x - x0;
  const h2 = h * h;
  const z = (u * u) / h2;
  const q = 1 + 4 * z;
  const g = (CG * Math.exp(-4 * LN2 * z)) / h;
  const l = CL / (h * q);
  const f = eta * l + (1 - eta) * g;
  // ∂G/∂x0 = G·8ln2·u/H²; ∂L/∂x0 = L·8u/(H²q)
  const dgdx0 = (g * 8 * LN2 * u) / h2;
  const dldx0 = (l * 8 * u) / (h2 * q);
  // ∂G/∂H = G(−1/H + 8ln2·u²/H³); ∂L/∂H = L(−1/H + 8u²/(H³q))
  const dgdh = g * (-1 / h + (8 * LN2 * z) / h);
  const dldh = l * (-1 / h + (8 * z) / (h * q));
  out[0] = area * f;
  out[1] = area * (eta * dldx0 + (1 - eta) * dgdx0);
  out[2] = f;
  out[3] = area * (eta * dldh + (1 - eta) * dgdh);
  out[4] = area * (l - g);
}
