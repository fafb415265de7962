"use client";

import { keepPreviousData, useQuery, useQueryClient } from "@tanstack/react-query";
import { referenceKeys } from "@/lib/client/query-keys";
import Link from "next/link";
import { useId, useState } from "react";
import { Badge } from "@/components/ui/badge";
import { Button } from "@/components/ui/button";
import { Skeleton } from "@/components/ui/card";
import { inputClass } from "@/components/ui/field";
import { ApiError, fetchJson } from "@/lib/client/fetch-json";

interface RefItem {
  id: string;
  mineral: string;
  formula: string;
  group: string | null;
  crystalSystem: string;
  spaceGroup: string;
  elements: string[];
  hazard: "asbestos" | "crystalline_silica" | null;
  otherHazards: string[];
  rir: number | null;
  builtin: boolean;
  strongLines: { d: number; intensity: number }[];
}

interface ImportResult {
  imported: { id: string; fileName: string; mineral: string; formula: string; lines: number; rir: number | null; hazard: string | null; warnings: string[] }[];
  errors: { fileName: string; message: string; line?: number }[];
}

function CifImport({ onDone }: { onDone: () => void }) {
  const id = useId();
  const [files, setFiles] = useState<File[]>([]);
  const [busy, setBusy] = useState(false);
  const [result, setResult] = useState<ImportResult | null>(null);
  const [err, setErr] = useState<string | null>(null);
  const submit = async (e: React.FormEvent) => {
    e.preventDefault();
    const form = new FormData();
    for (const f of files) form.append("files", f, f.name);
    setBusy(true);
    setErr(null);
    setResult(null);
    try {
      setResult(await fetchJson<ImportResult>("/api/reference-phases/import", { method: "POST", body: form }));
      onDone();
    } catch (error) {
      if (error instanceof ApiError && Array.isArray(error.details?.errors)) setResult({ imported: [], errors: error.details.errors as ImportResult["errors"] });
      setErr(error instanceof ApiError ? error.message : "Import failed; try again.");
    }
    setBusy(false);
  };
  return (
    <form onSubmit={submit} className="space-y-2 rounded-lg border border-line bg-white p-4" aria-label="Import CIF files">
      <label htmlFor={`${id}-files`} className="block text-sm font-medium">
        Import crystal structures (CIF)
      </label>
      <p className="text-xs text-muted">
        Use ambient-condition entries from open collections (e.g. COD, AMCSD) and keep their citation. Each file is read, its pattern (Cu Kα1, 2θ ≤ 100°) and RIR against corundum computed; files that
        cannot be used are listed with the reason and the CIF line.
      </p>
      <input id={`${id}-files`} type="file" multiple accept=".cif,.txt" onChange={(e) => setFiles([...(e.target.files ?? [])])} className="block w-full text-sm file:mr-3 file:rounded-md file:border-0 file:bg-brand-light file:px-3 file:py-2 file:text-brand-dark" />
      <Button type="submit" disabled={busy || files.length === 0}>
        {busy ? "Importing…" : `Import ${files.length || ""} file${files.length === 1 ? "" : "s"}`}
      </Button>
      {err && (
        <p role="alert" className="text-sm font-medium text-danger">
          {err}
        </p>
      )}
      {result && (
        <ul className="space-y-1 text-sm" data-testid="import-result">
          {result.imported.map((r) => (
            <li key={r.id} className="text-ok">
              ✓ {r.fileName}: <Link href={`/library/${r.id}`} className="font-medium capitalize underline">{r.mineral}</Link> ({r.formula}), {r.lines} lines, RIR {r.rir ?? "n/a"}
              {r.warnings.length > 0 && <span className="text-xs text-muted"> — {r.warnings.join(" ")}</span>}
            </li>
          ))}
          {result.errors.map((e) => (
            <li key={e.fileName} className="text-danger">
              ✗ {e.fileName}: {e.message}
            </li>
          ))}
        </ul>
      )}
    </form>
  );
}

/** Browse and search the reference library; analysts and admins can import CIFs. */
export function ReferenceLibrary({ canImport }: { canImport: boolean }) {
  const id = useId();
  const qc = useQueryClient();
  const [q, setQ] = useState("");
  const [hazard, setHazard] = useState("");
  const [element, setElement] = useState("");
  const [source, setSource] = useState("");
  const params = new URLSearchParams({ pageSize: "500", ...(q && { q }), ...(hazard && { hazard }), ...(element && { element }), ...(source && { source }) });
  const { data, isLoading, error } = useQuery({
    queryKey: referenceKeys.list(params.toString()),
    queryFn: () => fetchJson<{ items: RefItem[]; total: number }>(`/api/reference-phases?${params}`),
    placeholderData: keepPreviousData,
  });
  return (
    <div className="space-y-4">
      {canImport && <CifImport onDone={() => void qc.invalidateQueries({ queryKey: referenceKeys.all() })} />}
      <div className="flex flex-wrap items-end gap-3" role="search">
        <div>
          <label htmlFor={`${id}-q`} className="block text-sm font-medium">
            Search
          </label>
          <input id={`${id}-q`} className={inputClass} placeholder="Mineral, formula or group" value={q} onChange={(e) => setQ(e.target.value)} />
        </div>
        <div>
          <label htmlFor={`${id}-el`} className="block text-sm font-medium">
            Contains element
          </label>
          <input id={`${id}-el`} className={`${inputClass} w-24`} placeholder="e.g. Fe" value={element} onChange={(e) => setElement(e.target.value.trim())} />
        </div>
        <div>
          <label htmlFor={`${id}-hz`} className="block text-sm font-medium">
            Hazard
          </label>
          <select id={`${id}-hz`} className={inputClass} value={hazard} onChange={(e) => setHazard(e.target.value)}>
            <option value="">Any</option>
            <option value="asbestos">Asbestos group</option>
            <option value="crystalline_silica">Crystalline silica</option>
          </select>
        </div>
        <div>
          <label htmlFor={`${id}-src`} className="block text-sm font-medium">
            Source
          </label>
          <select id={`${id}-src`} className={inputClass} value={source} onChange={(e) => setSource(e.target.value)}>
            <option value="">All</option>
            <option value="builtin">Shipped</option>
            <option value="imported">Imported</option>
          </select>
        </div>
        {data && (
          <p className="pb-2 text-sm text-muted" role="status">
            {data.total} phase{data.total === 1 ? "" : "s"}
          </p>
        )}
      </div>
      {isLoading && <Skeleton className="h-64 w-full" />}
      {error && <p role="alert" className="text-danger">{error instanceof ApiError ? error.message : "Could not load the library."}</p>}
      {data && (
        <div className="overflow-x-auto rounded-lg border border-line bg-white">
          <table className="w-full text-sm">
            <caption className="sr-only">Reference phases</caption>
            <thead className="bg-stone text-left text-xs text-muted">
              <tr>
                <th scope="col" className="px-3 py-2 font-medium">
                  Mineral
                </th>
                <th scope="col" className="px-3 py-2 font-medium">
                  Formula
                </th>
                <th scope="col" className="hidden px-3 py-2 font-medium md:table-cell">
                  System / space group
                </th>
                <th scope="col" className="px-3 py-2 font-medium">
                  Strongest d (Å)
                </th>
                <th scope="col" className="hidden px-3 py-2 text-right font-medium sm:table-cell">
                  RIR
                </th>
              </tr>
            </thead>
            <tbody>
              {data.items.map((r) => (
                <tr key={r.id} className="border-t border-line">
                  <td className="px-3 py-1.5">
                    <Link href={`/library/${r.id}`} className="font-medium capitalize text-brand-dark hover:underline">
                      {r.mineral}
                    </Link>
                    <span className="ml-1 inline-flex flex-wrap gap-1 align-middle">
                      {!r.builtin && <Badge tone="brand">imported</Badge>}
                      {r.hazard === "asbestos" && <Badge tone="danger">asbestos group</Badge>}
                      {r.hazard === "crystalline_silica" && <Badge tone="oxide">crystalline silica</Badge>}
                      {r.otherHazards.map((h) => (
                        <Badge key={h} tone="oxide">
                          {h.replace("toxic-", "")}
                        </Badge>
                      ))}
                    </span>
                    {r.group && <span className="block text-xs text-muted">{r.group}</span>}
                  </td>
                  <td className="px-3 py-1.5 text-muted">{r.formula}</td>
                  <td className="hidden px-3 py-1.5 text-muted md:table-cell">
                    {r.crystalSystem} · {r.spaceGroup}
                  </td>
                  <td className="px-3 py-1.5 tabular-nums">{r.strongLines.map((l) => l.d.toFixed(3)).join(" · ")}</td>
                  <td className="hidden px-3 py-1.5 text-right tabular-nums sm:table-cell">{r.rir != null ? r.rir.toFixed(2) : "—"}</td>
                </tr>
              ))}
            </tbody>
          </table>
        </div>
      )}
    </div>
  );
}
