"use client";

import { useMutation, useQuery, useQueryClient } from "@tanstack/react-query";
import { shareLinkKeys } from "@/lib/client/query-keys";
import { useState } from "react";
import { Badge } from "@/components/ui/badge";
import { buttonClass } from "@/components/ui/button";
import { inputClass } from "@/components/ui/field";
import { ApiError, fetchJson } from "@/lib/client/fetch-json";
import { describeFilter } from "@/lib/export/filter-text";
import { cn } from "@/lib/utils";

interface LinkRow {
  id: string;
  label: string | null;
  filter: Record<string, string>;
  expiresAt: string;
  revokedAt: string | null;
  createdAt: string;
  createdByName: string | null;
  state: "active" | "expired" | "revoked";
}

/** Lead only: a time-limited read-only link for the current filter; the list of links with revoke. */
export function SharePanel({ projectId, params }: { projectId: string; params: Record<string, string> }) {
  const qc = useQueryClient();
  const [created, setCreated] = useState<{ url: string; expiresAt: string } | null>(null);
  const links = useQuery({ queryKey: shareLinkKeys.all(projectId), queryFn: () => fetchJson<{ items: LinkRow[] }>(`/api/projects/${projectId}/share-links`) });
  const create = useMutation({
    mutationFn: (body: { label: string; expiresInDays: number }) => fetchJson<{ url: string; expiresAt: string }>(`/api/projects/${projectId}/share-links`, { method: "POST", json: { ...body, filter: params } }),
    onSuccess: (r) => {
      setCreated(r);
      void qc.invalidateQueries({ queryKey: shareLinkKeys.all(projectId) });
    },
  });
  const revoke = useMutation({
    mutationFn: (id: string) => fetchJson(`/api/projects/${projectId}/share-links/${id}`, { method: "DELETE" }),
    onSuccess: () => qc.invalidateQueries({ queryKey: shareLinkKeys.all(projectId) }),
  });
  const err = (create.error ?? revoke.error) as ApiError | null;
  return (
    <details className="rounded-lg border border-line bg-white p-3">
      <summary className="cursor-pointer text-sm font-semibold">Share this selection (read-only link)</summary>
      <form
        className="mt-2 grid grid-cols-[1fr_auto] gap-2"
        onSubmit={(e) => {
          e.preventDefault();
          const f = new FormData(e.currentTarget);
          create.mutate({ label: String(f.get("label") ?? ""), expiresInDays: Number(f.get("days")) });
        }}
      >
        <label className="col-span-2 text-xs text-muted">
          Label (who it is for)
          <input name="label" maxLength={120} className={cn(inputClass, "mt-0.5")} placeholder="e.g. Review by consultant" />
        </label>
        <label className="text-xs text-muted">
          Valid for
          <select name="days" defaultValue="14" className={cn(inputClass, "mt-0.5")}>
            {[1, 7, 14, 30, 90].map((d) => (
              <option key={d} value={d}>
                {d} day{d === 1 ? "" : "s"}
              </option>
            ))}
          </select>
        </label>
        <div className="flex items-end">
          <button type="submit" className={buttonClass("primary")} disabled={create.isPending}>
            Create link
          </button>
        </div>
      </form>
      <p className="mt-1 text-xs text-muted">Selection: {describeFilter(params)}. Anyone with the link can read this register and download it until it expires or you revoke it.</p>
      {created && (
        <div className="mt-2 rounded border border-ok/30 bg-green-50 p-2 text-sm" role="status">
          <p>Link created (shown once — copy it now):</p>
          <div className="mt-1 flex gap-2">
            <input readOnly value={created.url} className={cn(inputClass, "font-mono text-xs")} aria-label="Share link" data-testid="share-url" onFocus={(e) => e.currentTarget.select()} />
            <button type="button" className={buttonClass("secondary")} onClick={() => void navigator.clipboard?.writeText(created.url)}>
              Copy
            </button>
          </div>
        </div>
      )}
      {err && (
        <p role="alert" className="mt-2 text-sm text-danger">
          {err.message}
          {err.fields && ` ${Object.values(err.fields).flat().join(" ")}`}
        </p>
      )}
      <ul className="mt-3 space-y-1 text-sm">
        {(links.data?.items ?? []).map((l) => (
          <li key={l.id} className="flex flex-wrap items-center justify-between gap-2 border-t border-line pt-1">
            <span>
              <Badge tone={l.state === "active" ? "ok" : "neutral"}>{l.state}</Badge> {l.label ?? "Untitled link"} · {describeFilter(l.filter)} · until {l.expiresAt.slice(0, 10)}
            </span>
            {l.state === "active" && (
              <button type="button" className={buttonClass("ghost", "px-2 py-1 text-danger")} onClick={() => revoke.mutate(l.id)} disabled={revoke.isPending}>
                Revoke
              </button>
            )}
          </li>
        ))}
      </ul>
    </details>
  );
}
