"use client";

import { useQuery, useQueryClient } from "@tanstack/react-query";
import { photoKeys } from "@/lib/client/query-keys";
import { useRouter } from "next/navigation";
import { useRef, useState } from "react";
import { Badge } from "@/components/ui/badge";
import { Button } from "@/components/ui/button";
import { Skeleton } from "@/components/ui/card";
import { ApiError, fetchJson } from "@/lib/client/fetch-json";
import { formatDistance, greatCircleDistanceM } from "@/lib/geo/distance";
import { formatDmsPair } from "@/lib/geo/dms";
import { PhotoUploader } from "./photo-uploader";
import { parseAzimuth } from "@/lib/photos/azimuth";
import type { Photo } from "./types";

/** The sample a gallery belongs to, for "use this photo's position". */
export interface GallerySample {
  id: string;
  version: number;
  lat: number | null;
  lon: number | null;
  stationCode: string | null;
}

function taken(p: Photo): string {
  if (p.takenLocal) return `${p.takenLocal.replace("T", " ")}${p.takenOffset ? ` (UTC${p.takenOffset})` : " (camera time, zone unknown)"}`;
  return "time not recorded";
}

/** Caption and azimuth the camera faced, editable by those who may edit photos. */
function PhotoEdit({ projectId, photo, onSaved }: { projectId: string; photo: Photo; onSaved: () => void }) {
  const [caption, setCaption] = useState(photo.caption ?? "");
  const [azimuth, setAzimuth] = useState(photo.imgDirection != null ? String(Math.round(photo.imgDirection * 10) / 10) : "");
  const [ref, setRef] = useState<"T" | "M">(photo.imgDirectionRef === "M" ? "M" : "T");
  const [error, setError] = useState<string | null>(null);
  const [saved, setSaved] = useState(false);
  const [busy, setBusy] = useState(false);
  async function save() {
    const az = parseAzimuth(azimuth);
    setSaved(false);
    if (!az.ok) return setError(az.error);
    setError(null);
    setBusy(true);
    try {
      await fetchJson(`/api/projects/${projectId}/photos/${photo.id}`, { method: "PATCH", json: { caption: caption.trim() || null, imgDirection: az.value, imgDirectionRef: az.value === null ? null : ref } });
      setSaved(true);
      onSaved();
    } catch (e) {
      setError(e instanceof ApiError ? [e.message, ...Object.values(e.fields ?? {}).flat()].join(" ") : (e as Error).message);
    } finally {
      setBusy(false);
    }
  }
  return (
    <form
      className="space-y-2 rounded border border-line p-2"
      aria-label="Edit caption and azimuth"
      onSubmit={(e) => {
        e.preventDefault();
        void save();
      }}
    >
      <label className="block text-xs">
        Caption
        <input className="mt-1 w-full rounded border border-line px-2 py-1 text-sm" value={caption} maxLength={500} onChange={(e) => setCaption(e.target.value)} data-testid="photo-caption" />
      </label>
      <div className="flex flex-wrap items-end gap-2">
        <label className="text-xs">
          Azimuth (° from north, 0–360)
          <input className="mt-1 block w-24 rounded border border-line px-2 py-1 text-sm" inputMode="decimal" value={azimuth} onChange={(e) => setAzimuth(e.target.value)} aria-invalid={!!error} data-testid="photo-azimuth" />
        </label>
        <label className="text-xs">
          North
          <select className="mt-1 block rounded border border-line px-2 py-1 text-sm" value={ref} onChange={(e) => setRef(e.target.value as "T" | "M")}>
            <option value="T">true</option>
            <option value="M">magnetic</option>
          </select>
        </label>
        <Button type="submit" variant="secondary" disabled={busy}>
          {busy ? "Saving…" : "Save"}
        </Button>
      </div>
      {error && (
        <p role="alert" className="text-xs text-danger">
          {error}
        </p>
      )}
      {saved && !error && (
        <p role="status" className="text-xs text-ok">
          Saved.
        </p>
      )}
    </form>
  );
}

function PhotoDetail({ projectId, photo, sample, canWrite, onDeleted, onChanged }: { projectId: string; photo: Photo; sample?: GallerySample; canWrite: boolean; onDeleted: () => void; onChanged: () => void }) {
  const router = useRouter();
  const [busy, setBusy] = useState(false);
  const [message, setMessage] = useState<{ tone: "ok" | "danger"; text: string } | null>(null);
  const [withElevation, setWithElevation] = useState(false);
  const g = photo.gps;
  const fromSample = g && sample?.lat != null && sample.lon != null ? greatCircleDistanceM(g, { lat: sample.lat, lon: sample.lon }) : null;

  async function apply() {
    if (!sample) return;
    if (photo.farFromStation && photo.distanceToStationM != null && !window.confirm(`This photo was taken ${formatDistance(photo.distanceToStationM)} from the station. Use its position for the sample anyway?`)) return;
    setBusy(true);
    setMessage(null);
    try {
      await fetchJson(`/api/projects/${projectId}/photos/${photo.id}/apply-location`, { method: "POST", json: { version: sample.version, includeElevation: withElevation } });
      setMessage({ tone: "ok", text: "The sample now has this photo's position (source: photo EXIF)." });
      router.refresh();
    } catch (e) {
      const text = e instanceof ApiError && e.status === 409 ? "The sample was changed by someone else since this page was loaded. Reload the page, check their position, then apply again." : (e as Error).message;
      setMessage({ tone: "danger", text });
    } finally {
      setBusy(false);
    }
  }

  async function remove() {
    if (!window.confirm(`Delete ${photo.originalName}? This cannot be undone.`)) return;
    setBusy(true);
    try {
      await fetchJson(`/api/projects/${projectId}/photos/${photo.id}`, { method: "DELETE" });
      onDeleted();
    } catch (e) {
      setMessage({ tone: "danger", text: (e as Error).message });
      setBusy(false);
    }
  }

  return (
    <div className="grid gap-4 md:grid-cols-[minmax(0,3fr)_minmax(0,2fr)]">
      {/* eslint-disable-next-line @next/next/no-img-element -- authenticated API bytes, already sized */}
      <img src={photo.urls.display} alt={photo.caption ?? photo.originalName} className="max-h-[70vh] w-full rounded bg-stone object-contain" />
      <div className="space-y-2 text-sm">
        <p className="font-medium break-all">{photo.originalName}</p>
        <dl className="space-y-1">
          <div>
            <dt className="inline text-muted">Taken: </dt>
            <dd className="inline">{taken(photo)}</dd>
          </div>
          <div>
            <dt className="inline text-muted">Position: </dt>
            <dd className="inline">
              {g ? (
                <>
                  {formatDmsPair(g.lat, g.lon)}
                  {g.horizontalErrorM != null && ` ± ${g.horizontalErrorM} m`}
                  {g.altitudeM != null && `, ${g.altitudeM} m`}
                </>
              ) : (
                "no GPS in the photo"
              )}
            </dd>
          </div>
          {photo.imgDirection != null && (
            <div>
              <dt className="inline text-muted">Looking toward: </dt>
              <dd className="inline">
                {Math.round(photo.imgDirection)}° {photo.imgDirectionRef === "M" ? "magnetic" : photo.imgDirectionRef === "T" ? "true" : ""}
              </dd>
            </div>
          )}
          <div>
            <dt className="inline text-muted">Size: </dt>
            <dd className="inline">
              {photo.width}×{photo.height} px, {photo.sizeBytes < 1024 * 1024 ? `${Math.max(1, Math.round(photo.sizeBytes / 1024))} KB` : `${(photo.sizeBytes / 1024 / 1024).toFixed(1)} MB`}{" "}
              {photo.mime.replace("image/", "").toUpperCase()}
            </dd>
          </div>
        </dl>
        {photo.farFromStation && photo.distanceToStationM != null && (
          <p className="rounded border border-oxide/40 bg-oxide-light p-2 text-xs" role="note">
            Taken {formatDistance(photo.distanceToStationM)} from station {sample?.stationCode ?? ""}. Check that it belongs here before using its position.
          </p>
        )}
        {fromSample != null && <p className="text-xs text-muted">The sample&apos;s recorded position is {formatDistance(fromSample)} from this photo&apos;s.</p>}
        {canWrite && <PhotoEdit key={photo.id} projectId={projectId} photo={photo} onSaved={onChanged} />}
        {canWrite && sample && g && (
          <div className="space-y-2 rounded border border-line p-2">
            <label className="flex items-center gap-2 text-xs">
              <input type="checkbox" checked={withElevation} onChange={(e) => setWithElevation(e.target.checked)} disabled={g.altitudeM == null} />
              Also copy the altitude{g.altitudeM == null ? " (none in photo)" : ` (${g.altitudeM} m, EXIF: above sea level)`}
            </label>
            <Button type="button" variant="secondary" onClick={apply} disabled={busy}>
              {sample.lat == null ? "Use this position for the sample" : "Replace the sample's position with this one"}
            </Button>
          </div>
        )}
        {message && (
          <p role={message.tone === "danger" ? "alert" : "status"} className={message.tone === "danger" ? "text-xs text-danger" : "text-xs text-ok"}>
            {message.text}
          </p>
        )}
        <div className="flex flex-wrap gap-3 pt-1">
          <a href={photo.urls.original} className="text-xs text-brand hover:underline" download={photo.originalName}>
            Download original
          </a>
          {canWrite && (
            <button type="button" onClick={remove} disabled={busy} className="text-xs text-danger hover:underline">
              Delete photo
            </button>
          )}
        </div>
      </div>
    </div>
  );
}

/** Thumbnails of a sample's or station's photos; click one for the large view, EXIF facts and actions. */
export function PhotoGallery({
  projectId,
  owner,
  canWrite,
  sample,
}: {
  projectId: string;
  owner: { sampleId: string } | { stationId: string };
  canWrite: boolean;
  sample?: GallerySample;
}) {
  const qc = useQueryClient();
  const base = "sampleId" in owner ? `/api/projects/${projectId}/samples/${owner.sampleId}/photos` : `/api/projects/${projectId}/stations/${owner.stationId}/photos`;
  const key = photoKeys.owner(projectId, owner);
  const { data, error, isLoading } = useQuery({ queryKey: key, queryFn: () => fetchJson<{ items: Photo[] }>(base) });
  const [openId, setOpenId] = useState<string | null>(null);
  const dialog = useRef<HTMLDialogElement>(null);
  const refresh = () => qc.invalidateQueries({ queryKey: key });
  const photos = data?.items ?? [];
  const open = photos.find((p) => p.id === openId);

  return (
    <div className="space-y-3">
      {canWrite && <PhotoUploader uploadUrl={base} onUploaded={refresh} />}
      {isLoading && (
        <div className="grid grid-cols-3 gap-2 sm:grid-cols-4 lg:grid-cols-6">
          {[0, 1, 2].map((i) => (
            <Skeleton key={i} className="h-24" />
          ))}
        </div>
      )}
      {error && (
        <p role="alert" className="text-sm text-danger">
          {(error as Error).message}
        </p>
      )}
      {!isLoading && !error && photos.length === 0 && <p className="text-sm text-muted">No photos yet.</p>}
      {photos.length > 0 && (
        <ul className="grid grid-cols-3 gap-2 sm:grid-cols-4 lg:grid-cols-6" aria-label="Photos" data-testid="photo-grid">
          {photos.map((p) => (
            <li key={p.id} className="relative">
              <button
                type="button"
                onClick={() => {
                  setOpenId(p.id);
                  dialog.current?.showModal();
                }}
                className="block w-full overflow-hidden rounded border border-line bg-stone"
                aria-label={`Open ${p.originalName}`}
              >
                {/* eslint-disable-next-line @next/next/no-img-element -- authenticated API bytes, already sized */}
                <img src={p.urls.thumb} alt={p.caption ?? p.originalName} loading="lazy" className="aspect-square w-full object-cover" />
              </button>
              <span className="pointer-events-none absolute left-1 top-1 flex flex-wrap gap-1">
                {p.gps && <Badge tone="brand">GPS</Badge>}
                {p.farFromStation && p.distanceToStationM != null && <Badge tone="oxide">{formatDistance(p.distanceToStationM)} from station</Badge>}
              </span>
            </li>
          ))}
        </ul>
      )}
      <dialog
        ref={dialog}
        className="m-auto w-[min(64rem,calc(100vw-2rem))] rounded-lg p-0 backdrop:bg-ink/60"
        onClose={() => setOpenId(null)}
        aria-label={open ? `Photo ${open.originalName}` : "Photo"}
      >
        <div className="space-y-3 p-4">
          <div className="flex justify-end">
            <Button type="button" variant="ghost" onClick={() => dialog.current?.close()}>
              Close
            </Button>
          </div>
          {open && (
            <PhotoDetail
              projectId={projectId}
              photo={open}
              sample={sample}
              canWrite={canWrite}
              onDeleted={() => {
                dialog.current?.close();
                void refresh();
              }}
              onChanged={() => void refresh()}
            />
          )}
        </div>
      </dialog>
    </div>
  );
}
