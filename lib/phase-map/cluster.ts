/**
 * Cluster summaries for supercluster (its `map` / `reduce` options): each cluster carries the number of
 * stations and samples it holds and, per mineral, how many of its stations have the mineral confirmed
 * and how many only as a candidate. Pure.
 */
import type { SymbolSegment } from "./svg";
import { phaseSymbol } from "./symbol-scheme";
import { TOL_PALE_GREY } from "./palette";
import type { PhaseMapStation } from "./types";

/** Per mineral: c = stations with it confirmed, k = stations with it as a candidate only, g = group. */
export type ClusterPhaseCounts = Record<string, { c: number; k: number; g: string | null }>;

export interface ClusterSummary {
  stations: number;
  samples: number;
  phases: ClusterPhaseCounts;
}

/** Properties of one station point as given to supercluster. */
export interface StationPointProps {
  key: string;
  samples: number;
  phases: ClusterPhaseCounts;
}

/** The station's contribution (counts per mineral, each station once per mineral). */
export function stationPointProps(station: Pick<PhaseMapStation, "key" | "samples" | "phases">, candidates = true): StationPointProps {
  const phases: ClusterPhaseCounts = {};
  for (const p of station.phases) {
    if (p.kind === "confirmed") phases[p.mineral] = { c: 1, k: 0, g: p.group };
  }
  if (candidates) {
    for (const p of station.phases) {
      if (p.kind === "candidate" && !phases[p.mineral]) phases[p.mineral] = { c: 0, k: 1, g: p.group };
    }
  }
  return { key: station.key, samples: station.samples, phases };
}

/** supercluster `map`: a fresh summary per point (never shares objects with the input). */
export function mapClusterProps(p: StationPointProps): ClusterSummary {
  const phases: ClusterPhaseCounts = {};
  for (const [m, v] of Object.entries(p.phases)) phases[m] = { c: v.c, k: v.k, g: v.g };
  return { stations: 1, samples: p.samples, phases };
}

/**
 * supercluster `reduce`: adds `b` into `acc`. supercluster hands `reduce` a *shallow* copy of a child
 * cluster's properties, so the nested per-mineral counts are rebuilt here, never mutated in place
 * (mutating them would double-count at the next zoom level).
 */
export function reduceClusterProps(acc: ClusterSummary, b: Readonly<ClusterSummary>): void {
  acc.stations += b.stations;
  acc.samples += b.samples;
  const phases: ClusterPhaseCounts = {};
  for (const [m, v] of Object.entries(acc.phases)) phases[m] = { c: v.c, k: v.k, g: v.g };
  for (const [m, v] of Object.entries(b.phases)) {
    const cur = phases[m];
    if (cur) {
      cur.c += v.c;
      cur.k += v.k;
    } else phases[m] = { c: v.c, k: v.k, g: v.g };
  }
  acc.phases = phases;
}

/** The supercluster options carrying the phase summaries. */
export const PHASE_CLUSTER_OPTIONS = { map: mapClusterProps, reduce: reduceClusterProps } as const;

/**
 * Ring segments of a cluster: per mineral a filled segment for its confirmed stations and an outlined
 * one for candidate-only stations, largest first; beyond `max` minerals the rest form one grey segment.
 */
export function clusterSegments(summary: Pick<ClusterSummary, "phases">, options: { candidates?: boolean; max?: number } = {}): SymbolSegment[] {
  const { candidates = true, max = 8 } = options;
  const rows = Object.entries(summary.phases)
    .map(([mineral, v]) => ({ mineral, ...v, total: v.c + (candidates ? v.k : 0) }))
    .filter((r) => r.total > 0)
    .sort((a, b) => b.total - a.total || (a.mineral < b.mineral ? -1 : 1));
  const out: SymbolSegment[] = [];
  let rest = 0;
  rows.forEach((r, i) => {
    if (i >= max) {
      rest += r.total;
      return;
    }
    const s = phaseSymbol(r.mineral, r.g);
    if (r.c > 0) out.push({ symbol: s.symbol, colour: s.colour, shape: s.shape, confirmed: true, weight: r.c });
    if (candidates && r.k > 0) out.push({ symbol: s.symbol, colour: s.colour, shape: s.shape, confirmed: false, weight: r.k });
  });
  if (rest > 0) out.push({ symbol: "…", colour: TOL_PALE_GREY, shape: "circle", confirmed: true, weight: rest });
  return out;
}
