/** From aggregated station phases to drawable symbol segments. Pure. */
import type { SymbolSegment } from "./svg";
import { phaseSymbol } from "./symbol-scheme";
import type { PhaseMapStation, StationPhase } from "./types";

/** Sort order of a station's phases: confirmed first, then larger mean wt%, more samples, name. */
export function comparePhases(a: StationPhase, b: StationPhase): number {
  if (a.kind !== b.kind) return a.kind === "confirmed" ? -1 : 1;
  const wa = a.wtMean ?? -1;
  const wb = b.wtMean ?? -1;
  if (wa !== wb) return wb - wa;
  if (a.samples !== b.samples) return b.samples - a.samples;
  return a.mineral < b.mineral ? -1 : a.mineral > b.mineral ? 1 : 0;
}

export interface SegmentOptions {
  /** Include candidates. @default true */
  candidates?: boolean;
  /** Only this mineral (lowercase). */
  mineral?: string | null;
  /** At most this many segments; the rest are dropped from the ring (still listed in the popup). @default 8 */
  max?: number;
}

/** Ring segments of a station: one per phase (weight = mean wt%), in {@link comparePhases} order. */
export function stationSegments(station: Pick<PhaseMapStation, "phases">, options: SegmentOptions = {}): SymbolSegment[] {
  const { candidates = true, mineral = null, max = 8 } = options;
  return station.phases
    .filter((p) => (candidates || p.kind === "confirmed") && (!mineral || p.mineral === mineral))
    .slice()
    .sort(comparePhases)
    .slice(0, max)
    .map((p) => {
      const s = phaseSymbol(p.mineral, p.group);
      return { symbol: s.symbol, colour: s.colour, shape: s.shape, confirmed: p.kind === "confirmed", weight: p.wtMean };
    });
}

/** Plain-text summary of a station's phases for titles and screen readers, e.g. "Qz 45 wt% (confirmed), Py (candidate)". */
export function describePhases(phases: readonly StationPhase[]): string {
  if (phases.length === 0) return "no identified phases";
  return phases
    .slice()
    .sort(comparePhases)
    .map((p) => `${p.symbol}${p.wtMean != null ? ` ${Math.round(p.wtMean)} wt%` : ""} (${p.kind})`)
    .join(", ");
}
