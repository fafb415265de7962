"use client";

import { useState } from "react";
import { Button } from "@/components/ui/button";
import { Field, inputClass } from "@/components/ui/field";
import { ApiError, fetchJson } from "@/lib/client/fetch-json";
import { enqueue, isNetworkFailure, newClientId } from "@/lib/client/offline-save";
import type { MapStation } from "./types";

/** New station at a position picked on the map; coordinates stay editable (WGS84, 6 decimals). */
export function NewStationForm({
  projectId,
  position,
  onPosition,
  onCreated,
  onCancel,
}: {
  projectId: string;
  position: [number, number];
  onPosition: (lat: number, lon: number) => void;
  onCreated: (s: MapStation) => void;
  onCancel: () => void;
}) {
  const [fields, setFields] = useState<Record<string, string[]>>({});
  const [problem, setProblem] = useState<string | null>(null);
  const [busy, setBusy] = useState(false);
  const [clientId] = useState(newClientId);

  async function submit(e: React.FormEvent<HTMLFormElement>) {
    e.preventDefault();
    const f = new FormData(e.currentTarget);
    const text = (k: string) => String(f.get(k) ?? "").trim() || undefined;
    const body = {
      ...(text("code") && { code: text("code") }),
      name: text("name"),
      description: text("description"),
      lat: Number(f.get("lat")),
      lon: Number(f.get("lon")),
      locationSource: "map",
    };
    setBusy(true);
    setProblem(null);
    setFields({});
    try {
      const created = await fetchJson<MapStation>(`/api/projects/${projectId}/stations`, { method: "POST", json: { ...body, id: clientId }, headers: { "idempotency-key": clientId } });
      onCreated(created);
    } catch (err) {
      if (!(err instanceof ApiError) && isNetworkFailure(err)) {
        // No connection: kept on this device and sent later with the same id and key (lib/client/outbox.ts).
        await enqueue({ projectId, kind: "station", action: "create", recordId: clientId, opId: clientId, label: `New station${body.name ? ` "${body.name}"` : ""}`, body });
        setProblem("No connection: the station is saved on this device and will be sent when you are back online (see Sync).");
        return;
      }
      if (err instanceof ApiError) {
        setProblem(err.message);
        setFields(err.fields ?? (err.details?.field ? { [String(err.details.field)]: [err.message] } : {}));
      } else setProblem("The station could not be saved; check your connection.");
    } finally {
      setBusy(false);
    }
  }

  const err = (k: string) => fields[k];
  return (
    <form onSubmit={submit} className="space-y-3" aria-label="New station" noValidate>
      <h2 className="font-semibold">New station</h2>
      <p className="text-xs text-muted">Picked on the map: accuracy is the map&apos;s, not a GNSS fix. Drag the pin or type exact coordinates.</p>
      <div className="grid grid-cols-2 gap-2">
        <Field label="Latitude (°)" htmlFor="ns-lat" error={err("lat")}>
          <input
            id="ns-lat"
            name="lat"
            type="number"
            step="any"
            min={-90}
            max={90}
            className={inputClass}
            value={position[0].toFixed(6)}
            onChange={(e) => onPosition(Number(e.target.value), position[1])}
            aria-invalid={!!err("lat")}
          />
        </Field>
        <Field label="Longitude (°)" htmlFor="ns-lon" error={err("lon")}>
          <input
            id="ns-lon"
            name="lon"
            type="number"
            step="any"
            min={-180}
            max={180}
            className={inputClass}
            value={position[1].toFixed(6)}
            onChange={(e) => onPosition(position[0], Number(e.target.value))}
            aria-invalid={!!err("lon")}
          />
        </Field>
      </div>
      <Field label="Code" htmlFor="ns-code" hint="Leave empty for the next project code." error={err("code")}>
        <input id="ns-code" name="code" className={inputClass} autoComplete="off" aria-invalid={!!err("code")} />
      </Field>
      <Field label="Name" htmlFor="ns-name" error={err("name")}>
        <input id="ns-name" name="name" className={inputClass} placeholder="e.g. Gossan ridge, east face" aria-invalid={!!err("name")} />
      </Field>
      <Field label="Description" htmlFor="ns-desc" error={err("description")}>
        <textarea id="ns-desc" name="description" rows={2} className={inputClass} aria-invalid={!!err("description")} />
      </Field>
      {problem && (
        <p role="alert" className="rounded bg-red-50 px-2 py-1 text-sm text-danger">
          {problem}
        </p>
      )}
      <div className="flex gap-2">
        <Button type="submit" disabled={busy}>
          {busy ? "Saving…" : "Create station"}
        </Button>
        <Button type="button" variant="secondary" onClick={onCancel}>
          Cancel
        </Button>
      </div>
    </form>
  );
}
