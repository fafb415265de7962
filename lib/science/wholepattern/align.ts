/**
 * Quick alignment of a candidate to the observed profile before any fit: the cell scale (within ±1.5 %, enough
 * for solid solutions such as biotite–phlogopite or Fe-bearing carbonates) that puts the most reference intensity
 * on observed signal, searched coarse to fine over the candidate's strongest lines. The score saturates at a few σ,
 * so strong peaks of other phases cannot dominate it; the same score at the chosen scale is the candidate's
 * coverage, used to shortlist.
 */
import type { PhaseLines } from "./phase-lines";
import { lowerBound } from "./profile";
import type { GlobalProfile } from "./types";

const DEG = 180 / Math.PI;
/** Lines used for the alignment (the strongest; weaker ones hardly change the score). */
const ALIGN_LINES = 40;

export interface Alignment {
  cellScale: number;
  /** Intensity-weighted share (0–1) of the candidate's lines in range that sit on significant signal. */
  coverage: number;
  /**
   * How far the coverage stands above chance, as a binomial z-score: (coverage − p₀)·√N / √(p₀(1 − p₀)), with p₀
   * the share of the scan covered by signal and N = (ΣI)²/ΣI² the effective number of lines. A phase with two
   * lines lands on peaks by chance far more easily than one with thirty.
   */
  z: number;
  /**
   * Matched-filter projection of the whitened signal on the candidate's stick pattern, (Σ I·y/σ)² / ΣI²: roughly
   * the χ² the candidate alone would explain. Ranks major phases with few lines that the z-score undervalues.
   */
  projection: number;
}

/**
 * The observed signal as a saturating "support" per grid point, min(1, max(0, signal/3σ)), with its mean (the
 * chance level p₀ that a random position sits on signal). Build once per profile; align many candidates on it.
 */
export interface SignalMap {
  x: Float64Array;
  support: Float64Array;
  /** Signal in σ units, clipped at 0. */
  whitened: Float64Array;
  chance: number;
  /** Grid start and step when the grid is uniform (index by arithmetic), else null (binary search). */
  uniform: { x0: number; step: number } | null;
}

export function signalMap(x: Float64Array, signal: Float64Array, sigma: Float64Array): SignalMap {
  const n = x.length;
  const support = new Float64Array(n);
  const whitened = new Float64Array(n);
  let s = 0;
  for (let i = 0; i < n; i++) {
    whitened[i] = Math.max(0, signal[i] / sigma[i]);
    support[i] = Math.min(1, whitened[i] / 3);
    s += support[i];
  }
  const step = (x[n - 1] - x[0]) / (n - 1);
  let uniform = true;
  for (let i = 1; i < n && uniform; i++) if (Math.abs(x[i] - x[i - 1] - step) > 0.01 * step) uniform = false;
  return { x, support, whitened, chance: s / n, uniform: uniform ? { x0: x[0], step } : null };
}

function valueAt(m: SignalMap, arr: Float64Array, v: number): number {
  const x = m.x;
  const n = x.length;
  let i: number;
  if (m.uniform) i = Math.floor((v - m.uniform.x0) / m.uniform.step) + 1;
  else i = lowerBound(x, v);
  if (i <= 0 || i >= n) return 0;
  const t = (v - x[i - 1]) / (x[i] - x[i - 1]);
  return arr[i - 1] + t * (arr[i] - arr[i - 1]);
}

/**
 * Best cell scale of a candidate on a signal map.
 * @param limit - largest relative cell change tried
 */
export function alignCandidate(map: SignalMap, lines: PhaseLines, g: GlobalProfile, limit = 0.015): Alignment {
  const lo = map.x[0];
  const hi = map.x[map.x.length - 1];
  const order = Array.from({ length: lines.count }, (_, j) => j)
    .sort((a, b) => lines.intensity[b] - lines.intensity[a])
    .slice(0, ALIGN_LINES);
  const sinAt1 = order.map((j) => g.wavelength / (2 * lines.d[j]));
  const weight = order.map((j) => lines.intensity[j]);
  const evaluate = (c: number) => {
    let total = 0;
    let total2 = 0;
    let hit = 0;
    for (let k = 0; k < order.length; k++) {
      const s = sinAt1[k] / c;
      if (!(s < 1)) continue;
      const pos = 2 * Math.asin(s) * DEG + g.zeroShift;
      if (pos < lo || pos > hi) continue;
      const I = weight[k];
      total += I;
      total2 += I * I;
      hit += I * valueAt(map, map.support, pos);
    }
    return { cov: total > 0 ? hit / total : 0, total, total2 };
  };
  let bestC = 1;
  let bestScore = -Infinity;
  let best = evaluate(1);
  const tryScale = (c: number) => {
    const e = evaluate(c);
    if (!(e.total > 0)) return;
    // Near-ties go to the scale closest to the reference cell.
    const score = e.cov - (0.005 * Math.abs(c - 1)) / limit;
    if (score > bestScore) {
      bestScore = score;
      bestC = c;
      best = e;
    }
  };
  const coarse = 0.001;
  for (let c = 1 - limit; c <= 1 + limit + 1e-12; c += coarse) tryScale(c);
  const center = bestC;
  for (let c = center - coarse; c <= center + coarse + 1e-12; c += coarse / 4) if (Math.abs(c - 1) <= limit + 1e-12) tryScale(c);
  const p0 = Math.min(0.95, Math.max(0.02, map.chance));
  const nLines = best.total2 > 0 ? (best.total * best.total) / best.total2 : 0;
  let proj = 0;
  for (let k = 0; k < order.length; k++) {
    const sn = sinAt1[k] / bestC;
    if (!(sn < 1)) continue;
    const pos = 2 * Math.asin(sn) * DEG + g.zeroShift;
    if (pos >= lo && pos <= hi) proj += weight[k] * valueAt(map, map.whitened, pos);
  }
  return {
    cellScale: bestC,
    coverage: best.cov,
    z: ((best.cov - p0) * Math.sqrt(nLines)) / Math.sqrt(p0 * (1 - p0)),
    projection: best.total2 > 0 ? (proj * proj) / best.total2 : 0,
  };
}
