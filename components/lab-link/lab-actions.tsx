"use client";

import { useRouter } from "next/navigation";
import { useState } from "react";
import { Button } from "@/components/ui/button";
import { Field, inputClass } from "@/components/ui/field";
import { ApiError, fetchJson } from "@/lib/client/fetch-json";

export interface LabSample {
  id: string;
  code: string;
  typeLabel: string;
  weightKg: number | null;
  suspectedAsbestos: boolean;
  intakeCondition: string | null;
  canUpload: boolean;
  scans: { originalName: string; status: string }[];
}

const NAME_KEY = "lithodex.lab-link.name";

function useName(): [string, (v: string) => void] {
  const [name, setName] = useState(() => (typeof window === "undefined" ? "" : (window.localStorage.getItem(NAME_KEY) ?? "")));
  return [
    name,
    (v: string) => {
      setName(v);
      try {
        window.localStorage.setItem(NAME_KEY, v);
      } catch {
        // private mode: the name is simply asked again next time
      }
    },
  ];
}

function Problem({ error, fields }: { error: string | null; fields: Record<string, string[]> }) {
  if (!error) return null;
  const extra = Object.entries(fields).flatMap(([k, v]) => v.map((m) => `${k}: ${m}`));
  return (
    <div role="alert" className="rounded-md bg-red-50 px-3 py-2 text-sm text-danger">
      <p>{error}</p>
      {extra.length > 0 && (
        <ul className="mt-1 list-disc pl-5 text-xs">
          {extra.map((m) => (
            <li key={m}>{m}</li>
          ))}
        </ul>
      )}
    </div>
  );
}

/** The outside lab's intake: who records it, the lab's batch number, and the condition of every bag on the manifest. */
export function LabIntakeForm({ token, samples }: { token: string; samples: LabSample[] }) {
  const router = useRouter();
  const [name, setName] = useName();
  const [conditions, setConditions] = useState<Record<string, string>>(() => Object.fromEntries(samples.map((s) => [s.id, "received"])));
  const [pending, setPending] = useState(false);
  const [error, setError] = useState<string | null>(null);
  const [fields, setFields] = useState<Record<string, string[]>>({});
  return (
    <form
      aria-label="Record the intake"
      className="space-y-3"
      onSubmit={async (e) => {
        e.preventDefault();
        const f = new FormData(e.currentTarget);
        setPending(true);
        setError(null);
        setFields({});
        try {
          await fetchJson(`/api/lab/${encodeURIComponent(token)}/receive`, {
            method: "POST",
            json: {
              receivedBy: name,
              labReference: String(f.get("labReference") ?? "").trim() || null,
              location: String(f.get("location") ?? "").trim() || null,
              items: samples.map((s) => ({ sampleId: s.id, condition: conditions[s.id], note: String(f.get(`note-${s.id}`) ?? "").trim() || null })),
            },
          });
          router.refresh();
        } catch (err) {
          if (err instanceof ApiError) {
            setError(err.message);
            setFields(err.fields ?? {});
          } else setError("Could not reach the server. Check the connection and try again.");
        } finally {
          setPending(false);
        }
      }}
    >
      <div className="grid gap-3 sm:grid-cols-3">
        <Field label="Your name" htmlFor="lab-name" error={fields.receivedBy} hint="Recorded with the intake.">
          <input id="lab-name" required value={name} onChange={(e) => setName(e.target.value)} className={inputClass} autoComplete="name" />
        </Field>
        <Field label="Lab batch / job number" htmlFor="labReference" error={fields.labReference}>
          <input id="labReference" name="labReference" className={inputClass} />
        </Field>
        <Field label="Where the bags are" htmlFor="lab-location" error={fields.location}>
          <input id="lab-location" name="location" className={inputClass} placeholder="e.g. Reception, shelf R2" />
        </Field>
      </div>
      <table className="w-full text-sm">
        <thead className="text-left text-xs uppercase tracking-wide text-muted">
          <tr>
            <th className="py-1 pr-3 font-medium">Bag</th>
            <th className="py-1 pr-3 font-medium">Condition</th>
            <th className="py-1 pr-3 font-medium">Note (damage, missing)</th>
          </tr>
        </thead>
        <tbody>
          {samples.map((s) => (
            <tr key={s.id} className="border-t border-line">
              <td className="py-1.5 pr-3 font-mono font-medium">
                {s.code}
                {s.suspectedAsbestos && <span className="ml-2 text-xs font-sans font-semibold text-danger">Suspected asbestos</span>}
                <span className="block font-sans text-xs font-normal text-muted">
                  {s.typeLabel}
                  {s.weightKg != null ? ` · ${s.weightKg} kg` : ""}
                </span>
              </td>
              <td className="py-1.5 pr-3">
                <select aria-label={`Condition of ${s.code}`} value={conditions[s.id]} onChange={(e) => setConditions({ ...conditions, [s.id]: e.target.value })} className={inputClass}>
                  <option value="received">Received in good order</option>
                  <option value="damaged">Damaged</option>
                  <option value="missing">Missing</option>
                </select>
              </td>
              <td className="py-1.5 pr-3">
                <input aria-label={`Note for ${s.code}`} name={`note-${s.id}`} className={inputClass} required={conditions[s.id] === "damaged"} />
              </td>
            </tr>
          ))}
        </tbody>
      </table>
      <Problem error={error} fields={fields} />
      <Button type="submit" disabled={pending}>
        {pending ? "Recording…" : `Record the intake of ${samples.length} bag${samples.length === 1 ? "" : "s"}`}
      </Button>
    </form>
  );
}

const ANODES = ["Cu", "Co", "Fe", "Cr", "Mo", "Ag"];

/** Upload one scan file per sample on the manifest (after the intake). */
export function LabScanUpload({ token, samples }: { token: string; samples: LabSample[] }) {
  const router = useRouter();
  const [name, setName] = useName();
  const [busy, setBusy] = useState<string | null>(null);
  const [done, setDone] = useState<string | null>(null);
  const [error, setError] = useState<string | null>(null);
  const [fields, setFields] = useState<Record<string, string[]>>({});
  const [anode, setAnode] = useState("");
  const open = samples.filter((s) => s.canUpload);
  return (
    <div className="space-y-3">
      <div className="grid gap-3 sm:grid-cols-3">
        <Field label="Your name" htmlFor="lab-upload-name" error={fields.uploadedBy} hint="Recorded with each scan.">
          <input id="lab-upload-name" value={name} onChange={(e) => setName(e.target.value)} className={inputClass} autoComplete="name" />
        </Field>
        <Field label="Anode (when the file does not say)" htmlFor="lab-anode" error={fields.anode}>
          <select id="lab-anode" value={anode} onChange={(e) => setAnode(e.target.value)} className={inputClass}>
            <option value="">Read from the file</option>
            {ANODES.map((a) => (
              <option key={a} value={a}>
                {a} Kα
              </option>
            ))}
          </select>
        </Field>
      </div>
      <ul className="divide-y divide-line rounded-md border border-line">
        {open.map((s) => (
          <li key={s.id} className="flex flex-wrap items-center gap-3 px-3 py-2 text-sm">
            <span className="w-32 font-mono font-medium">{s.code}</span>
            <span className="min-w-40 flex-1 text-muted">{s.scans.length ? s.scans.map((x) => x.originalName).join(", ") : "No scan yet"}</span>
            <label className="text-sm">
              <span className="sr-only">Scan file for {s.code}</span>
              <input
                type="file"
                aria-label={`Scan file for ${s.code}`}
                disabled={busy !== null}
                onChange={async (e) => {
                  const file = e.currentTarget.files?.[0];
                  e.currentTarget.value = "";
                  if (!file) return;
                  setBusy(s.id);
                  setError(null);
                  setFields({});
                  setDone(null);
                  const f = new FormData();
                  f.set("sampleId", s.id);
                  f.set("uploadedBy", name);
                  if (anode) f.set("anode", anode);
                  f.append("file", file, file.name);
                  try {
                    await fetchJson(`/api/lab/${encodeURIComponent(token)}/scans`, { method: "POST", body: f });
                    setDone(`${file.name} uploaded for ${s.code}; the project team reviews the results.`);
                    router.refresh();
                  } catch (err) {
                    if (err instanceof ApiError) {
                      setError(err.message);
                      setFields(err.fields ?? {});
                    } else setError("Could not reach the server. Check the connection and try again.");
                  } finally {
                    setBusy(null);
                  }
                }}
              />
            </label>
            {busy === s.id && <span className="text-muted">Uploading…</span>}
          </li>
        ))}
        {open.length === 0 && <li className="px-3 py-3 text-sm text-muted">No sample can take a scan (missing bags need their late arrival recorded by the project team).</li>}
      </ul>
      {done && (
        <p role="status" className="rounded-md bg-green-50 px-3 py-2 text-sm text-ok">
          {done}
        </p>
      )}
      <Problem error={error} fields={fields} />
    </div>
  );
}
