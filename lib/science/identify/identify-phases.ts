/**
 * Multiphase search–match of an observed peak list against a reference library (common practice): chemistry filter,
 * strong-line index look-up (Hanawalt, Rinn & Frevel 1938), scoring of the shortlisted references, acceptance of the
 * best confident phase, joint scaling of the accepted phases, and a new round on the unexplained peaks, until the
 * remainder is at noise level or nothing scores above the threshold. Weight fractions by RIR (Chung 1974) are
 * semi-quantitative. A ranked candidate is a suggestion, not a confirmed identification.
 */
import type { Peak, ReferencePattern } from "@/lib/science/types";
import { normalizeElementFilter, passesElementFilter } from "./element-filter";
import { EXPLAIN_FACTOR, evaluateCandidate, type CandidateEvaluation } from "./evaluate-candidate";
import { fitPhaseScales, type PhaseContribution } from "./fit-phase-scales";
import { prepareObservedPeaks } from "./observed-peaks";
import { scanReferenceLines, type ScanReferenceLines } from "./reference-lines";
import { rirWeightFractions } from "./rir-quantification";
import { buildStrongLineIndex, lookupStrongLines } from "./strong-line-index";
import type {
  IdentificationResult,
  IdentifiedPhase,
  IdentifyOptions,
  MatchedLine,
  PhaseCandidate,
  ResolvedIdentifyParams,
  StrongLineIndex,
} from "./types";

const DEG = Math.PI / 180;
const indexCache = new WeakMap<readonly ReferencePattern[], StrongLineIndex>();
// A peak is explained once the accepted phases predict at least this fraction of it (a factor EXPLAIN_FACTOR
// below the observed intensity is tolerated, as in the figure of merit).
const EXPLAINED_FRACTION = 1 / EXPLAIN_FACTOR;

/**
 * Identify the crystalline phases of a processed scan.
 * @param peaks - fitted peaks (2θ in °, d in Å, area/height in counts)
 * @param library - reference patterns; its strong-line index is built on first use and cached for this array
 *   (pass `options.index` to reuse one explicitly; rebuild it if the array is changed)
 * @param options - see {@link IdentifyOptions}
 * @throws TypeError for malformed peaks or element symbols, RangeError for impossible options
 */
export function identifyPhases(peaks: readonly Peak[], library: readonly ReferencePattern[], options: IdentifyOptions = {}): IdentificationResult {
  if (!Array.isArray(peaks)) throw new TypeError("peaks must be an array");
  if (!Array.isArray(library)) throw new TypeError("library must be an array of reference patterns");
  const {
    tolerance = {},
    maxZeroShift = 0.15,
    intensityFrom = "area",
    minScore = 0.5,
    minMatchedLines = 3,
    maxPhases = 6,
    residualStopPercent = 2,
    maxPeakFwhm = 1.5,
    lookupPeaks = 12,
    minSharedStrongLines = 3,
    maxCandidates = 20,
    kAlpha2,
  } = options;
  const tolTT = tolerance.twoTheta ?? 0.1;
  const tolD = tolerance.dRelative ?? 0;
  if (!(tolTT >= 0 && tolD >= 0 && tolTT + tolD > 0)) throw new RangeError("tolerance must be positive (twoTheta in °, dRelative as a fraction)");
  if (!(maxZeroShift >= 0 && maxZeroShift <= 2)) throw new RangeError("maxZeroShift must be 0–2° 2θ");
  const wavelength = options.wavelength ?? wavelengthFromPeaks(peaks);
  if (!(wavelength > 0 && wavelength < 5)) throw new RangeError(`wavelength must be 0–5 Å, got ${wavelength}`);
  const elements = options.elements ? normalizeElementFilter(options.elements) : null;

  const obs = prepareObservedPeaks(peaks, { intensityFrom, maxPeakFwhm, wavelength, kAlpha2, satelliteTolerance: tolTT });
  let range = options.twoThetaRange;
  if (!range) {
    let lo = Infinity;
    let hi = -Infinity;
    for (const p of peaks) {
      lo = Math.min(lo, p.twoTheta);
      hi = Math.max(hi, p.twoTheta);
    }
    range = Number.isFinite(lo) ? [Math.max(0.5, lo - 1), Math.min(170, hi + 1)] : [5, 90];
  }
  if (!(range[0] < range[1] && range[0] > 0 && range[1] < 180)) throw new RangeError("twoThetaRange must be [start, end] with 0 < start < end < 180°");
  let weakest = Infinity;
  for (let j = 0; j < obs.length; j++) if (obs.intensity[j] > 0) weakest = Math.min(weakest, obs.intensity[j]);
  const detectionLimit = options.detectionLimit ?? Math.max(1, Number.isFinite(weakest) ? weakest : 1);

  const index = options.index ?? cachedIndex(library);
  if (index.size !== library.length) throw new RangeError("options.index was built for a different library (size differs)");

  const params: ResolvedIdentifyParams = {
    wavelength,
    twoThetaRange: [range[0], range[1]],
    tolerance: { twoTheta: tolTT, dRelative: tolD },
    maxZeroShift,
    intensityFrom: obs.measure,
    detectionLimit,
    minScore,
    minMatchedLines,
    maxPhases,
    residualStopPercent,
    maxPeakFwhm,
    lookupPeaks,
    minSharedStrongLines,
    maxCandidates,
    elements,
    referencesSearched: library.length,
    candidatesScored: 0,
  };

  const lineCache = new Map<number, ScanReferenceLines>();
  const linesOf = (r: number): ScanReferenceLines => {
    let l = lineCache.get(r);
    if (!l) {
      l = scanReferenceLines(library[r], {
        wavelength,
        window: [range[0] - tolTT - maxZeroShift - 1, range[1] + tolTT + maxZeroShift + 1],
        toleranceTwoTheta: tolTT,
        toleranceDRelative: tolD,
      });
      lineCache.set(r, l);
    }
    return l;
  };
  const dRange: [number, number] = [dAt(range[1], wavelength), dAt(range[0], wavelength)];
  const filterOk = new Map<number, boolean>();
  const passes = (r: number): boolean => {
    if (!elements) return true;
    let ok = filterOk.get(r);
    if (ok === undefined) filterOk.set(r, (ok = passesElementFilter(library[r], elements)));
    return ok;
  };

  const total = obs.intensity.reduce((a, b) => a + b, 0);
  const residual = Float64Array.from(obs.intensity);
  const best = new Map<number, { ev: CandidateEvaluation; round: number; confident: boolean }>();
  const accepted: { r: number; ev: CandidateEvaluation; contribution: PhaseContribution }[] = [];
  const settings = { range, maxZeroShift, detectionLimit };
  const isConfident = (ev: CandidateEvaluation): boolean =>
    ev.score >= minScore && ev.expectedLines >= 2 && ev.matchedExpected >= Math.max(2, Math.min(minMatchedLines, ev.expectedLines));

  for (let round = 1; round <= maxPhases && obs.length > 0; round++) {
    const residualTotal = residual.reduce((a, b) => a + b, 0);
    if (residualTotal < (residualStopPercent / 100) * total) break;
    // Strongest unexplained peaks → d windows (position ± tolerance ± zero shift).
    const order = Array.from({ length: obs.length }, (_, j) => j)
      .filter((j) => residual[j] > 0)
      .sort((a, b) => residual[b] - residual[a])
      .slice(0, lookupPeaks);
    const strongTT = order.map((j) => obs.twoTheta[j]);
    const lookup = (minShared: number): number[] =>
      lookupStrongLines(index, {
        twoTheta: strongTT,
        wavelength,
        tolerance: strongTT.map((t) => Math.max(tolTT, (2 * Math.tan((t * DEG) / 2) * tolD) / DEG)),
        maxZeroShift,
        minShared,
        dRange,
      });
    const found: { pick: { r: number; ev: CandidateEvaluation } | null } = { pick: null };
    const seen = new Set<number>();
    const scoreAll = (shortlist: number[]): void => {
      for (const r of shortlist) {
        if (seen.has(r) || !passes(r) || accepted.some((a) => a.r === r)) continue;
        seen.add(r);
        const ev = evaluateCandidate(linesOf(r), obs, residual, residualTotal, settings);
        params.candidatesScored++;
        const confident = isConfident(ev);
        const prev = best.get(r);
        if (!prev || ev.score > prev.ev.score) best.set(r, { ev, round, confident: confident || (prev?.confident ?? false) });
        else if (confident) prev.confident = true;
        // A new phase must explain a noticeable part of what is left.
        if (confident && ev.explainedResidual >= (residualStopPercent / 200) * total && (!found.pick || ev.score > found.pick.ev.score))
          found.pick = { r, ev };
      }
    };
    scoreAll(lookup(minSharedStrongLines));
    // Round 1 (for the ranked alternatives) or nothing found: widen the look-up to references sharing two strong
    // lines (overlaps and preferred orientation can hide a third).
    if ((round === 1 || !found.pick) && minSharedStrongLines > 2) scoreAll(lookup(2));
    const pick = found.pick;
    if (!pick) break;
    const refByPeak = new Map<number, number>();
    const lines = linesOf(pick.r);
    pick.ev.lineIndex.forEach((i, k) => {
      const j = pick.ev.obsIndex[k];
      refByPeak.set(j, (refByPeak.get(j) ?? 0) + lines.intensity[i]);
    });
    accepted.push({ r: pick.r, ev: pick.ev, contribution: { refByPeak, scale: pick.ev.scale } });
    // Joint scales, then the unexplained remainder of each peak.
    const scales = fitPhaseScales(obs.intensity, accepted.map((a) => a.contribution), { floor: detectionLimit });
    accepted.forEach((a, k) => (a.contribution.scale = scales[k]));
    for (let j = 0; j < obs.length; j++) {
      let pred = 0;
      for (const a of accepted) pred += a.contribution.scale * (a.contribution.refByPeak.get(j) ?? 0);
      residual[j] = pred >= EXPLAINED_FRACTION * obs.intensity[j] ? 0 : obs.intensity[j] - pred;
    }
  }

  const matchedLinesOf = (r: number, ev: CandidateEvaluation): MatchedLine[] => {
    const lines = linesOf(r);
    const out: MatchedLine[] = [];
    ev.lineIndex.forEach((i, k) => {
      const j = ev.obsIndex[k];
      out.push({
        obsIndex: obs.source[j],
        refIndex: lines.refIndex[i],
        d: obs.d[j],
        dRef: lines.d[i],
        twoTheta: obs.twoTheta[j],
        intensity: obs.intensity[j],
        intensityRef: lines.intensity[i],
      });
    });
    return out;
  };

  const acceptedSet = new Set(accepted.map((a) => a.r));
  const candidates: PhaseCandidate[] = [...best.entries()]
    .map(([r, { ev, round, confident }]) => ({
      referenceId: library[r].id,
      mineral: library[r].mineral,
      formula: library[r].formula,
      score: round4(ev.score),
      confident,
      accepted: acceptedSet.has(r),
      matchedLines: matchedLinesOf(r, ev),
      explainedRefIntensity: round4(ev.parts.reference),
      explainedObsIntensity: round4(ev.parts.observed),
      zeroShift: round4(ev.zeroShift),
      expectedLines: ev.expectedLines,
      parts: { position: round4(ev.parts.position), intensity: round4(ev.parts.intensity), reference: round4(ev.parts.reference), observed: round4(ev.parts.observed) },
      round,
    }))
    .filter((c) => c.score > 0 || c.accepted)
    .sort((a, b) => Number(b.accepted) - Number(a.accepted) || b.score - a.score || a.referenceId.localeCompare(b.referenceId));
  const shown = candidates.filter((c) => c.accepted).concat(candidates.filter((c) => !c.accepted)).slice(0, Math.max(maxCandidates, accepted.length));
  shown.sort((a, b) => b.score - a.score || a.referenceId.localeCompare(b.referenceId));

  const wt = rirWeightFractions(accepted.map((a) => ({ intensity: 100 * a.contribution.scale, rir: library[a.r].rir })));
  const phases: IdentifiedPhase[] = accepted.map((a, k) => ({
    referenceId: library[a.r].id,
    mineral: library[a.r].mineral,
    formula: library[a.r].formula,
    score: round4(best.get(a.r)?.ev.score ?? a.ev.score),
    wtPercent: wt[k] === null ? null : Math.round(wt[k]! * 10) / 10,
    rir: library[a.r].rir ?? null,
    scale: a.contribution.scale,
    zeroShift: round4(a.ev.zeroShift),
    matchedLines: matchedLinesOf(a.r, a.ev),
  }));
  const unexplainedPeaks: Peak[] = [];
  for (let j = 0; j < obs.length; j++) if (residual[j] > 0) unexplainedPeaks.push(peaks[obs.source[j]]);
  return {
    candidates: shown,
    phases,
    unexplainedPeaks,
    broadFeatures: obs.broad.map((i) => peaks[i]),
    noConfidentMatch: phases.length === 0,
    quantification: "semi-quantitative (RIR, Chung 1974)",
    params,
  };
}

function cachedIndex(library: readonly ReferencePattern[]): StrongLineIndex {
  let index = indexCache.get(library);
  if (!index || index.size !== library.length) {
    index = buildStrongLineIndex(library);
    indexCache.set(library, index);
  }
  return index;
}

/** Wavelength implied by the peaks' own (2θ, d) pairs: median of 2·d·sinθ, Å (NaN without usable peaks). */
function wavelengthFromPeaks(peaks: readonly Peak[]): number {
  const v = peaks
    .filter((p) => p.d > 0 && p.twoTheta > 0 && p.twoTheta < 180)
    .map((p) => 2 * p.d * Math.sin((p.twoTheta * DEG) / 2))
    .sort((a, b) => a - b);
  if (v.length === 0) return peaks.length === 0 ? 1.540593 : NaN;
  return v[v.length >> 1];
}

function dAt(twoTheta: number, wavelength: number): number {
  return wavelength / (2 * Math.sin((twoTheta * DEG) / 2));
}

function round4(x: number): number {
  return Math.round(x * 1e4) / 1e4;
}
