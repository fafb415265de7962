"use client";

import { useQuery } from "@tanstack/react-query";
import { sampleKeys } from "@/lib/client/query-keys";
import { useRouter } from "next/navigation";
import { useId, useState } from "react";
import { Button } from "@/components/ui/button";
import { Field, inputClass } from "@/components/ui/field";
import { ApiError, fetchJson } from "@/lib/client/fetch-json";
import { parseScan, ScanParseError } from "@/lib/science/scan";
import { cn } from "@/lib/utils";
import { ANODES } from "@/lib/vocabulary";

interface SampleHit {
  id: string;
  code: string;
  lithology: string | null;
  status: string;
}

/** What the browser could read from a chosen file (the server checks again). */
type LocalCheck =
  | { ok: true; points: number; start: number; end: number; step: number; anode?: string; wavelength?: number; instrument?: string; notes: string[] }
  | { ok: false; message: string }
  | null;

async function checkLocally(file: File): Promise<LocalCheck> {
  const text = await file.text();
  try {
    let scan;
    const notes: string[] = [];
    try {
      scan = parseScan(text);
    } catch (err) {
      // d-spacings without a wavelength in the file: the form's anode or wavelength converts them on upload.
      if (!(err instanceof ScanParseError && err.code === "NEEDS_WAVELENGTH")) throw err;
      scan = parseScan(text, { anode: "Cu" });
      notes.push("The file gives d-spacings and no wavelength: they are converted to 2θ with the anode or wavelength set below (range shown for Cu).");
    }
    const n = scan.twoTheta.length;
    notes.push(...(scan.meta.warnings ?? []));
    return { ok: true, points: n, start: scan.twoTheta[0], end: scan.twoTheta[n - 1], step: (scan.twoTheta[n - 1] - scan.twoTheta[0]) / (n - 1), anode: scan.meta.anode, wavelength: scan.meta.wavelength, instrument: scan.meta.instrument, notes };
  } catch (err) {
    return { ok: false, message: err instanceof ScanParseError ? err.message : "The file could not be read." };
  }
}

/** The project's usual instrument (set by the lead in the project settings), used when the file does not say. */
export interface InstrumentDefaults {
  anode: string | null;
  instrument: string | null;
}

function SettingsFields({ id, errors, defaults }: { id: string; errors?: Record<string, string[]>; defaults: InstrumentDefaults }) {
  return (
    <fieldset className="grid gap-3 sm:grid-cols-2 lg:grid-cols-4">
      <legend className="mb-1 text-sm font-medium sm:col-span-2 lg:col-span-4">Instrument settings — used only where the file does not give them</legend>
      <Field label="Anode" htmlFor={`${id}-anode`} error={errors?.anode}>
        <select id={`${id}-anode`} name="anode" className={inputClass} defaultValue={defaults.anode ?? "Cu"}>
          <option value="">— (type a wavelength)</option>
          {ANODES.map((a) => (
            <option key={a}>{a}</option>
          ))}
        </select>
      </Field>
      <Field label="Wavelength Kα1 (Å)" htmlFor={`${id}-wl`} hint="Instead of the anode, e.g. 1.78897" error={errors?.wavelength}>
        <input id={`${id}-wl`} name="wavelength" className={inputClass} inputMode="decimal" />
      </Field>
      <Field label="Time per step (s)" htmlFor={`${id}-t`} error={errors?.timePerStepS}>
        <input id={`${id}-t`} name="timePerStepS" className={inputClass} inputMode="decimal" />
      </Field>
      <Field label="Instrument" htmlFor={`${id}-inst`} error={errors?.instrument}>
        <input id={`${id}-inst`} name="instrument" className={inputClass} defaultValue={defaults.instrument ?? ""} placeholder="e.g. Lab diffractometer 2" />
      </Field>
      <Field label="Kα2" htmlFor={`${id}-ka2`} hint="Absent on Kα1-only scans (primary monochromator)" error={errors?.kAlpha2}>
        <select id={`${id}-ka2`} name="kAlpha2" className={inputClass} defaultValue="auto">
          <option value="auto">Decide from the peak shapes</option>
          <option value="present">Present (Kα1 + Kα2)</option>
          <option value="absent">Absent (Kα1 only)</option>
        </select>
      </Field>
    </fieldset>
  );
}

function SamplePicker({ projectId, value, onChange, error }: { projectId: string; value: SampleHit | null; onChange: (s: SampleHit | null) => void; error?: string[] }) {
  const id = useId();
  const [q, setQ] = useState("");
  const { data } = useQuery({
    queryKey: sampleKeys.search(projectId, q),
    queryFn: () => fetchJson<{ items: SampleHit[] }>(`/api/projects/${projectId}/samples?pageSize=10&q=${encodeURIComponent(q)}`),
    enabled: q.trim().length >= 2 && !value,
  });
  return (
    <Field label="Sample" htmlFor={`${id}-q`} error={error}>
      {value ? (
        <div className="flex items-center justify-between rounded-md border border-line bg-stone px-3 py-2 text-sm">
          <span data-testid="picked-sample">
            <span className="font-medium">{value.code}</span> {value.lithology && <span className="text-muted">· {value.lithology}</span>}
          </span>
          <button type="button" className="text-xs text-brand hover:underline" onClick={() => onChange(null)}>
            Change
          </button>
        </div>
      ) : (
        <>
          <input id={`${id}-q`} className={inputClass} placeholder="Type a sample code, e.g. APR-000012" value={q} onChange={(e) => setQ(e.target.value)} autoComplete="off" aria-invalid={!!error} />
          {data && q.trim().length >= 2 && (
            <ul className="mt-1 max-h-48 overflow-auto rounded-md border border-line bg-white text-sm" role="listbox" aria-label="Matching samples">
              {data.items.length === 0 && <li className="px-3 py-1.5 text-muted">No sample matches “{q}”.</li>}
              {data.items.map((s) => (
                <li key={s.id}>
                  <button type="button" role="option" aria-selected={false} className="w-full px-3 py-1.5 text-left hover:bg-brand-light" onClick={() => onChange(s)}>
                    <span className="font-medium">{s.code}</span> {s.lithology && <span className="text-muted">· {s.lithology}</span>}
                  </button>
                </li>
              ))}
            </ul>
          )}
        </>
      )}
    </Field>
  );
}

function SingleUpload({ projectId, initialSample, defaults }: { projectId: string; initialSample: SampleHit | null; defaults: InstrumentDefaults }) {
  const id = useId();
  const router = useRouter();
  const [sample, setSample] = useState<SampleHit | null>(initialSample);
  const [check, setCheck] = useState<LocalCheck>(null);
  const [busy, setBusy] = useState(false);
  const [err, setErr] = useState<ApiError | null>(null);
  const onFile = async (e: React.ChangeEvent<HTMLInputElement>) => {
    const f = e.target.files?.[0];
    setErr(null);
    setCheck(f ? await checkLocally(f) : null);
  };
  const submit = async (e: React.FormEvent<HTMLFormElement>) => {
    e.preventDefault();
    const form = new FormData(e.currentTarget);
    if (sample) form.set("sampleId", sample.id);
    setBusy(true);
    setErr(null);
    try {
      const res = await fetchJson<{ scan: { id: string } }>(`/api/projects/${projectId}/scans`, { method: "POST", body: form });
      router.push(`/projects/${projectId}/scans/${res.scan.id}`);
    } catch (error) {
      setErr(error instanceof ApiError ? error : new ApiError(0, "error", "Upload failed; check the connection and try again."));
      setBusy(false);
    }
  };
  const fileError = err?.fields?.file ?? (check && !check.ok ? [check.message] : undefined);
  return (
    <form onSubmit={submit} className="space-y-4" aria-label="Upload one scan">
      <div className="grid gap-4 md:grid-cols-2">
        <SamplePicker projectId={projectId} value={sample} onChange={setSample} error={err?.fields?.sampleId} />
        <Field label="Scan file (XY, XYE, CSV or pdCIF)" htmlFor={`${id}-file`} error={fileError}>
          <input id={`${id}-file`} name="file" type="file" required accept=".xy,.xye,.csv,.txt,.dat,.cif" onChange={onFile} className="block w-full text-sm file:mr-3 file:rounded-md file:border-0 file:bg-brand-light file:px-3 file:py-2 file:text-brand-dark" aria-invalid={!!fileError} />
        </Field>
      </div>
      {check?.ok && (
        <p className="rounded-md border border-line bg-stone px-3 py-2 text-sm" role="status" data-testid="file-check">
          {check.points} points, {check.start}–{check.end}° 2θ, step ≈ {check.step.toFixed(4)}°.{" "}
          {check.anode || check.wavelength ? `The file gives ${check.anode ?? ""} ${check.wavelength ? `λ = ${check.wavelength} Å` : ""}; that is used.` : "The file gives no anode or wavelength: the form's setting is used."}
          {check.instrument && ` Instrument: ${check.instrument}.`}
          {check.notes.length > 0 && (
            <span className="mt-1 block text-muted" data-testid="file-check-notes">
              {check.notes.map((n) => `Note: ${n.replace(/\.$/, "")}.`).join(" ")}
            </span>
          )}
        </p>
      )}
      <SettingsFields id={id} errors={err?.fields} defaults={defaults} />
      {err && !err.fields?.file && (
        <p role="alert" className="text-sm font-medium text-danger">
          {err.message}
        </p>
      )}
      <Button type="submit" disabled={busy || !sample || (check !== null && !check.ok)}>
        {busy ? "Uploading…" : "Upload and process"}
      </Button>
      {!sample && <p className="text-xs text-muted">Choose the sample first.</p>}
    </form>
  );
}

interface Preview {
  matches: { fileName: string; sampleId: string; sampleCode: string; assigned: boolean; pointCount?: number; range?: [number, number]; notes?: string[] }[];
  unmatched: { fileName: string; reason: string; alternatives?: string[] }[];
  problems: { fileName: string; message: string; line?: number }[];
}

function BulkUpload({ projectId, defaults }: { projectId: string; defaults: InstrumentDefaults }) {
  const id = useId();
  const router = useRouter();
  const [files, setFiles] = useState<File[]>([]);
  const [preview, setPreview] = useState<Preview | null>(null);
  const [assign, setAssign] = useState<Record<string, string>>({});
  const [skip, setSkip] = useState(false);
  const [busy, setBusy] = useState(false);
  const [err, setErr] = useState<ApiError | null>(null);
  const [formEl, setFormEl] = useState<HTMLFormElement | null>(null);
  const body = () => {
    const form = new FormData(formEl ?? undefined);
    form.delete("files");
    for (const f of files) form.append("files", f, f.name);
    const a = Object.fromEntries(Object.entries(assign).filter(([, v]) => v.trim()));
    if (Object.keys(a).length) form.set("assignments", JSON.stringify(a));
    if (skip) form.set("skipUnmatched", "true");
    return form;
  };
  const run = async (mode: "preview" | "commit") => {
    setBusy(true);
    setErr(null);
    try {
      if (mode === "preview") setPreview(await fetchJson<Preview>(`/api/projects/${projectId}/scans/bulk?mode=preview`, { method: "POST", body: body() }));
      else {
        await fetchJson(`/api/projects/${projectId}/scans/bulk?mode=commit`, { method: "POST", body: body() });
        router.push(`/projects/${projectId}/scans`);
        return;
      }
    } catch (error) {
      setErr(error instanceof ApiError ? error : new ApiError(0, "error", "Upload failed; check the connection and try again."));
      const p = error instanceof ApiError ? (error.details?.preview as Preview | undefined) : undefined;
      if (p) setPreview(p);
    }
    setBusy(false);
  };
  const canCommit = preview && preview.problems.length === 0 && preview.matches.length > 0 && (preview.unmatched.length === 0 || skip);
  return (
    <form ref={setFormEl} onSubmit={(e) => { e.preventDefault(); void run("preview"); }} className="space-y-4" aria-label="Upload several scans">
      <Field label="Scan files" htmlFor={`${id}-files`} hint="File names must contain the sample code, e.g. APR-000012.xy or apr-000012_bulk.csv">
        <input
          id={`${id}-files`}
          type="file"
          multiple
          accept=".xy,.xye,.csv,.txt,.dat,.cif"
          onChange={(e) => {
            setFiles([...(e.target.files ?? [])]);
            setPreview(null);
            setAssign({});
          }}
          className="block w-full text-sm file:mr-3 file:rounded-md file:border-0 file:bg-brand-light file:px-3 file:py-2 file:text-brand-dark"
        />
      </Field>
      <SettingsFields id={id} errors={err?.fields} defaults={defaults} />
      <Button type="submit" variant="secondary" disabled={busy || files.length === 0}>
        {busy ? "Checking…" : `Check ${files.length || ""} file${files.length === 1 ? "" : "s"}`}
      </Button>
      {preview && (
        <div className="space-y-3" data-testid="bulk-preview">
          <table className="w-full text-sm">
            <caption className="mb-1 text-left font-medium">
              {preview.matches.length} matched · {preview.unmatched.length} unmatched · {preview.problems.length} cannot be read
            </caption>
            <thead className="bg-stone text-left text-xs text-muted">
              <tr>
                <th scope="col" className="px-2 py-1 font-medium">
                  File
                </th>
                <th scope="col" className="px-2 py-1 font-medium">
                  Sample
                </th>
                <th scope="col" className="px-2 py-1 font-medium">
                  Data / problem
                </th>
              </tr>
            </thead>
            <tbody>
              {preview.problems.map((p) => (
                <tr key={p.fileName} className="border-t border-line bg-red-50">
                  <td className="px-2 py-1">{p.fileName}</td>
                  <td className="px-2 py-1">—</td>
                  <td className="px-2 py-1 text-danger">{p.message}</td>
                </tr>
              ))}
              {preview.unmatched.map((u) => (
                <tr key={u.fileName} className="border-t border-line bg-oxide-light/60">
                  <td className="px-2 py-1">{u.fileName}</td>
                  <td className="px-2 py-1">
                    <label className="sr-only" htmlFor={`${id}-as-${u.fileName}`}>
                      Sample code for {u.fileName}
                    </label>
                    <input id={`${id}-as-${u.fileName}`} className={cn(inputClass, "py-1")} placeholder={u.alternatives?.join(" or ") ?? "Sample code"} value={assign[u.fileName] ?? ""} onChange={(e) => setAssign((a) => ({ ...a, [u.fileName]: e.target.value }))} />
                  </td>
                  <td className="px-2 py-1 text-oxide">{u.reason}</td>
                </tr>
              ))}
              {preview.matches.map((m) => (
                <tr key={m.fileName} className="border-t border-line">
                  <td className="px-2 py-1">{m.fileName}</td>
                  <td className="px-2 py-1 font-medium">
                    {m.sampleCode}
                    {m.assigned && <span className="ml-1 text-xs font-normal text-muted">(assigned)</span>}
                  </td>
                  <td className="px-2 py-1 text-muted tabular-nums">
                    {m.pointCount} points{m.range ? `, ${m.range[0]}–${m.range[1]}°` : ""}
                    {m.notes?.length ? ` · ${m.notes.join(" ")}` : ""}
                  </td>
                </tr>
              ))}
            </tbody>
          </table>
          {preview.unmatched.length > 0 && (
            <div className="flex flex-wrap items-center gap-3 text-sm">
              <Button type="button" variant="secondary" disabled={busy} onClick={() => void run("preview")}>
                Check again with these codes
              </Button>
              <label className="flex items-center gap-2">
                <input type="checkbox" checked={skip} onChange={(e) => setSkip(e.target.checked)} /> Skip files that match no sample
              </label>
            </div>
          )}
          <Button type="button" disabled={busy || !canCommit} onClick={() => void run("commit")}>
            Upload {preview.matches.length} file{preview.matches.length === 1 ? "" : "s"} and queue processing
          </Button>
          {preview.problems.length > 0 && <p className="text-xs text-danger">Fix or remove the files that cannot be read; nothing is uploaded while one is bad.</p>}
        </div>
      )}
      {err && (
        <p role="alert" className="text-sm font-medium text-danger">
          {err.message}
        </p>
      )}
    </form>
  );
}

/** Upload one scan to a sample, or several matched to samples by file name (preview, then commit). */
export function ScanUpload({ projectId, initialSample, defaults }: { projectId: string; initialSample: SampleHit | null; defaults: InstrumentDefaults }) {
  const [mode, setMode] = useState<"single" | "bulk">("single");
  const tab = (m: typeof mode, label: string) => (
    <button type="button" role="tab" aria-selected={mode === m} onClick={() => setMode(m)} className={cn("border-b-2 px-3 py-2 text-sm font-medium", mode === m ? "border-oxide text-ink" : "border-transparent text-muted hover:text-ink")}>
      {label}
    </button>
  );
  return (
    <div className="space-y-4">
      <div role="tablist" aria-label="Upload mode" className="flex gap-1 border-b border-line">
        {tab("single", "One file")}
        {tab("bulk", "Several files (matched by name)")}
      </div>
      <div role="tabpanel">{mode === "single" ? <SingleUpload projectId={projectId} initialSample={initialSample} defaults={defaults} /> : <BulkUpload projectId={projectId} defaults={defaults} />}</div>
    </div>
  );
}
