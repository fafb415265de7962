/**
 * The computation of a processing run, free of database and framework imports (so it can run in a worker thread):
 * parse + process the scan, rank candidates by the peak-list search, fit the whole pattern (the deciding step), and
 * shape the result for storage: the curves for the review page (RunProfile) and one phase_results row per phase.
 *
 * The whole-pattern fit decides which phases are reported (with Hill & Howard wt% ± σ); the peak-list search keeps
 * its ranked list for the analyst. Neither is an identification: the analyst confirms phases at sign-off.
 */
import { identifyPhases, type IdentificationResult } from "@/lib/science/identify";
import { parseScan } from "@/lib/science/scan";
import { processScan, type ProcessParams, type ProcessedScan } from "@/lib/science/signal";
import type { ReferencePattern } from "@/lib/science/types";
import { identifyWholePattern, type FitStatistics, type WholePatternOptions, type WholePatternResult } from "@/lib/science/wholepattern";
import type { ProcessParamsInput } from "@/lib/validation/scan";

/** Options of the whole-pattern step as a run records them. */
export type RunFitOptions = Pick<WholePatternOptions, "elements" | "maxPhases" | "phaseIds">;

/** What a run stores in processing_runs.params_json. */
export interface RunParams {
  requested: ProcessParamsInput;
  /** A refit: the whole pattern fitted with the analyst's phases, on the processing of `fromRunId`. */
  refit?: { fromRunId: string; phaseIds: string[] };
  resolved?: { processing: ProcessedScan["params"]; identify?: IdentificationResult["params"]; wholePattern?: RunFitOptions };
}

/** A matched line as stored in phase_results.matched_json. */
export interface StoredMatch {
  twoTheta: number;
  d: number;
  dRef: number;
  intensity: number;
  intensityRef: number;
  hkl: [number, number, number] | null;
}

/**
 * A curve that is zero over most of the scan, as runs of grid points: [[startIndex, values[]], …]. Points outside
 * every run are zero (below half a count and 0.1 % of the curve's maximum).
 */
export type SparseCurve = [number, number[]][];

/** The whole-pattern fit of a run as the review page draws it (in processing_runs.profile_json.fit). */
export interface RunFit {
  /** Background + every phase, on the scan grid (counts). */
  calculated: number[];
  /** The fit's background: the processing background with the fit's smooth correction (calculated − every phase). */
  background: number[];
  /** Observed − calculated. */
  difference: number[];
  /** Each fitted phase's own contribution (net counts above the background), largest wt% first. */
  phases: { referencePhaseId: string; mineral: string; wtPercent: number | null; wtSigma: number | null; profile: SparseCurve }[];
  stats: FitStatistics;
  quantification: WholePatternResult["quantification"];
  noConfidentMatch: boolean;
  /** Who chose the phases: the fit's own selection, or the analyst (refit). */
  chosenBy: "fit" | "analyst";
  /** Candidates the selection tried and left out (best first, at most 10). */
  rejected: WholePatternResult["rejected"];
  /** Refined instrument terms common to every phase. */
  global: { zeroShift: number; displacementMm: number; eta: number; caglioti: { U: number; V: number; W: number } };
  elapsedMs: number;
}

/** What a run stores in processing_runs.profile_json: the curves for the diffractogram and the identification summary. */
export interface RunProfile {
  wavelength: number;
  twoTheta: number[];
  raw: number[];
  background: number[];
  /** Background + Kα1-only processed signal. */
  processed: number[];
  /** Background + fitted peak model (the peak list's own fit). */
  fitted: number[];
  warnings: string[];
  /** No phase passed the whole-pattern selection (amorphous material, minerals outside the library). */
  noConfidentMatch: boolean;
  /** How the wt% were obtained, e.g. "Hill & Howard (1987) ZMV, normalised to 100 % — semi-quantitative". */
  quantification: string;
  /** The peak-list search's own mixture (RIR wt%, Chung 1974): kept for the ranked candidate list only. */
  mixture: { referencePhaseId: string; mineral: string; wtPercent: number | null; rir: number | null; scale: number; zeroShift: number }[];
  broadFeatures: { twoTheta: number; d: number; fwhm: number }[];
  /** The whole-pattern fit (the deciding step). Absent on runs made before it existed. */
  fit?: RunFit;
}

/** The fit's account of one phase, as stored in phase_results.fit_json. */
export interface StoredFit {
  scale: number;
  scaleSigma: number;
  params: { cellScale: number; widthFactor: number; marchR: number | null };
  /** Chung (1974) RIR estimate, wt%, as a cross-check of the whole-pattern wt%. */
  rirWtPercent: number | null;
  wtNote?: string;
  evidence: {
    aloneLines: { twoTheta: number; d: number; hkl: [number, number, number]; observed: number; share: number }[];
    profileShare: number;
    deltaBic: number;
  };
  /** Library phases a pattern alone cannot tell apart from this one. */
  alternatives: { referenceId: string; mineral: string }[];
}

/** A peak the fit leaves unexplained, as stored in processing_runs.unexplained_json. */
export interface StoredUnexplained {
  twoTheta: number;
  d: number;
  intensity: number;
}

/** One ranked candidate of the peak-list search. */
export interface SearchRow {
  referencePhaseId: string;
  rank: number;
  score: number;
  confident: boolean;
  matchedJson: StoredMatch[];
}

/** A phase_results row computed by a run (decisions are added by the caller). */
export interface ComputedPhaseRow {
  referencePhaseId: string;
  rank: number | null;
  score: number | null;
  confident: boolean;
  wtPercent: number | null;
  wtSigma: number | null;
  fitted: boolean;
  fitJson: StoredFit | null;
  matchedJson: StoredMatch[] | null;
}

export const round = (x: number, digits: number) => {
  const f = 10 ** digits;
  return Math.round(x * f) / f;
};
const roundArray = (a: ArrayLike<number>, digits: number) => Array.from(a, (v) => round(v, digits));

type ScanWavelength = { anode: string | null; wavelengthA: number; wavelength2A: number | null; settingsJson?: unknown };

/**
 * Parses and processes scan text with a run's parameters. The wavelength is the scan's (from the file or the
 * upload form) unless the run overrides it; it is never silently assumed.
 */
export function processScanText(text: string, requested: ProcessParamsInput, scanRow: ScanWavelength) {
  // Read as at upload: the stored wavelength and time per step convert d columns and counts per second.
  const time = (scanRow.settingsJson as { timePerStep?: unknown } | null | undefined)?.timePerStep;
  const parsed = parseScan(text, { wavelength: scanRow.wavelengthA, countingTimeS: typeof time === "number" ? time : undefined });
  const req = requested.processing ?? {};
  const override = req.anode !== undefined || req.wavelength !== undefined;
  const params: ProcessParams = {
    ...req,
    ...(override
      ? { anode: req.anode, wavelength: req.wavelength, wavelength2: req.wavelength2 }
      : { anode: (scanRow.anode ?? undefined) as ProcessParams["anode"], wavelength: scanRow.wavelengthA, wavelength2: scanRow.wavelength2A ?? req.wavelength2 }),
    fallbackAnode: null,
  };
  return { parsed, processed: processScan(parsed, params) };
}

/** Search–match of processed peaks against the library over the measured range (the ranked candidate list). */
export function identifyProcessed(processed: ProcessedScan, requested: ProcessParamsInput, library: readonly ReferencePattern[]): IdentificationResult {
  const n = processed.twoTheta.length;
  return identifyPhases(processed.peaks, library, {
    ...requested.identify,
    wavelength: processed.wavelength,
    twoThetaRange: [processed.twoTheta[0], processed.twoTheta[n - 1]],
  });
}

/** The whole-pattern options a run uses: the run's element filter and phase limit, or the analyst's phases. */
export function fitOptionsOf(requested: ProcessParamsInput, phaseIds?: readonly string[]): RunFitOptions {
  const id = requested.identify;
  return {
    ...(id?.elements && !phaseIds ? { elements: id.elements } : {}),
    ...(id?.maxPhases && !phaseIds ? { maxPhases: id.maxPhases } : {}),
    ...(phaseIds ? { phaseIds: [...phaseIds] } : {}),
  };
}

/** Whole-pattern fit of a processed scan (the deciding step). */
export function fitProcessed(processed: ProcessedScan, library: readonly ReferencePattern[], options: RunFitOptions): WholePatternResult {
  return identifyWholePattern(processed, library, options);
}

/** The search's ranked candidates as rows (rank 1 = best). */
export function searchRows(identification: IdentificationResult, library: readonly ReferencePattern[]): SearchRow[] {
  const byId = new Map(library.map((p) => [p.id, p]));
  return identification.candidates.map((c, i) => {
    const ref = byId.get(c.referenceId);
    return {
      referencePhaseId: c.referenceId,
      rank: i + 1,
      score: round(c.score, 4),
      confident: c.confident,
      matchedJson: c.matchedLines.map((m) => {
        const line = ref?.lines[m.refIndex];
        return {
          twoTheta: round(m.twoTheta, 4),
          d: round(m.d, 5),
          dRef: round(m.dRef, 5),
          intensity: round(m.intensity, 2),
          intensityRef: round(m.intensityRef, 2),
          hkl: line ? ([line.h, line.k, line.l] as [number, number, number]) : null,
        };
      }),
    };
  });
}

/**
 * A curve as runs of grid points where it is at least half a count and 0.1 % of its maximum; runs closer than
 * `gap` points are joined. Values rounded to `digits`.
 */
export function sparseCurve(values: ArrayLike<number>, digits = 1, gap = 4): SparseCurve {
  let max = 0;
  for (let i = 0; i < values.length; i++) max = Math.max(max, Math.abs(values[i]));
  const threshold = Math.max(0.5, 1e-3 * max);
  const out: SparseCurve = [];
  let start = -1;
  let last = -1;
  const flush = () => {
    if (start >= 0) out.push([start, roundArray(Array.prototype.slice.call(values, start, last + 1) as number[], digits)]);
  };
  for (let i = 0; i < values.length; i++) {
    if (Math.abs(values[i]) < threshold) continue;
    if (start >= 0 && i - last <= gap) last = i;
    else {
      flush();
      start = i;
      last = i;
    }
  }
  flush();
  return out;
}

/** The full curve of a sparse one (zeros outside its runs). */
export function expandSparse(curve: SparseCurve, n: number): number[] {
  const out = new Array<number>(n).fill(0);
  for (const [start, vals] of curve) for (let i = 0; i < vals.length && start + i < n; i++) out[start + i] = vals[i];
  return out;
}

function storedFit(p: WholePatternResult["phases"][number]): StoredFit {
  return {
    scale: round(p.scale, 4),
    scaleSigma: round(p.scaleSigma, 4),
    params: { cellScale: round(p.params.cellScale, 6), widthFactor: round(p.params.widthFactor, 4), marchR: p.params.marchR === null ? null : round(p.params.marchR, 4) },
    rirWtPercent: p.rirWtPercent,
    ...(p.wtNote ? { wtNote: p.wtNote } : {}),
    evidence: {
      aloneLines: p.evidence.aloneLines.map((l) => ({ twoTheta: l.twoTheta, d: l.d, hkl: l.hkl, observed: l.observed, share: l.share })),
      profileShare: round(p.evidence.profileShare, 4),
      deltaBic: round(p.evidence.deltaBic, 1),
    },
    alternatives: p.alternatives.map((a) => ({ referenceId: a.referenceId, mineral: a.mineral })),
  };
}

const clampWt = (w: number | null) => (w === null ? null : Math.min(100, Math.max(0, round(w, 2))));

/**
 * One row per phase: the fit's phases (fitted, with wt% ± σ and the evidence), then the search's ranked candidates
 * the fit did not keep. A phase both fitted and ranked keeps its search rank, score and matched lines.
 */
export function phaseRowsOf(fit: WholePatternResult, search: readonly SearchRow[]): ComputedPhaseRow[] {
  const bySearch = new Map(search.map((s) => [s.referencePhaseId, s]));
  const fitted = new Set(fit.phases.map((p) => p.referenceId));
  const rows: ComputedPhaseRow[] = fit.phases.map((p) => {
    const s = bySearch.get(p.referenceId);
    return {
      referencePhaseId: p.referenceId,
      rank: s?.rank ?? null,
      score: s?.score ?? null,
      confident: s?.confident ?? false,
      wtPercent: clampWt(p.wtPercent),
      wtSigma: p.wtSigma === null ? null : round(p.wtSigma, 2),
      fitted: true,
      fitJson: storedFit(p),
      matchedJson: s?.matchedJson ?? null,
    };
  });
  for (const s of search) {
    if (fitted.has(s.referencePhaseId)) continue;
    rows.push({ referencePhaseId: s.referencePhaseId, rank: s.rank, score: s.score, confident: s.confident, wtPercent: null, wtSigma: null, fitted: false, fitJson: null, matchedJson: s.matchedJson });
  }
  return rows;
}

/** "Hill & Howard (1987) ZMV, normalised to 100 % — semi-quantitative". */
export function quantificationLabel(q: WholePatternResult["quantification"]): string {
  return `${q.method} — ${q.semiQuantitative ? "semi-quantitative" : "quantitative with an internal standard"}`;
}

/** The fit's part of the run profile: rounded curves, sparse per-phase profiles, statistics. */
export function runFitOf(fit: WholePatternResult, chosenBy: RunFit["chosenBy"]): RunFit {
  const order = fit.phases.map((p, k) => ({ p, k })).sort((a, b) => (b.p.wtPercent ?? -1) - (a.p.wtPercent ?? -1));
  const background = Float64Array.from(fit.calculated);
  for (const p of fit.phases) for (let i = 0; i < background.length; i++) background[i] -= p.profile[i];
  return {
    calculated: roundArray(fit.calculated, 1),
    background: roundArray(background, 1),
    difference: roundArray(fit.difference, 1),
    phases: order.map(({ p }) => ({ referencePhaseId: p.referenceId, mineral: p.mineral, wtPercent: p.wtPercent, wtSigma: p.wtSigma, profile: sparseCurve(p.profile) })),
    stats: fit.stats,
    quantification: fit.quantification,
    noConfidentMatch: fit.noConfidentMatch,
    chosenBy,
    rejected: fit.rejected.slice(0, 10),
    global: {
      zeroShift: round(fit.global.zeroShift, 4),
      displacementMm: round(fit.global.displacementMm, 4),
      eta: round(fit.global.eta, 4),
      caglioti: { U: round(fit.global.caglioti.U, 6), V: round(fit.global.caglioti.V, 6), W: round(fit.global.caglioti.W, 6) },
    },
    elapsedMs: Math.round(fit.elapsedMs),
  };
}

/**
 * The stored profile of a run. `search` is the run's own peak-list search, or (refit) the mixture and broad
 * features of the run it refits.
 */
export function runProfileOf(
  processed: ProcessedScan,
  fit: WholePatternResult,
  search: IdentificationResult | Pick<RunProfile, "mixture" | "broadFeatures">,
  chosenBy: RunFit["chosenBy"],
): RunProfile {
  const own = "candidates" in search;
  return {
    wavelength: processed.wavelength,
    twoTheta: roundArray(processed.twoTheta, 5),
    raw: roundArray(processed.raw, 2),
    background: roundArray(processed.background, 2),
    processed: roundArray(processed.stripped, 2),
    fitted: roundArray(processed.fitted, 2),
    warnings: processed.warnings,
    noConfidentMatch: fit.noConfidentMatch,
    quantification: quantificationLabel(fit.quantification),
    mixture: own
      ? search.phases.map((p) => ({
          referencePhaseId: p.referenceId,
          mineral: p.mineral,
          wtPercent: p.wtPercent === null ? null : round(p.wtPercent, 2),
          rir: p.rir,
          scale: p.scale,
          zeroShift: round(p.zeroShift, 4),
        }))
      : search.mixture,
    broadFeatures: own ? search.broadFeatures.map((p) => ({ twoTheta: round(p.twoTheta, 4), d: round(p.d, 5), fwhm: round(p.fwhm, 4) })) : search.broadFeatures,
    fit: runFitOf(fit, chosenBy),
  };
}

/** Unexplained peaks of the fit, rounded for storage. */
export function unexplainedOf(fit: WholePatternResult): StoredUnexplained[] {
  return fit.unexplained.map((p) => ({ twoTheta: round(p.twoTheta, 4), d: round(p.d, 5), intensity: round(p.intensity, 2) }));
}
