"use client";

import { useMutation, useQuery, useQueryClient } from "@tanstack/react-query";
import { scanKeys } from "@/lib/client/query-keys";
import { useState } from "react";
import { Button } from "@/components/ui/button";
import { Card } from "@/components/ui/card";
import { Field, inputClass } from "@/components/ui/field";
import { ApiError, fetchJson } from "@/lib/client/fetch-json";
import { formatDateTime } from "@/lib/dates";
import type { SignOffRecord } from "@/lib/dal/scan-review";

interface Version {
  id: string;
  version: number;
  current: boolean;
  signedAt: string;
  signedByName: string | null;
  note: string | null;
  reopenedAt: string | null;
  reopenedByName: string | null;
  reopenReason: string | null;
  record: SignOffRecord;
}

/**
 * Every sign-off of a scan (newest first): what it confirmed, with each phase's wt% or why it has none; who reopened
 * an earlier one and why; and — for a lead or the signing analyst — reopening the current one with a reason.
 */
export function SignOffHistory({ projectId, scanId }: { projectId: string; scanId: string }) {
  const qc = useQueryClient();
  const key = scanKeys.signOffs(projectId, scanId);
  const { data } = useQuery({ queryKey: key, queryFn: () => fetchJson<{ items: Version[]; canReopen: boolean }>(`/api/projects/${projectId}/scans/${scanId}/sign-offs`) });
  const [open, setOpen] = useState(false);
  const [reason, setReason] = useState("");
  const reopen = useMutation({
    mutationFn: () => fetchJson(`/api/projects/${projectId}/scans/${scanId}/reopen`, { method: "POST", json: { reason } }),
    onSuccess: async () => {
      setOpen(false);
      setReason("");
      await qc.invalidateQueries({ queryKey: scanKeys.detail(projectId, scanId) });
    },
  });
  if (!data || data.items.length === 0) return null;
  const err = reopen.error instanceof ApiError ? reopen.error : null;
  return (
    <Card className="space-y-3" data-testid="sign-off-history">
      <div className="flex flex-wrap items-center justify-between gap-2">
        <h2 className="font-semibold">Sign-offs</h2>
        {data.canReopen && !open && (
          <Button type="button" variant="secondary" onClick={() => setOpen(true)}>
            Reopen the sign-off…
          </Button>
        )}
      </div>
      {open && (
        <form
          aria-label="Reopen the sign-off"
          className="space-y-2 rounded-md border border-line p-3"
          onSubmit={(e) => {
            e.preventDefault();
            reopen.mutate();
          }}
        >
          <p className="text-sm text-muted">The scan goes back under review and its phases stop counting as confirmed until it is signed off again. This sign-off stays in the history with your reason. A submission already reported with this result goes back to “in progress” and is reported again, with a new e-mail to the leads, when all its samples are signed off.</p>
          <Field label="Why reopen" htmlFor="reopen-reason" error={err?.fields?.reason}>
            <textarea id="reopen-reason" required rows={2} value={reason} onChange={(e) => setReason(e.target.value)} className={inputClass} />
          </Field>
          {err && !err.fields && (
            <p role="alert" className="text-sm text-danger">
              {err.message}
            </p>
          )}
          <div className="flex gap-2">
            <Button type="submit" disabled={reopen.isPending}>
              {reopen.isPending ? "Reopening…" : "Reopen"}
            </Button>
            <Button type="button" variant="ghost" onClick={() => setOpen(false)}>
              Cancel
            </Button>
          </div>
        </form>
      )}
      <ol className="space-y-3">
        {data.items.map((v) => (
          <li key={v.id} className="rounded-md border border-line p-3 text-sm" data-testid="sign-off-version">
            <p>
              <span className="font-medium">Version {v.version}</span> · signed by {v.signedByName ?? "—"} · {formatDateTime(v.signedAt)}
              {v.current ? <span className="ml-2 rounded bg-green-50 px-1.5 py-0.5 text-xs text-ok">current</span> : v.reopenedAt ? <span className="ml-2 rounded bg-stone px-1.5 py-0.5 text-xs text-muted">reopened</span> : null}
              {v.record.recomputed && <span className="ml-2 text-xs text-muted">wt% recomputed together for the accepted phases</span>}
            </p>
            <ul className="mt-1 flex flex-wrap gap-x-4 gap-y-1">
              {v.record.phases.map((p) => (
                <li key={p.phaseResultId}>
                  <span className="capitalize">{p.mineral}</span> {p.wtPercent != null ? `${p.wtPercent} wt%${p.wtSigma != null ? ` ± ${p.wtSigma}` : ""}` : <span className="text-muted">no wt% ({p.wtNote ?? "not given"})</span>}
                </li>
              ))}
            </ul>
            {v.record.fit && <p className="mt-1 text-xs text-muted">Rwp {v.record.fit.rwp.toFixed(2)} %, χ² {v.record.fit.gof.toFixed(2)}</p>}
            {v.note && <p className="mt-1 text-ink/80">{v.note}</p>}
            {v.reopenedAt && (
              <p className="mt-1 text-xs">
                Reopened by {v.reopenedByName ?? "—"} · {formatDateTime(v.reopenedAt)}: {v.reopenReason}
              </p>
            )}
          </li>
        ))}
      </ol>
    </Card>
  );
}
