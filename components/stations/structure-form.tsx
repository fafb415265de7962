"use client";

import { useRouter } from "next/navigation";
import { useState } from "react";
import { useForm, useWatch } from "react-hook-form";
import { Button } from "@/components/ui/button";
import { Field, inputClass } from "@/components/ui/field";
import { ApiError, fetchJson } from "@/lib/client/fetch-json";
import { lazyZodResolver } from "@/lib/client/lazy-resolver";
import { ConflictPanel, type ConflictField } from "./conflict-panel";
import { enqueue, isNetworkFailure, newClientId } from "@/lib/client/offline-save";
import { normalizeAzimuth } from "@/lib/geo/angles";
import { angleLineToPlane, dipDirectionFromStrike, formatAttitude, lineFromRake, poleToPlane } from "@/lib/geo/structure";
import { LINEAR_FEATURES, PLANAR_FEATURES, STRUCTURE_QUALITIES } from "@/lib/vocabulary";
import { asNumber, applyServerErrors } from "./server-errors";
import { FEATURE_LABELS } from "./structure-labels";

export interface PlaneOption {
  id: string;
  feature: string;
  dipDirection: number;
  dip: number;
}

type Convention = "rhr" | "dip_dipdir" | "trend_plunge" | "rake";

interface Values {
  convention: Convention;
  feature: string;
  strike?: number | null;
  dipDirection?: number | null;
  dip?: number | null;
  trend?: number | null;
  plunge?: number | null;
  rake?: number | null;
  planeId?: string | null;
  azimuthRef: "true" | "magnetic";
  declinationDeg?: number | null;
  generation?: string;
  quality?: string | null;
  overturned?: boolean;
  note?: string;
}

const CONVENTIONS: { value: Convention; label: string }[] = [
  { value: "rhr", label: "Plane — strike / dip (right-hand rule)" },
  { value: "dip_dipdir", label: "Plane — dip direction / dip" },
  { value: "trend_plunge", label: "Line — trend / plunge" },
  { value: "rake", label: "Line — rake on a plane" },
];

const KNOWN = ["convention", "feature", "strike", "dipDirection", "dip", "trend", "plunge", "rake", "planeId", "azimuthRef", "declinationDeg", "generation", "quality", "overturned", "note"];
const fin = (v: unknown): v is number => typeof v === "number" && Number.isFinite(v);
const azOk = (v: unknown): v is number => fin(v) && v >= 0 && v <= 360;
const incOk = (v: unknown): v is number => fin(v) && v >= 0 && v <= 90;

/** What the entry means, computed as you type (same formulas the server stores with). */
function preview(v: Partial<Values>, planes: PlaneOption[]): string | null {
  const decl = v.azimuthRef === "magnetic" && fin(v.declinationDeg) ? v.declinationDeg : 0;
  const t = (a: number) => normalizeAzimuth(a + decl);
  if (v.azimuthRef === "magnetic" && v.declinationDeg != null && !(fin(v.declinationDeg) && Math.abs(v.declinationDeg) <= 90)) return null;
  if (v.convention === "rhr" && azOk(v.strike) && incOk(v.dip)) {
    const dd = dipDirectionFromStrike(t(v.strike));
    const pole = poleToPlane({ dipDirection: dd, dip: v.dip });
    return `Dips ${Math.round(v.dip)}° toward ${formatAttitude(dd, 0).slice(0, 3)}° (true) · stored as ${formatAttitude(dd, v.dip)} dip dir./dip · pole ${formatAttitude(pole.trend, pole.plunge)}`;
  }
  if (v.convention === "dip_dipdir" && azOk(v.dipDirection) && incOk(v.dip)) {
    const dd = t(v.dipDirection);
    const pole = poleToPlane({ dipDirection: dd, dip: v.dip });
    return `Strike ${formatAttitude(dd - 90, 0).slice(0, 3)} (RHR) · pole ${formatAttitude(pole.trend, pole.plunge)}`;
  }
  const plane = planes.find((p) => p.id === v.planeId);
  if (v.convention === "rake" && fin(v.rake) && v.rake >= 0 && v.rake <= 180 && plane) {
    const l = lineFromRake(plane, v.rake);
    return `Trend/plunge ${formatAttitude(l.trend, l.plunge)} (plunge ${l.plunge.toFixed(1)}° toward ${l.trend.toFixed(1)}°)`;
  }
  if (v.convention === "trend_plunge" && azOk(v.trend) && incOk(v.plunge)) {
    const line = { trend: t(v.trend), plunge: v.plunge };
    if (!plane) return `${Math.round(v.plunge)}→${formatAttitude(line.trend, 0).slice(0, 3)}`;
    const off = angleLineToPlane(line, plane);
    return off < 10 ? `${off.toFixed(1)}° off its plane — within the 10° allowed.` : `⚠ ${off.toFixed(1)}° off plane ${formatAttitude(plane.dipDirection, plane.dip)}: a line measured on a plane must lie in it (10° allowed).`;
  }
  return null;
}

/** A stored measurement as a structure form fills it in (true north; a rake stays a rake). */
export interface EditableStructure {
  id: string;
  version: number;
  kind: "planar" | "linear";
  feature: string;
  convention: string;
  dipDirection: number | null;
  dip: number | null;
  trend: number | null;
  plunge: number | null;
  rake: number | null;
  planeId: string | null;
  generation: string | null;
  overturned: boolean;
  quality: string | null;
  note: string | null;
}

function editValues(s: EditableStructure): Values {
  const common = { feature: s.feature, azimuthRef: "true" as const, generation: s.generation ?? "", quality: s.quality, overturned: s.overturned, note: s.note ?? "" };
  if (s.kind === "planar") return { ...common, convention: "dip_dipdir", dipDirection: s.dipDirection, dip: s.dip };
  if (s.convention === "rake") return { ...common, convention: "rake", rake: s.rake, planeId: s.planeId };
  return { ...common, convention: "trend_plunge", trend: s.trend, plunge: s.plunge, planeId: s.planeId };
}

const CONFLICT_FIELDS: ConflictField[] = [
  { key: "feature", label: "Feature" },
  { key: "dipDirection", label: "Dip direction" },
  { key: "dip", label: "Dip" },
  { key: "trend", label: "Trend" },
  { key: "plunge", label: "Plunge" },
  { key: "rake", label: "Rake" },
  { key: "generation", label: "Generation" },
  { key: "quality", label: "Quality" },
  { key: "note", label: "Note" },
];

/** The server's schema, loaded on the first check (not with the page). */
const resolver = lazyZodResolver<Values>(() => import("@/lib/validation/structure").then((m) => m.structureCreateSchema));

/**
 * Adds a structural measurement to a station (same zod schema as the server), or re-enters one (`edit`): an edit
 * carries the version it was made against; without a connection it waits in the outbox; a newer version on the
 * server is shown side by side (keep mine / take theirs).
 */
export function StructureForm({ projectId, stationId, planes, edit, onDone }: { projectId: string; stationId: string; planes: PlaneOption[]; edit?: EditableStructure; onDone?: () => void }) {
  const router = useRouter();
  const px = edit ? "se" : "sf";
  const [general, setGeneral] = useState<string[]>([]);
  const [saved, setSaved] = useState<string | null>(null);
  const [version, setVersion] = useState(edit?.version ?? 1);
  const [conflict, setConflict] = useState<EditableStructure | null>(null);
  const { register, handleSubmit, control, setError, reset, formState, getValues, setValue } = useForm<Values>({
    resolver,
    defaultValues: edit ? editValues(edit) : { convention: "rhr", feature: "bedding", azimuthRef: "true" },
    shouldUnregister: true,
  });
  const v = useWatch({ control }) as Partial<Values>;
  const errors = formState.errors;
  const err = (k: keyof Values) => errors[k]?.message as string | undefined;
  const isPlane = v.convention === "rhr" || v.convention === "dip_dipdir";
  const features = isPlane ? PLANAR_FEATURES : LINEAR_FEATURES;
  const num = (name: keyof Values, label: string, hint?: string) => (
    <Field label={label} htmlFor={`${px}-${name}`} error={err(name)} hint={hint}>
      <input id={`${px}-${name}`} type="number" step="any" inputMode="decimal" className={inputClass} {...register(name, { setValueAs: asNumber })} aria-invalid={err(name) ? true : undefined} />
    </Field>
  );

  const onSubmit = handleSubmit(
    async (values) => {
    if (edit) return saveEdit(values, version);
    setGeneral([]);
    setSaved(null);
    const body: Record<string, unknown> = { ...values };
    for (const [k, val] of Object.entries(body)) if (val === "" || val === undefined) delete body[k];
    if (body.azimuthRef === "true") delete body.declinationDeg;
    // A client id and key make the create replay-safe; without a connection it waits in the outbox (lib/client/outbox.ts).
    const id = newClientId();
    body.id = id;
    const url = `/api/projects/${projectId}/stations/${stationId}/structures`;
    try {
      const row = await fetchJson<{ feature: string }>(url, { method: "POST", json: body, headers: { "idempotency-key": id } });
      setSaved(`Saved ${FEATURE_LABELS[row.feature] ?? row.feature}.`);
      reset({ convention: values.convention, feature: values.feature, azimuthRef: values.azimuthRef, declinationDeg: values.declinationDeg });
      router.refresh();
    } catch (e) {
      if (!(e instanceof ApiError) && isNetworkFailure(e)) {
        const label = FEATURE_LABELS[values.feature] ?? values.feature;
        await enqueue({ projectId, kind: "structure", action: "create", recordId: id, opId: id, url, label: `New measurement (${label})`, body });
        setSaved(`No connection: the ${label.toLowerCase()} measurement is saved on this device and will be sent when you are back online (see Sync).`);
        reset({ convention: values.convention, feature: values.feature, azimuthRef: values.azimuthRef, declinationDeg: values.declinationDeg });
        return;
      }
      setGeneral(applyServerErrors(e, setError, KNOWN));
    }
    },
    () => setSaved(null),
  );

  async function saveEdit(values: Values, against: number) {
    setGeneral([]);
    setSaved(null);
    const body: Record<string, unknown> = { ...values, version: against };
    for (const [k, val] of Object.entries(body)) if (val === "" || val === undefined) delete body[k];
    if (body.azimuthRef === "true") delete body.declinationDeg;
    const url = `/api/projects/${projectId}/stations/${stationId}/structures/${edit!.id}`;
    try {
      await fetchJson(url, { method: "PATCH", json: body });
      onDone?.();
      router.refresh();
    } catch (e) {
      if (!(e instanceof ApiError) && isNetworkFailure(e)) {
        const label = FEATURE_LABELS[values.feature] ?? values.feature;
        await enqueue({ projectId, kind: "structure", action: "update", recordId: edit!.id, url, label: `Edit of ${label.toLowerCase()} measurement`, body });
        setSaved("No connection: the edit is saved on this device and will be sent when you are back online (see Sync).");
        return;
      }
      if (e instanceof ApiError && e.status === 409 && e.details?.current) {
        setConflict(e.details.current as EditableStructure);
        return;
      }
      setGeneral(applyServerErrors(e, setError, KNOWN));
    }
  }

  const hint = preview(v, planes);
  return (
    <form onSubmit={onSubmit} noValidate className="space-y-3" aria-label={edit ? "Edit a structural measurement" : "Add a structural measurement"}>
      <div className="grid gap-3 sm:grid-cols-2">
        <Field label="Measurement" htmlFor={`${px}-convention`} error={err("convention")}>
          <select
            id={`${px}-convention`}
            className={inputClass}
            {...register("convention", {
              onChange: (e: React.ChangeEvent<HTMLSelectElement>) => {
                const plane = e.target.value === "rhr" || e.target.value === "dip_dipdir";
                if (!(plane ? (PLANAR_FEATURES as readonly string[]) : (LINEAR_FEATURES as readonly string[])).includes(getValues("feature"))) setValue("feature", plane ? "bedding" : "lineation");
              },
            })}
          >
            {CONVENTIONS.map((c) => (
              <option key={c.value} value={c.value} disabled={c.value === "rake" && planes.length === 0}>
                {c.label}
              </option>
            ))}
          </select>
        </Field>
        <Field label="Feature" htmlFor={`${px}-feature`} error={err("feature")}>
          {/* Registered so the value (also a stored one being edited) stays in the form with shouldUnregister. */}
          <input type="hidden" {...register("feature")} />
          <select id={`${px}-feature`} name="feature" className={inputClass} value={v.feature ?? ""} onChange={(e) => setValue("feature", e.target.value, { shouldValidate: formState.isSubmitted })}>
            {features.map((f) => (
              <option key={f} value={f}>
                {FEATURE_LABELS[f]}
              </option>
            ))}
          </select>
        </Field>
      </div>
      <div className="grid gap-3 sm:grid-cols-3">
        {v.convention === "rhr" && (
          <>
            {num("strike", "Strike (°)", "Right-hand rule: dips to your right.")}
            {num("dip", "Dip (°)", "0–90")}
          </>
        )}
        {v.convention === "dip_dipdir" && (
          <>
            {num("dipDirection", "Dip direction (°)", "0–360")}
            {num("dip", "Dip (°)", "0–90")}
          </>
        )}
        {v.convention === "trend_plunge" && (
          <>
            {num("trend", "Trend (°)", "Azimuth of the down-plunge direction")}
            {num("plunge", "Plunge (°)", "0–90")}
          </>
        )}
        {v.convention === "rake" && num("rake", "Rake (°)", "0–180 from the plane's RHR strike")}
        {(v.convention === "rake" || v.convention === "trend_plunge") && (
          <Field label={v.convention === "rake" ? "On plane" : "On plane (optional)"} htmlFor={`${px}-plane`} error={err("planeId")}>
            <select id={`${px}-plane`} className={inputClass} {...register("planeId", { setValueAs: (x: string) => x || null })}>
              <option value="">{v.convention === "rake" ? "Choose a plane…" : "— not measured on a plane"}</option>
              {planes.map((p) => (
                <option key={p.id} value={p.id}>
                  {FEATURE_LABELS[p.feature] ?? p.feature} {formatAttitude(p.dipDirection, p.dip)}
                </option>
              ))}
            </select>
          </Field>
        )}
      </div>
      {v.convention !== "rake" && (
        <div className="grid gap-3 sm:grid-cols-3">
          <Field label="Azimuth read from" htmlFor={`${px}-ref`} error={err("azimuthRef")}>
            <select id={`${px}-ref`} className={inputClass} {...register("azimuthRef")}>
              <option value="true">True north (compass corrected)</option>
              <option value="magnetic">Magnetic north</option>
            </select>
          </Field>
          {v.azimuthRef === "magnetic" && num("declinationDeg", "Declination (°, east +)", "True = magnetic + declination")}
        </div>
      )}
      <div className="grid gap-3 sm:grid-cols-3">
        <Field label="Generation" htmlFor={`${px}-gen`} error={err("generation")} hint="e.g. S0, S1, L2">
          <input id={`${px}-gen`} className={inputClass} {...register("generation")} />
        </Field>
        <Field label="Quality" htmlFor={`${px}-q`} error={err("quality")}>
          <select id={`${px}-q`} className={inputClass} {...register("quality", { setValueAs: (x: string) => x || null })}>
            <option value="">—</option>
            {STRUCTURE_QUALITIES.map((q) => (
              <option key={q} value={q}>
                {q}
              </option>
            ))}
          </select>
        </Field>
        {isPlane && (
          <label className="flex items-center gap-2 self-end pb-2 text-sm">
            <input type="checkbox" {...register("overturned")} /> Overturned
          </label>
        )}
      </div>
      <Field label="Note" htmlFor={`${px}-note`} error={err("note")}>
        <input id={`${px}-note`} className={inputClass} {...register("note")} />
      </Field>
      {hint && (
        <p className="text-sm text-ink" aria-live="polite" data-testid="structure-preview">
          {hint}
        </p>
      )}
      {general.length > 0 && (
        <div role="alert" className="rounded-md border border-danger/30 bg-red-50 p-3 text-sm text-danger">
          {general.map((g) => (
            <p key={g}>{g}</p>
          ))}
        </div>
      )}
      {saved && (
        <p role="status" className="text-sm text-ok">
          {saved}
        </p>
      )}
      {conflict && (
        <ConflictPanel
          fields={CONFLICT_FIELDS}
          mine={getValues() as unknown as Record<string, unknown>}
          theirs={conflict as unknown as Record<string, unknown>}
          onKeepMine={async () => {
            const v2 = conflict.version;
            setConflict(null);
            setVersion(v2);
            await saveEdit(getValues(), v2);
          }}
          onTakeTheirs={() => {
            reset(editValues(conflict));
            setVersion(conflict.version);
            setConflict(null);
          }}
        />
      )}
      <div className="flex flex-wrap gap-2">
        <Button type="submit" disabled={formState.isSubmitting}>
          {formState.isSubmitting ? "Saving…" : edit ? "Save measurement" : "Add measurement"}
        </Button>
        {edit && onDone && (
          <Button type="button" variant="secondary" onClick={onDone}>
            Cancel
          </Button>
        )}
      </div>
    </form>
  );
}
