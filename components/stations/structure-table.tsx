"use client";

import { useRouter } from "next/navigation";
import { Fragment, useState } from "react";
import { Badge } from "@/components/ui/badge";
import { fetchJson } from "@/lib/client/fetch-json";
import { formatAttitude, poleToPlane, strikeFromDipDirection } from "@/lib/geo/structure";
import { StructureForm } from "./structure-form";
import { FEATURE_LABELS } from "./structure-labels";

export interface StructureItem {
  id: string;
  kind: "planar" | "linear";
  feature: string;
  dipDirection: number | null;
  dip: number | null;
  trend: number | null;
  plunge: number | null;
  rake: number | null;
  planeId: string | null;
  convention: string;
  generation: string | null;
  overturned: boolean;
  quality: string | null;
  rawAzimuth: number | null;
  declinationDeg: number | null;
  declinationApplied: boolean;
  note: string | null;
  version?: number;
}

function attitude(s: StructureItem): { main: string; sub: string } {
  if (s.kind === "planar" && s.dipDirection != null && s.dip != null) {
    const pole = poleToPlane({ dipDirection: s.dipDirection, dip: s.dip });
    return {
      main: `${formatAttitude(s.dipDirection, s.dip)}`,
      sub: `strike ${formatAttitude(strikeFromDipDirection(s.dipDirection), s.dip)} RHR · pole ${formatAttitude(pole.trend, pole.plunge)}`,
    };
  }
  if (s.trend != null && s.plunge != null) {
    return { main: `${String(Math.round(s.plunge)).padStart(2, "0")}→${formatAttitude(s.trend, 0).slice(0, 3)}`, sub: s.rake != null ? `rake ${s.rake}° on its plane` : "trend/plunge" };
  }
  return { main: "—", sub: "" };
}

/** The station's measurements; planes as dip direction/dip (true north), lines as plunge→trend. */
export function StructureTable({ projectId, stationId, items, canWrite }: { projectId: string; stationId: string; items: StructureItem[]; canWrite: boolean }) {
  const router = useRouter();
  const [error, setError] = useState<string | null>(null);
  const [editing, setEditing] = useState<string | null>(null);
  if (items.length === 0) return <p className="text-sm text-muted">No measurements yet.</p>;
  const byId = new Map(items.map((s) => [s.id, s]));
  async function remove(s: StructureItem) {
    if (!window.confirm(`Delete this ${FEATURE_LABELS[s.feature]?.toLowerCase() ?? s.feature} measurement?`)) return;
    setError(null);
    try {
      await fetchJson(`/api/projects/${projectId}/stations/${stationId}/structures/${s.id}`, { method: "DELETE" });
      router.refresh();
    } catch (e) {
      setError((e as Error).message);
    }
  }
  return (
    <div className="overflow-x-auto">
      {error && (
        <p role="alert" className="mb-2 text-sm text-danger">
          {error}
        </p>
      )}
      <table className="w-full text-sm" data-testid="structure-table">
        <thead>
          <tr className="text-left text-muted">
            <th className="py-1.5 pr-3 font-medium">Feature</th>
            <th className="py-1.5 pr-3 font-medium">Attitude (true north)</th>
            <th className="py-1.5 pr-3 font-medium">Details</th>
            {canWrite && <th className="py-1.5 font-medium"><span className="sr-only">Actions</span></th>}
          </tr>
        </thead>
        <tbody>
          {items.map((s) => {
            const a = attitude(s);
            const plane = s.planeId ? byId.get(s.planeId) : undefined;
            const planes = items
              .filter((p) => p.kind === "planar" && p.id !== s.id && p.dipDirection != null && p.dip != null)
              .map((p) => ({ id: p.id, feature: p.feature, dipDirection: p.dipDirection!, dip: p.dip! }));
            return (
              <Fragment key={s.id}>
              <tr className="border-t border-line align-top">
                <td className="py-1.5 pr-3">
                  {FEATURE_LABELS[s.feature] ?? s.feature}
                  {s.generation && <span className="ml-1 text-muted">{s.generation}</span>}
                </td>
                <td className="py-1.5 pr-3">
                  <span className="font-mono font-medium tabular-nums">{a.main}</span>
                  <span className="block text-xs text-muted">{a.sub}</span>
                </td>
                <td className="py-1.5 pr-3 text-xs text-muted">
                  <span className="flex flex-wrap gap-1">
                    {s.overturned && <Badge tone="oxide">overturned</Badge>}
                    {s.quality && <Badge>{s.quality}</Badge>}
                    {s.declinationApplied && (
                      <Badge>
                        read {formatAttitude(s.rawAzimuth ?? 0, 0).slice(0, 3)} magnetic, declination {s.declinationDeg! > 0 ? "+" : ""}
                        {s.declinationDeg}°
                      </Badge>
                    )}
                    {plane && plane.dipDirection != null && <Badge>on {FEATURE_LABELS[plane.feature]?.toLowerCase()} {formatAttitude(plane.dipDirection, plane.dip ?? 0)}</Badge>}
                  </span>
                  {s.note && <span className="mt-1 block">{s.note}</span>}
                </td>
                {canWrite && (
                  <td className="py-1.5 text-right">
                    <button type="button" className="mr-3 text-xs text-brand hover:underline" onClick={() => setEditing(editing === s.id ? null : s.id)} aria-expanded={editing === s.id}>
                      Edit
                    </button>
                    <button type="button" className="text-xs text-danger hover:underline" onClick={() => remove(s)}>
                      Delete
                    </button>
                  </td>
                )}
              </tr>
              {canWrite && editing === s.id && (
                <tr>
                  <td colSpan={4} className="pb-3">
                    <StructureForm projectId={projectId} stationId={stationId} planes={planes} edit={{ ...s, version: s.version ?? 1 }} onDone={() => setEditing(null)} />
                  </td>
                </tr>
              )}
              </Fragment>
            );
          })}
        </tbody>
      </table>
    </div>
  );
}
