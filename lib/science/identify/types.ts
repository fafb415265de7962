/**
 * Shapes of the phase-identification step (search–match of a peak list against reference patterns).
 * Angles in degrees 2θ, d-spacings and wavelengths in ångström, intensities on a 0–100 scale
 * (strongest observed peak = 100) unless a field says otherwise.
 */
import type { Peak } from "@/lib/science/types";

/** Chemistry filter applied to the reference set before scoring. Element symbols as in the periodic table ("Si"). */
export interface ElementFilter {
  /** Each candidate must contain every one of these elements. */
  required?: string[];
  /** Each candidate may contain only these elements (list O, H, C too when they may occur). */
  allowed?: string[];
  /** No candidate may contain any of these elements. */
  excluded?: string[];
}

/** Matching tolerance. When both are given the wider window (per line) is used. */
export interface MatchTolerance {
  /**
   * Half-width of the position window, ° 2θ.
   * @default 0.1
   */
  twoTheta?: number;
  /** Half-width of the position window as a relative d-spacing error (e.g. 0.005 for 0.5 %). */
  dRelative?: number;
}

/** Options of {@link identifyPhases}. */
export interface IdentifyOptions {
  /** Wavelength of the scan, Å. @default derived from the peaks (2·d·sinθ, median) */
  wavelength?: number;
  /** Measured 2θ range [start, end], °. Reference lines outside it are not expected. @default peak range ± 1° */
  twoThetaRange?: [number, number];
  /** Position window. @default { twoTheta: 0.1 } */
  tolerance?: MatchTolerance;
  /**
   * Largest common zero shift searched per candidate, ° 2θ (fitted within ±maxZeroShift).
   * @default 0.15
   */
  maxZeroShift?: number;
  /** Chemistry filter. @default no filter */
  elements?: ElementFilter;
  /**
   * Intensity measure of the observed peaks: integrated `area` (comparable to computed integrated intensities)
   * or `height`. Falls back to height when areas are missing.
   * @default "area"
   */
  intensityFrom?: "area" | "height";
  /**
   * Detection limit as % of the strongest observed peak: reference lines predicted below it are not expected.
   * @default max(1, weakest observed peak)
   */
  detectionLimit?: number;
  /** Score (0–1) at or above which a candidate may be called confident. @default 0.5 */
  minScore?: number;
  /** Fewest matched expected lines for a confident candidate (fewer only if fewer are expected, never < 2). @default 3 */
  minMatchedLines?: number;
  /** Largest number of phases accepted. @default 6 */
  maxPhases?: number;
  /**
   * Stop when the unexplained observed intensity falls below this % of the total.
   * @default 2
   */
  residualStopPercent?: number;
  /** Peaks broader than this (FWHM, ° 2θ) are treated as non-crystalline features, not matched. @default 1.5 */
  maxPeakFwhm?: number;
  /** Number of strongest (unexplained) observed peaks used for the strong-line index look-up per round. @default 12 */
  lookupPeaks?: number;
  /**
   * Strong lines a reference must share with the strongest unexplained peaks to be scored (a round that finds
   * nothing retries with 2).
   * @default 3
   */
  minSharedStrongLines?: number;
  /** Number of candidates returned. @default 20 */
  maxCandidates?: number;
  /** Optional Kα2 satellites: observed peaks at the Kα2 position of a stronger peak are treated as explained. */
  kAlpha2?: { wavelength: number; ratio?: number };
  /** A prebuilt strong-line index of the same library (built on first use and cached otherwise). */
  index?: StrongLineIndex;
}

/** A strong-line (Hanawalt-style) index of a reference library; see {@link buildStrongLineIndex}. */
export interface StrongLineIndex {
  /** Number of references indexed (equals the library length). */
  size: number;
  /** Lines indexed per reference. */
  linesPerReference: number;
  /** Bin width in ln(d). */
  binWidth: number;
  /** ln(d) of the lower edge of bin 0. */
  lnDMin: number;
  /** CSR offsets into `entries`, length = bins + 1. */
  binStart: Int32Array;
  /** Entry = reference index × linesPerReference + slot. */
  entries: Int32Array;
  /** ln(d) of each entry (same order as `entries`). */
  entryLnD: Float64Array;
  /** d of each indexed line, reference-major (NaN when a reference has fewer lines). */
  lineD: Float64Array;
}

/** An observed peak matched to a reference line. */
export interface MatchedLine {
  /** Index into the input peak list. */
  obsIndex: number;
  /** Index into the reference's `lines` (the strongest line of a merged group). */
  refIndex: number;
  /** Observed d, Å. */
  d: number;
  /** Reference d, Å. */
  dRef: number;
  /** Observed 2θ, °. */
  twoTheta: number;
  /** Observed intensity, % of strongest peak. */
  intensity: number;
  /** Reference intensity (summed over lines merged with it), 0–100. */
  intensityRef: number;
}

/** Components of a candidate's figure of merit, each 0–1. */
export interface ScoreParts {
  /** Position agreement of the matched lines (1 = exact after the zero shift). */
  position: number;
  /** Intensity agreement (log-ratio, capped; weak observed lines penalised more than strong ones). */
  intensity: number;
  /** Fraction of the expected reference intensity found (= explainedRefIntensity). */
  reference: number;
  /** Fraction of the observed (unexplained) intensity this candidate explains (= explainedObsIntensity). */
  observed: number;
}

/** A ranked candidate phase. A candidate is a suggestion, not an identification. */
export interface PhaseCandidate {
  referenceId: string;
  mineral: string;
  formula: string;
  /** Figure of merit 0–1 (best over the search rounds). */
  score: number;
  /** Score above threshold and enough expected lines found. */
  confident: boolean;
  /** Accepted as a phase of the mixture. */
  accepted: boolean;
  matchedLines: MatchedLine[];
  /** Fraction (0–1) of the reference intensity expected in the range and above the detection limit that was found. */
  explainedRefIntensity: number;
  /** Fraction (0–1) of the observed intensity (still unexplained in that round) explained by this candidate. */
  explainedObsIntensity: number;
  /** Fitted common zero shift, ° 2θ (observed − reference). */
  zeroShift: number;
  /** Number of reference lines expected in the range above the detection limit. */
  expectedLines: number;
  parts: ScoreParts;
  /** Search round (1-based) in which the best score was reached. */
  round: number;
}

/** An accepted phase with its semi-quantitative weight fraction. */
export interface IdentifiedPhase {
  referenceId: string;
  mineral: string;
  formula: string;
  score: number;
  /**
   * Weight % by the RIR method (Chung 1974), normalised over the accepted phases; semi-quantitative, assumes no
   * amorphous or unidentified content. Null when a phase has no RIR.
   */
  wtPercent: number | null;
  /** Reference intensity ratio used. */
  rir: number | null;
  /** Fitted scale: observed intensity (% of strongest peak) per unit of reference intensity (0–100 scale). */
  scale: number;
  zeroShift: number;
  matchedLines: MatchedLine[];
}

/** Result of {@link identifyPhases}. */
export interface IdentificationResult {
  /** Ranked candidates, best first. Suggestions, not identifications. */
  candidates: PhaseCandidate[];
  /** Accepted phases, in acceptance order. */
  phases: IdentifiedPhase[];
  /** Observed peaks not (or only in small part) explained by the accepted phases. */
  unexplainedPeaks: Peak[];
  /** Peaks too broad to be crystalline (e.g. an amorphous hump); not matched. */
  broadFeatures: Peak[];
  /** True when no phase was accepted. */
  noConfidentMatch: boolean;
  /** Label of the quantification method. */
  quantification: "semi-quantitative (RIR, Chung 1974)";
  /** Resolved parameters used. */
  params: ResolvedIdentifyParams;
}

/** Parameters after defaults and derivations were applied. */
export interface ResolvedIdentifyParams {
  wavelength: number;
  twoThetaRange: [number, number];
  tolerance: { twoTheta: number; dRelative: number };
  maxZeroShift: number;
  intensityFrom: "area" | "height";
  detectionLimit: number;
  minScore: number;
  minMatchedLines: number;
  maxPhases: number;
  residualStopPercent: number;
  maxPeakFwhm: number;
  lookupPeaks: number;
  minSharedStrongLines: number;
  maxCandidates: number;
  elements: ElementFilter | null;
  referencesSearched: number;
  candidatesScored: number;
}
