/**
 * Instrument width function from the scan's own clean peaks: H² = U·tan²θ + V·tanθ + W (Caglioti, Paoletti & Ricci
 * 1958, Nucl. Instrum. 3, 223), fitted by weighted least squares to the fitted FWHMs, with the broadest outliers
 * (overlaps, broadened phases) trimmed so the function follows the sharp phases; each phase then gets its own width
 * factor in the refinement.
 */
import { solve, Matrix } from "ml-matrix";
import type { Peak } from "@/lib/science/types";
import type { Caglioti } from "./types";

const RAD = Math.PI / 180;

export interface CagliotiFit extends Caglioti {
  /** Peaks the final fit used. */
  used: number;
  /** "quadratic" (U, V, W), "linear" (U, W), "constant" (W) or "default" (no usable peaks). */
  form: "quadratic" | "linear" | "constant" | "default";
  /** Median pseudo-Voigt η of the used peaks (0.5 when unknown). */
  eta: number;
}

interface Point {
  t: number;
  h2: number;
  w: number;
  h: number;
  eta: number | undefined;
}

function fitForm(pts: readonly Point[], form: CagliotiFit["form"]): Caglioti | null {
  const cols = form === "quadratic" ? 3 : form === "linear" ? 2 : 1;
  if (pts.length < cols + 1) return null;
  const a = Matrix.zeros(cols, cols);
  const b = Matrix.zeros(cols, 1);
  for (const p of pts) {
    const row = form === "quadratic" ? [p.t * p.t, p.t, 1] : form === "linear" ? [p.t * p.t, 1] : [1];
    for (let i = 0; i < cols; i++) {
      b.set(i, 0, b.get(i, 0) + p.w * row[i] * p.h2);
      for (let j = 0; j < cols; j++) a.set(i, j, a.get(i, j) + p.w * row[i] * row[j]);
    }
  }
  let x: Matrix;
  try {
    x = solve(a, b);
  } catch {
    return null;
  }
  const v = x.to1DArray();
  const c = form === "quadratic" ? { U: v[0], V: v[1], W: v[2] } : form === "linear" ? { U: v[0], V: 0, W: v[1] } : { U: 0, V: 0, W: v[0] };
  return Object.values(c).every(Number.isFinite) ? c : null;
}

function positiveOver(c: Caglioti, tLo: number, tHi: number): boolean {
  for (let k = 0; k <= 20; k++) {
    const t = tLo + ((tHi - tLo) * k) / 20;
    if (!(c.U * t * t + c.V * t + c.W > 1e-6)) return false;
  }
  return c.U >= 0 || c.U * tHi * tHi + c.V * tHi + c.W > 0;
}

/**
 * Fit the width function to the peaks of a processed scan.
 * @param peaks - fitted peaks (fwhm in ° 2θ)
 * @param range - 2θ range of the scan (°), where the function must stay positive
 * @param fallbackFwhm - width used when no peak is usable, ° 2θ
 */
export function fitCaglioti(peaks: readonly Peak[], range: [number, number], fallbackFwhm = 0.1): CagliotiFit {
  let pts: Point[] = peaks
    .filter((p) => p.fwhm > 0 && Number.isFinite(p.fwhm) && p.intensity >= 2)
    .map((p) => {
      const rel = p.fwhmEsd && p.fwhmEsd > 0 ? p.fwhmEsd / p.fwhm : 0.1;
      return { t: Math.tan((p.twoTheta / 2) * RAD), h2: p.fwhm * p.fwhm, h: p.fwhm, w: 1 / Math.max(rel, 0.02) ** 2, eta: p.eta };
    });
  const tLo = Math.tan((range[0] / 2) * RAD);
  const tHi = Math.tan((Math.min(range[1], 170) / 2) * RAD);
  const median = (v: number[]) => {
    const s = v.slice().sort((a, b) => a - b);
    return s.length ? s[s.length >> 1] : NaN;
  };
  // Start from a robust constant: the lower half of the widths.
  if (pts.length >= 3) {
    const m = median(pts.map((p) => p.h));
    pts = pts.filter((p) => p.h <= 2 * m);
  }
  for (const form of ["quadratic", "linear", "constant"] as const) {
    let use = pts;
    let c: Caglioti | null = null;
    for (let round = 0; round < 4; round++) {
      c = fitForm(use, form);
      if (!c) break;
      const fit = c;
      const keep = use.filter((p) => p.h <= 1.25 * Math.sqrt(Math.max(fit.U * p.t * p.t + fit.V * p.t + fit.W, 1e-8)));
      if (keep.length === use.length || keep.length < Math.max(4, 0.4 * pts.length)) break;
      use = keep;
    }
    if (c && positiveOver(c, tLo, tHi) && (form === "constant" || use.length >= 6)) {
      const etas = use.map((p) => p.eta).filter((e): e is number => e !== undefined && Number.isFinite(e));
      return { ...c, used: use.length, form, eta: etas.length ? Math.min(1, Math.max(0, median(etas))) : 0.5 };
    }
  }
  return { U: 0, V: 0, W: fallbackFwhm * fallbackFwhm, used: 0, form: "default", eta: 0.5 };
}
