/** Shapes of the phase-map data, shared by the DAL, the route, the map layer and the exports. Pure types. */

/** Confirmed = accepted on a signed-off scan; candidate = a leading, not yet confirmed result. */
export type PhaseKind = "confirmed" | "candidate";

/** One phase at a station, aggregated over the station's samples. */
export interface StationPhase {
  /** Lowercase IMA mineral name. */
  mineral: string;
  group: string | null;
  /** IMA symbol. */
  symbol: string;
  kind: PhaseKind;
  /** Number of the station's (filtered) samples with this phase of this kind. */
  samples: number;
  /** Mean and largest semi-quantitative wt% over those samples (null when none was estimated). */
  wtMean: number | null;
  wtMax: number | null;
  /** Health hazard class of the reference phase ("asbestos", "crystalline_silica") or null. */
  hazard?: string | null;
}

/** A station (or an unattached sample with its own position) on the phase map. */
export interface PhaseMapStation {
  /** Station id, or "sample:<id>" for a sample that belongs to no station. */
  key: string;
  stationId: string | null;
  code: string;
  name: string | null;
  /** WGS84 decimal degrees. */
  lat: number;
  lon: number;
  /** Samples at this station that match the filter. */
  samples: number;
  /** Most frequent lithology of those samples. */
  lithology: string | null;
  lastCollectedAt: string | null;
  /** Confirmed phases first (by mean wt% then sample count), then candidates. */
  phases: StationPhase[];
}

/** A mineral that occurs in the project, for the filter list and the legend. */
export interface MineralOption {
  mineral: string;
  symbol: string;
  group: string | null;
  /** Stations (or unattached samples) with it confirmed / only as a candidate, under the register filter without the mineral/group criterion. */
  confirmedStations: number;
  candidateStations: number;
}

export interface PhaseMapData {
  stations: PhaseMapStation[];
  /** Samples matching the filter, and how many of them have no position (not on the map). */
  totals: { samples: number; stations: number; unlocatedSamples: number };
  generatedAt: string;
}
