"use client";

import { useQuery } from "@tanstack/react-query";
import { sampleKeys } from "@/lib/client/query-keys";
import { useRouter } from "next/navigation";
import { useState } from "react";
import { AsbestosBanner } from "@/components/submissions/lab-cautions";
import { Badge } from "@/components/ui/badge";
import { Button } from "@/components/ui/button";
import { Card } from "@/components/ui/card";
import { Field, inputClass } from "@/components/ui/field";
import { ApiError, fetchJson } from "@/lib/client/fetch-json";
import { SAMPLE_STATUS_LABELS, SAMPLE_TYPE_LABELS } from "@/lib/format";
import { PRIORITIES, REQUESTED_ANALYSES, type SampleStatus, type SampleType } from "@/lib/vocabulary";
import { PRIORITY_LABELS } from "./labels";

export interface PickSample {
  id: string;
  code: string;
  sampleType: SampleType;
  status: SampleStatus;
  suspectedAsbestos: boolean;
  weightKg: number | null;
}

const SUBMITTABLE: SampleStatus[] = ["collected", "stored", "returned"];

/** Pick samples, say what the lab should do, and create a draft submission. */
export function SubmissionForm({ projectId, defaultLabEmail, preselected }: { projectId: string; defaultLabEmail: string; preselected: PickSample[] }) {
  const router = useRouter();
  const [picked, setPicked] = useState<PickSample[]>(preselected);
  const [search, setSearch] = useState("");
  const [query, setQuery] = useState("");
  const [analyses, setAnalyses] = useState<string[]>(["XRD bulk"]);
  const [other, setOther] = useState("");
  const [fields, setFields] = useState<Record<string, string[]>>({});
  const [error, setError] = useState<string | null>(null);
  const [pending, setPending] = useState(false);

  const results = useQuery({
    queryKey: sampleKeys.picker(projectId, query),
    queryFn: () => fetchJson<{ items: PickSample[]; total: number }>(`/api/projects/${projectId}/samples?pageSize=50&sort=code${query ? `&q=${encodeURIComponent(query)}` : ""}`),
  });
  const pickedIds = new Set(picked.map((p) => p.id));
  const toggle = (s: PickSample) => setPicked((cur) => (cur.some((p) => p.id === s.id) ? cur.filter((p) => p.id !== s.id) : [...cur, s].sort((a, b) => a.code.localeCompare(b.code))));

  async function onSubmit(e: React.FormEvent<HTMLFormElement>) {
    e.preventDefault();
    const f = new FormData(e.currentTarget);
    const requestedAnalysis = [...analyses, ...other.split(";").map((s) => s.trim()).filter(Boolean)];
    setPending(true);
    setError(null);
    setFields({});
    try {
      const created = await fetchJson<{ id: string }>(`/api/projects/${projectId}/submissions`, {
        method: "POST",
        json: {
          sampleIds: picked.map((p) => p.id),
          requestedAnalysis,
          priority: f.get("priority"),
          hazards: f.get("hazards"),
          qaqcNote: f.get("qaqcNote"),
          notes: f.get("notes"),
          labEmail: String(f.get("labEmail") ?? "").trim() || null,
        },
      });
      router.push(`/projects/${projectId}/submissions/${created.id}`);
    } catch (err) {
      setPending(false);
      if (err instanceof ApiError) {
        setError(err.message);
        setFields(err.fields ?? {});
      } else setError("Could not reach the server. Check the connection and try again.");
    }
  }

  const flagged = picked.filter((p) => p.suspectedAsbestos).map((p) => p.code);
  return (
    <form onSubmit={onSubmit} className="grid gap-4 lg:grid-cols-2" aria-label="New submission">
      <Card className="space-y-3">
        <h2 className="font-semibold">1. Samples ({picked.length} selected)</h2>
        <div className="flex gap-2">
          <input
            value={search}
            onChange={(e) => setSearch(e.target.value)}
            onKeyDown={(e) => {
              if (e.key === "Enter") {
                e.preventDefault();
                setQuery(search.trim());
              }
            }}
            placeholder="Search code, lithology…"
            aria-label="Search samples"
            className={inputClass}
          />
          <Button type="button" variant="secondary" onClick={() => setQuery(search.trim())}>
            Search
          </Button>
        </div>
        <div className="max-h-72 overflow-y-auto rounded border border-line">
          <ul aria-label="Search results">
            {results.data?.items.map((s) => {
              const can = SUBMITTABLE.includes(s.status);
              return (
                <li key={s.id} className="flex items-center gap-2 border-b border-line px-2 py-1.5 text-sm last:border-0">
                  <input id={`pick-${s.id}`} type="checkbox" checked={pickedIds.has(s.id)} disabled={!can && !pickedIds.has(s.id)} onChange={() => toggle(s)} />
                  <label htmlFor={`pick-${s.id}`} className="flex flex-1 flex-wrap items-center gap-2">
                    <span className="font-medium">{s.code}</span>
                    <span className="text-muted">{SAMPLE_TYPE_LABELS[s.sampleType]}</span>
                    {!can && <span className="text-xs text-muted">({SAMPLE_STATUS_LABELS[s.status]})</span>}
                    {s.suspectedAsbestos && <Badge tone="danger">Suspected asbestos</Badge>}
                  </label>
                </li>
              );
            })}
            {results.isLoading && <li className="px-2 py-3 text-sm text-muted">Loading…</li>}
            {results.data && results.data.items.length === 0 && <li className="px-2 py-3 text-sm text-muted">No samples match.</li>}
          </ul>
        </div>
        {results.data && results.data.total > results.data.items.length && <p className="text-xs text-muted">Showing the first {results.data.items.length} of {results.data.total}; search to narrow down.</p>}
        <div>
          <h3 className="text-sm font-medium">Selected</h3>
          {picked.length === 0 ? (
            <p className="text-sm text-muted">None yet. Tick samples above, or select them in the sample register.</p>
          ) : (
            <ul className="mt-1 flex flex-wrap gap-1" aria-label="Selected samples">
              {picked.map((p) => (
                <li key={p.id}>
                  <button type="button" onClick={() => toggle(p)} className="rounded-full border border-line bg-stone px-2 py-0.5 text-xs hover:bg-red-50" aria-label={`Remove ${p.code}`}>
                    {p.code} ×
                  </button>
                </li>
              ))}
            </ul>
          )}
          {fields.sampleIds && (
            <ul role="alert" className="mt-2 space-y-0.5 text-xs font-medium text-danger">
              {fields.sampleIds.map((m) => (
                <li key={m}>{m}</li>
              ))}
            </ul>
          )}
        </div>
        <AsbestosBanner codes={flagged} />
      </Card>

      <Card className="space-y-3">
        <h2 className="font-semibold">2. Request</h2>
        <fieldset className="space-y-1">
          <legend className="text-sm font-medium">Requested analysis</legend>
          {REQUESTED_ANALYSES.map((a) => (
            <label key={a} className="flex items-center gap-2 text-sm">
              <input type="checkbox" checked={analyses.includes(a)} onChange={() => setAnalyses((cur) => (cur.includes(a) ? cur.filter((x) => x !== a) : [...cur, a]))} />
              {a}
            </label>
          ))}
          <input value={other} onChange={(e) => setOther(e.target.value)} placeholder="Other (separate with ;)" aria-label="Other analyses" className={inputClass} />
          {fields.requestedAnalysis && <p className="text-xs font-medium text-danger" role="alert">{fields.requestedAnalysis.join(" ")}</p>}
        </fieldset>
        <Field label="Priority" htmlFor="priority" error={fields.priority}>
          <select id="priority" name="priority" defaultValue="routine" className={inputClass}>
            {PRIORITIES.map((p) => (
              <option key={p} value={p}>
                {PRIORITY_LABELS[p]}
              </option>
            ))}
          </select>
        </Field>
        <Field label="Hazards" htmlFor="hazards" error={fields.hazards} hint="Suspected-asbestos samples are added automatically. Add e.g. sulfide-rich (may self-heat), arsenic, radioactive minerals.">
          <textarea id="hazards" name="hazards" rows={2} className={inputClass} />
        </Field>
        <Field label="QA/QC samples inserted" htmlFor="qaqcNote" error={fields.qaqcNote} hint="e.g. 1 field duplicate, 1 blank (clean quartz sand), 1 standard — about 1 in 20 of each is common practice.">
          <textarea id="qaqcNote" name="qaqcNote" rows={2} className={inputClass} />
        </Field>
        <Field label="Notes to the lab" htmlFor="notes" error={fields.notes}>
          <textarea id="notes" name="notes" rows={2} className={inputClass} />
        </Field>
        <Field label="Lab e-mail" htmlFor="labEmail" error={fields.labEmail} hint="The lab's reception address; the project default is filled in.">
          <input id="labEmail" name="labEmail" type="email" defaultValue={defaultLabEmail} className={inputClass} />
        </Field>
        {error && (
          <p role="alert" className="rounded-md bg-red-50 px-3 py-2 text-sm text-danger">
            {error}
          </p>
        )}
        <Button type="submit" disabled={pending || picked.length === 0} className="w-full">
          {pending ? "Creating…" : `Create draft with ${picked.length} sample${picked.length === 1 ? "" : "s"}`}
        </Button>
        <p className="text-xs text-muted">The draft is not sent yet: print the packing list, pack the bags, then send it with the waybill number.</p>
      </Card>
    </form>
  );
}
