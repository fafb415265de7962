"use client";

import { keepPreviousData, useQuery } from "@tanstack/react-query";
import { scanKeys } from "@/lib/client/query-keys";
import Link from "next/link";
import { useState } from "react";
import { Badge } from "@/components/ui/badge";
import { Skeleton } from "@/components/ui/card";
import { fetchJson } from "@/lib/client/fetch-json";
import { isPending, SCAN_STATUS_LABEL, ScanStatusBadge } from "./scan-status";
import type { ScanListItem, ScanStatus } from "./types";
import { formatLocalDate } from "@/lib/dates";

interface Page {
  items: ScanListItem[];
  total: number;
  page: number;
  pageSize: number;
}

/** Scans of a project with status and processing progress; refreshes itself while anything is queued or running. */
export function ScanList({ projectId }: { projectId: string }) {
  const [status, setStatus] = useState<ScanStatus | "">("");
  const [page, setPage] = useState(1);
  const { data, error, isLoading } = useQuery({
    queryKey: scanKeys.list(projectId, status, page),
    queryFn: () => fetchJson<Page>(`/api/projects/${projectId}/scans?page=${page}&pageSize=50${status ? `&status=${status}` : ""}`),
    placeholderData: keepPreviousData,
    refetchInterval: (q) => (q.state.data?.items.some((i) => isPending(i.status, i.progress)) ? 1500 : false),
  });
  const pending = data?.items.filter((i) => isPending(i.status, i.progress)).length ?? 0;
  return (
    <div className="space-y-3">
      <div className="flex flex-wrap items-center gap-3">
        <label className="flex items-center gap-2 text-sm">
          Status
          <select className="rounded-md border border-line bg-white px-2 py-1 text-sm" value={status} onChange={(e) => { setStatus(e.target.value as ScanStatus | ""); setPage(1); }}>
            <option value="">All</option>
            {(Object.keys(SCAN_STATUS_LABEL) as ScanStatus[]).map((s) => (
              <option key={s} value={s}>
                {SCAN_STATUS_LABEL[s]}
              </option>
            ))}
          </select>
        </label>
        {data && (
          <span className="text-sm text-muted" role="status">
            {data.total} scan{data.total === 1 ? "" : "s"}
            {pending > 0 && ` · ${pending} in the processing queue`}
          </span>
        )}
      </div>
      {isLoading && <Skeleton className="h-48 w-full" />}
      {error && <p role="alert" className="text-danger">{(error as Error).message}</p>}
      {data && data.items.length === 0 && <p className="rounded-md border border-line bg-white p-6 text-muted">No scans yet{status ? " with this status" : ""}.</p>}
      {data && data.items.length > 0 && (
        <div className="overflow-x-auto rounded-lg border border-line bg-white">
          <table className="w-full text-sm" data-testid="scan-table">
            <caption className="sr-only">Scans</caption>
            <thead className="bg-stone text-left text-xs text-muted">
              <tr>
                <th scope="col" className="px-3 py-2 font-medium">
                  Sample
                </th>
                <th scope="col" className="px-3 py-2 font-medium">
                  File
                </th>
                <th scope="col" className="px-3 py-2 font-medium">
                  Status
                </th>
                <th scope="col" className="px-3 py-2 font-medium">
                  Phases
                </th>
                <th scope="col" className="hidden px-3 py-2 font-medium md:table-cell">
                  Range
                </th>
                <th scope="col" className="hidden px-3 py-2 font-medium md:table-cell">
                  Uploaded
                </th>
              </tr>
            </thead>
            <tbody>
              {data.items.map((s) => (
                <tr key={s.id} className="border-t border-line align-top">
                  <td className="px-3 py-2">
                    <Link href={`/projects/${projectId}/samples/${s.sampleId}`} className="font-medium text-brand-dark hover:underline">
                      {s.sampleCode}
                    </Link>
                    {s.suspectedAsbestos && (
                      <span className="ml-1" title="Suspected asbestos flagged at collection">
                        <Badge tone="danger">asbestos?</Badge>
                      </span>
                    )}
                  </td>
                  <td className="px-3 py-2">
                    <Link href={`/projects/${projectId}/scans/${s.id}`} className="text-brand hover:underline" data-testid="scan-link">
                      {s.originalName}
                    </Link>
                  </td>
                  <td className="px-3 py-2">
                    <ScanStatusBadge status={s.status} progress={s.progress} />
                    {s.status === "failed" && s.error && <p className="mt-1 max-w-xs text-xs text-danger">{s.error}</p>}
                  </td>
                  <td className="px-3 py-2">
                    {s.status === "signed_off" ? (
                      <span className="capitalize">{s.accepted.map((a) => a.mineral).join(", ")}</span>
                    ) : s.leading ? (
                      <span className="text-muted">
                        Leading candidate: <span className="capitalize">{s.leading.mineral}</span>
                        {s.accepted.length > 0 && ` · ${s.accepted.length} accepted`}
                      </span>
                    ) : (
                      <span className="text-muted">—</span>
                    )}
                    <span className="ml-1 inline-flex gap-1">
                      {s.hazards.includes("asbestos") && <Badge tone="danger">Asbestos group</Badge>}
                      {s.hazards.includes("crystalline_silica") && <Badge tone="oxide">Crystalline silica</Badge>}
                    </span>
                  </td>
                  <td className="hidden px-3 py-2 tabular-nums text-muted md:table-cell">
                    {s.anode ?? `${s.wavelengthA} Å`} · {s.twoThetaStart}–{s.twoThetaEnd}°
                  </td>
                  <td className="hidden px-3 py-2 text-muted md:table-cell">{formatLocalDate(s.createdAt)}</td>
                </tr>
              ))}
            </tbody>
          </table>
        </div>
      )}
      {data && data.total > data.pageSize && (
        <div className="flex items-center gap-2 text-sm">
          <button type="button" className="rounded border border-line bg-white px-2 py-1 disabled:opacity-50" disabled={page <= 1} onClick={() => setPage(page - 1)}>
            Previous
          </button>
          <span>
            Page {page} of {Math.ceil(data.total / data.pageSize)}
          </span>
          <button type="button" className="rounded border border-line bg-white px-2 py-1 disabled:opacity-50" disabled={page * data.pageSize >= data.total} onClick={() => setPage(page + 1)}>
            Next
          </button>
        </div>
      )}
    </div>
  );
}
