import { choleskyFactor, choleskySolve, invertSpd } from "./linear-algebra";
import { pseudoVoigtArea, pseudoVoigtHeight } from "./pseudo-voigt";

const DEG = Math.PI / 180;
const LN2 = Math.LN2;
const FOUR_LN2 = 4 * LN2;
const CG = 2 * Math.sqrt(LN2 / Math.PI);
const CL = 2 / Math.PI;

/** Starting values for one peak. */
export interface PeakGuess {
  /** Kα1 position, ° 2θ. */
  twoTheta: number;
  /** Height above background, counts. */
  height: number;
  /** FWHM, ° 2θ. */
  fwhm: number;
}

/** Kα2 companion line fitted together with each Kα1 peak. */
export interface DoubletModel {
  lambda1: number;
  lambda2: number;
  /** I(Kα2)/I(Kα1). */
  ratio: number;
}

/** Options of {@link fitPeaks}. */
export interface FitPeaksOptions {
  /**
   * Half-width of each peak's fitting window, in multiples of its FWHM (the Kα2 separation is added on the right).
   * @default 4
   */
  windowFwhm?: number;
  /**
   * Most peaks fitted together in one overlapping group; bigger clusters are split at their widest gap.
   * @default 6
   */
  maxGroupSize?: number;
  /**
   * Levenberg–Marquardt iteration limit per group.
   * @default 60
   */
  maxIterations?: number;
  /**
   * Local baseline fitted with each group on top of the (already subtracted) background.
   * @default "linear"
   */
  baseline?: "linear" | "constant" | "none";
  /**
   * Pseudo-Voigt mixing: "fit" refines η in [0, 1] per peak; a number fixes it.
   * @default "fit"
   */
  eta?: "fit" | number;
  /**
   * Fit each peak as a Kα1 + Kα2 pair (same shape, area ratio and exact Kα2 position from λ2/λ1); null fits single lines.
   * @default null
   */
  doublet?: DoubletModel | null;
  /**
   * Narrowest FWHM allowed, ° 2θ.
   * @default 0.005
   */
  minFwhmDeg?: number;
  /**
   * Broadest FWHM allowed, ° 2θ.
   * @default 3
   */
  maxFwhmDeg?: number;
}

/** A fitted Kα1 line (the Kα2 companion, when modelled, is implied). */
export interface FittedPeak {
  /** Position, ° 2θ (as measured; no zero correction). */
  twoTheta: number;
  twoThetaEsd: number;
  /** Integrated Kα1 area above background, counts·°. */
  area: number;
  areaEsd: number;
  /** Height of the Kα1 line above background, counts. */
  height: number;
  /** FWHM, ° 2θ. */
  fwhm: number;
  /** Standard uncertainty of the FWHM: √(covariance) scaled by max(1, χ²ν). */
  fwhmEsd: number;
  /** Pseudo-Voigt mixing η. */
  eta: number;
  etaEsd: number;
  /** Reduced χ² of the group the peak was fitted in. */
  chi2Reduced: number;
  /** Index of the fitting group. */
  group: number;
  /** False when the fit hit the iteration limit or the covariance could not be computed. */
  converged: boolean;
  /** Levenberg–Marquardt iterations (accepted steps) used by the group. */
  iterations: number;
  /** Points in the group's fitting window. */
  points: number;
}

/** Result of {@link fitPeaks}. */
export interface FitPeaksResult {
  peaks: FittedPeak[];
  /** Model above background over the whole scan (peaks + local baselines inside fitted windows, 0 elsewhere). */
  model: Float64Array;
}

function lowerBound(x: ArrayLike<number>, v: number): number {
  let lo = 0;
  let hi = x.length;
  while (lo < hi) {
    const mid = (lo + hi) >>> 1;
    if (x[mid] < v) lo = mid + 1;
    else hi = mid;
  }
  return lo;
}

interface GroupSpec {
  guesses: PeakGuess[];
  lo: number;
  hi: number;
}

/**
 * Fit pseudo-Voigt profiles to peaks of a background-subtracted scan by weighted Levenberg–Marquardt
 * (Levenberg 1944; Marquardt 1963) with analytic derivatives, peak by peak or in small overlapping groups inside
 * windows. Parameters per peak: position, area, FWHM, η. Weights are 1/variance (counting statistics). Standard
 * uncertainties come from the inverse normal matrix at the minimum, scaled by max(1, reduced χ²).
 * (Own implementation rather than ml-spectra-fitting because the covariance — needed for the FWHM uncertainty —
 * is not returned by that package.)
 * @param twoTheta - angles, ° 2θ, increasing
 * @param net - intensity above background, counts
 * @param variance - variance of each point, counts² (e.g. raw counts for Poisson statistics)
 * @param guesses - starting peaks, any order
 */
export function fitPeaks(
  twoTheta: ArrayLike<number>,
  net: ArrayLike<number>,
  variance: ArrayLike<number>,
  guesses: PeakGuess[],
  options: FitPeaksOptions = {},
): FitPeaksResult {
  const {
    windowFwhm = 4,
    maxGroupSize = 6,
    maxIterations = 60,
    baseline = "linear",
    eta = "fit",
    doublet = null,
    minFwhmDeg = 0.005,
    maxFwhmDeg = 3,
  } = options;
  const n = twoTheta.length;
  const model = new Float64Array(n);
  const peaks: FittedPeak[] = [];
  if (n === 0 || guesses.length === 0) return { peaks, model };
  const sorted = guesses
    .filter((g) => Number.isFinite(g.twoTheta) && Number.isFinite(g.height))
    .map((g) => ({ ...g, fwhm: Math.min(maxFwhmDeg, Math.max(minFwhmDeg, Number.isFinite(g.fwhm) ? g.fwhm : minFwhmDeg)) }))
    .sort((a, b) => a.twoTheta - b.twoTheta);
  const sep = (x: number) =>
    doublet ? Math.max(0, (2 * Math.asin(Math.min(1, (doublet.lambda2 / doublet.lambda1) * Math.sin(x * DEG * 0.5)))) / DEG - x) : 0;
  // Windows, merged into groups where they overlap.
  const groups: GroupSpec[] = [];
  let cur: { guesses: PeakGuess[]; from: number; to: number } | null = null;
  const flush = () => {
    if (!cur) return;
    for (const part of splitGroup(cur.guesses, maxGroupSize)) {
      const from = part[0].twoTheta - windowFwhm * part[0].fwhm;
      const last = part[part.length - 1];
      const to = last.twoTheta + windowFwhm * last.fwhm + sep(last.twoTheta);
      const lo = lowerBound(twoTheta, from);
      const hi = lowerBound(twoTheta, to);
      if (hi - lo >= 4 * part.length + 3) groups.push({ guesses: part, lo, hi });
    }
    cur = null;
  };
  for (const g of sorted) {
    const from = g.twoTheta - windowFwhm * g.fwhm;
    const to = g.twoTheta + windowFwhm * g.fwhm + sep(g.twoTheta);
    if (cur && from <= cur.to) {
      cur.guesses.push(g);
      cur.to = Math.max(cur.to, to);
    } else {
      flush();
      cur = { guesses: [g], from, to };
    }
  }
  flush();
  groups.forEach((spec, gi) => {
    const res = fitGroup(twoTheta, net, variance, spec, {
      maxIterations,
      baseline,
      eta,
      doublet,
      minFwhmDeg,
      maxFwhmDeg,
    });
    for (let i = spec.lo; i < spec.hi; i++) model[i] += res.model[i - spec.lo];
    for (const p of res.peaks) peaks.push({ ...p, group: gi });
  });
  peaks.sort((a, b) => a.twoTheta - b.twoTheta);
  return { peaks, model };
}

/** Result of {@link fitPeaksInWindow}. */
export interface WindowFit {
  peaks: Omit<FittedPeak, "group">[];
  /** Model over the window (peaks + local baseline), one value per point of [lo, hi). */
  model: Float64Array;
  /** Weighted χ² at the minimum. */
  chi2: number;
  /** Points minus free parameters. */
  dof: number;
  /** Points in the window. */
  points: number;
  /** Free parameters. */
  parameters: number;
}

/**
 * Fit the given peaks together over a fixed window of points [lo, hi) (same model and method as {@link fitPeaks}),
 * for comparing models on the same data, e.g. a Kα1+Kα2 doublet against a singlet.
 */
export function fitPeaksInWindow(
  twoTheta: ArrayLike<number>,
  net: ArrayLike<number>,
  variance: ArrayLike<number>,
  guesses: PeakGuess[],
  lo: number,
  hi: number,
  options: FitPeaksOptions = {},
): WindowFit {
  const { maxIterations = 60, baseline = "linear", eta = "fit", doublet = null, minFwhmDeg = 0.005, maxFwhmDeg = 3 } = options;
  const sorted = guesses.map((g) => ({ ...g, fwhm: Math.min(maxFwhmDeg, Math.max(minFwhmDeg, g.fwhm)) })).sort((a, b) => a.twoTheta - b.twoTheta);
  const res = fitGroup(twoTheta, net, variance, { guesses: sorted, lo, hi }, { maxIterations, baseline, eta, doublet, minFwhmDeg, maxFwhmDeg });
  const nb = baseline === "linear" ? 2 : baseline === "constant" ? 1 : 0;
  return { ...res, points: hi - lo, parameters: sorted.length * (eta === "fit" ? 4 : 3) + nb };
}

function splitGroup(g: PeakGuess[], max: number): PeakGuess[][] {
  if (g.length <= max) return [g];
  let cut = 1;
  let best = -Infinity;
  for (let i = 1; i < g.length; i++) {
    const gap = (g[i].twoTheta - g[i - 1].twoTheta) / (g[i].fwhm + g[i - 1].fwhm);
    if (gap > best) {
      best = gap;
      cut = i;
    }
  }
  return [...splitGroup(g.slice(0, cut), max), ...splitGroup(g.slice(cut), max)];
}

interface GroupOptions {
  maxIterations: number;
  baseline: "linear" | "constant" | "none";
  eta: "fit" | number;
  doublet: DoubletModel | null;
  minFwhmDeg: number;
  maxFwhmDeg: number;
}

/** Result of fitting one window: the peaks, the model over the window and the fit statistics. */
interface GroupResult {
  peaks: Omit<FittedPeak, "group">[];
  model: Float64Array;
  /** Weighted χ² at the minimum. */
  chi2: number;
  /** Points minus free parameters. */
  dof: number;
}

/**
 * Each peak's profile is evaluated on its own support only: its Kα1 line ± SUPPORT_FWHM starting FWHMs (plus the
 * Kα2 separation), clipped to the window. Inside a group this is where the profiles overlap; beyond it a
 * pseudo-Voigt carries less than η/(1 + 4·8²) ≈ 0.4 %·η of its height (Lorentzian tail), which the local baseline
 * absorbs. It makes the cost per evaluation Σ(support points) instead of (window points × peaks).
 */
const SUPPORT_FWHM = 6;

/**
 * Weighted Levenberg–Marquardt fit of k pseudo-Voigt peaks (optionally Kα1+Kα2 doublets) and a local baseline in
 * the window [lo, hi) (Levenberg 1944; Marquardt 1963; λ update and bound handling as in Madsen, Nielsen &
 * Tingleff 2004, "Methods for non-linear least squares problems", §3.2, with an active set for the bounds).
 * The Jacobian is stored column by column on each peak's support, and the normal matrix JᵀWJ is built from the
 * overlaps of those supports, so each evaluation is linear in the number of points.
 */
function fitGroup(
  xAll: ArrayLike<number>,
  yAll: ArrayLike<number>,
  vAll: ArrayLike<number>,
  spec: GroupSpec,
  o: GroupOptions,
): GroupResult {
  const { lo, hi, guesses } = spec;
  const m = hi - lo;
  const k = guesses.length;
  const nb = o.baseline === "linear" ? 2 : o.baseline === "constant" ? 1 : 0;
  const fitEta = o.eta === "fit";
  const eta0 = fitEta ? 0.5 : Math.min(1, Math.max(0, o.eta as number));
  const npar = 4 * k + nb;
  const xs = new Float64Array(m);
  const ys = new Float64Array(m);
  const ws = new Float64Array(m);
  for (let i = 0; i < m; i++) {
    xs[i] = xAll[lo + i];
    ys[i] = yAll[lo + i];
    const v = vAll[lo + i];
    ws[i] = 1 / (v > 1 ? v : 1);
  }
  const xc = 0.5 * (xs[0] + xs[m - 1]);
  const xlo = xs[0];
  const xhi = xs[m - 1];
  const q = o.doublet ? o.doublet.lambda2 / o.doublet.lambda1 : 1;
  const ratio = o.doublet ? o.doublet.ratio : 0;
  // Parameter vector: [x0, area, H, η] per peak, then baseline b0 (, b1).
  const par = new Float64Array(npar);
  // Support of each parameter's Jacobian column: [from, to) in window points.
  const from = new Int32Array(npar);
  const to = new Int32Array(npar).fill(m);
  guesses.forEach((g, j) => {
    const h = Math.min(o.maxFwhmDeg, Math.max(o.minFwhmDeg, g.fwhm));
    par[4 * j] = g.twoTheta;
    par[4 * j + 1] = Math.max(pseudoVoigtArea(Math.max(g.height, 1e-9), h, eta0), 1e-9);
    par[4 * j + 2] = h;
    par[4 * j + 3] = eta0;
    const s = ratio > 0 ? Math.min(1, q * Math.sin(g.twoTheta * DEG * 0.5)) : 0;
    const x2 = ratio > 0 ? (2 * Math.asin(s)) / DEG : g.twoTheta;
    const a = lowerBound(xs, g.twoTheta - SUPPORT_FWHM * h);
    const b = Math.max(a, lowerBound(xs, Math.max(g.twoTheta, x2) + SUPPORT_FWHM * h));
    for (let t = 0; t < 4; t++) {
      from[4 * j + t] = a;
      to[4 * j + t] = b;
    }
  });
  const free: number[] = [];
  for (let i = 0; i < npar; i++) if (fitEta || i >= 4 * k || i % 4 !== 3) free.push(i);
  const p = free.length;

  // Current and trial state: model, residual, Jacobian columns (npar × m, only the support is ever read).
  let jac = new Float64Array(npar * m);
  let jacTrial = new Float64Array(npar * m);
  // Baseline columns do not depend on the parameters.
  for (let i = 0; i < m; i++) {
    if (nb >= 1) jac[4 * k * m + i] = jacTrial[4 * k * m + i] = 1;
    if (nb === 2) jac[(4 * k + 1) * m + i] = jacTrial[(4 * k + 1) * m + i] = xs[i] - xc;
  }
  let model = new Float64Array(m);
  let modelTrial = new Float64Array(m);

  /**
   * Model and Jacobian at `prm` (pseudo-Voigt and its derivatives written out inline, as in
   * `pseudoVoigtWithGradient`: one exp and one division per point and line); returns χ².
   */
  const evaluate = (prm: Float64Array, out: Float64Array, jc: Float64Array): number => {
    out.fill(0);
    for (let j = 0; j < k; j++) {
      const x0 = prm[4 * j];
      const ar = prm[4 * j + 1];
      const ih = 1 / prm[4 * j + 2];
      const ih2 = ih * ih;
      const et = prm[4 * j + 3];
      const ge = 1 - et;
      const a = from[4 * j];
      const b = to[4 * j];
      const c0 = 4 * j * m;
      const c1 = c0 + m;
      const c2 = c1 + m;
      const c3 = c2 + m;
      // Kα1 line (and the Kα2 line with the same shape at the Bragg angle for λ2, area × ratio).
      for (let line = 0; line < (ratio > 0 ? 2 : 1); line++) {
        let xc0 = x0;
        let sc = 1;
        let dxc = 1;
        if (line === 1) {
          const sn = Math.min(1, q * Math.sin(x0 * DEG * 0.5));
          xc0 = (2 * Math.asin(sn)) / DEG;
          dxc = sn < 1 ? (q * Math.cos(x0 * DEG * 0.5)) / Math.cos(xc0 * DEG * 0.5) : 1;
          sc = ratio;
        }
        const arl = ar * sc;
        for (let i = a; i < b; i++) {
          const u = xs[i] - xc0;
          const z = u * u * ih2;
          const iq = 1 / (1 + 4 * z);
          // Beyond 3.8 FWHM the Gaussian part is below 10⁻¹⁷ of its peak: skip the exponential there.
          const gk = z < 14.4 ? CG * Math.exp(-FOUR_LN2 * z) * ih : 0;
          const lk = CL * ih * iq;
          const f = et * lk + ge * gk;
          const dx = 8 * u * ih2 * (et * lk * iq + ge * gk * LN2);
          const dh = ih * (et * lk * (8 * z * iq - 1) + ge * gk * (8 * LN2 * z - 1));
          out[i] += arl * f;
          if (line === 0) {
            jc[c0 + i] = arl * dx;
            jc[c1 + i] = f;
            jc[c2 + i] = arl * dh;
            jc[c3 + i] = arl * (lk - gk);
          } else {
            jc[c0 + i] += arl * dx * dxc;
            jc[c1 + i] += f * sc;
            jc[c2 + i] += arl * dh;
            jc[c3 + i] += arl * (lk - gk);
          }
        }
      }
    }
    if (nb >= 1) {
      const b0 = prm[4 * k];
      const b1 = nb === 2 ? prm[4 * k + 1] : 0;
      for (let i = 0; i < m; i++) out[i] += b0 + b1 * (xs[i] - xc);
    }
    let chi2 = 0;
    for (let i = 0; i < m; i++) {
      const r = ys[i] - out[i];
      chi2 += ws[i] * r * r;
    }
    return chi2;
  };

  const a = new Float64Array(p * p);
  const g = new Float64Array(p);
  // Normal matrix and gradient over all parameters (free or not), assembled block by block.
  const full = new Float64Array(npar * npar);
  const gFull = new Float64Array(npar);
  const wr = new Float64Array(m);
  /**
   * Normal matrix JᵀWJ and gradient JᵀWr from the stored Jacobian and model. Peaks interact only where their
   * supports overlap: each pair of overlapping peaks contributes one 4×4 block summed over the overlap in a single
   * pass, so the cost is Σ over overlapping pairs of the overlap length (not points × parameters²).
   */
  const buildNormal = () => {
    for (let i = 0; i < m; i++) wr[i] = ws[i] * (ys[i] - model[i]);
    full.fill(0);
    for (let j1 = 0; j1 < k; j1++) {
      const f1 = from[4 * j1];
      const t1 = to[4 * j1];
      const a0 = 4 * j1 * m;
      const a1 = a0 + m;
      const a2 = a1 + m;
      const a3 = a2 + m;
      // Gradient and the peak × baseline block.
      let g0 = 0, g1 = 0, g2 = 0, g3 = 0;
      let c00 = 0, c10 = 0, c20 = 0, c30 = 0, c01 = 0, c11 = 0, c21 = 0, c31 = 0;
      for (let i = f1; i < t1; i++) {
        const w = ws[i];
        const r = wr[i];
        const u0 = jac[a0 + i], u1 = jac[a1 + i], u2 = jac[a2 + i], u3 = jac[a3 + i];
        g0 += u0 * r;
        g1 += u1 * r;
        g2 += u2 * r;
        g3 += u3 * r;
        c00 += u0 * w;
        c10 += u1 * w;
        c20 += u2 * w;
        c30 += u3 * w;
        const wx = w * (xs[i] - xc);
        c01 += u0 * wx;
        c11 += u1 * wx;
        c21 += u2 * wx;
        c31 += u3 * wx;
      }
      gFull[4 * j1] = g0;
      gFull[4 * j1 + 1] = g1;
      gFull[4 * j1 + 2] = g2;
      gFull[4 * j1 + 3] = g3;
      if (nb >= 1) {
        const bcol = 4 * k;
        full[(4 * j1) * npar + bcol] = c00;
        full[(4 * j1 + 1) * npar + bcol] = c10;
        full[(4 * j1 + 2) * npar + bcol] = c20;
        full[(4 * j1 + 3) * npar + bcol] = c30;
      }
      if (nb === 2) {
        const bcol = 4 * k + 1;
        full[(4 * j1) * npar + bcol] = c01;
        full[(4 * j1 + 1) * npar + bcol] = c11;
        full[(4 * j1 + 2) * npar + bcol] = c21;
        full[(4 * j1 + 3) * npar + bcol] = c31;
      }
      // Peak × peak blocks (j2 ≥ j1) over the overlap of the supports.
      for (let j2 = j1; j2 < k; j2++) {
        const i0 = Math.max(f1, from[4 * j2]);
        const i1 = Math.min(t1, to[4 * j2]);
        if (i1 <= i0) continue;
        const b0 = 4 * j2 * m;
        const b1 = b0 + m;
        const b2 = b1 + m;
        const b3 = b2 + m;
        let s00 = 0, s01 = 0, s02 = 0, s03 = 0, s10 = 0, s11 = 0, s12 = 0, s13 = 0;
        let s20 = 0, s21 = 0, s22 = 0, s23 = 0, s30 = 0, s31 = 0, s32 = 0, s33 = 0;
        for (let i = i0; i < i1; i++) {
          const w = ws[i];
          const u0 = jac[a0 + i] * w, u1 = jac[a1 + i] * w, u2 = jac[a2 + i] * w, u3 = jac[a3 + i] * w;
          const v0 = jac[b0 + i], v1 = jac[b1 + i], v2 = jac[b2 + i], v3 = jac[b3 + i];
          s00 += u0 * v0; s01 += u0 * v1; s02 += u0 * v2; s03 += u0 * v3;
          s10 += u1 * v0; s11 += u1 * v1; s12 += u1 * v2; s13 += u1 * v3;
          s20 += u2 * v0; s21 += u2 * v1; s22 += u2 * v2; s23 += u2 * v3;
          s30 += u3 * v0; s31 += u3 * v1; s32 += u3 * v2; s33 += u3 * v3;
        }
        const r0 = 4 * j1 * npar + 4 * j2;
        full[r0] = s00; full[r0 + 1] = s01; full[r0 + 2] = s02; full[r0 + 3] = s03;
        full[r0 + npar] = s10; full[r0 + npar + 1] = s11; full[r0 + npar + 2] = s12; full[r0 + npar + 3] = s13;
        full[r0 + 2 * npar] = s20; full[r0 + 2 * npar + 1] = s21; full[r0 + 2 * npar + 2] = s22; full[r0 + 2 * npar + 3] = s23;
        full[r0 + 3 * npar] = s30; full[r0 + 3 * npar + 1] = s31; full[r0 + 3 * npar + 2] = s32; full[r0 + 3 * npar + 3] = s33;
      }
    }
    if (nb >= 1) {
      let sw = 0, swx = 0, swxx = 0, gr0 = 0, gr1 = 0;
      for (let i = 0; i < m; i++) {
        const w = ws[i];
        const dx = xs[i] - xc;
        sw += w;
        swx += w * dx;
        swxx += w * dx * dx;
        gr0 += wr[i];
        gr1 += wr[i] * dx;
      }
      const bc = 4 * k;
      full[bc * npar + bc] = sw;
      gFull[bc] = gr0;
      if (nb === 2) {
        full[bc * npar + bc + 1] = swx;
        full[(bc + 1) * npar + bc + 1] = swxx;
        gFull[bc + 1] = gr1;
      }
    }
    // Gather the free parameters (the upper triangle was filled; mirror it).
    for (let u = 0; u < p; u++) {
      const pu = free[u];
      g[u] = gFull[pu];
      for (let v = u; v < p; v++) {
        const pv = free[v];
        const t = pu <= pv ? full[pu * npar + pv] : full[pv * npar + pu];
        a[u * p + v] = t;
        a[v * p + u] = t;
      }
    }
  };

  // Box bounds: position inside the window, area > 0, FWHM within limits, 0 ≤ η ≤ 1; the baseline is free.
  const lower = new Float64Array(npar).fill(-Infinity);
  const upper = new Float64Array(npar).fill(Infinity);
  for (let j = 0; j < k; j++) {
    lower[4 * j] = xlo;
    upper[4 * j] = xhi;
    lower[4 * j + 1] = 1e-12;
    lower[4 * j + 2] = o.minFwhmDeg;
    upper[4 * j + 2] = o.maxFwhmDeg;
    lower[4 * j + 3] = 0;
    upper[4 * j + 3] = 1;
  }
  const clamp = (prm: Float64Array) => {
    for (let idx = 0; idx < 4 * k; idx++) prm[idx] = Math.min(upper[idx], Math.max(lower[idx], prm[idx]));
  };

  let chi2 = evaluate(par, model, jac);
  buildNormal();
  // Damping λ on the diagonal of JᵀWJ (Marquardt scaling), updated from the gain ratio ρ = actual / predicted χ²
  // decrease (Nielsen 1999; Madsen, Nielsen & Tingleff 2004, eq. 3.14): fewer rejected steps than fixed factors.
  let lambda = 1e-3;
  let nu = 2;
  let converged = false;
  const trial = new Float64Array(npar);
  const act = new Int32Array(p);
  const mat = new Float64Array(p * p);
  const chol = new Float64Array(p * p);
  const rhs = new Float64Array(p);
  const delta = new Float64Array(p);
  let it = 0;
  for (; it < o.maxIterations && !converged; it++) {
    // Active set: a parameter at a bound whose descent direction points out of the box is held this iteration.
    let nFree = 0;
    let maxDiag = 0;
    for (let u = 0; u < p; u++) {
      const idx = free[u];
      const held = (par[idx] <= lower[idx] && g[u] < 0) || (par[idx] >= upper[idx] && g[u] > 0);
      if (held) continue;
      act[nFree++] = u;
      maxDiag = Math.max(maxDiag, a[u * p + u]);
    }
    let improved = false;
    while (lambda < 1e8 && nFree > 0) {
      for (let r = 0; r < nFree; r++) {
        const u = act[r];
        rhs[r] = g[u];
        for (let c = 0; c < nFree; c++) mat[r * nFree + c] = a[u * p + act[c]];
        mat[r * nFree + r] += lambda * a[u * p + u] + 1e-12 * maxDiag + 1e-300;
      }
      if (!choleskyFactor(mat, nFree, chol)) {
        lambda *= nu;
        nu *= 2;
        continue;
      }
      choleskySolve(chol, rhs, nFree, delta);
      // Predicted decrease of χ² for the step: δᵀ(λ·diag·δ + g).
      let predicted = 0;
      for (let r = 0; r < nFree; r++) {
        const u = act[r];
        predicted += delta[r] * (lambda * a[u * p + u] * delta[r] + g[u]);
      }
      trial.set(par);
      for (let r = 0; r < nFree; r++) trial[free[act[r]]] += delta[r];
      clamp(trial);
      const c2 = evaluate(trial, modelTrial, jacTrial);
      if (c2 < chi2) {
        const drop = chi2 - c2;
        const rho = predicted > 0 ? drop / predicted : 1;
        par.set(trial);
        [model, modelTrial] = [modelTrial, model];
        [jac, jacTrial] = [jacTrial, jac];
        chi2 = c2;
        buildNormal();
        lambda = Math.max(lambda * Math.max(1 / 3, 1 - (2 * rho - 1) ** 3), 1e-9);
        nu = 2;
        improved = true;
        // Converged when χ² falls by far less than one unit of (noise-scaled) χ²: parameter changes ≪ 1σ.
        if (drop < 1e-3 * Math.max(1, chi2 / Math.max(1, m - p))) converged = true;
        break;
      }
      lambda *= nu;
      nu *= 2;
    }
    if (!improved) converged = true; // no downhill step left: at a (possibly bounded) minimum
  }
  const dof = Math.max(1, m - p);
  const chi2Reduced = chi2 / dof;
  const scale = Math.max(1, chi2Reduced);
  const cov = invertSpd(a, p);
  const esdOf = (paramIndex: number): number => {
    const u = free.indexOf(paramIndex);
    if (u < 0 || !cov) return NaN;
    const v = cov[u * p + u] * scale;
    return v >= 0 ? Math.sqrt(v) : NaN;
  };
  const peaks = guesses.map((_, j) => {
    const fwhm = par[4 * j + 2];
    const area = par[4 * j + 1];
    const et = par[4 * j + 3];
    return {
      twoTheta: par[4 * j],
      twoThetaEsd: esdOf(4 * j),
      area,
      areaEsd: esdOf(4 * j + 1),
      height: pseudoVoigtHeight(area, fwhm, et),
      fwhm,
      fwhmEsd: esdOf(4 * j + 2),
      eta: et,
      etaEsd: fitEta ? esdOf(4 * j + 3) : 0,
      chi2Reduced,
      converged: converged && cov !== null,
      iterations: it,
      points: m,
    };
  });
  return { peaks, model, chi2, dof };
}
