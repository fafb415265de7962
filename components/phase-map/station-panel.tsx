"use client";

import { useQuery } from "@tanstack/react-query";
import { phaseMapKeys } from "@/lib/client/query-keys";
import Link from "next/link";
import { Badge } from "@/components/ui/badge";
import { fetchJson } from "@/lib/client/fetch-json";
import { ASBESTOS_CAVEAT, IDENTIFICATION_CAVEAT, hasAsbestiformPhase } from "@/lib/export";
import { SAMPLE_STATUS_LABELS, SAMPLE_TYPE_LABELS, formatDate } from "@/lib/format";
import { PhaseChip } from "./phase-chip";

interface Cell {
  mineral: string;
  group: string | null;
  hazard: string | null;
  kind: "confirmed" | "candidate";
  wtPercent: number | null;
  scanId: string;
  rank: number | null;
  symbol: string;
}
interface StationDetail {
  key: string;
  station: { id: string | null; code: string; name: string | null; lat: number | null; lon: number | null; lithology: string | null; description: string | null };
  samples: {
    id: string;
    code: string;
    sampleType: string;
    lithology: string | null;
    status: string;
    collectedAt: string | null;
    collectorName: string | null;
    suspectedAsbestos: boolean;
    phases: { confirmed: Cell[]; candidates: Cell[] };
    scans: { id: string; originalName: string; status: string }[];
  }[];
  truncated: boolean;
}

/** The selected station: its matching samples, their confirmed phases and candidates, links to samples and scans. */
export function StationPanel({ projectId, stationKey, query, onClose }: { projectId: string; stationKey: string; query: string; onClose: () => void }) {
  const { data, error, isPending } = useQuery({
    queryKey: phaseMapKeys.station(projectId, stationKey, query),
    queryFn: () => fetchJson<StationDetail>(`/api/projects/${projectId}/phase-map/stations/${encodeURIComponent(stationKey)}?${query}`),
  });
  return (
    <section aria-labelledby="station-title" className="space-y-2 rounded-lg border border-line bg-white p-3 shadow-sm" data-testid="station-panel">
      <div className="flex items-start justify-between gap-2">
        <h2 id="station-title" className="text-base font-semibold">
          {data ? data.station.code : "Station"}
          {data?.station.name && <span className="block text-xs font-normal text-muted">{data.station.name}</span>}
        </h2>
        <button type="button" onClick={onClose} className="rounded px-2 text-lg leading-none text-muted hover:text-ink" aria-label="Close station details">
          ×
        </button>
      </div>
      {isPending && <p className="text-sm text-muted">Loading…</p>}
      {error && (
        <p role="alert" className="text-sm text-danger">
          {(error as Error).message}
        </p>
      )}
      {data && (
        <>
          {data.station.lithology && <p className="text-xs text-muted">Lithology: {data.station.lithology}</p>}
          {data.samples.some((s) => hasAsbestiformPhase(s.phases)) && (
            <p role="alert" className="rounded border border-danger/30 bg-red-50 px-2 py-1 text-xs text-danger">
              {ASBESTOS_CAVEAT}
            </p>
          )}
          <ul className="max-h-[40vh] space-y-2 overflow-y-auto">
            {data.samples.map((s) => (
              <li key={s.id} className="rounded border border-line p-2 text-sm">
                <div className="flex flex-wrap items-baseline justify-between gap-1">
                  <Link href={`/projects/${projectId}/samples/${s.id}`} className="font-medium text-brand hover:underline">
                    {s.code}
                  </Link>
                  <span className="flex gap-1">
                    <Badge>{SAMPLE_STATUS_LABELS[s.status as keyof typeof SAMPLE_STATUS_LABELS] ?? s.status}</Badge>
                    {s.suspectedAsbestos && <Badge tone="danger">Suspected asbestos</Badge>}
                  </span>
                </div>
                <p className="text-xs text-muted">
                  {SAMPLE_TYPE_LABELS[s.sampleType as keyof typeof SAMPLE_TYPE_LABELS] ?? s.sampleType}
                  {s.lithology ? ` · ${s.lithology}` : ""} · {formatDate(s.collectedAt)}
                  {s.collectorName ? ` · ${s.collectorName}` : ""}
                </p>
                <div className="mt-1 flex flex-wrap items-center gap-1">
                  <span className="text-xs text-muted">Confirmed:</span>
                  {s.phases.confirmed.length ? s.phases.confirmed.map((p) => <PhaseChip key={p.mineral} mineral={p.mineral} group={p.group} kind="confirmed" wtPercent={p.wtPercent} />) : <span className="text-xs">—</span>}
                </div>
                {s.phases.candidates.length > 0 && (
                  <div className="mt-1 flex flex-wrap items-center gap-1">
                    <span className="text-xs text-muted">Candidates (unconfirmed):</span>
                    {s.phases.candidates.map((p) => (
                      <PhaseChip key={p.mineral} mineral={p.mineral} group={p.group} kind="candidate" />
                    ))}
                  </div>
                )}
                {s.scans.length > 0 && (
                  <p className="mt-1 text-xs">
                    Scans:{" "}
                    {s.scans.map((sc, i) => (
                      <span key={sc.id}>
                        {i > 0 && ", "}
                        <Link href={`/projects/${projectId}/scans/${sc.id}`} className="text-brand hover:underline">
                          {sc.originalName}
                        </Link>{" "}
                        <span className="text-muted">({sc.status === "signed_off" ? "signed off" : sc.status})</span>
                      </span>
                    ))}
                  </p>
                )}
              </li>
            ))}
          </ul>
          {data.truncated && <p className="text-xs text-muted">Only the first 200 samples are listed.</p>}
          <p className="text-[11px] leading-snug text-muted">{IDENTIFICATION_CAVEAT}</p>
        </>
      )}
    </section>
  );
}
