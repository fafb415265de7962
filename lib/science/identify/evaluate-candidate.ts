/**
 * Figure of merit of one reference against an observed peak list (search–match scoring, common practice): line positions
 * within a window after a fitted common zero shift, intensity agreement, the fraction of the expected reference
 * intensity found (missing strong lines penalised) and the fraction of the still-unexplained observed intensity it
 * explains. Only reference lines inside the measured range and predicted above the detection limit are expected.
 */
import type { ScoreParts } from "./types";
import { nearestPeak, type ObservedPeaks } from "./observed-peaks";
import type { ScanReferenceLines } from "./reference-lines";

/** Settings of {@link evaluateCandidate}. */
export interface EvaluateSettings {
  /** Measured 2θ range, °. */
  range: [number, number];
  /** Largest zero shift searched, ° 2θ. */
  maxZeroShift: number;
  /** Detection limit, % of the strongest observed peak. */
  detectionLimit: number;
}

/** Evaluation of one candidate. */
export interface CandidateEvaluation {
  score: number;
  parts: ScoreParts;
  zeroShift: number;
  /** Observed % per reference intensity unit. */
  scale: number;
  /** Matched pairs: reference line (index into the scan lines) → observed peak (index into the observed set). */
  lineIndex: Int32Array;
  obsIndex: Int32Array;
  /** Expected reference lines (in range, predicted above the detection limit). */
  expectedLines: number;
  /** Expected lines that were found. */
  matchedExpected: number;
  /** Observed intensity (same scale as the observed set) newly explained. */
  explainedResidual: number;
}

// Intensity log-ratio cap: beyond a factor 4 the penalty saturates (preferred orientation can exceed it).
const LOG_CAP = Math.log(4);
// Observed stronger than predicted may be overlap with another phase: penalised at this fraction.
const OVER_WEIGHT = 0.3;
// Peaks already explained by accepted phases count as available for scaling only above this residual fraction.
const AVAILABLE_FRACTION = 0.2;
// A matched peak is credited as explained up to this multiple of the predicted intensity (preferred orientation
// can raise a line several-fold; Dollase 1986, J. Appl. Cryst. 19, 267).
export const EXPLAIN_FACTOR = 3;

/**
 * Score one candidate.
 * @param lines - the reference's lines on the scan's 2θ axis (see scanReferenceLines)
 * @param obs - observed peaks
 * @param residual - still-unexplained intensity of each observed peak (same scale as `obs.intensity`)
 * @param residualTotal - Σ residual
 */
export function evaluateCandidate(
  lines: ScanReferenceLines,
  obs: ObservedPeaks,
  residual: Float64Array,
  residualTotal: number,
  settings: EvaluateSettings,
): CandidateEvaluation {
  const { range, maxZeroShift, detectionLimit } = settings;
  const nL = lines.length;
  const nO = obs.length;
  const empty: CandidateEvaluation = {
    score: 0,
    parts: { position: 0, intensity: 0, reference: 0, observed: 0 },
    zeroShift: 0,
    scale: 0,
    lineIndex: new Int32Array(0),
    obsIndex: new Int32Array(0),
    expectedLines: 0,
    matchedExpected: 0,
    explainedResidual: 0,
  };
  if (nL === 0 || nO === 0) return empty;
  const tt = lines.twoTheta;
  const li = lines.intensity;
  const tol = lines.tolerance;
  const ott = obs.twoTheta;
  const oi = obs.intensity;

  // In-range lines, strongest first, for the shift search.
  const inRange: number[] = [];
  for (let i = 0; i < nL; i++) if (tt[i] >= range[0] && tt[i] <= range[1]) inRange.push(i);
  if (inRange.length === 0) return empty;
  const strong = inRange.slice().sort((a, b) => li[b] - li[a]).slice(0, 15);

  // Zero shift: candidate shifts from pairings of strong lines with nearby peaks, keep the best-supported one.
  const shifts: number[] = [0];
  for (const i of strong.slice(0, 8)) {
    const w = maxZeroShift + tol[i];
    let j = nearestPeak(ott, nO, tt[i] - w);
    if (j < 0) continue;
    while (j > 0 && ott[j] > tt[i] - w) j--;
    for (; j < nO && ott[j] <= tt[i] + w; j++) {
      const s = ott[j] - tt[i];
      if (Math.abs(s) <= maxZeroShift + tol[i]) shifts.push(Math.max(-maxZeroShift, Math.min(maxZeroShift, s)));
    }
  }
  const support = (shift: number): number => {
    let q = 0;
    for (const i of strong) {
      const j = nearestPeak(ott, nO, tt[i] + shift);
      const r = (ott[j] - tt[i] - shift) / tol[i];
      if (r * r < 1) q += Math.sqrt(li[i]) * (1 - r * r);
    }
    return q;
  };
  let shift = 0;
  let bestQ = support(0);
  for (const s of shifts) {
    const q = support(s);
    if (q > bestQ + 1e-9 || (Math.abs(q - bestQ) <= 1e-9 && Math.abs(s) < Math.abs(shift))) {
      bestQ = q;
      shift = s;
    }
  }
  // Refine: weighted mean offset of the strong matched lines.
  {
    let sw = 0;
    let sr = 0;
    for (const i of strong) {
      const j = nearestPeak(ott, nO, tt[i] + shift);
      const r = ott[j] - tt[i] - shift;
      if (Math.abs(r) <= tol[i]) {
        sw += li[i];
        sr += li[i] * r;
      }
    }
    if (sw > 0) shift = Math.max(-maxZeroShift, Math.min(maxZeroShift, shift + sr / sw));
  }

  // Match every line (range widened by the tolerance) to its nearest peak.
  const lineIdx: number[] = [];
  const obsIdx: number[] = [];
  const matchOf = new Int32Array(nL).fill(-1);
  const refSum = new Map<number, number>();
  let posW = 0;
  let posSum = 0;
  for (let i = 0; i < nL; i++) {
    if (tt[i] < range[0] - tol[i] || tt[i] > range[1] + tol[i]) continue;
    const j = nearestPeak(ott, nO, tt[i] + shift);
    const r = (ott[j] - tt[i] - shift) / tol[i];
    if (r * r > 1) continue;
    matchOf[i] = j;
    lineIdx.push(i);
    obsIdx.push(j);
    refSum.set(j, (refSum.get(j) ?? 0) + li[i]);
    posW += li[i];
    posSum += li[i] * (1 - r * r);
  }
  if (lineIdx.length === 0) return { ...empty, zeroShift: shift };

  // Scale: weighted median of residual / reference over peaks that still carry unexplained intensity.
  const ratios: { r: number; w: number }[] = [];
  for (const [j, sum] of refSum) {
    if (residual[j] > AVAILABLE_FRACTION * oi[j]) ratios.push({ r: residual[j] / sum, w: sum });
  }
  let scale = 0;
  if (ratios.length > 0) {
    ratios.sort((a, b) => a.r - b.r);
    const half = ratios.reduce((s, x) => s + x.w, 0) / 2;
    let acc = 0;
    for (const x of ratios) {
      acc += x.w;
      if (acc >= half) {
        scale = x.r;
        break;
      }
    }
  }
  if (!(scale > 0)) return { ...empty, zeroShift: shift, lineIndex: Int32Array.from(lineIdx), obsIndex: Int32Array.from(obsIdx) };

  // Expected lines: in range and predicted above the detection limit (the strongest in-range line always).
  let expW = 0;
  let foundW = 0;
  let expected = 0;
  let matchedExpected = 0;
  for (const i of inRange) {
    if (scale * li[i] < detectionLimit && i !== strong[0]) continue;
    expected++;
    expW += li[i];
    if (matchOf[i] >= 0) {
      matchedExpected++;
      foundW += li[i];
    }
  }
  const reference = expW > 0 ? foundW / expW : 0;

  // Intensity agreement and newly explained intensity, per matched peak.
  let intW = 0;
  let intPen = 0;
  let explained = 0;
  for (const [j, sum] of refSum) {
    const pred = scale * sum;
    const lr = Math.log(pred / Math.max(oi[j], 1e-9));
    const pen = lr > 0 ? Math.min(lr / LOG_CAP, 1) : OVER_WEIGHT * Math.min(-lr / LOG_CAP, 1);
    // Only judge lines that are clearly above the detection limit.
    if (pred >= detectionLimit || oi[j] >= detectionLimit) {
      intW += sum;
      intPen += sum * pen;
    }
    if (residual[j] > AVAILABLE_FRACTION * oi[j]) explained += Math.min(residual[j], EXPLAIN_FACTOR * pred);
  }
  const position = posW > 0 ? posSum / posW : 0;
  const intensity = intW > 0 ? 1 - intPen / intW : 0;
  const observed = residualTotal > 0 ? Math.min(1, explained / residualTotal) : 0;
  const score = Math.sqrt(position) * reference * intensity * Math.sqrt(observed);
  return {
    score,
    parts: { position, intensity, reference, observed },
    zeroShift: shift,
    scale,
    lineIndex: Int32Array.from(lineIdx),
    obsIndex: Int32Array.from(obsIdx),
    expectedLines: expected,
    matchedExpected,
    explainedResidual: explained,
  };
}
