"use client";

import Link from "next/link";
import { Badge } from "@/components/ui/badge";
import type { ScanDetail } from "./types";

/** All runs of a scan, newest first: view any, make a finished one current. */
export function RunList({ runs, selectedId, hrefFor, canReview, locked, onMakeCurrent }: { runs: ScanDetail["runs"]; selectedId: string | null; hrefFor: (runId: string) => string; canReview: boolean; locked: boolean; onMakeCurrent: (runId: string) => void }) {
  return (
    <ul className="divide-y divide-line text-sm" aria-label="Processing runs">
      {runs.map((r, i) => (
        <li key={r.id} className="flex flex-wrap items-center justify-between gap-2 py-1.5">
          <span>
            Run {runs.length - i}
            {r.refit ? ` (refit, ${r.refit.phaseCount} phase${r.refit.phaseCount === 1 ? "" : "s"})` : ""} · {new Date(r.createdAt).toLocaleString("en-GB", { dateStyle: "short", timeStyle: "short" })}
            {r.createdByName ? ` · ${r.createdByName}` : ""}
            {r.durationMs != null ? ` · ${(r.durationMs / 1000).toFixed(1)} s` : ""}
          </span>
          <span className="flex items-center gap-2">
            {r.current && <Badge tone="brand">Current</Badge>}
            <Badge tone={r.status === "done" ? "ok" : r.status === "failed" ? "danger" : "neutral"}>{r.status}</Badge>
            {r.id === selectedId ? (
              <span className="text-xs text-muted">Viewing</span>
            ) : (
              <Link href={hrefFor(r.id)} className="text-xs font-medium text-brand hover:underline">
                View
              </Link>
            )}
            {canReview && !locked && !r.current && r.status === "done" && (
              <button type="button" className="text-xs font-medium text-brand hover:underline" onClick={() => onMakeCurrent(r.id)}>
                Make current
              </button>
            )}
          </span>
        </li>
      ))}
    </ul>
  );
}
