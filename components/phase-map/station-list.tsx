"use client";

import { PhaseChip } from "./phase-chip";
import { cn } from "@/lib/utils";
import type { PhaseMapStation } from "@/lib/phase-map";

const LIST_LIMIT = 150;

/** The stations inside the current map view (follows panning and zooming); click one to open it. */
export function StationList({ stations, total, selectedKey, onSelect }: { stations: readonly PhaseMapStation[]; total: number; selectedKey: string | null; onSelect: (s: PhaseMapStation) => void }) {
  return (
    <section aria-labelledby="stations-in-view" className="flex min-h-0 flex-col">
      <h2 id="stations-in-view" className="mb-1 text-sm font-semibold">
        In view: <span data-testid="in-view-count">{stations.length}</span> of {total} stations
      </h2>
      {stations.length === 0 && <p className="text-sm text-muted">No station in this part of the map. Zoom out or change the filter.</p>}
      <ul className="max-h-[52vh] space-y-1 overflow-y-auto pr-1" data-testid="station-list">
        {stations.slice(0, LIST_LIMIT).map((s) => (
          <li key={s.key}>
            <button
              type="button"
              onClick={() => onSelect(s)}
              aria-pressed={s.key === selectedKey}
              data-testid="station-item"
              data-station={s.code}
              className={cn("w-full rounded-md border px-2 py-1.5 text-left text-sm hover:border-brand", s.key === selectedKey ? "border-brand bg-brand-light" : "border-line bg-white")}
            >
              <span className="flex items-baseline justify-between gap-2">
                <span className="font-medium">{s.code}</span>
                <span className="text-xs text-muted">
                  {s.samples} sample{s.samples === 1 ? "" : "s"}
                </span>
              </span>
              {s.name && <span className="block truncate text-xs text-muted">{s.name}</span>}
              <span className="mt-1 flex flex-wrap gap-1">
                {s.phases.length === 0 ? <span className="text-xs text-muted">No result yet</span> : s.phases.slice(0, 8).map((p) => <PhaseChip key={`${p.mineral}-${p.kind}`} mineral={p.mineral} group={p.group} kind={p.kind} wtPercent={p.wtMean} />)}
                {s.phases.length > 8 && <span className="text-xs text-muted">+{s.phases.length - 8}</span>}
              </span>
            </button>
          </li>
        ))}
      </ul>
      {stations.length > LIST_LIMIT && <p className="mt-1 text-xs text-muted">Showing {LIST_LIMIT} of {stations.length}; zoom in to see the rest.</p>}
    </section>
  );
}
