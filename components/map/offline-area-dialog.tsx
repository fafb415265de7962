"use client";

import type L from "leaflet";
import { useEffect, useMemo, useRef, useState } from "react";
import { Button } from "@/components/ui/button";
import { deleteSavedArea, downloadArea, listSavedAreas, requestPersistentStorage, storageState, type DownloadProgress, type SavedArea, type StorageState } from "@/lib/client/offline-areas";
import { MAX_AREA_TILES, MAX_AREA_ZOOM, fitsStorage, formatBytes, planArea, type OfflineTileSource } from "@/lib/map/offline-area";
import { BASEMAP_SOURCE_ID, basemapCovers } from "@/lib/map/tile-sources";
import { MERCATOR_MAX_LAT, type LonLatBBox } from "@/lib/map/tiles";
import type { BBox } from "./types";
import { formatLocalDate } from "@/lib/dates";

const clampBox = (b: BBox): LonLatBBox => ({
  west: Math.max(-180, b[0]),
  south: Math.max(-MERCATOR_MAX_LAT, b[1]),
  east: Math.min(180, b[2]),
  north: Math.min(MERCATOR_MAX_LAT, b[3]),
});

const fromMap = (map: L.Map): BBox => {
  const b = map.getBounds();
  return [b.getWest(), b.getSouth(), b.getEast(), b.getNorth()];
};

const zoomOptions = Array.from({ length: MAX_AREA_ZOOM + 1 }, (_, z) => z);

/** Saved areas of the project on this device (a hook, so the map can outline them too). */
export function useSavedAreas(projectId: string) {
  // The map is rendered in the browser only (ssr: false), so localStorage is there on the first render.
  const [areas, setAreas] = useState<SavedArea[]>(() => listSavedAreas(projectId));
  return [areas, () => setAreas(listSavedAreas(projectId))] as const;
}

export interface OfflineAreaDialogProps {
  projectId: string;
  map: L.Map | null;
  /** A box drawn with "Draw a box", or null. */
  drawn: BBox | null;
  onDraw: () => void;
  sources: OfflineTileSource[];
  areas: SavedArea[];
  onAreasChanged: () => void;
  onShow: (bbox: LonLatBBox) => void;
  onClose: () => void;
}

/** "Make this area available offline": box + zoom range → tile count, size against the storage budget, download. */
export function OfflineAreaDialog({ projectId, map, drawn, onDraw, sources, areas, onAreasChanged, onShow, onClose }: OfflineAreaDialogProps) {
  const [view, setView] = useState<BBox | null>(() => (map ? fromMap(map) : null));
  const [which, setWhich] = useState<"view" | "drawn">(drawn ? "drawn" : "view");
  // A box drawn while the dialog was hidden is the one to use when it comes back.
  const [seenDrawn, setSeenDrawn] = useState(drawn);
  if (drawn !== seenDrawn) {
    setSeenDrawn(drawn);
    if (drawn) setWhich("drawn");
  }
  const startZoom = Math.round(map?.getZoom() ?? 12);
  const [minZoom, setMinZoom] = useState(Math.max(0, startZoom - 2));
  const [maxZoom, setMaxZoom] = useState(Math.min(17, Math.max(startZoom + 2, 15)));
  const [name, setName] = useState("");
  const [storage, setStorage] = useState<StorageState | null>(null);
  const [persist, setPersist] = useState<boolean | null>(null);
  const [progress, setProgress] = useState<DownloadProgress | null>(null);
  const [result, setResult] = useState<{ tone: "ok" | "error"; text: string } | null>(null);
  const abort = useRef<AbortController | null>(null);

  useEffect(() => {
    if (!map) return;
    const onMove = () => setView(fromMap(map));
    map.on("moveend", onMove);
    return () => void map.off("moveend", onMove);
  }, [map]);
  useEffect(() => {
    void storageState().then((s) => {
      setStorage(s);
      setPersist(s.persisted);
    });
  }, [progress === null]); // eslint-disable-line react-hooks/exhaustive-deps -- refresh when a download starts/ends

  const box = which === "drawn" && drawn ? drawn : view;
  const req = box ? { bbox: clampBox(box), minZoom, maxZoom } : null;
  const plan = useMemo(() => (req ? planArea(req, sources) : null), [req?.bbox.west, req?.bbox.south, req?.bbox.east, req?.bbox.north, minZoom, maxZoom, sources]); // eslint-disable-line react-hooks/exhaustive-deps -- req is rebuilt each render
  const fits = plan ? fitsStorage(plan.estimatedBytes, storage ? { usage: storage.usage ?? undefined, quota: storage.quota ?? undefined } : null) : null;
  const busy = progress !== null;

  async function start() {
    if (!req || !plan || plan.problem) return;
    setResult(null);
    const granted = await requestPersistentStorage();
    setPersist(granted);
    const ctl = new AbortController();
    abort.current = ctl;
    setProgress({ done: 0, total: plan.tiles, bytes: 0, failed: 0, empty: 0 });
    const label = name.trim() || `Area ${formatLocalDate(new Date(), Intl.DateTimeFormat().resolvedOptions().timeZone)} (z${minZoom}–${maxZoom})`;
    try {
      const a = await downloadArea(projectId, label, req, sources, { signal: ctl.signal, onProgress: setProgress });
      const parts = [`Saved “${a.name}”: ${a.tiles.toLocaleString("en")} tiles, ${formatBytes(a.bytes)} in ${(a.durationMs / 1000).toFixed(1)} s.`];
      if (a.failed) parts.push(`${a.failed} tiles failed (no connection?) — save the area again to fill the gaps.`);
      setResult({ tone: a.failed ? "error" : "ok", text: parts.join(" ") });
      onAreasChanged();
    } catch (err) {
      setResult({ tone: "error", text: err instanceof DOMException && err.name === "AbortError" ? "Download cancelled; the area was not saved (tiles already fetched stay until the browser clears them)." : err instanceof Error ? err.message : "Download failed." });
    } finally {
      abort.current = null;
      setProgress(null);
    }
  }

  async function remove(a: SavedArea) {
    if (!confirm(`Delete the saved area “${a.name}” from this device? The map needs a connection there again.`)) return;
    const n = await deleteSavedArea(projectId, a.id, { [BASEMAP_SOURCE_ID]: basemapCovers });
    setResult({ tone: "ok", text: `Deleted “${a.name}” (${n.toLocaleString("en")} tiles removed from this device).` });
    onAreasChanged();
  }

  const pct = progress && progress.total ? Math.round((100 * progress.done) / progress.total) : 0;

  return (
    <section role="dialog" aria-labelledby="oa-title" aria-modal="false" className="space-y-3 rounded-lg border border-line bg-white p-3 text-sm shadow-lg" data-testid="offline-area-dialog">
      <div className="flex items-start justify-between gap-2">
        <h2 id="oa-title" className="font-semibold">
          Make this area available offline
        </h2>
        <button type="button" onClick={onClose} disabled={busy} className="min-h-6 px-1 text-muted hover:text-ink" aria-label="Close the offline area panel">
          ✕
        </button>
      </div>

      <fieldset className="space-y-1" disabled={busy}>
        <legend className="text-xs font-medium text-muted">Area</legend>
        <label className="flex items-center gap-2">
          <input type="radio" name="oa-box" checked={which === "view"} onChange={() => setWhich("view")} /> The map as it is now
        </label>
        <label className="flex items-center gap-2">
          <input type="radio" name="oa-box" checked={which === "drawn"} disabled={!drawn} onChange={() => setWhich("drawn")} /> A box I draw
          <Button variant="ghost" className="ml-auto px-2 py-1 text-xs" onClick={onDraw}>
            {drawn ? "Draw again" : "Draw a box"}
          </Button>
        </label>
      </fieldset>

      <div className="flex flex-wrap items-end gap-3">
        <label className="text-xs font-medium text-muted">
          From zoom
          <select className="mt-0.5 block rounded border border-line px-2 py-1 text-sm text-ink" value={minZoom} disabled={busy} onChange={(e) => setMinZoom(Number(e.target.value))} aria-label="Lowest zoom level">
            {zoomOptions.map((z) => (
              <option key={z} value={z}>
                {z}
              </option>
            ))}
          </select>
        </label>
        <label className="text-xs font-medium text-muted">
          to zoom
          <select className="mt-0.5 block rounded border border-line px-2 py-1 text-sm text-ink" value={maxZoom} disabled={busy} onChange={(e) => setMaxZoom(Number(e.target.value))} aria-label="Highest zoom level">
            {zoomOptions.map((z) => (
              <option key={z} value={z}>
                {z}
              </option>
            ))}
          </select>
        </label>
        <p className="pb-1 text-xs text-muted">Map now at zoom {map ? Math.round(map.getZoom()) : "?"}</p>
      </div>

      <label className="block text-xs font-medium text-muted">
        Name (optional)
        <input className="mt-0.5 block w-full rounded border border-line px-2 py-1 text-sm text-ink" value={name} maxLength={80} disabled={busy} onChange={(e) => setName(e.target.value)} placeholder="e.g. Pinar creek, week 3" />
      </label>

      {plan && (
        <div className="space-y-1 rounded bg-stone/60 p-2 text-xs" data-testid="oa-summary">
          {plan.problem ? (
            <p role="alert" className="text-danger">
              {plan.problem}
            </p>
          ) : (
            <>
              <p className="text-sm">
                <strong className="tabular-nums">{plan.tiles.toLocaleString("en")}</strong> tiles, about <strong>{formatBytes(plan.estimatedBytes)}</strong>
                <span className="text-muted"> (limit {MAX_AREA_TILES.toLocaleString("en")} tiles per area)</span>
              </p>
              <ul className="text-muted">
                {plan.sources.map((s) => (
                  <li key={s.source.id}>
                    {s.source.name}: {s.tiles.toLocaleString("en")} tiles, zoom {s.ranges[0].z}–{s.ranges[s.ranges.length - 1].z}
                    {s.source.maxNativeZoom < maxZoom ? ` (finer zooms enlarge zoom ${s.source.maxNativeZoom})` : ""}
                  </li>
                ))}
              </ul>
            </>
          )}
          <p data-testid="oa-storage">
            Storage on this device:{" "}
            {storage?.quota ? (
              <>
                {formatBytes(storage.usage ?? 0)} used of {formatBytes(storage.quota)} available to this site
                {fits === false && <strong className="text-danger"> — this area may not fit</strong>}
              </>
            ) : (
              "the browser does not say how much is free"
            )}
            .
          </p>
          <p data-testid="oa-persist">
            Persistent storage:{" "}
            {persist === true ? (
              <strong>granted</strong>
            ) : persist === false ? (
              <>
                <strong>not granted</strong> — the browser may clear saved tiles when space runs low (installing the app usually helps)
              </>
            ) : (
              "asked when you download"
            )}
            .
          </p>
        </div>
      )}

      {progress ? (
        <div className="space-y-1" role="status" aria-live="polite">
          <div className="h-2 overflow-hidden rounded bg-line" aria-hidden>
            <div className="h-full bg-brand transition-[width]" style={{ width: `${pct}%` }} />
          </div>
          <p className="text-xs tabular-nums" data-testid="oa-progress">
            {progress.done.toLocaleString("en")} / {progress.total.toLocaleString("en")} tiles · {formatBytes(progress.bytes)}
            {progress.failed ? ` · ${progress.failed} failed` : ""}
          </p>
          <Button variant="secondary" onClick={() => abort.current?.abort()}>
            Cancel download
          </Button>
        </div>
      ) : (
        <Button onClick={start} disabled={!plan || !!plan.problem}>
          Download for offline use
        </Button>
      )}
      {typeof navigator !== "undefined" && !navigator.onLine && !progress && <p className="text-xs text-oxide">You are offline: tiles can only be downloaded with a connection.</p>}

      {result && (
        <p role={result.tone === "error" ? "alert" : "status"} className={result.tone === "ok" ? "rounded bg-brand-light px-2 py-1 text-xs" : "rounded bg-red-50 px-2 py-1 text-xs text-danger"} data-testid="oa-result">
          {result.text}
        </p>
      )}

      <div>
        <h3 className="text-xs font-semibold">Saved on this device ({areas.length})</h3>
        {areas.length === 0 ? (
          <p className="text-xs text-muted">No saved areas yet.</p>
        ) : (
          <ul className="mt-1 space-y-1" data-testid="oa-saved">
            {areas.map((a) => (
              <li key={a.id} className="flex items-center justify-between gap-2 rounded border border-line px-2 py-1 text-xs">
                <span className="min-w-0">
                  <span className="block truncate font-medium">{a.name}</span>
                  <span className="tabular-nums text-muted">
                    z{a.minZoom}–{a.maxZoom} · {a.tiles.toLocaleString("en")} tiles · {formatBytes(a.bytes)} · {new Date(a.savedAt).toLocaleDateString("en-GB")}
                  </span>
                </span>
                <span className="flex shrink-0 gap-1">
                  <button type="button" className="min-h-6 px-1 text-brand hover:underline" onClick={() => onShow(a.bbox)}>
                    Show
                  </button>
                  <button type="button" className="min-h-6 px-1 text-danger hover:underline" onClick={() => void remove(a)} disabled={busy}>
                    Delete
                  </button>
                </span>
              </li>
            ))}
          </ul>
        )}
      </div>
    </section>
  );
}
