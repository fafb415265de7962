import Link from "next/link";
import { HazardCautions } from "@/components/cautions";
import { Badge } from "@/components/ui/badge";
import { Card } from "@/components/ui/card";
import type { Actor } from "@/lib/dal/actor";
import { getSamplePhases } from "@/lib/dal/scan-review";
import { SCAN_STATUS_LABEL } from "./scan-status";
import { formatLocalDate } from "@/lib/dates";

/**
 * "Phases" section of a sample page (server component): confirmed phases (signed off) apart from unconfirmed ones
 * (accepted but not signed off, phases of the whole-pattern fit, leading candidates), with links to the scans and the cautions that apply.
 */
export async function SamplePhases({ actor, projectId, sampleId, canUpload }: { actor: Actor; projectId: string; sampleId: string; canUpload: boolean }) {
  const { confirmed, unconfirmed, scans } = await getSamplePhases(actor, projectId, sampleId);
  const scanHref = (id: string) => `/projects/${projectId}/scans/${id}`;
  return (
    <Card>
      <div className="mb-2 flex flex-wrap items-center justify-between gap-2">
        <h2 className="font-semibold">Phases (XRD)</h2>
        {canUpload && (
          <Link href={`/projects/${projectId}/scans/upload?sample=${sampleId}`} className="text-sm font-medium text-brand hover:underline">
            Upload a scan
          </Link>
        )}
      </div>
      <HazardCautions phases={[...confirmed, ...unconfirmed]} className="mb-3" />
      {confirmed.length > 0 ? (
        <div className="mb-3">
          <h3 className="text-sm font-medium text-ok">Confirmed by the analyst (signed off)</h3>
          <ul className="mt-1 space-y-1" data-testid="confirmed-phases">
            {confirmed.map((p, i) => (
              <li key={`${p.scanId}-${p.mineral}-${i}`} className="flex flex-wrap items-baseline gap-2 text-sm">
                <Badge tone="ok">Confirmed</Badge>
                <span className="font-medium capitalize" data-testid="confirmed-phase">
                  {p.mineral}
                </span>
                <span className="text-xs text-muted">{p.formula}</span>
                {p.wtPercent != null && <span className="text-xs text-muted">≈ {p.wtPercent.toFixed(0)} wt% (semi-quantitative)</span>}
                <Link href={scanHref(p.scanId)} className="text-xs text-brand hover:underline">
                  {p.scanName}
                </Link>
              </li>
            ))}
          </ul>
        </div>
      ) : (
        <p className="mb-3 text-sm text-muted">No confirmed phases yet.</p>
      )}
      {unconfirmed.length > 0 && (
        <div className="mb-3 rounded-md border border-dashed border-line p-2">
          <h3 className="text-sm font-medium text-muted">Not confirmed — under review (suggestions, not an identification)</h3>
          <ul className="mt-1 space-y-1" data-testid="unconfirmed-phases">
            {unconfirmed.map((p, i) => (
              <li key={`${p.scanId}-${p.mineral}-${i}`} className="flex flex-wrap items-baseline gap-2 text-sm text-muted">
                <Badge>{p.kind === "accepted" ? "Accepted, not signed off" : p.kind === "fitted" ? "In the fit, not confirmed" : "Leading candidate"}</Badge>
                <span className="capitalize italic">{p.mineral}</span>
                {p.kind === "fitted" && p.wtPercent != null ? <span className="text-xs">≈ {p.wtPercent.toFixed(0)} wt% (semi-quantitative)</span> : p.score != null && <span className="text-xs">score {p.score.toFixed(2)}</span>}
                <Link href={scanHref(p.scanId)} className="text-xs text-brand hover:underline">
                  {p.scanName}
                </Link>
              </li>
            ))}
          </ul>
        </div>
      )}
      {scans.length > 0 && (
        <div>
          <h3 className="text-sm font-medium">Scans</h3>
          <ul className="mt-1 space-y-0.5 text-sm">
            {scans.map((s) => (
              <li key={s.id} className="flex flex-wrap items-baseline gap-2">
                <Link href={scanHref(s.id)} className="text-brand hover:underline">
                  {s.originalName}
                </Link>
                <span className="text-xs text-muted">
                  {SCAN_STATUS_LABEL[s.status]}
                  {s.signedOffAt ? ` by ${s.signedOffByName ?? "analyst"} on ${formatLocalDate(s.signedOffAt)}` : ""}
                </span>
              </li>
            ))}
          </ul>
        </div>
      )}
    </Card>
  );
}
