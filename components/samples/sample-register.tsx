"use client";

import { keepPreviousData, useQuery } from "@tanstack/react-query";
import { sampleKeys } from "@/lib/client/query-keys";
import { flexRender, getCoreRowModel, useReactTable, type ColumnDef, type RowSelectionState, type VisibilityState } from "@tanstack/react-table";
import Link from "next/link";
import { usePathname, useRouter, useSearchParams } from "next/navigation";
import { useMemo, useState } from "react";
import { Badge } from "@/components/ui/badge";
import { buttonClass } from "@/components/ui/button";
import { inputClass } from "@/components/ui/field";
import { SAMPLE_STATUSES, SAMPLE_TYPES } from "@/lib/vocabulary";
import { fetchJson } from "@/lib/client/fetch-json";
import { SAMPLE_STATUS_LABELS, SAMPLE_TYPE_LABELS, formatDate } from "@/lib/format";
import { cn } from "@/lib/utils";

export interface SampleListItem {
  id: string;
  code: string;
  igsn: string | null;
  sampleType: keyof typeof SAMPLE_TYPE_LABELS;
  lithology: string | null;
  alteration: string | null;
  status: keyof typeof SAMPLE_STATUS_LABELS;
  collectedAt: string | null;
  collectedTz?: string | null;
  collectorName: string | null;
  lat: number | null;
  lon: number | null;
  stationId: string | null;
  stationCode: string | null;
  suspectedAsbestos: boolean;
}

interface Page {
  items: SampleListItem[];
  total: number;
  page: number;
  pageSize: number;
}

const FILTER_KEYS = ["q", "status", "sampleType", "lithology", "alteration", "collector", "from", "to", "stationId", "bbox"] as const;
const SORTABLE: Record<string, string> = { code: "code", stationCode: "station", sampleType: "sampleType", lithology: "lithology", status: "status", collectedAt: "collectedAt" };

/** The sample register: server-side paging, sorting and filtering, kept in the URL. */
export function SampleRegister({ projectId, children }: { projectId: string; children?: (selected: SampleListItem[], query: string) => React.ReactNode }) {
  const router = useRouter();
  const pathname = usePathname();
  const search = useSearchParams();
  const query = search.toString();
  const sort = search.get("sort") ?? "code";
  const dir = search.get("dir") ?? "asc";
  const page = Number(search.get("page") ?? 1);
  const pageSize = Number(search.get("pageSize") ?? 25);
  const [selection, setSelection] = useState<RowSelectionState>({});
  const [visibility, setVisibility] = useState<VisibilityState>({ alteration: false, collectorName: false, igsn: false });

  const { data, error, isFetching } = useQuery({
    queryKey: sampleKeys.register(projectId, query),
    queryFn: () => fetchJson<Page>(`/api/projects/${projectId}/samples?${query}`),
    placeholderData: keepPreviousData,
  });

  function setParams(update: Record<string, string | null>, resetPage = true) {
    const next = new URLSearchParams(search.toString());
    for (const [k, v] of Object.entries(update)) {
      if (v === null || v === "") next.delete(k);
      else next.set(k, v);
    }
    if (resetPage) next.delete("page");
    router.replace(`${pathname}?${next.toString()}`, { scroll: false });
  }

  const columns = useMemo<ColumnDef<SampleListItem>[]>(
    () => [
      {
        id: "select",
        header: ({ table }) => (
          <input type="checkbox" aria-label="Select all on this page" checked={table.getIsAllRowsSelected()} onChange={table.getToggleAllRowsSelectedHandler()} />
        ),
        cell: ({ row }) => <input type="checkbox" aria-label={`Select ${row.original.code}`} checked={row.getIsSelected()} onChange={row.getToggleSelectedHandler()} />,
        enableHiding: false,
      },
      {
        accessorKey: "code",
        header: "Code",
        cell: ({ row }) => (
          <Link className="font-medium text-brand hover:underline" href={`/projects/${projectId}/samples/${row.original.id}`}>
            {row.original.code}
          </Link>
        ),
        enableHiding: false,
      },
      { accessorKey: "igsn", header: "IGSN" },
      { accessorKey: "stationCode", header: "Station", cell: ({ getValue }) => getValue<string>() ?? "—" },
      { accessorKey: "sampleType", header: "Type", cell: ({ row }) => SAMPLE_TYPE_LABELS[row.original.sampleType] },
      { accessorKey: "lithology", header: "Lithology", cell: ({ getValue }) => getValue<string>() ?? "—" },
      { accessorKey: "alteration", header: "Alteration", cell: ({ getValue }) => getValue<string>() ?? "—" },
      { accessorKey: "collectedAt", header: "Collected", cell: ({ row }) => formatDate(row.original.collectedAt, row.original.collectedTz) },
      { accessorKey: "collectorName", header: "Collector", cell: ({ getValue }) => getValue<string>() ?? "—" },
      {
        accessorKey: "status",
        header: "Status",
        cell: ({ row }) => (
          <span className="flex flex-wrap gap-1">
            <Badge tone={row.original.status === "confirmed" ? "ok" : "neutral"}>{SAMPLE_STATUS_LABELS[row.original.status]}</Badge>
            {row.original.suspectedAsbestos && <Badge tone="danger">Suspected asbestos</Badge>}
          </span>
        ),
      },
    ],
    [projectId],
  );

  const items = data?.items ?? [];
  const table = useReactTable({
    data: items,
    columns,
    getCoreRowModel: getCoreRowModel(),
    getRowId: (r) => r.id,
    state: { rowSelection: selection, columnVisibility: visibility },
    onRowSelectionChange: setSelection,
    onColumnVisibilityChange: setVisibility,
    manualPagination: true,
    manualSorting: true,
  });
  const selected = table.getSelectedRowModel().rows.map((r) => r.original);
  const total = data?.total ?? 0;
  const pages = Math.max(1, Math.ceil(total / pageSize));
  const activeFilters = FILTER_KEYS.filter((k) => search.get(k));

  return (
    <div className="space-y-3">
      <form
        className="grid grid-cols-2 gap-2 md:grid-cols-4 lg:grid-cols-8"
        onSubmit={(e) => {
          e.preventDefault();
          const f = new FormData(e.currentTarget);
          setParams(Object.fromEntries(FILTER_KEYS.filter((k) => f.has(k)).map((k) => [k, String(f.get(k) ?? "")])));
        }}
        aria-label="Filter samples"
        key={query}
      >
        <input name="q" defaultValue={search.get("q") ?? ""} placeholder="Search code, description…" aria-label="Search" className={cn(inputClass, "col-span-2")} />
        <select name="status" defaultValue={search.get("status") ?? ""} aria-label="Status" className={inputClass}>
          <option value="">Any status</option>
          {SAMPLE_STATUSES.map((s) => (
            <option key={s} value={s}>
              {SAMPLE_STATUS_LABELS[s]}
            </option>
          ))}
        </select>
        <select name="sampleType" defaultValue={search.get("sampleType") ?? ""} aria-label="Sample type" className={inputClass}>
          <option value="">Any type</option>
          {SAMPLE_TYPES.map((s) => (
            <option key={s} value={s}>
              {SAMPLE_TYPE_LABELS[s]}
            </option>
          ))}
        </select>
        <input name="lithology" defaultValue={search.get("lithology") ?? ""} placeholder="Lithology" aria-label="Lithology" className={inputClass} />
        <input name="collector" defaultValue={search.get("collector") ?? ""} placeholder="Collector" aria-label="Collector" className={inputClass} />
        <input name="from" type="date" defaultValue={search.get("from") ?? ""} aria-label="Collected from" className={inputClass} />
        <input name="to" type="date" defaultValue={search.get("to") ?? ""} aria-label="Collected to" className={inputClass} />
        <div className="col-span-2 flex gap-2 md:col-span-4 lg:col-span-8">
          <button type="submit" className={buttonClass("primary")}>
            Apply filters
          </button>
          {activeFilters.length > 0 && (
            <button type="button" className={buttonClass("secondary")} onClick={() => setParams(Object.fromEntries(FILTER_KEYS.map((k) => [k, null])))}>
              Clear ({activeFilters.length})
            </button>
          )}
          <details className="relative ml-auto">
            <summary className={buttonClass("secondary", "cursor-pointer list-none")}>Columns</summary>
            <div className="absolute right-0 z-20 mt-1 w-48 rounded-md border border-line bg-white p-2 shadow-lg">
              {table
                .getAllLeafColumns()
                .filter((c) => c.getCanHide())
                .map((c) => (
                  <label key={c.id} className="flex items-center gap-2 py-0.5 text-sm">
                    <input type="checkbox" checked={c.getIsVisible()} onChange={c.getToggleVisibilityHandler()} />
                    {String(c.columnDef.header)}
                  </label>
                ))}
            </div>
          </details>
        </div>
      </form>

      {children?.(selected, query)}

      {error && (
        <p role="alert" className="rounded-md bg-red-50 px-3 py-2 text-sm text-danger">
          {(error as Error).message}
        </p>
      )}

      {/* Narrow screens: one card per sample (the table needs 720 px). */}
      <ul className="space-y-2 md:hidden" data-testid="register-cards" aria-busy={isFetching}>
        {table.getRowModel().rows.map((row) => {
          const s = row.original;
          return (
            <li key={row.id} className={cn("rounded-lg border border-line bg-white p-3", row.getIsSelected() && "border-brand bg-brand-light/60")}>
              <div className="flex items-start gap-3">
                <input type="checkbox" className="mt-1 h-5 w-5" aria-label={`Select ${s.code}`} checked={row.getIsSelected()} onChange={row.getToggleSelectedHandler()} />
                <div className="min-w-0 flex-1 space-y-1">
                  <div className="flex flex-wrap items-center justify-between gap-2">
                    <Link className="font-semibold text-brand hover:underline" href={`/projects/${projectId}/samples/${s.id}`}>
                      {s.code}
                    </Link>
                    <Badge tone={s.status === "confirmed" ? "ok" : "neutral"}>{SAMPLE_STATUS_LABELS[s.status]}</Badge>
                  </div>
                  <p className="text-sm text-ink">
                    {SAMPLE_TYPE_LABELS[s.sampleType]}
                    {s.lithology ? ` · ${s.lithology}` : ""}
                  </p>
                  <p className="text-xs text-muted">
                    {s.stationCode ? `${s.stationCode} · ` : ""}
                    {formatDate(s.collectedAt, s.collectedTz)}
                    {s.collectorName ? ` · ${s.collectorName}` : ""}
                  </p>
                  {s.suspectedAsbestos && <Badge tone="danger">Suspected asbestos</Badge>}
                </div>
              </div>
            </li>
          );
        })}
        {data && items.length === 0 && <li className="rounded-lg border border-line bg-white px-3 py-8 text-center text-muted">No samples match these filters.</li>}
        {!data && Array.from({ length: 4 }, (_, i) => <li key={i} className="h-20 animate-pulse rounded-lg border border-line bg-line/40" />)}
      </ul>

      <div className="hidden overflow-x-auto rounded-lg border border-line bg-white md:block">
        <table className="w-full min-w-[720px] text-sm" aria-busy={isFetching}>
          <thead className="bg-stone text-left text-xs uppercase tracking-wide text-muted">
            {table.getHeaderGroups().map((hg) => (
              <tr key={hg.id}>
                {hg.headers.map((h) => {
                  const key = SORTABLE[h.column.id];
                  const active = key === sort;
                  return (
                    <th key={h.id} className="px-3 py-2 font-medium" aria-sort={active ? (dir === "asc" ? "ascending" : "descending") : undefined}>
                      {key ? (
                        <button type="button" className="flex items-center gap-1 uppercase hover:text-ink" onClick={() => setParams({ sort: key, dir: active && dir === "asc" ? "desc" : "asc" }, false)}>
                          {flexRender(h.column.columnDef.header, h.getContext())}
                          <span aria-hidden="true">{active ? (dir === "asc" ? "▲" : "▼") : "↕"}</span>
                        </button>
                      ) : (
                        flexRender(h.column.columnDef.header, h.getContext())
                      )}
                    </th>
                  );
                })}
              </tr>
            ))}
          </thead>
          <tbody>
            {table.getRowModel().rows.map((row) => (
              <tr key={row.id} className={cn("border-t border-line", row.getIsSelected() && "bg-brand-light/60")}>
                {row.getVisibleCells().map((cell) => (
                  <td key={cell.id} className="px-3 py-2 align-top">
                    {flexRender(cell.column.columnDef.cell, cell.getContext())}
                  </td>
                ))}
              </tr>
            ))}
            {data && items.length === 0 && (
              <tr>
                <td colSpan={columns.length} className="px-3 py-8 text-center text-muted">
                  No samples match these filters.
                </td>
              </tr>
            )}
            {!data &&
              Array.from({ length: 6 }, (_, i) => (
                <tr key={i} className="border-t border-line">
                  <td colSpan={columns.length} className="px-3 py-3">
                    <div className="h-4 animate-pulse rounded bg-line/60" />
                  </td>
                </tr>
              ))}
          </tbody>
        </table>
      </div>

      <div className="flex flex-wrap items-center justify-between gap-2 text-sm">
        <p className="text-muted" data-testid="register-total">
          {total} samples{selected.length > 0 && ` · ${selected.length} selected`}
        </p>
        <div className="flex items-center gap-2">
          <label className="flex items-center gap-1 text-muted">
            Rows
            <select value={pageSize} onChange={(e) => setParams({ pageSize: e.target.value })} className="rounded border border-line bg-white px-1 py-1">
              {[25, 50, 100, 200].map((n) => (
                <option key={n}>{n}</option>
              ))}
            </select>
          </label>
          <button type="button" className={buttonClass("secondary")} disabled={page <= 1} onClick={() => setParams({ page: String(page - 1) }, false)}>
            Previous
          </button>
          <span>
            Page {page} of {pages}
          </span>
          <button type="button" className={buttonClass("secondary")} disabled={page >= pages} onClick={() => setParams({ page: String(page + 1) }, false)}>
            Next
          </button>
        </div>
      </div>
    </div>
  );
}
