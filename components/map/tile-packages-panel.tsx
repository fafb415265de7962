"use client";

import { useMutation, useQueryClient } from "@tanstack/react-query";
import { tilePackageKeys } from "@/lib/client/query-keys";
import { useState } from "react";
import { buttonClass } from "@/components/ui/button";
import { ApiError, fetchJson } from "@/lib/client/fetch-json";
import type { TilePackageInfo } from "./types";

/** The project's MBTiles packages: list, upload (lead, field geologist), delete. */
export function TilePackagesPanel({ projectId, packages, canManage }: { projectId: string; packages: TilePackageInfo[]; canManage: boolean }) {
  const qc = useQueryClient();
  const [problem, setProblem] = useState<string | null>(null);
  const refresh = () => qc.invalidateQueries({ queryKey: tilePackageKeys.all(projectId) });

  const upload = useMutation({
    mutationFn: (file: File) =>
      fetchJson<TilePackageInfo>(`/api/projects/${projectId}/tile-packages`, {
        method: "POST",
        body: file,
        headers: { "content-type": "application/vnd.sqlite3", "x-filename": encodeURIComponent(file.name) },
      }),
    onSuccess: () => (setProblem(null), refresh()),
    onError: (err) => setProblem(err instanceof ApiError ? [err.message, ...Object.values(err.fields ?? {}).flat()].join(" ") : "Upload failed; check your connection."),
  });
  const remove = useMutation({
    mutationFn: (id: string) => fetchJson(`/api/projects/${projectId}/tile-packages/${id}`, { method: "DELETE" }),
    onSuccess: refresh,
    onError: (err) => setProblem(err instanceof Error ? err.message : "Could not delete."),
  });

  return (
    <section aria-labelledby="tp-title" className="space-y-2">
      <h2 id="tp-title" className="font-semibold">
        Map layers (MBTiles)
      </h2>
      {packages.length === 0 ? (
        <p className="text-xs text-muted">No packages yet. Layers appear in the map&apos;s layer switcher (top right).</p>
      ) : (
        <ul className="space-y-1 text-sm">
          {packages.map((p) => (
            <li key={p.id} className="flex items-start justify-between gap-2 rounded border border-line px-2 py-1">
              <span className="min-w-0">
                <span className="block truncate font-medium">{p.name}</span>
                <span className="text-xs text-muted">
                  {p.format.toUpperCase()} · z{p.minZoom ?? "?"}–{p.maxZoom ?? "?"}
                </span>
              </span>
              {canManage && (
                <button
                  type="button"
                  className="text-xs text-danger hover:underline"
                  onClick={() => confirm(`Delete the layer “${p.name}”? Its tiles are removed for everyone in the project.`) && remove.mutate(p.id)}
                >
                  Delete
                </button>
              )}
            </li>
          ))}
        </ul>
      )}
      {canManage && (
        <label className={buttonClass("secondary", "w-full cursor-pointer")}>
          {upload.isPending ? "Uploading and checking…" : "Upload .mbtiles (raster PNG/JPEG/WebP)"}
          <input
            type="file"
            accept=".mbtiles,application/vnd.sqlite3,application/x-sqlite3"
            className="sr-only"
            disabled={upload.isPending}
            onChange={(e) => {
              const f = e.target.files?.[0];
              if (f) upload.mutate(f);
              e.target.value = "";
            }}
          />
        </label>
      )}
      {problem && (
        <p role="alert" className="rounded bg-red-50 px-2 py-1 text-xs text-danger">
          {problem}
        </p>
      )}
      <p className="text-xs text-muted">Use only tiles whose licence allows offline use (own renders, licensed survey maps, own imagery).</p>
    </section>
  );
}
