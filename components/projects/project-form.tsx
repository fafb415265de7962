"use client";

import { useRouter } from "next/navigation";
import { useState } from "react";
import { Button } from "@/components/ui/button";
import { Field, inputClass } from "@/components/ui/field";
import { ApiError, fetchJson } from "@/lib/client/fetch-json";

export interface ProjectValues {
  id?: string;
  code: string;
  name: string;
  region: string | null;
  description: string | null;
  timeZone: string | null;
  labEmail: string | null;
  labAddress: string | null;
  labInHouse: boolean;
  defaultAnode: string | null;
  defaultInstrument: string | null;
  sampleCodePattern: string | null;
  version?: number;
}

const ANODES = ["Cu", "Co", "Fe", "Cr", "Mo", "Ag"];

function zones(): string[] {
  try {
    return (Intl as unknown as { supportedValuesOf(k: string): string[] }).supportedValuesOf("timeZone");
  } catch {
    return [];
  }
}

/** Create a project (site admin) or edit its settings (lead). Server errors land on their fields. */
export function ProjectForm({ project, codeLocked }: { project?: ProjectValues; codeLocked?: boolean }) {
  const router = useRouter();
  const creating = !project?.id;
  const [pending, setPending] = useState(false);
  const [error, setError] = useState<string | null>(null);
  const [fields, setFields] = useState<Record<string, string[]>>({});
  const [saved, setSaved] = useState<string | null>(null);
  const v = project;
  const allZones = zones();
  return (
    <form
      aria-label={creating ? "New project" : "Project settings"}
      className="space-y-4"
      onSubmit={async (e) => {
        e.preventDefault();
        const f = new FormData(e.currentTarget);
        const text = (k: string) => String(f.get(k) ?? "").trim() || null;
        const body: Record<string, unknown> = {
          name: String(f.get("name") ?? ""),
          code: String(f.get("code") ?? ""),
          region: text("region"),
          description: text("description"),
          timeZone: text("timeZone"),
          labEmail: text("labEmail"),
          labAddress: text("labAddress"),
          labInHouse: f.get("labInHouse") === "on",
          defaultAnode: text("defaultAnode"),
          defaultInstrument: text("defaultInstrument"),
          sampleCodePattern: text("sampleCodePattern"),
        };
        if (!creating) {
          body.version = v!.version;
          if (codeLocked) delete body.code;
        }
        setPending(true);
        setError(null);
        setFields({});
        setSaved(null);
        try {
          if (creating) {
            const row = await fetchJson<{ id: string }>("/api/projects", { method: "POST", json: body });
            router.push(`/projects/${row.id}`);
          } else {
            await fetchJson(`/api/projects/${v!.id}`, { method: "PATCH", json: body });
            setSaved("Settings saved.");
            router.refresh();
          }
        } catch (err) {
          if (err instanceof ApiError) {
            setError(err.status === 409 && err.details?.current ? `${err.message} Reload the page to see them.` : err.message);
            setFields(err.fields ?? (typeof err.details?.field === "string" ? { [err.details.field as string]: [err.message] } : {}));
          } else setError("Could not reach the server. Check the connection and try again.");
        } finally {
          setPending(false);
        }
      }}
    >
      <section className="grid gap-3 sm:grid-cols-2">
        <Field label="Name" htmlFor="p-name" error={fields.name}>
          <input id="p-name" name="name" required defaultValue={v?.name ?? ""} className={inputClass} />
        </Field>
        <Field label="Code" htmlFor="p-code" error={fields.code} hint={codeLocked ? "Fixed: it prefixes the sample codes already issued." : "2–8 capital letters or digits; it prefixes sample codes (e.g. APR → APR-000001)."}>
          <input id="p-code" name="code" required defaultValue={v?.code ?? ""} disabled={codeLocked} className={`${inputClass} disabled:bg-stone disabled:text-muted`} style={{ textTransform: "uppercase" }} />
        </Field>
        <Field label="Region" htmlFor="p-region" error={fields.region}>
          <input id="p-region" name="region" defaultValue={v?.region ?? ""} className={inputClass} />
        </Field>
        <Field label="Time zone for dates" htmlFor="p-zone" error={fields.timeZone} hint="Pages and exports show local dates in this zone; files also carry ISO 8601 times in UTC.">
          <input id="p-zone" name="timeZone" list="p-zones" defaultValue={v?.timeZone ?? ""} placeholder="UTC" className={inputClass} />
          <datalist id="p-zones">
            {allZones.map((z) => (
              <option key={z} value={z} />
            ))}
          </datalist>
        </Field>
        <Field label="Description" htmlFor="p-desc" error={fields.description} className="sm:col-span-2">
          <textarea id="p-desc" name="description" rows={3} defaultValue={v?.description ?? ""} className={inputClass} />
        </Field>
      </section>
      <section className="grid gap-3 sm:grid-cols-2">
        <h2 className="font-semibold sm:col-span-2">Lab</h2>
        <Field label="Lab e-mail" htmlFor="p-lab-email" error={fields.labEmail} hint="Submissions are e-mailed here. An outside lab gets a link that needs no account.">
          <input id="p-lab-email" name="labEmail" type="email" defaultValue={v?.labEmail ?? ""} className={inputClass} />
        </Field>
        <Field label="Lab address" htmlFor="p-lab-address" error={fields.labAddress} hint="Printed on the manifest.">
          <textarea id="p-lab-address" name="labAddress" rows={2} defaultValue={v?.labAddress ?? ""} className={inputClass} />
        </Field>
        <label className="flex items-start gap-2 text-sm sm:col-span-2">
          <input type="checkbox" name="labInHouse" defaultChecked={v?.labInHouse ?? false} className="mt-1" />
          <span>
            The lab is in-house: its analysts may take a sample without a submission by recording “received directly” (who and why). Otherwise scans need a recorded intake.
          </span>
        </label>
      </section>
      <section className="grid gap-3 sm:grid-cols-3">
        <h2 className="font-semibold sm:col-span-3">Scans and sample codes</h2>
        <Field label="Default anode" htmlFor="p-anode" error={fields.defaultAnode}>
          <select id="p-anode" name="defaultAnode" defaultValue={v?.defaultAnode ?? ""} className={inputClass}>
            <option value="">None (ask each time)</option>
            {ANODES.map((a) => (
              <option key={a} value={a}>
                {a}
              </option>
            ))}
          </select>
        </Field>
        <Field label="Default instrument" htmlFor="p-instrument" error={fields.defaultInstrument}>
          <input id="p-instrument" name="defaultInstrument" defaultValue={v?.defaultInstrument ?? ""} className={inputClass} />
        </Field>
        <Field label="Sample code pattern" htmlFor="p-pattern" error={fields.sampleCodePattern} hint="{code} project code, {yyyy} year, {seq:6} sequence. Empty: {code}-{seq:6}.">
          <input id="p-pattern" name="sampleCodePattern" defaultValue={v?.sampleCodePattern ?? ""} placeholder="{code}-{seq:6}" className={inputClass} />
        </Field>
      </section>
      {error && (
        <p role="alert" className="rounded-md bg-red-50 px-3 py-2 text-sm text-danger">
          {error}
        </p>
      )}
      {saved && (
        <p role="status" className="rounded-md bg-green-50 px-3 py-2 text-sm text-ok">
          {saved}
        </p>
      )}
      <Button type="submit" disabled={pending}>
        {pending ? "Saving…" : creating ? "Create project" : "Save settings"}
      </Button>
    </form>
  );
}

/** Archive (read-only) or bring back a project. */
export function ArchiveButton({ projectId, archived }: { projectId: string; archived: boolean }) {
  const router = useRouter();
  const [pending, setPending] = useState(false);
  const [error, setError] = useState<string | null>(null);
  return (
    <div className="space-y-2">
      <Button
        type="button"
        variant={archived ? "secondary" : "danger"}
        disabled={pending}
        onClick={async () => {
          if (!archived && !window.confirm("Archive this project? It becomes read-only for everyone until a lead brings it back.")) return;
          setPending(true);
          setError(null);
          try {
            await fetchJson(`/api/projects/${projectId}/archive`, { method: "POST", json: { archived: !archived } });
            router.refresh();
          } catch (err) {
            setError(err instanceof ApiError ? err.message : "Could not reach the server.");
          } finally {
            setPending(false);
          }
        }}
      >
        {archived ? "Bring the project back (unarchive)" : "Archive the project"}
      </Button>
      {error && (
        <p role="alert" className="text-sm text-danger">
          {error}
        </p>
      )}
    </div>
  );
}
