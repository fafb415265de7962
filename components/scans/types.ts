/** Shapes of the scan API responses as the browser receives them (dates as ISO strings). */
export type Hazard = "asbestos" | "crystalline_silica" | null;
export type ScanStatus = "uploaded" | "processing" | "processed" | "failed" | "signed_off";
export type RunStatus = "queued" | "running" | "done" | "failed";

export interface RunProgress {
  status: RunStatus;
  ahead?: number;
  stage?: "reading" | "processing" | "identifying" | "fitting" | "saving";
  fraction?: number;
}

export interface MatchedLine {
  twoTheta: number;
  d: number;
  dRef: number;
  intensity: number;
  intensityRef: number;
  hkl: [number, number, number] | null;
}

export interface PhaseRow {
  id: string;
  referencePhaseId: string;
  rank: number | null;
  score: number | null;
  confident: boolean;
  /** Whole-pattern wt% (fitted phases only). */
  wtPercent: number | null;
  wtSigma: number | null;
  /** Kept by the whole-pattern fit of this run (still a candidate until sign-off). */
  fitted: boolean;
  /** The fit's account of the phase (fitted phases only). */
  fit: StoredFit | null;
  matched: MatchedLine[] | null;
  source: "auto" | "manual";
  status: "candidate" | "accepted" | "rejected";
  decidedAt: string | null;
  decidedByName: string | null;
  note: string | null;
  mineral: string;
  formula: string;
  group: string | null;
  hazard: Hazard;
  rir: number | null;
  otherHazards: string[];
}

export interface PeakRow {
  id: string;
  twoTheta: number;
  d: number;
  height: number;
  area: number | null;
  fwhm: number | null;
  fwhmEsd: number | null;
  relIntensity: number;
  crystalliteNm: number | null;
}

/** The stored run profile, as the review page receives it (types only; no server code reaches the client). */
import type { RunFit, RunProfile, SparseCurve, StoredFit } from "@/lib/jobs/analyse-scan";
import type { SignOffRecord } from "@/lib/dal/scan-review";

export type { RunFit, RunProfile, SignOffRecord, SparseCurve, StoredFit };

/** What POST …/refit returns. */
export interface RefitResponse {
  runId: string;
  fromRunId: string;
  stats: RunFit["stats"];
  noConfidentMatch: boolean;
  phases: { referencePhaseId: string; mineral: string; wtPercent: number | null; wtSigma: number | null }[];
  withdrawn: string[];
  elapsedMs: number;
}

export interface ScanDetail {
  scan: {
    id: string;
    projectId: string;
    sampleId: string;
    originalName: string;
    sha256: string;
    format: string;
    anode: string | null;
    wavelengthA: number;
    wavelength2A: number | null;
    instrument: string | null;
    settingsJson: Record<string, unknown> | null;
    twoThetaStart: number | null;
    twoThetaEnd: number | null;
    stepDeg: number | null;
    pointCount: number | null;
    status: ScanStatus;
    error: string | null;
    currentRunId: string | null;
    analystNote: string | null;
    signedOffAt: string | null;
    signedOffByName: string | null;
    /** What the sign-off recorded (fit statistics with the phases); null before sign-off. */
    signOffJson: SignOffRecord | null;
    createdAt: string;
  };
  sample: { id: string; code: string; status: string; suspectedAsbestos: boolean; lithology: string | null };
  runs: {
    id: string;
    status: RunStatus;
    error: string | null;
    durationMs: number | null;
    createdAt: string;
    createdByName: string | null;
    softwareVersion: string;
    /** Set on a refit: the run it refits and how many phases the analyst chose. */
    refit: { fromRunId: string; phaseCount: number } | null;
    progress: RunProgress | null;
    current: boolean;
  }[];
  run: {
    id: string;
    status: RunStatus;
    error: string | null;
    params: { requested: Record<string, unknown>; refit?: { fromRunId: string; phaseIds: string[] }; resolved?: { processing: Record<string, unknown>; identify?: Record<string, unknown> } };
    progress: RunProgress | null;
    profile: RunProfile | null;
    unexplained: { twoTheta: number; d: number; intensity: number }[];
    peaks: PeakRow[];
    phases: PhaseRow[];
  } | null;
  canProcess: boolean;
  canReview: boolean;
}

export interface ScanListItem {
  id: string;
  sampleId: string;
  sampleCode: string;
  suspectedAsbestos: boolean;
  originalName: string;
  format: string;
  anode: string | null;
  wavelengthA: number;
  instrument: string | null;
  twoThetaStart: number | null;
  twoThetaEnd: number | null;
  pointCount: number | null;
  status: ScanStatus;
  error: string | null;
  currentRunId: string | null;
  signedOffAt: string | null;
  createdAt: string;
  runStatus: RunStatus | null;
  runDurationMs: number | null;
  progress: RunProgress | null;
  accepted: { mineral: string; hazard: Hazard }[];
  leading: { mineral: string; hazard: Hazard; confident: boolean } | null;
  hazards: ("asbestos" | "crystalline_silica")[];
}
