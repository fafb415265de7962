/**
 * Shapes of the whole-pattern phase analysis. Angles in ° 2θ, d in Å, intensities in counts above background.
 * A fitted phase is a ranked, statistically supported candidate, not a confirmed identification: the analyst
 * confirms phases at sign-off.
 */
import type { ElementFilter } from "@/lib/science/identify/types";

/** Peak width as a function of angle: H² = U·tan²θ + V·tanθ + W (Caglioti, Paoletti & Ricci 1958). */
export interface Caglioti {
  U: number;
  V: number;
  W: number;
}

/** The instrument and specimen model shared by every phase. */
export interface GlobalProfile {
  /** Kα1 wavelength, Å. */
  wavelength: number;
  /** Kα2 wavelength, Å, or null when the scan has no Kα2 (monochromated or stripped). */
  wavelength2: number | null;
  /** I(Kα2)/I(Kα1). */
  ka2Ratio: number;
  caglioti: Caglioti;
  /** Pseudo-Voigt mixing η (0 Gaussian … 1 Lorentzian), common to all phases. */
  eta: number;
  /** Zero error added to every calculated position, ° 2θ. */
  zeroShift: number;
  /** Specimen displacement s (mm; positive = below the focusing circle): Δ2θ = −2·s·cosθ/R rad. */
  displacementMm: number;
  /** Goniometer radius R, mm. */
  radiusMm: number;
}

/** The parameters of one phase's profile. */
export interface PhaseProfileParams {
  /** Multiplier of every d-spacing (isotropic cell change: solid solution, thermal state). */
  cellScale: number;
  /** Multiplier of the Caglioti width (size/strain broadening). */
  widthFactor: number;
  /** March–Dollase r along the phase's texture direction (1 = random), or null when not refined. */
  marchR: number | null;
}

/** A line of a phase that the observed profile supports where no other phase contributes much. */
export interface EvidenceLine {
  twoTheta: number;
  d: number;
  hkl: [number, number, number];
  /** Net observed counts at the line position. */
  observed: number;
  /** Share of the calculated profile at that position that comes from this phase (0–1). */
  share: number;
}

/** Why a phase is believed. */
export interface PhaseEvidence {
  /** Lines of this phase that stand alone (≥ 70 % of the calculated profile there, observed ≥ 3σ). */
  aloneLines: EvidenceLine[];
  /** Share of the phases' summed calculated profile (area) that this phase explains (0–1). */
  profileShare: number;
  /** How much worse the fit gets (Bayesian information criterion, Schwarz 1978) when the phase is removed. */
  deltaBic: number;
}

/** A phase of the final fit. */
export interface FittedPhase {
  referenceId: string;
  mineral: string;
  formula: string;
  /** Multiplier of the reference's relative intensities (0–100 scale) in counts·°. */
  scale: number;
  scaleSigma: number;
  params: PhaseProfileParams;
  /** Hill & Howard (1987) weight percent, or null with `wtNote` saying why. */
  wtPercent: number | null;
  /** Standard uncertainty of wtPercent from the scale covariance (counting statistics × goodness of fit). */
  wtSigma: number | null;
  wtNote?: string;
  /** Chung (1974) RIR estimate from the phase's strongest stand-alone observed line, as a cross-check. */
  rirWtPercent: number | null;
  evidence: PhaseEvidence;
  /**
   * Library phases that fit this profile as well (a pattern alone cannot tell them apart: a solid-solution series,
   * the K-feldspars, magnetite/chromite…). Empty when the choice is clear.
   */
  alternatives: { referenceId: string; mineral: string }[];
  /**
   * Series the phase and its alternatives belong to (e.g. "biotite", "garnet"). Biotite and K-feldspar are always
   * reported by the series name; plagioclase and tremolite-actinolite when another member fits as well. Then
   * `mineral` is the series name and `referenceId` the structure that was fitted.
   */
  series?: string;
  /** This phase's own calculated contribution on the scan grid (net counts). */
  profile: Float64Array;
}

/** Fit statistics (weighted, Poisson or file esd): Young (1993) "The Rietveld Method", ch. 1. */
export interface FitStatistics {
  /** Weighted-profile R, %. */
  rwp: number;
  /** Expected R, %. */
  rexp: number;
  /** Goodness of fit χ²_ν = (Rwp/Rexp)². */
  gof: number;
  points: number;
  parameters: number;
}

/** A peak the final model does not explain. */
export interface UnexplainedPeak {
  twoTheta: number;
  d: number;
  /** Relative intensity of the observed peak (strongest observed = 100). */
  intensity: number;
}

/** A phase tried and kept out, with the reason (for the review page). */
export interface RejectedCandidate {
  referenceId: string;
  mineral: string;
  reason: string;
  deltaBic: number;
}

/** Options of the whole-pattern analysis. */
export interface WholePatternOptions {
  /** Only phases made of these elements (see `ElementFilter`). */
  elements?: ElementFilter;
  /**
   * Fit exactly these reference ids (the analyst's choice; selection is skipped). Unknown ids are a RangeError.
   */
  phaseIds?: readonly string[];
  /** Most phases to select. @default 8 */
  maxPhases?: number;
  /** Candidates from the strong-line look-up to try. @default 40 */
  maxCandidates?: number;
  /** ΔBIC a phase must bring (Kass & Raftery 1995: > 10 is "very strong" evidence; stricter here, see identifyWholePattern). @default 30 */
  minDeltaBic?: number;
  /** Internal standard of known weight (Chung 1974): its reference id and wt% of the spiked specimen. */
  internalStandard?: { referenceId: string; wtPercent: number };
  /** Limit on the Levenberg–Marquardt iterations of each refinement. @default 25 */
  maxIterations?: number;
}

/** Result of {@link identifyWholePattern}. Arrays are on the scan's own grid. */
export interface WholePatternResult {
  twoTheta: Float64Array;
  /** Background under the fit (counts). */
  background: Float64Array;
  /** Observed counts. */
  observed: Float64Array;
  /** Background + every phase. */
  calculated: Float64Array;
  /** observed − calculated. */
  difference: Float64Array;
  phases: FittedPhase[];
  /** Candidates tried and not kept, best first. */
  rejected: RejectedCandidate[];
  global: GlobalProfile;
  stats: FitStatistics;
  unexplained: UnexplainedPeak[];
  /** True when no phase passed the selection: amorphous material, or minerals outside the library. */
  noConfidentMatch: boolean;
  quantification: {
    method: string;
    /** True unless an internal standard was declared. */
    semiQuantitative: boolean;
    /** Amorphous + unidentified wt% (only with an internal standard). */
    amorphousWtPercent: number | null;
    notes: string[];
  };
  /** Wall time of the analysis, ms. */
  elapsedMs: number;
}
