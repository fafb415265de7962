"use client";

import Link from "next/link";
import { useRouter } from "next/navigation";
import { useState } from "react";
import { LITHOLOGY_TERMS } from "@/components/samples/field-terms";
import { useDeviceZone } from "@/components/stations/use-device-zone";
import { Button, buttonClass } from "@/components/ui/button";
import { Field, inputClass } from "@/components/ui/field";
import { ApiError, fetchJson } from "@/lib/client/fetch-json";
import { enqueue, isNetworkFailure, newClientId, queuePhoto, reservedCodeForOfflineSample } from "@/lib/client/offline-save";
import { SAMPLE_TYPE_LABELS } from "@/lib/format";
import type { SampleType } from "@/lib/vocabulary";
import { cn } from "@/lib/utils";
import { useNextSampleCode } from "./use-next-sample-code";

/** The types taken most in the field first; the full list stays in the long form. */
const QUICK_TYPES: SampleType[] = ["hand_sample", "chip", "float", "soil", "stream_sediment", "channel"];
/** A short pick list: the first terms of the suggested list; anything else can be typed. */
const QUICK_LITHOLOGIES = ["granite", "andesite", "basalt", "sandstone", "shale", "limestone", "schist", "quartzite", "gossan", "massive sulfide"];

interface Fix {
  lat: number;
  lon: number;
  accuracy: number;
  fixedAt: string;
}

/**
 * "New sample here": the device position with its accuracy, a photo from the camera, type and lithology from short
 * pick lists; everything else can be added later in the full form. Without a connection the sample goes to the
 * device outbox with a client id and the photo waits on the device (IndexedDB) until the sample has been sent.
 */
export function QuickCapture({
  projectId,
  userId,
  stations,
  defaultZone,
}: {
  projectId: string;
  userId: string;
  stations: { id: string; code: string; name: string | null }[];
  defaultZone: string | null;
}) {
  const router = useRouter();
  const deviceZone = useDeviceZone();
  const [clientId] = useState(newClientId);
  const [fix, setFix] = useState<Fix | null>(null);
  const [locating, setLocating] = useState(false);
  const [geoNote, setGeoNote] = useState<string | null>(null);
  const [sampleType, setSampleType] = useState<SampleType>("hand_sample");
  const [lithology, setLithology] = useState("");
  const [tag, setTag] = useState("");
  const [stationId, setStationId] = useState("");
  const [photo, setPhoto] = useState<File | null>(null);
  const [preview, setPreview] = useState<string | null>(null);
  const code = useNextSampleCode(projectId, userId);
  const online = code.online;
  const [busy, setBusy] = useState(false);
  const [problem, setProblem] = useState<string | null>(null);

  function choosePhoto(file: File | null) {
    if (preview) URL.revokeObjectURL(preview);
    setPhoto(file);
    setPreview(file ? URL.createObjectURL(file) : null);
  }

  function locate() {
    if (!("geolocation" in navigator)) {
      setGeoNote("This browser cannot report a location; add the position later in the full form.");
      return;
    }
    setLocating(true);
    setGeoNote(null);
    navigator.geolocation.getCurrentPosition(
      (pos) => {
        setLocating(false);
        const c = pos.coords;
        setFix({ lat: +c.latitude.toFixed(7), lon: +c.longitude.toFixed(7), accuracy: Math.round(c.accuracy * 10) / 10, fixedAt: new Date(pos.timestamp).toISOString() });
        if (c.accuracy > 50) setGeoNote(`± ${Math.round(c.accuracy)} m is coarse — likely a network fix, not GNSS. Wait in the open and take the position again.`);
      },
      (err) => {
        setLocating(false);
        setGeoNote(err.code === err.PERMISSION_DENIED ? "Location permission was refused; allow it in the browser settings, or add the position later." : "No position yet; try again in the open.");
      },
      { enableHighAccuracy: true, timeout: 30_000, maximumAge: 0 },
    );
  }

  async function save() {
    setBusy(true);
    setProblem(null);
    const body: Record<string, unknown> = {
      id: clientId,
      sampleType,
      lithology: lithology.trim() || null,
      collectedAt: new Date().toISOString(),
      collectedTz: defaultZone || deviceZone,
      ...(tag.trim() && { code: tag.trim().toUpperCase() }),
      ...(stationId && { stationId }),
      ...(fix && { lat: fix.lat, lon: fix.lon, horizontalAccuracyM: fix.accuracy, locationSource: "device_gnss", locationFixedAt: fix.fixedAt }),
    };
    // Known to be offline and no tag typed: the next code reserved for this device (provisional until synced).
    const reserved = !navigator.onLine && !body.code ? await reservedCodeForOfflineSample(projectId) : null;
    if (reserved) body.code = reserved.code;
    try {
      const saved = await fetchJson<{ id: string }>(`/api/projects/${projectId}/samples`, { method: "POST", json: body, headers: { "idempotency-key": clientId } });
      if (photo) {
        const form = new FormData();
        form.append("files", photo, photo.name || "photo.jpg");
        const sent = await fetch(`/api/projects/${projectId}/samples/${saved.id}/photos`, { method: "POST", body: form }).catch(() => null);
        // The connection dropped after the sample: the photo waits on the device and is sent resumably.
        if (!sent) await queuePhoto({ projectId, owner: { kind: "sample", id: saved.id }, label: `Photo of sample ${String(body.code ?? saved.id.slice(0, 8))}`, file: photo });
      }
      router.push(`/projects/${projectId}/samples/${saved.id}`);
    } catch (e) {
      if (!(e instanceof ApiError) && isNetworkFailure(e)) {
        const label = reserved ? `code ${reserved.code}, provisional until synced` : tag.trim() ? `tag ${tag.trim().toUpperCase()}` : "code issued on sync";
        await enqueue({ projectId, kind: "sample", action: "create", recordId: clientId, opId: clientId, label: `New sample (${label})`, body, ...(reserved && { headers: reserved.headers }) });
        if (photo) await queuePhoto({ projectId, owner: { kind: "sample", id: clientId }, label: `Photo of new sample (${label})`, file: photo });
        router.push(`/projects/${projectId}/sync`);
        return;
      }
      setProblem(e instanceof ApiError ? [e.message, ...Object.values(e.fields ?? {}).flat()].join(" ") : "The sample could not be saved.");
    } finally {
      setBusy(false);
    }
  }

  const chip = (active: boolean) => cn("rounded-full border px-3 py-2 text-sm", active ? "border-brand bg-brand text-white" : "border-line bg-white text-ink");
  return (
    <form
      className="space-y-5"
      aria-label="Quick sample"
      onSubmit={(e) => {
        e.preventDefault();
        void save();
      }}
    >
      <section className="space-y-2" aria-labelledby="qc-pos">
        <h2 id="qc-pos" className="text-sm font-semibold">
          Position
        </h2>
        <div className="flex flex-wrap items-center gap-2">
          <Button type="button" variant="secondary" onClick={locate} disabled={locating}>
            {locating ? "Locating…" : fix ? "Take the position again" : "Use my location"}
          </Button>
          <span className="text-sm" data-testid="qc-fix">
            {fix ? `${fix.lat.toFixed(6)}, ${fix.lon.toFixed(6)} · ± ${Math.round(fix.accuracy)} m` : "No position yet (optional)"}
          </span>
        </div>
        {geoNote && (
          <p className="text-xs text-ink" role="status">
            {geoNote}
          </p>
        )}
      </section>

      <section className="space-y-2" aria-labelledby="qc-photo">
        <h2 id="qc-photo" className="text-sm font-semibold">
          Photo
        </h2>
        <label className={buttonClass("secondary", "cursor-pointer")}>
          {photo ? "Take another photo" : "Take a photo"}
          <input type="file" accept="image/*" capture="environment" className="sr-only" onChange={(e) => choosePhoto(e.target.files?.[0] ?? null)} data-testid="qc-photo-input" />
        </label>
        {!online && <p className="text-sm text-muted">No connection: the photo stays on this device with the sample and is sent after it, in pieces that resume after a drop.</p>}
        {/* eslint-disable-next-line @next/next/no-img-element -- a local preview (blob: URL), not a served image */}
        {preview && photo && <img src={preview} alt="Photo to attach" className="h-32 w-auto rounded-md border border-line object-cover" />}
      </section>

      <fieldset className="space-y-2">
        <legend className="text-sm font-semibold">Sample type</legend>
        <div className="flex flex-wrap gap-2">
          {QUICK_TYPES.map((t) => (
            <button key={t} type="button" className={chip(sampleType === t)} aria-pressed={sampleType === t} onClick={() => setSampleType(t)}>
              {SAMPLE_TYPE_LABELS[t]}
            </button>
          ))}
        </div>
      </fieldset>

      <fieldset className="space-y-2">
        <legend className="text-sm font-semibold">Lithology</legend>
        <div className="flex flex-wrap gap-2">
          {QUICK_LITHOLOGIES.map((t) => (
            <button key={t} type="button" className={chip(lithology === t)} aria-pressed={lithology === t} onClick={() => setLithology(lithology === t ? "" : t)}>
              {t}
            </button>
          ))}
        </div>
        <input aria-label="Other lithology" list="qc-lithology" className={inputClass} placeholder="or type another" value={lithology} onChange={(e) => setLithology(e.target.value)} />
        <datalist id="qc-lithology">
          {LITHOLOGY_TERMS.map((t) => (
            <option key={t} value={t} />
          ))}
        </datalist>
      </fieldset>

      <div className="grid gap-3 sm:grid-cols-2">
        <Field label="Tag number (pre-printed, optional)" htmlFor="qc-tag" hint={code.hint}>
          <input id="qc-tag" className={inputClass} placeholder={code.placeholder} value={tag} onChange={(e) => setTag(e.target.value)} autoComplete="off" autoCapitalize="characters" />
        </Field>
        <Field label="Station (optional)" htmlFor="qc-station">
          <select id="qc-station" className={inputClass} value={stationId} onChange={(e) => setStationId(e.target.value)}>
            <option value="">—</option>
            {stations.map((s) => (
              <option key={s.id} value={s.id}>
                {s.code}
                {s.name ? ` · ${s.name}` : ""}
              </option>
            ))}
          </select>
        </Field>
      </div>

      {problem && (
        <p role="alert" className="rounded-md bg-red-50 px-3 py-2 text-sm text-danger">
          {problem}
        </p>
      )}
      <div className="flex flex-wrap gap-2">
        <Button type="submit" disabled={busy} className="min-h-12 flex-1 sm:flex-none">
          {busy ? "Saving…" : online ? "Save sample" : "Save on this device"}
        </Button>
        <Link href={`/projects/${projectId}/samples/new`} className={buttonClass("secondary", "min-h-12")}>
          Full form
        </Link>
      </div>
    </form>
  );
}
