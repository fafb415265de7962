"use client";

import { useQuery } from "@tanstack/react-query";
import { referenceKeys } from "@/lib/client/query-keys";
import { useId, useState } from "react";
import { Button } from "@/components/ui/button";
import { inputClass } from "@/components/ui/field";
import { fetchJson } from "@/lib/client/fetch-json";

interface RefItem {
  id: string;
  mineral: string;
  formula: string;
  hazard: string | null;
  builtin: boolean;
  strongLines: { d: number; intensity: number }[];
}

/**
 * Search the reference library and pick a phase: by default it is added as accepted (with an optional note); with
 * `actionLabel` the caller decides what adding means (e.g. add it to the fit and refit) and no note is asked.
 */
export function AddPhase({
  onAdd,
  busy,
  error,
  label = "Add a phase from the library",
  actionLabel,
  exclude = [],
}: {
  onAdd: (referencePhaseId: string, note: string, mineral: string) => void;
  busy: boolean;
  error?: string | null;
  label?: string;
  actionLabel?: (mineral: string) => string;
  /** Reference ids not to offer (already in the fit). */
  exclude?: string[];
}) {
  const id = useId();
  const [q, setQ] = useState("");
  const [picked, setPicked] = useState<RefItem | null>(null);
  const [note, setNote] = useState("");
  const { data, isFetching } = useQuery({
    queryKey: referenceKeys.search(q),
    queryFn: () => fetchJson<{ items: RefItem[] }>(`/api/reference-phases?pageSize=12&q=${encodeURIComponent(q)}`),
    enabled: q.trim().length >= 2 && !picked,
  });
  return (
    <div className="space-y-2">
      <label htmlFor={`${id}-q`} className="block text-sm font-medium">
        {label}
      </label>
      {picked ? (
        <div className="flex items-center justify-between gap-2 rounded-md border border-line bg-stone px-2 py-1.5 text-sm">
          <span>
            <span className="font-medium capitalize">{picked.mineral}</span> <span className="text-xs text-muted">{picked.formula}</span>
          </span>
          <button type="button" className="text-xs text-brand hover:underline" onClick={() => setPicked(null)}>
            Change
          </button>
        </div>
      ) : (
        <>
          <input id={`${id}-q`} className={inputClass} placeholder="Mineral, formula or group (e.g. dolomite, FeS2)" value={q} onChange={(e) => setQ(e.target.value)} autoComplete="off" />
          {q.trim().length >= 2 && (
            <ul className="max-h-48 overflow-auto rounded-md border border-line bg-white text-sm" role="listbox" aria-label="Matching reference phases">
              {isFetching && <li className="px-2 py-1 text-muted">Searching…</li>}
              {data?.items.length === 0 && <li className="px-2 py-1 text-muted">No phase matches “{q}”.</li>}
              {data?.items.filter((r) => !exclude.includes(r.id)).map((r) => (
                <li key={r.id}>
                  <button type="button" role="option" aria-selected={false} className="flex w-full items-baseline justify-between gap-2 px-2 py-1 text-left hover:bg-brand-light" onClick={() => setPicked(r)}>
                    <span>
                      <span className="capitalize">{r.mineral}</span> <span className="text-xs text-muted">{r.formula}</span>
                    </span>
                    <span className="text-xs text-muted tabular-nums">{r.strongLines.map((l) => l.d.toFixed(2)).join(" · ")} Å</span>
                  </button>
                </li>
              ))}
            </ul>
          )}
        </>
      )}
      {picked && (
        <>
          {!actionLabel && (
            <>
              <label htmlFor={`${id}-note`} className="sr-only">
                Why this phase (optional)
              </label>
              <input id={`${id}-note`} className={inputClass} placeholder="Why (optional), e.g. shoulder at 2.89 Å" value={note} onChange={(e) => setNote(e.target.value)} />
            </>
          )}
          <Button
            type="button"
            disabled={busy}
            onClick={() => {
              onAdd(picked.id, note, picked.mineral);
              setPicked(null);
              setQ("");
              setNote("");
            }}
          >
            {actionLabel ? actionLabel(picked.mineral) : `Add ${picked.mineral} as accepted`}
          </Button>
        </>
      )}
      {error && (
        <p role="alert" className="text-xs font-medium text-danger">
          {error}
        </p>
      )}
    </div>
  );
}
