/**
 * Calculated powder profile of one phase on a scan's 2θ grid: every reflection as an area-normalised pseudo-Voigt
 * (Thompson, Cox & Hastings 1987 mixing idea) of width H(θ) from the Caglioti relation, Kα1 plus Kα2 at the same d,
 * positions moved by the zero error and specimen displacement (Δ2θ = −2s·cosθ/R; Klug & Alexander 1974, ch. 5),
 * intensities scaled by the March–Dollase factor (Dollase 1986).
 */
import { marchDollase } from "@/lib/science/crystal/preferred-orientation";
import type { PhaseLines } from "./phase-lines";
import type { Caglioti, GlobalProfile, PhaseProfileParams } from "./types";

const DEG = 180 / Math.PI;
const LN2x4 = 4 * Math.LN2;
/** Peak heights of the unit-area Gaussian and Lorentzian of FWHM 1: 2√(ln2/π) and 2/π. */
export const CG = 2 * Math.sqrt(Math.LN2 / Math.PI);
export const CL = 2 / Math.PI;
/** Profile tails are cut at this many FWHM (the Lorentzian area beyond ±8 H is about 4 % of η). */
export const TAIL_FWHM = 8;
/** The Gaussian part is negligible (< 1e-11 of its peak) beyond ±3 H. */
export const GAUSS_FWHM = 3;

/** FWHM (° 2θ) at Bragg angle θ (rad) from the Caglioti relation, floored at a tenth of W's width. */
export function cagliotiFwhm(c: Caglioti, thetaRad: number): number {
  const t = Math.tan(thetaRad);
  const h2 = c.U * t * t + c.V * t + c.W;
  const floor = 0.01 * Math.max(c.W, 1e-6);
  return Math.sqrt(Math.max(h2, floor));
}

/** Index of the first grid point ≥ v (binary search on an increasing grid). */
export function lowerBound(x: ArrayLike<number>, v: number): number {
  let lo = 0;
  let hi = x.length;
  while (lo < hi) {
    const mid = (lo + hi) >> 1;
    if (x[mid] < v) lo = mid + 1;
    else hi = mid;
  }
  return lo;
}

function addLine(x: ArrayLike<number>, out: Float64Array, pos: number, area: number, h: number, eta: number, tail: number): void {
  const lo = lowerBound(x, pos - tail * h);
  const hiV = pos + tail * h;
  const gAmp = ((1 - eta) * CG * area) / h;
  const lAmp = (eta * CL * area) / h;
  const inv2 = 1 / (h * h);
  const gLim = GAUSS_FWHM * GAUSS_FWHM * h * h;
  for (let i = lo; i < x.length; i++) {
    const u = x[i] - pos;
    if (x[i] > hiV) break;
    const u2 = u * u;
    let v = lAmp / (1 + 4 * u2 * inv2);
    if (u2 < gLim) v += gAmp * Math.exp(-LN2x4 * u2 * inv2);
    out[i] += v;
  }
}

/** Kα1 2θ (°) of a line of spacing d at a given profile: Bragg's law, then zero error and displacement. */
export function linePosition(d: number, wavelength: number, g: Pick<GlobalProfile, "zeroShift" | "displacementMm" | "radiusMm">): { twoTheta: number; theta: number } {
  const s = wavelength / (2 * d);
  if (!(s < 1)) return { twoTheta: NaN, theta: NaN };
  const theta = Math.asin(s);
  const shift = g.zeroShift - ((2 * g.displacementMm * Math.cos(theta)) / g.radiusMm) * DEG;
  return { twoTheta: 2 * theta * DEG + shift, theta };
}

/**
 * Add `scale` × the phase's calculated profile to `out` (same length as `x`). Intensities are the reference's
 * relative values, so `scale` is in counts·° per unit of relative intensity. `tailFwhm` cuts each line that many
 * FWHM from its centre (shorter tails make sparser columns for the selection stage).
 */
export function renderPhase(
  x: ArrayLike<number>,
  lines: PhaseLines,
  g: GlobalProfile,
  p: PhaseProfileParams,
  out: Float64Array,
  scale = 1,
  tailFwhm = TAIL_FWHM,
): void {
  const lo = x[0];
  const hi = x[x.length - 1];
  const useMd = lines.cosAlpha !== null && p.marchR !== null && p.marchR !== 1;
  for (let j = 0; j < lines.count; j++) {
    const d = lines.d[j] * p.cellScale;
    let area = scale * lines.intensity[j];
    if (useMd) area *= marchDollase(lines.cosAlpha![j], p.marchR!);
    const k1 = linePosition(d, g.wavelength, g);
    if (!Number.isFinite(k1.twoTheta)) continue;
    const h = p.widthFactor * cagliotiFwhm(g.caglioti, k1.theta);
    if (k1.twoTheta + tailFwhm * h >= lo && k1.twoTheta - tailFwhm * h <= hi) addLine(x, out, k1.twoTheta, area, h, g.eta, tailFwhm);
    if (g.wavelength2 !== null && g.ka2Ratio > 0) {
      const k2 = linePosition(d, g.wavelength2, g);
      if (Number.isFinite(k2.twoTheta) && k2.twoTheta - tailFwhm * h <= hi && k2.twoTheta + tailFwhm * h >= lo)
        addLine(x, out, k2.twoTheta, area * g.ka2Ratio, h, g.eta, tailFwhm);
    }
  }
}
