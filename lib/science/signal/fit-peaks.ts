import { invertSpd, solveSpd } from "./linear-algebra";
import { pseudoVoigtArea, pseudoVoigtHeight, pseudoVoigtWithGradient } from "./pseudo-voigt";

const DEG = Math.PI / 180;

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

function fitGroup(
  xAll: ArrayLike<number>,
  yAll: ArrayLike<number>,
  vAll: ArrayLike<number>,
  spec: GroupSpec,
  o: GroupOptions,
): { peaks: Omit<FittedPeak, "group">[]; model: Float64Array } {
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
  // Parameter vector: [x0, area, H, η] per peak, then baseline b0 (, b1).
  const par = new Float64Array(npar);
  guesses.forEach((g, j) => {
    const h = Math.min(o.maxFwhmDeg, Math.max(o.minFwhmDeg, g.fwhm));
    par[4 * j] = g.twoTheta;
    par[4 * j + 1] = Math.max(pseudoVoigtArea(Math.max(g.height, 1e-9), h, eta0), 1e-9);
    par[4 * j + 2] = h;
    par[4 * j + 3] = eta0;
  });
  const free: number[] = [];
  for (let i = 0; i < npar; i++) if (fitEta || i >= 4 * k || i % 4 !== 3) free.push(i);
  const p = free.length;
  const q = o.doublet ? o.doublet.lambda2 / o.doublet.lambda1 : 1;
  const ratio = o.doublet ? o.doublet.ratio : 0;
  const grad = new Float64Array(5);
  const row = new Float64Array(npar);
  const a = new Float64Array(p * p);
  const g = new Float64Array(p);

  // Kα2 positions depend only on the parameters: computed once per evaluation, not per point.
  const x2s = new Float64Array(k);
  const dx2s = new Float64Array(k);
  const prepare = (prm: Float64Array) => {
    if (ratio === 0) return;
    for (let j = 0; j < k; j++) {
      const x0 = prm[4 * j];
      const s = Math.min(1, q * Math.sin(x0 * DEG * 0.5));
      x2s[j] = (2 * Math.asin(s)) / DEG;
      dx2s[j] = s < 1 ? (q * Math.cos(x0 * DEG * 0.5)) / Math.cos(x2s[j] * DEG * 0.5) : 1;
    }
  };

  const modelAt = (prm: Float64Array, x: number, wantRow: boolean): number => {
    let f = 0;
    if (wantRow) row.fill(0);
    for (let j = 0; j < k; j++) {
      const x0 = prm[4 * j];
      const ar = prm[4 * j + 1];
      const h = prm[4 * j + 2];
      const et = prm[4 * j + 3];
      pseudoVoigtWithGradient(x, x0, ar, h, et, grad);
      f += grad[0];
      if (wantRow) {
        row[4 * j] += grad[1];
        row[4 * j + 1] += grad[2];
        row[4 * j + 2] += grad[3];
        row[4 * j + 3] += grad[4];
      }
      if (ratio > 0) {
        pseudoVoigtWithGradient(x, x2s[j], ratio * ar, h, et, grad);
        f += grad[0];
        if (wantRow) {
          row[4 * j] += grad[1] * dx2s[j];
          row[4 * j + 1] += grad[2] * ratio;
          row[4 * j + 2] += grad[3];
          row[4 * j + 3] += grad[4];
        }
      }
    }
    if (nb >= 1) {
      f += prm[4 * k];
      if (wantRow) row[4 * k] = 1;
    }
    if (nb === 2) {
      f += prm[4 * k + 1] * (x - xc);
      if (wantRow) row[4 * k + 1] = x - xc;
    }
    return f;
  };

  const chi2Of = (prm: Float64Array, normal: boolean): number => {
    prepare(prm);
    if (normal) {
      a.fill(0);
      g.fill(0);
    }
    let chi2 = 0;
    for (let i = 0; i < m; i++) {
      const r = ys[i] - modelAt(prm, xs[i], normal);
      const w = ws[i];
      chi2 += w * r * r;
      if (normal) {
        for (let u = 0; u < p; u++) {
          const ju = row[free[u]] * w;
          if (ju === 0) continue;
          g[u] += ju * r;
          for (let v = 0; v <= u; v++) a[u * p + v] += ju * row[free[v]];
        }
      }
    }
    if (normal) for (let u = 0; u < p; u++) for (let v = 0; v < u; v++) a[v * p + u] = a[u * p + v];
    return chi2;
  };

  const clamp = (prm: Float64Array) => {
    for (let j = 0; j < k; j++) {
      prm[4 * j] = Math.min(xhi, Math.max(xlo, prm[4 * j]));
      prm[4 * j + 1] = Math.max(1e-12, prm[4 * j + 1]);
      prm[4 * j + 2] = Math.min(o.maxFwhmDeg, Math.max(o.minFwhmDeg, prm[4 * j + 2]));
      prm[4 * j + 3] = Math.min(1, Math.max(0, prm[4 * j + 3]));
    }
  };

  let chi2 = chi2Of(par, true);
  let lambda = 1e-3;
  let converged = false;
  const trial = new Float64Array(npar);
  const mat = new Float64Array(p * p);
  let it = 0;
  for (; it < o.maxIterations && !converged; it++) {
    let improved = false;
    while (lambda < 1e12) {
      mat.set(a);
      let maxDiag = 0;
      for (let u = 0; u < p; u++) maxDiag = Math.max(maxDiag, a[u * p + u]);
      for (let u = 0; u < p; u++) mat[u * p + u] += lambda * a[u * p + u] + 1e-12 * maxDiag + 1e-300;
      const delta = solveSpd(mat, g, p);
      if (!delta) {
        lambda *= 10;
        continue;
      }
      trial.set(par);
      for (let u = 0; u < p; u++) trial[free[u]] += delta[u];
      clamp(trial);
      const c2 = chi2Of(trial, false);
      if (c2 < chi2) {
        // Converged when χ² falls by far less than one unit of (noise-scaled) χ²: parameter changes ≪ 1σ.
        const drop = chi2 - c2;
        par.set(trial);
        chi2 = chi2Of(par, true);
        lambda = Math.max(lambda / 5, 1e-9);
        improved = true;
        if (drop < 1e-3 * Math.max(1, chi2 / Math.max(1, m - p))) converged = true;
        break;
      }
      lambda *= 4;
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
  const out = new Float64Array(m);
  prepare(par);
  for (let i = 0; i < m; i++) out[i] = modelAt(par, xs[i], false);
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
  return { peaks, model: out };
}
