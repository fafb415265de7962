/**
 * One phase's calculated profile together with its derivatives with respect to the non-linear parameters, in a
 * single pass over the lines (analytic derivatives of the pseudo-Voigt, chain rule through Bragg's law, the
 * displacement term, the Caglioti width and the March–Dollase factor of Dollase 1986).
 */
import { marchDollase } from "@/lib/science/crystal/preferred-orientation";
import { forgetSegments } from "./nnls";
import type { PhaseLines } from "./phase-lines";
import { CG, CL, GAUSS_FWHM, TAIL_FWHM, cagliotiFwhm, linePosition, lowerBound } from "./profile";
import type { GlobalProfile, PhaseProfileParams } from "./types";

const DEG = 180 / Math.PI;
const LN2 = Math.LN2;

/** Profile and derivatives of one phase, each the length of the grid. */
export interface PhaseRender {
  value: Float64Array;
  /** ∂/∂(zero shift, °). */
  dZero: Float64Array;
  /** ∂/∂(displacement, mm). */
  dDisp: Float64Array;
  /** ∂/∂η. */
  dEta: Float64Array;
  /** ∂/∂(relative cell change), i.e. ∂/∂cellScale. */
  dCell: Float64Array;
  /** ∂/∂ln(width factor). */
  dLnWidth: Float64Array;
  /** ∂/∂ln(March r), or null when the phase has no texture axis. */
  dLnR: Float64Array | null;
  /** Index span [lo, hi] of non-zero values. */
  span: [number, number];
}

export function emptyRender(n: number, textured: boolean): PhaseRender {
  return {
    value: new Float64Array(n),
    dZero: new Float64Array(n),
    dDisp: new Float64Array(n),
    dEta: new Float64Array(n),
    dCell: new Float64Array(n),
    dLnWidth: new Float64Array(n),
    dLnR: textured ? new Float64Array(n) : null,
    span: [n, -1],
  };
}

/** d ln P / d ln r of the March–Dollase factor P = (r²cos²α + sin²α/r)^(−3/2). */
function dLnMarch(cosAlpha: number, r: number): number {
  const c2 = cosAlpha * cosAlpha;
  const s2 = 1 - c2;
  const q = r * r * c2 + s2 / r;
  return (-1.5 * (2 * r * r * c2 - s2 / r)) / q;
}

/**
 * Render a phase (unit scale) with derivatives into `out` (zeroed first). The displacement derivative is filled
 * only when asked for (it is refined only on request).
 */
export function renderPhaseWithDerivatives(
  x: Float64Array,
  lines: PhaseLines,
  g: GlobalProfile,
  p: PhaseProfileParams,
  out: PhaseRender,
  withDisplacement = false,
): void {
  const n = x.length;
  forgetSegments(out.value);
  for (const a of [out.value, out.dZero, out.dDisp, out.dEta, out.dCell, out.dLnWidth, out.dLnR]) a?.fill(0);
  let spanLo = n;
  let spanHi = -1;
  const { value, dZero, dEta, dCell, dLnWidth, dLnR } = out;
  const dDisp = withDisplacement ? out.dDisp : null;
  const lo = x[0];
  const hi = x[n - 1];
  const useMd = lines.cosAlpha !== null && p.marchR !== null;
  const eta = g.eta;
  const waves: [number, number][] = [[g.wavelength, 1]];
  if (g.wavelength2 !== null && g.ka2Ratio > 0) waves.push([g.wavelength2, g.ka2Ratio]);
  for (let j = 0; j < lines.count; j++) {
    const d = lines.d[j] * p.cellScale;
    let area = lines.intensity[j];
    let dlnA = 0;
    if (useMd) {
      area *= marchDollase(lines.cosAlpha![j], p.marchR!);
      dlnA = dLnMarch(lines.cosAlpha![j], p.marchR!);
    }
    for (const [lambda, ratio] of waves) {
      const pos = linePosition(d, lambda, g);
      if (!Number.isFinite(pos.twoTheta)) continue;
      const theta = pos.theta;
      const h = p.widthFactor * cagliotiFwhm(g.caglioti, theta);
      if (pos.twoTheta + TAIL_FWHM * h < lo || pos.twoTheta - TAIL_FWHM * h > hi) continue;
      const A = area * ratio;
      const dPosDisp = ((-2 * Math.cos(theta)) / g.radiusMm) * DEG;
      // 2θ = 2·asin(λ/2d): ∂(2θ)/∂(cellScale) = −2·tanθ/cellScale (rad) at fixed λ.
      const dPosCell = ((-2 * Math.tan(theta)) / p.cellScale) * DEG;
      const h2 = h * h;
      const inv2 = 1 / h2;
      const start = lowerBound(x, pos.twoTheta - TAIL_FWHM * h);
      const end = pos.twoTheta + TAIL_FWHM * h;
      if (start < spanLo) spanLo = start;
      const p0 = pos.twoTheta;
      const lAmp = (A * CL) / h;
      const gAmp = (A * CG) / h;
      const gCut = GAUSS_FWHM * GAUSS_FWHM;
      let i = start;
      for (; i < n; i++) {
        const xi = x[i];
        if (xi > end) break;
        const u = xi - p0;
        const z = u * u * inv2;
        const q = 1 + 4 * z;
        const L = lAmp / q; // A·L(u)
        const G = z < gCut ? gAmp * Math.exp(-4 * LN2 * z) : 0; // A·G(u)
        const l = eta * L;
        const gg = (1 - eta) * G;
        const v = l + gg;
        // ∂/∂pos (pos = 2θ₀): ∂G/∂pos = G·8ln2·u/H², ∂L/∂pos = L·8u/(H²q)
        const dPos = ((l * 8) / q + gg * 8 * LN2) * (u / h2);
        value[i] += v;
        dZero[i] += dPos;
        dCell[i] += dPos * dPosCell;
        // H·∂/∂H: G(−1 + 8ln2·z), L(−1 + 8z/q)
        dLnWidth[i] += l * (-1 + (8 * z) / q) + gg * (-1 + 8 * LN2 * z);
        // ∂/∂η of A(ηL + (1 − η)G) = A(L − G)
        dEta[i] += L - G;
        if (dDisp) dDisp[i] += dPos * dPosDisp;
        if (dLnR) dLnR[i] += v * dlnA;
      }
      if (i - 1 > spanHi) spanHi = i - 1;
    }
  }
  out.span = [spanLo, spanHi];
}
