import type { DetectedPeak } from "./detect-peaks";
import { fitPeaksInWindow, type PeakGuess } from "./fit-peaks";
import { kAlpha2Separation } from "./kalpha2";

/** Options of {@link detectKAlpha2}. */
export interface DetectKAlpha2Options {
  /**
   * I(Kα2)/I(Kα1) of the doublet model.
   * @default 0.5
   */
  ratio?: number;
  /**
   * Most peaks compared (the clearest isolated ones); the comparison stops earlier once two or more peaks agree
   * beyond five times the margin.
   * @default 5
   */
  maxPeaks?: number;
  /**
   * Decision margin on the summed BIC difference; |ΔBIC| below it leaves the question open.
   * @default 10 ("very strong" evidence on the scale of Kass & Raftery 1995)
   */
  margin?: number;
  /**
   * Half-width of each comparison window beyond the line(s), in FWHMs.
   * @default 3
   */
  windowFwhm?: number;
}

/** One peak's evidence. */
export interface KAlpha2PeakEvidence {
  /** Position of the peak (Kα1 under the doublet model), ° 2θ. */
  twoTheta: number;
  /** Kα1–Kα2 separation there, ° 2θ. */
  separation: number;
  /** χ² of the singlet and doublet models over the same points. */
  chi2Singlet: number;
  chi2Doublet: number;
  /** BIC(singlet) − BIC(doublet), with χ² scaled by the better model's reduced χ² when above 1. Positive favours Kα2. */
  deltaBic: number;
  points: number;
}

/** Outcome of {@link detectKAlpha2}. */
export interface KAlpha2Detection {
  /** true: Kα2 present; false: absent (Kα1-only, e.g. a primary monochromator); null: the profiles cannot tell. */
  present: boolean | null;
  /** Σ ΔBIC over the peaks compared. */
  deltaBic: number;
  peaks: KAlpha2PeakEvidence[];
}

/**
 * Decide from the profile shape whether a scan carries the Kα2 line. On the clearest isolated peaks (highest
 * signal-to-noise, weighted by how far the Kα2 line would sit from Kα1 relative to the width), two models are
 * fitted by weighted least squares over the same points: a doublet — Kα1 plus Kα2 with the same profile, a fixed
 * intensity ratio (0.5, the value used in Rachinger's method) at the Bragg angle of λ2 — and a singlet with free
 * position, width and shape (plus a free line wherever a peak was detected at a Kα2 position, so that a
 * neighbouring reflection is not taken for Kα2). Weaker neighbouring peaks inside the window are fitted in both
 * models, as doublets or as single lines. The models are compared by the Bayesian information criterion
 * (Schwarz 1978) `BIC = χ² + p·ln n`, with χ² divided by the reduced χ² of the better model when that exceeds 1,
 * so profile-shape misfit common to both is not counted as evidence. The summed ΔBIC decides with a margin.
 * @param twoTheta - angles, ° 2θ
 * @param net - raw intensity above background
 * @param variance - variance of each point (counting statistics)
 * @param detected - peaks found on the scan without Kα2 stripping
 * @param lambda1 - Kα1 wavelength, Å
 * @param lambda2 - Kα2 wavelength, Å
 */
export function detectKAlpha2(
  twoTheta: ArrayLike<number>,
  net: ArrayLike<number>,
  variance: ArrayLike<number>,
  detected: readonly DetectedPeak[],
  lambda1: number,
  lambda2: number,
  options: DetectKAlpha2Options = {},
): KAlpha2Detection {
  const { ratio = 0.5, maxPeaks = 5, margin = 10, windowFwhm = 3 } = options;
  const n = twoTheta.length;
  const lowerBound = (v: number) => {
    let lo = 0;
    let hi = n;
    while (lo < hi) {
      const mid = (lo + hi) >>> 1;
      if (twoTheta[mid] < v) lo = mid + 1;
      else hi = mid;
    }
    return lo;
  };
  const localStep = (i: number) => {
    const a = Math.max(0, Math.min(n - 2, i));
    return twoTheta[a + 1] - twoTheta[a];
  };
  interface Candidate {
    peak: DetectedPeak;
    sep: number;
    /** Other Kα1 peaks inside the window (fitted in both models). */
    neighbours: DetectedPeak[];
    /** Peaks at the Kα2 position of a stronger peak in the window (free lines in the singlet model only). */
    companions: DetectedPeak[];
    lo: number;
    hi: number;
    score: number;
  }
  const tolAt = (q: DetectedPeak) => Math.max(0.35 * q.fwhm, 2 * localStep(q.index));
  /** The stronger peak whose Kα2 line `q` could be, if any. */
  const kAlpha1Of = (q: DetectedPeak, among: readonly DetectedPeak[]): DetectedPeak | undefined =>
    among.find((r) => r !== q && r.twoTheta < q.twoTheta && r.height > q.height && Math.abs(r.twoTheta + kAlpha2Separation(r.twoTheta, lambda1, lambda2) - q.twoTheta) <= tolAt(q));
  const candidates: Candidate[] = [];
  for (const p of detected) {
    const sep = kAlpha2Separation(p.twoTheta, lambda1, lambda2);
    if (!(sep > 0) || !(p.fwhm > 0)) continue;
    if (kAlpha1Of(p, detected)) continue; // itself the Kα2 line of a stronger peak
    const from = p.twoTheta - windowFwhm * p.fwhm;
    const to = p.twoTheta + sep + windowFwhm * p.fwhm;
    const inside = detected.filter((q) => q !== p && q.twoTheta >= from && q.twoTheta <= to);
    const neighbours: DetectedPeak[] = [];
    const companions: DetectedPeak[] = [];
    for (const q of inside) (kAlpha1Of(q, [p, ...inside]) ? companions : neighbours).push(q);
    // A neighbour stronger than the candidate dominates the window: its own window tells more.
    if (neighbours.length > 3 || neighbours.some((q) => q.height > p.height)) continue;
    const resolution = sep / p.fwhm;
    if (companions.length === 0 && resolution < 0.3) continue;
    const lo = lowerBound(from);
    const hi = lowerBound(to);
    if (hi - lo < 12 + 4 * (neighbours.length + companions.length)) continue;
    candidates.push({ peak: p, sep, neighbours, companions, lo, hi, score: p.snr * Math.min(1, resolution) });
  }
  candidates.sort((a, b) => b.score - a.score);
  const chosen = candidates.slice(0, maxPeaks);
  const peaks: KAlpha2PeakEvidence[] = [];
  let total = 0;
  const guess = (q: DetectedPeak): PeakGuess => ({ twoTheta: q.twoTheta, height: q.height, fwhm: q.fwhm });
  for (const c of chosen) {
    // Enough already: two or more peaks agreeing far beyond the margin settle it.
    if (peaks.length >= 2 && Math.abs(total) >= 5 * margin && peaks.every((q) => Math.sign(q.deltaBic) === Math.sign(total))) break;
    const p = c.peak;
    const single: PeakGuess[] = [guess(p), ...c.neighbours.map(guess), ...c.companions.map(guess)];
    // Doublet start: an unresolved doublet's apex and width overstate Kα1's; the fit moves from there.
    const resolved = c.companions.length > 0 || c.sep > p.fwhm;
    const start = (q: DetectedPeak, sep: number): PeakGuess =>
      resolved || sep > q.fwhm ? guess(q) : { twoTheta: q.twoTheta - sep / 3, height: q.height / (1 + ratio), fwhm: Math.max(q.fwhm - 0.5 * sep, 0.6 * q.fwhm) };
    const doublet: PeakGuess[] = [start(p, c.sep), ...c.neighbours.map((q) => start(q, kAlpha2Separation(q.twoTheta, lambda1, lambda2)))];
    const s = fitPeaksInWindow(twoTheta, net, variance, single, c.lo, c.hi);
    const d = fitPeaksInWindow(twoTheta, net, variance, doublet, c.lo, c.hi, { doublet: { lambda1, lambda2, ratio } });
    const m = c.hi - c.lo;
    const scale = Math.max(1, Math.min(s.chi2 / s.dof, d.chi2 / d.dof));
    const deltaBic = (s.chi2 - d.chi2) / scale + (s.parameters - d.parameters) * Math.log(m);
    total += deltaBic;
    const fitted = d.peaks.reduce((best, q) => (Math.abs(q.twoTheta - p.twoTheta) < Math.abs(best.twoTheta - p.twoTheta) ? q : best));
    peaks.push({ twoTheta: fitted.twoTheta, separation: c.sep, chi2Singlet: s.chi2, chi2Doublet: d.chi2, deltaBic, points: m });
  }
  const present = peaks.length === 0 ? null : total >= margin ? true : total <= -margin ? false : null;
  return { present, deltaBic: total, peaks };
}
