"use client";

import { useRouter } from "next/navigation";
import { useMemo, useState } from "react";
import { useForm, useWatch, type Resolver } from "react-hook-form";
import { Button, buttonClass } from "@/components/ui/button";
import { Field, inputClass } from "@/components/ui/field";
import { ApiError, fetchJson } from "@/lib/client/fetch-json";
import { lazyZodResolver } from "@/lib/client/lazy-resolver";
import { enqueue, isNetworkFailure, newClientId } from "@/lib/client/offline-save";
import { utcToZonedLocal, zonedLocalToUtc } from "@/lib/geo/zoned-time";
import { ConflictPanel, type ConflictField } from "./conflict-panel";
import { LocationFields, type LocationValue } from "./location-fields";
import { applyServerErrors } from "./server-errors";
import { useDeviceZone } from "./use-device-zone";

/** A station as the form reads and writes it. */
export interface StationFormValues extends LocationValue {
  code?: string;
  name: string | null;
  lithology: string | null;
  description: string | null;
  observedAt: string | null;
  version?: number;
}

export interface StationRecord extends Omit<StationFormValues, "lat" | "lon"> {
  id: string;
  code: string;
  lat: number;
  lon: number;
  version: number;
}

const KNOWN = ["code", "name", "lat", "lon", "elevationM", "elevationRef", "horizontalAccuracyM", "locationSource", "locationFixedAt", "lithology", "description", "observedAt"] as const;

const CONFLICT_FIELDS: ConflictField[] = [
  { key: "code", label: "Code" },
  { key: "name", label: "Name" },
  { key: "lat", label: "Latitude" },
  { key: "lon", label: "Longitude" },
  { key: "elevationM", label: "Elevation (m)" },
  { key: "elevationRef", label: "Elevation reference" },
  { key: "horizontalAccuracyM", label: "Accuracy (m)" },
  { key: "lithology", label: "Lithology" },
  { key: "description", label: "Description" },
  { key: "observedAt", label: "Observed (UTC)" },
];

const emptyToNull = (v: string | null | undefined) => (v == null || v.trim() === "" ? null : v);

/** Form values → API body: blank text → null, no code → let the server issue one, no undefined keys (the schema is strict). */
function toBody(values: StationFormValues, editing: boolean): Record<string, unknown> {
  const body: Record<string, unknown> = {
    ...values,
    name: emptyToNull(values.name),
    lithology: emptyToNull(values.lithology),
    description: emptyToNull(values.description),
  };
  if (!body.code) delete body.code;
  if (!editing) delete body.version;
  if (body.elevationM == null) body.elevationRef = null;
  for (const [k, v] of Object.entries(body)) if (v === undefined) delete body[k];
  return body;
}

function toForm(s?: StationRecord): StationFormValues {
  return {
    code: s?.code,
    name: s?.name ?? null,
    lat: s?.lat ?? null,
    lon: s?.lon ?? null,
    elevationM: s?.elevationM ?? null,
    elevationRef: s?.elevationRef ?? "msl",
    horizontalAccuracyM: s?.horizontalAccuracyM ?? null,
    locationSource: s?.locationSource ?? null,
    locationFixedAt: s?.locationFixedAt ?? null,
    lithology: s?.lithology ?? null,
    description: s?.description ?? null,
    observedAt: s?.observedAt ?? null,
    version: s?.version,
  };
}

/** Create or edit a station. Same zod schema as the server; a stale edit shows both versions. */
export function StationForm({ projectId, station, nextCode }: { projectId: string; station?: StationRecord; nextCode?: string }) {
  const router = useRouter();
  const editing = !!station;
  const zone = useDeviceZone();
  const resolver = useMemo<Resolver<StationFormValues>>(
    () =>
      lazyZodResolver(
        () => import("@/lib/validation/station").then((m) => (editing ? m.stationPatchSchema : m.stationCreateSchema)),
        (values) => toBody(values, editing),
      ),
    [editing],
  );
  const form = useForm<StationFormValues>({ resolver, defaultValues: toForm(station) });
  const { register, handleSubmit, setValue, control, setError, getValues, reset, formState } = form;
  const [general, setGeneral] = useState<string[]>([]);
  const [conflict, setConflict] = useState<StationRecord | null>(null);
  const [clientId] = useState(newClientId);
  const [queued, setQueued] = useState(false);
  // Wall time as typed; shown in the device zone (the stored value is UTC).
  const [typedObserved, setTypedObserved] = useState<string | null>(null);
  const observedAt = useWatch({ control, name: "observedAt" });
  const observedLocal = typedObserved ?? (observedAt ? (utcToZonedLocal(observedAt, zone) ?? "") : "");
  const errors = formState.errors;
  const err = (k: keyof StationFormValues) => errors[k]?.message as string | undefined;
  const loc = useWatch({ control, name: ["lat", "lon", "elevationM", "elevationRef", "horizontalAccuracyM", "locationSource", "locationFixedAt"] });
  const location: LocationValue = {
    lat: loc[0],
    lon: loc[1],
    elevationM: loc[2],
    elevationRef: loc[3],
    horizontalAccuracyM: loc[4],
    locationSource: loc[5],
    locationFixedAt: loc[6],
  };

  async function save(values: StationFormValues, version?: number) {
    setGeneral([]);
    const body = toBody(values, editing);
    // An edit carries the version it was made against; a create its client id and key (lib/client/outbox.ts).
    const json: Record<string, unknown> = editing ? { ...body, version: version ?? values.version } : { ...body, id: clientId };
    try {
      const saved = editing
        ? await fetchJson<StationRecord>(`/api/projects/${projectId}/stations/${station!.id}`, { method: "PATCH", json })
        : await fetchJson<StationRecord>(`/api/projects/${projectId}/stations`, { method: "POST", json, headers: { "idempotency-key": clientId } });
      router.push(`/projects/${projectId}/stations/${saved.id}`);
      router.refresh();
    } catch (e) {
      if (!(e instanceof ApiError) && isNetworkFailure(e)) {
        // No connection: kept on this device and sent later; a stale edit comes back as a conflict to resolve on the sync page.
        // An edit sends only the fields changed here, so fields someone else changed meanwhile are not put back.
        const original = toBody(toForm(station), true);
        const changed = editing ? Object.fromEntries(Object.entries(body).filter(([k, v]) => k !== "version" && JSON.stringify(v ?? null) !== JSON.stringify(original[k] ?? null))) : null;
        await enqueue({
          projectId,
          kind: "station",
          action: editing ? "update" : "create",
          recordId: editing ? station!.id : clientId,
          label: editing ? `Edit of station ${station!.code}` : `New station${body.name ? ` "${String(body.name)}"` : ""}`,
          body: changed ? { ...changed, version: json.version } : json,
          ...(!editing && { opId: clientId }),
        });
        setQueued(true);
        return;
      }
      if (e instanceof ApiError && e.status === 409 && e.details?.current) {
        setConflict(e.details.current as StationRecord);
        return;
      }
      setGeneral(applyServerErrors(e, setError, KNOWN));
    }
  }

  function onObserved(v: string) {
    setTypedObserved(v);
    setValue("observedAt", v ? zonedLocalToUtc(v, zone) : null, { shouldDirty: true });
  }

  const onSubmit = handleSubmit((values) => save(values));

  return (
    <form onSubmit={onSubmit} noValidate className="space-y-5" aria-label={editing ? "Edit station" : "New station"}>
      {conflict && (
        <ConflictPanel
          fields={CONFLICT_FIELDS}
          mine={getValues() as unknown as Record<string, unknown>}
          theirs={conflict as unknown as Record<string, unknown>}
          busy={formState.isSubmitting}
          onKeepMine={async () => {
            const v = conflict.version;
            setConflict(null);
            setValue("version", v);
            await handleSubmit((values) => save(values, v))();
          }}
          onTakeTheirs={() => {
            reset(toForm(conflict));
            setTypedObserved(null);
            setConflict(null);
          }}
        />
      )}
      <div className="grid gap-3 sm:grid-cols-2">
        <Field label="Station code" htmlFor="st-code" error={err("code")} hint={editing ? "Unique in the project." : `Leave empty to use the next code${nextCode ? `, ${nextCode}` : ""}.`}>
          <input
            id="st-code"
            className={inputClass}
            placeholder={nextCode}
            autoCapitalize="characters"
            {...register("code", { setValueAs: (v: string) => (v?.trim() ? v.trim().toUpperCase() : undefined) })}
            aria-invalid={err("code") ? true : undefined}
          />
        </Field>
        <Field label="Name" htmlFor="st-name" error={err("name")} hint="A short place name, e.g. Gossan ridge north.">
          <input id="st-name" className={inputClass} {...register("name")} aria-invalid={err("name") ? true : undefined} />
        </Field>
      </div>
      <LocationFields
        required
        value={location}
        onChange={(patch) => {
          for (const [k, v] of Object.entries(patch)) setValue(k as keyof StationFormValues, v as never, { shouldDirty: true, shouldValidate: formState.isSubmitted });
        }}
        errors={{
          lat: err("lat"),
          lon: err("lon"),
          elevationM: err("elevationM"),
          elevationRef: err("elevationRef"),
          horizontalAccuracyM: err("horizontalAccuracyM"),
          locationSource: err("locationSource"),
        }}
      />
      <div className="grid gap-3 sm:grid-cols-2">
        <Field label="Lithology" htmlFor="st-lith" error={err("lithology")}>
          <input id="st-lith" className={inputClass} list="lithology-terms" {...register("lithology")} />
        </Field>
        <Field label={`Observed (${zone})`} htmlFor="st-obs" error={err("observedAt")} hint="Local time on this device; stored in UTC.">
          <input id="st-obs" type="datetime-local" className={inputClass} value={observedLocal} onChange={(e) => onObserved(e.target.value)} />
        </Field>
      </div>
      <Field label="Description" htmlFor="st-desc" error={err("description")}>
        <textarea id="st-desc" rows={4} className={inputClass} {...register("description")} />
      </Field>
      {Object.keys(errors).length > 0 && general.length === 0 && (
        <p role="alert" className="text-sm text-danger">
          Some fields need attention (marked above).
          {Object.entries(errors)
            .filter(([k]) => !(KNOWN as readonly string[]).includes(k))
            .map(([k, e]) => ` ${k || "form"}: ${(e as { message?: string })?.message ?? ""}`)}
        </p>
      )}
      {general.length > 0 && (
        <div role="alert" className="rounded-md border border-danger/30 bg-red-50 p-3 text-sm text-danger">
          {general.map((g) => (
            <p key={g}>{g}</p>
          ))}
        </div>
      )}
      {queued && (
        <p role="status" className="rounded-md border border-line bg-stone p-3 text-sm" data-testid="station-queued">
          No connection: the {editing ? "edit" : "station"} is saved on this device and will be sent when you are back online.{" "}
          <a className="underline" href={`/projects/${projectId}/sync`}>
            See Sync
          </a>
          .
        </p>
      )}
      <div className="flex flex-wrap gap-2">
        <Button type="submit" disabled={formState.isSubmitting}>
          {formState.isSubmitting ? "Saving…" : editing ? "Save changes" : "Create station"}
        </Button>
        <a href={editing ? `/projects/${projectId}/stations/${station!.id}` : `/projects/${projectId}/stations`} className={buttonClass("secondary")}>
          Cancel
        </a>
      </div>
    </form>
  );
}
