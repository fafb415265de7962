/** What every export writer reads: the project, the filter and the register rows with their phases. Pure types. */
import type { PhaseMapStation, RegisterFilter } from "@/lib/phase-map";

/** One phase of one sample. */
export interface ExportPhase {
  mineral: string;
  /** IMA symbol. */
  symbol: string;
  group: string | null;
  /** "asbestos" | "crystalline_silica" | null */
  hazard: string | null;
  kind: "confirmed" | "candidate";
  /** Semi-quantitative estimate, wt%; null when not estimated. */
  wtPercent: number | null;
  scanId: string;
  /** Rank among the scan's candidates (candidates only). */
  rank: number | null;
}

/** A register row as exported. Dates are ISO 8601 UTC strings. */
export interface ExportRow {
  id: string;
  code: string;
  igsn: string | null;
  stationCode: string | null;
  stationLat: number | null;
  stationLon: number | null;
  sampleType: string;
  lithology: string | null;
  alteration: string | null;
  alterationIntensity: string | null;
  description: string | null;
  collectedAt: string | null;
  collectedTz: string | null;
  collectorName: string | null;
  lat: number | null;
  lon: number | null;
  elevationM: number | null;
  horizontalAccuracyM: number | null;
  locationSource: string | null;
  storageLocation: string | null;
  status: string;
  suspectedAsbestos: boolean;
  weightKg: number | null;
  /** Confirmed phases (accepted on a signed-off scan), largest wt% first. */
  confirmed: ExportPhase[];
  /** Leading candidates not yet confirmed. */
  candidates: ExportPhase[];
}

/** Extra content of the PDF report. */
export interface RegisterReportData {
  totals: { samples: number; located: number; withConfirmed: number; withCandidatesOnly: number; stations: number };
  /** Confirmed phases over the filtered samples. */
  phaseSummary: { mineral: string; symbol: string; group: string | null; hazard: string | null; samples: number; wtMean: number | null; wtMin: number | null; wtMax: number | null }[];
  /** Minerals that appear only as candidates, with the number of samples. */
  candidateSummary: { mineral: string; symbol: string; samples: number }[];
  methods: {
    anodes: { anode: string | null; wavelengthA: number; scans: number }[];
    instruments: string[];
    processing: { params: Record<string, unknown>; softwareVersion: string; runs: number }[];
    /** Reference structures behind the confirmed phases, with their published sources. */
    references: { mineral: string; formula: string; spaceGroup: string; citation: string; builtin: boolean }[];
  };
  /** Stations for the map figure. */
  stations: PhaseMapStation[];
}

export interface RegisterExport {
  project: { id: string; code: string; name: string; region: string | null; description: string | null; /** IANA zone for local dates (null = UTC). */ timeZone?: string | null };
  filter: RegisterFilter;
  generatedAt: Date;
  /** Who the export is for: a signed-in member, or the holder of a share link. */
  source: { kind: "member"; name: string } | { kind: "share"; label: string | null; expiresAt: Date };
  /** Pages of rows in register order, read lazily (bounded memory). */
  pages: () => AsyncGenerator<ExportRow[]>;
  /** Summary, methods and map stations for the report. */
  report: () => Promise<RegisterReportData>;
}
