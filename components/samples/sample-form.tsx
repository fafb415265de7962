"use client";

import Link from "next/link";
import { useRouter } from "next/navigation";
import { useMemo, useState } from "react";
import { useForm, useWatch, type Resolver } from "react-hook-form";
import { ConflictPanel, type ConflictField } from "@/components/stations/conflict-panel";
import { LocationFields, type LocationValue } from "@/components/stations/location-fields";
import { applyServerErrors, asNumber } from "@/components/stations/server-errors";
import { useDeviceZone } from "@/components/stations/use-device-zone";
import { Button, buttonClass } from "@/components/ui/button";
import { Field, inputClass } from "@/components/ui/field";
import { ApiError, fetchJson } from "@/lib/client/fetch-json";
import { lazyZodResolver } from "@/lib/client/lazy-resolver";
import { enqueue, isNetworkFailure, newClientId, reservedCodeForOfflineSample } from "@/lib/client/offline-save";
import { SAMPLE_TYPE_LABELS } from "@/lib/format";
import { utcToZonedLocal, zonedLocalToUtc } from "@/lib/geo/zoned-time";
import { emptySampleDetails } from "@/lib/sample-details";
import type { SampleDetails } from "@/lib/validation/sample-details";
import { SAMPLE_TYPES, type SampleType } from "@/lib/vocabulary";
import { FieldTermLists } from "./field-terms";
import { SampleTypeDetails } from "./sample-type-details";
import { useNextSampleCode } from "./use-next-sample-code";

/** What the sample form edits (the API's sample fields, less status and bookkeeping). */
export interface SampleFormValues extends LocationValue {
  code?: string;
  igsn: string | null;
  stationId: string | null;
  sampleType: SampleType;
  typeDetails: SampleDetails | null;
  lithology: string | null;
  alteration: string | null;
  alterationIntensity: "none" | "weak" | "moderate" | "strong" | "intense" | null;
  description: string | null;
  collectedAt: string | null;
  collectedTz: string | null;
  collectorName: string | null;
  storageLocation: string | null;
  suspectedAsbestos: boolean;
  weightKg: number | null;
  status?: "planned" | "collected";
  version?: number;
}

export interface SampleRecord extends Omit<SampleFormValues, "status"> {
  id: string;
  code: string;
  version: number;
  status: string;
}

export interface StationChoice {
  id: string;
  code: string;
  name: string | null;
  lat: number;
  lon: number;
}

const INTENSITIES = ["none", "weak", "moderate", "strong", "intense"] as const;
const KNOWN = [
  "code", "igsn", "stationId", "sampleType", "typeDetails", "lithology", "alteration", "alterationIntensity", "description", "collectedAt", "collectedTz",
  "collectorName", "lat", "lon", "elevationM", "elevationRef", "horizontalAccuracyM", "locationSource", "locationFixedAt", "storageLocation", "suspectedAsbestos", "weightKg", "status",
];

const CONFLICT_FIELDS: ConflictField[] = [
  { key: "code", label: "Code" },
  { key: "sampleType", label: "Type" },
  { key: "typeDetails", label: "Type details" },
  { key: "stationId", label: "Station" },
  { key: "lithology", label: "Lithology" },
  { key: "alteration", label: "Alteration" },
  { key: "alterationIntensity", label: "Intensity" },
  { key: "description", label: "Description" },
  { key: "collectedAt", label: "Collected (UTC)" },
  { key: "collectorName", label: "Collector" },
  { key: "lat", label: "Latitude" },
  { key: "lon", label: "Longitude" },
  { key: "elevationM", label: "Elevation (m)" },
  { key: "horizontalAccuracyM", label: "Accuracy (m)" },
  { key: "storageLocation", label: "Storage" },
  { key: "suspectedAsbestos", label: "Suspected asbestos" },
  { key: "weightKg", label: "Weight (kg)" },
  { key: "igsn", label: "IGSN" },
];

const blank = (v: unknown) => v === null || v === undefined || v === "";

/** Details with nothing filled in become null (except drill core on create: hole ID and depths are its key). */
function normalizeDetails(d: SampleDetails | null, type: SampleType, creating: boolean): SampleDetails | null {
  if (!d || d.kind !== type) return creating && type === "core" ? emptySampleDetails(type) : null;
  const filled = Object.entries(d).some(([k, v]) => k !== "kind" && k !== "inSitu" && !blank(v));
  if (!filled) return creating && type === "core" ? d : type === "float" ? d : null;
  return d;
}

function toForm(s: SampleRecord | undefined, defaults: Partial<SampleFormValues>): SampleFormValues {
  const type = s?.sampleType ?? defaults.sampleType ?? "hand_sample";
  return {
    code: s?.code,
    igsn: s?.igsn ?? null,
    stationId: s?.stationId ?? defaults.stationId ?? null,
    sampleType: type,
    typeDetails: s?.typeDetails ?? emptySampleDetails(type),
    lithology: s?.lithology ?? null,
    alteration: s?.alteration ?? null,
    alterationIntensity: s?.alterationIntensity ?? null,
    description: s?.description ?? null,
    collectedAt: s?.collectedAt ?? null,
    collectedTz: s?.collectedTz ?? defaults.collectedTz ?? null,
    collectorName: s?.collectorName ?? defaults.collectorName ?? null,
    lat: s?.lat ?? null,
    lon: s?.lon ?? null,
    elevationM: s?.elevationM ?? null,
    elevationRef: s?.elevationRef ?? "msl",
    horizontalAccuracyM: s?.horizontalAccuracyM ?? null,
    locationSource: s?.locationSource ?? null,
    locationFixedAt: s?.locationFixedAt ?? null,
    storageLocation: s?.storageLocation ?? null,
    suspectedAsbestos: s?.suspectedAsbestos ?? false,
    weightKg: s?.weightKg ?? null,
    status: s ? undefined : "collected",
    version: s?.version,
  };
}

/** Form values → the API body (the same shape the shared zod schema checks). */
function toBody(v: SampleFormValues, creating: boolean): Record<string, unknown> {
  const body: Record<string, unknown> = { ...v, typeDetails: normalizeDetails(v.typeDetails, v.sampleType, creating) };
  if (!body.code) delete body.code;
  // The status is never sent: a new sample is registered as collected (a collection event) unless planned.
  if (creating && body.status === "planned") body.planned = true;
  delete body.status;
  for (const k of ["igsn", "lithology", "alteration", "description", "collectorName", "storageLocation"]) if (typeof body[k] === "string" && !(body[k] as string).trim()) body[k] = null;
  if (body.elevationM == null) body.elevationRef = null;
  for (const [k, val] of Object.entries(body)) if (val === undefined) delete body[k];
  return body;
}

function zones(): string[] {
  try {
    return (Intl as unknown as { supportedValuesOf(k: string): string[] }).supportedValuesOf("timeZone");
  } catch {
    return ["UTC", "Europe/Madrid"];
  }
}

/**
 * Create or edit a sample with the server's own zod schema. A code left empty is issued by the server (offline:
 * the device's next reserved code, shown before saving); server field errors land on the fields; a stale edit
 * shows "changed by someone else" with both versions and keeps what was typed.
 */
export function SampleForm({
  projectId,
  sample,
  stations,
  userId,
  defaults = {},
}: {
  projectId: string;
  sample?: SampleRecord;
  stations: StationChoice[];
  /** The signed-in account, for the device's reserved codes shown offline (new samples only). */
  userId?: string;
  defaults?: Partial<SampleFormValues>;
}) {
  const router = useRouter();
  const creating = !sample;
  const codePreview = useNextSampleCode(projectId, creating ? userId : undefined);
  const resolver = useMemo<Resolver<SampleFormValues>>(
    () =>
      lazyZodResolver(
        () => import("@/lib/validation/sample").then((m) => (creating ? m.sampleCreateSchema : m.samplePatchSchema)),
        (values) => toBody(values, creating),
      ),
    [creating],
  );
  const browserZone = useDeviceZone();
  const initial = toForm(sample, defaults);
  const { register, handleSubmit, setValue, control, setError, getValues, reset, formState } = useForm<SampleFormValues>({ resolver, defaultValues: initial });
  const [general, setGeneral] = useState<string[]>([]);
  const [conflict, setConflict] = useState<SampleRecord | null>(null);
  const [clientId] = useState(newClientId);
  const [collectedLocal, setCollectedLocal] = useState(initial.collectedAt ? (utcToZonedLocal(initial.collectedAt, initial.collectedTz || "UTC") ?? "") : "");
  const allZones = useMemo(() => zones(), []);
  const w = useWatch({ control });
  const errors = formState.errors;
  const err = (k: keyof SampleFormValues) => (errors[k] as { message?: string } | undefined)?.message;
  const type = (w.sampleType ?? "hand_sample") as SampleType;
  const station = stations.find((s) => s.id === w.stationId);
  const location: LocationValue = {
    lat: w.lat ?? null,
    lon: w.lon ?? null,
    elevationM: w.elevationM ?? null,
    elevationRef: w.elevationRef ?? null,
    horizontalAccuracyM: w.horizontalAccuracyM ?? null,
    locationSource: w.locationSource ?? null,
    locationFixedAt: w.locationFixedAt ?? null,
  };
  const set = (k: keyof SampleFormValues, v: unknown) => setValue(k, v as never, { shouldDirty: true, shouldValidate: formState.isSubmitted });

  function setCollected(local: string, tz: string | null) {
    setCollectedLocal(local);
    set("collectedTz", tz);
    set("collectedAt", local && tz ? zonedLocalToUtc(local, tz) : null);
  }

  async function save(values: SampleFormValues, version?: number) {
    setGeneral([]);
    const body = toBody(values, creating);
    // A create carries its client id and key, so a send whose answer was lost can be replayed (lib/client/outbox.ts).
    const json: Record<string, unknown> = creating ? { ...body, id: clientId } : { ...body, version: version ?? values.version };
    // Known to be offline and no code typed: the next code reserved for this device (provisional until synced).
    const reserved = creating && !json.code && !navigator.onLine ? await reservedCodeForOfflineSample(projectId) : null;
    if (reserved) json.code = reserved.code;
    try {
      const saved = creating
        ? await fetchJson<SampleRecord>(`/api/projects/${projectId}/samples`, { method: "POST", json, headers: { "idempotency-key": clientId } })
        : await fetchJson<SampleRecord>(`/api/projects/${projectId}/samples/${sample!.id}`, { method: "PATCH", json });
      router.push(`/projects/${projectId}/samples/${saved.id}`);
      router.refresh();
    } catch (e) {
      if (!(e instanceof ApiError) && isNetworkFailure(e)) {
        const tag = reserved ? `code ${reserved.code}, provisional until synced` : typeof json.code === "string" && json.code ? `tag ${json.code}` : "code issued on sync";
        await enqueue({
          projectId,
          kind: "sample",
          action: creating ? "create" : "update",
          recordId: creating ? clientId : sample!.id,
          label: creating ? `New sample (${tag})` : `Edit of ${sample!.code}`,
          body: json,
          ...(creating && { opId: clientId }),
          ...(reserved && { headers: reserved.headers }),
        });
        router.push(`/projects/${projectId}/sync`);
        return;
      }
      if (e instanceof ApiError && e.status === 409 && e.details?.current) {
        setConflict(e.details.current as SampleRecord);
        return;
      }
      setGeneral(applyServerErrors(e, setError, KNOWN));
    }
  }

  const stationLabel = (id: unknown) => stations.find((s) => s.id === id)?.code ?? (id ? String(id) : "—");
  const conflictFields = CONFLICT_FIELDS.map((f) => (f.key === "stationId" ? { ...f, format: stationLabel } : f));

  return (
    <form onSubmit={handleSubmit((v) => save(v))} noValidate className="space-y-6" aria-label={creating ? "New sample" : "Edit sample"}>
      <FieldTermLists />
      {conflict && (
        <ConflictPanel
          fields={conflictFields}
          mine={toBody(getValues(), false)}
          theirs={conflict as unknown as Record<string, unknown>}
          busy={formState.isSubmitting}
          onKeepMine={async () => {
            const v = conflict.version;
            setConflict(null);
            setValue("version", v);
            await handleSubmit((values) => save(values, v))();
          }}
          onTakeTheirs={() => {
            const next = toForm(conflict, {});
            reset(next);
            setCollectedLocal(next.collectedAt ? (utcToZonedLocal(next.collectedAt, next.collectedTz || "UTC") ?? "") : "");
            setConflict(null);
          }}
        />
      )}

      <section className="space-y-3" aria-labelledby="sf-id">
        <h2 id="sf-id" className="text-sm font-semibold">
          Identity
        </h2>
        <div className="grid gap-3 sm:grid-cols-3">
          <Field
            label="Sample code"
            htmlFor="sf-code"
            error={err("code")}
            hint={creating ? codePreview.hint : "Unique in the project."}
          >
            <input
              id="sf-code"
              className={inputClass}
              placeholder={creating ? codePreview.placeholder : undefined}
              autoCapitalize="characters"
              aria-invalid={err("code") ? true : undefined}
              {...register("code", { setValueAs: (v: string) => (v?.trim() ? v.trim().toUpperCase() : undefined) })}
            />
          </Field>
          <Field label="Sample type *" htmlFor="sf-type" error={err("sampleType")}>
            <select
              id="sf-type"
              className={inputClass}
              {...register("sampleType", { onChange: (e: React.ChangeEvent<HTMLSelectElement>) => set("typeDetails", emptySampleDetails(e.target.value as SampleType)) })}
            >
              {SAMPLE_TYPES.map((t) => (
                <option key={t} value={t}>
                  {SAMPLE_TYPE_LABELS[t]}
                </option>
              ))}
            </select>
          </Field>
          <Field label="Station" htmlFor="sf-station" error={err("stationId")}>
            <select id="sf-station" className={inputClass} {...register("stationId", { setValueAs: (v: string) => v || null })}>
              <option value="">— none —</option>
              {stations.map((s) => (
                <option key={s.id} value={s.id}>
                  {s.code}
                  {s.name ? ` — ${s.name}` : ""}
                </option>
              ))}
            </select>
          </Field>
        </div>
        {creating && (
          <div className="flex flex-wrap gap-4 text-sm">
            <span className="text-muted">Status:</span>
            <label className="flex items-center gap-1">
              <input type="radio" value="collected" {...register("status")} /> collected
            </label>
            <label className="flex items-center gap-1">
              <input type="radio" value="planned" {...register("status")} /> planned (not yet taken)
            </label>
          </div>
        )}
      </section>

      <section className="space-y-3 rounded-md border border-line bg-stone/50 p-3" aria-labelledby="sf-details">
        <h2 id="sf-details" className="text-sm font-semibold">
          {SAMPLE_TYPE_LABELS[type]} details
        </h2>
        <SampleTypeDetails type={type} register={register} errors={errors} />
        {err("typeDetails") && (
          <p role="alert" className="text-xs text-danger">
            {err("typeDetails")}
          </p>
        )}
      </section>

      <section className="space-y-3" aria-labelledby="sf-desc">
        <h2 id="sf-desc" className="text-sm font-semibold">
          Description
        </h2>
        <div className="grid gap-3 sm:grid-cols-3">
          <Field label="Lithology" htmlFor="sf-lith" error={err("lithology")}>
            <input id="sf-lith" list="lithology-terms" className={inputClass} {...register("lithology")} />
          </Field>
          <Field label="Alteration" htmlFor="sf-alt" error={err("alteration")}>
            <input id="sf-alt" list="alteration-terms" className={inputClass} {...register("alteration")} />
          </Field>
          <Field label="Alteration intensity" htmlFor="sf-int" error={err("alterationIntensity")}>
            <select id="sf-int" className={inputClass} {...register("alterationIntensity", { setValueAs: (v: string) => v || null })}>
              <option value="">—</option>
              {INTENSITIES.map((i) => (
                <option key={i} value={i}>
                  {i}
                </option>
              ))}
            </select>
          </Field>
        </div>
        <Field label="Description" htmlFor="sf-description" error={err("description")} hint="Grain size, colour, texture, mineralization (minerals with %), veins, weathering.">
          <textarea id="sf-description" rows={3} className={inputClass} {...register("description")} />
        </Field>
      </section>

      <section className="space-y-3" aria-labelledby="sf-hazard">
        <h2 id="sf-hazard" className="sr-only">
          Hazard
        </h2>
        <label className="flex items-start gap-2 text-sm">
          <input type="checkbox" className="mt-1" {...register("suspectedAsbestos")} data-testid="suspected-asbestos" />
          <span>
            <span className="font-medium">Suspected asbestos</span> — fibrous serpentine or amphibole seen or likely at this site.
          </span>
        </label>
        {w.suspectedAsbestos && (
          <p className="rounded-md border border-danger/30 bg-red-50 p-3 text-xs text-ink" role="note">
            The lab sees this flag on the sample before preparation. Avoid breaking the sample further, double-bag and label the bag, and follow your
            site rules and local regulations for potentially asbestos-bearing material. XRD can identify the mineral but not its fibrous habit;
            confirmation needs accredited methods (e.g. polarized light or electron microscopy).
          </p>
        )}
      </section>

      <section className="space-y-3" aria-labelledby="sf-coll">
        <h2 id="sf-coll" className="text-sm font-semibold">
          Collection
        </h2>
        <div className="grid gap-3 sm:grid-cols-3">
          <Field label="Collected (local time at the site)" htmlFor="sf-when" error={err("collectedAt")}>
            <div className="flex gap-2">
              <input id="sf-when" type="datetime-local" className={inputClass} value={collectedLocal} onChange={(e) => setCollected(e.target.value, w.collectedTz ?? browserZone)} />
              <Button type="button" variant="secondary" onClick={() => setCollected(utcToZonedLocal(new Date().toISOString(), w.collectedTz ?? browserZone) ?? "", w.collectedTz ?? browserZone)}>
                Now
              </Button>
            </div>
          </Field>
          <Field label="Time zone of the site" htmlFor="sf-tz" error={err("collectedTz")} hint={w.collectedAt ? `Stored as ${w.collectedAt}` : undefined}>
            <select id="sf-tz" className={inputClass} value={w.collectedTz ?? ""} onChange={(e) => setCollected(collectedLocal, e.target.value || null)}>
              <option value="">—</option>
              {(w.collectedTz && !allZones.includes(w.collectedTz) ? [w.collectedTz, ...allZones] : allZones).map((z) => (
                <option key={z} value={z}>
                  {z}
                </option>
              ))}
            </select>
          </Field>
          <Field label="Collector" htmlFor="sf-collector" error={err("collectorName")}>
            <input id="sf-collector" className={inputClass} {...register("collectorName")} />
          </Field>
        </div>
        {station && location.lat == null && (
          <p className="text-sm">
            No position of its own: the sample shows station {station.code}&apos;s position.{" "}
            <button
              type="button"
              className="font-medium text-brand hover:underline"
              onClick={() => {
                set("lat", station.lat);
                set("lon", station.lon);
                set("locationSource", "other");
              }}
            >
              Copy the station position
            </button>
          </p>
        )}
        <LocationFields
          value={location}
          onChange={(patch) => {
            for (const [k, v] of Object.entries(patch)) set(k as keyof SampleFormValues, v);
          }}
          errors={{ lat: err("lat"), lon: err("lon"), elevationM: err("elevationM"), elevationRef: err("elevationRef"), horizontalAccuracyM: err("horizontalAccuracyM"), locationSource: err("locationSource") }}
        />
        <div className="grid gap-3 sm:grid-cols-3">
          <Field label="Weight (kg)" htmlFor="sf-weight" error={err("weightKg")}>
            <input id="sf-weight" type="number" step="any" min={0} inputMode="decimal" className={inputClass} {...register("weightKg", { setValueAs: asNumber })} />
          </Field>
          <Field label="Storage location" htmlFor="sf-storage" error={err("storageLocation")}>
            <input id="sf-storage" className={inputClass} {...register("storageLocation")} />
          </Field>
          <Field label="IGSN (optional)" htmlFor="sf-igsn" error={err("igsn")} hint="Only if already registered, e.g. 10.58052/ABC123.">
            <input id="sf-igsn" className={inputClass} {...register("igsn", { setValueAs: (v: string) => (v?.trim() ? v.trim() : null) })} />
          </Field>
        </div>
      </section>

      {general.length > 0 && (
        <div role="alert" className="rounded-md border border-danger/30 bg-red-50 p-3 text-sm text-danger">
          {general.map((g) => (
            <p key={g}>{g}</p>
          ))}
        </div>
      )}
      {Object.keys(errors).length > 0 && !general.length && (
        <p role="alert" className="text-sm text-danger">
          Some fields need attention (marked above).
          {Object.entries(errors)
            .filter(([k]) => !KNOWN.includes(k))
            .map(([k, e]) => ` ${k || "form"}: ${(e as { message?: string })?.message ?? ""}`)}
        </p>
      )}
      <div className="flex flex-wrap gap-2">
        <Button type="submit" disabled={formState.isSubmitting}>
          {formState.isSubmitting ? "Saving…" : creating ? "Create sample" : "Save changes"}
        </Button>
        <Link href={creating ? `/projects/${projectId}/samples` : `/projects/${projectId}/samples/${sample!.id}`} className={buttonClass("secondary")}>
          Cancel
        </Link>
      </div>
    </form>
  );
}
