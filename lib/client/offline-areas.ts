/**
 * Saved offline map areas on this device: download a plan's tiles into the service worker's tile cache (Cache Storage),
 * keep a small list of saved areas per project (localStorage), delete an area's tiles again, and read the browser's
 * storage budget (StorageManager: estimate() and persist()). Browser-only; the arithmetic is in lib/map/offline-area.ts.
 */
import { MAP_TILE_CACHE, OFFLINE_AREA_HEADER, planArea, planTileUrls, type AreaRequest, type OfflineTileSource } from "@/lib/map/offline-area";
import type { LonLatBBox } from "@/lib/map/tiles";

/** What a saved area remembers: enough to list it, show it and enumerate its tiles again for deletion. */
export interface SavedArea {
  id: string;
  name: string;
  bbox: LonLatBBox;
  minZoom: number;
  maxZoom: number;
  /** The sources as they were when saved (templates, native zooms, bounds). */
  sources: Omit<OfflineTileSource, "covered">[];
  /** Tiles stored (the source had them). */
  tiles: number;
  /** Tiles the source does not have (204/404) — nothing to store. */
  empty: number;
  /** Tiles that failed (network or server error). */
  failed: number;
  bytes: number;
  durationMs: number;
  savedAt: string;
}

const key = (projectId: string) => `lithodex.offline-areas.${projectId}`;

export function listSavedAreas(projectId: string): SavedArea[] {
  try {
    const raw = localStorage.getItem(key(projectId));
    return raw ? (JSON.parse(raw) as SavedArea[]) : [];
  } catch {
    return [];
  }
}

function writeSavedAreas(projectId: string, areas: SavedArea[]) {
  localStorage.setItem(key(projectId), JSON.stringify(areas));
}

export interface StorageState {
  usage: number | null;
  quota: number | null;
  persisted: boolean | null;
}

/** The browser's storage use and budget, and whether this site's storage is persistent. */
export async function storageState(): Promise<StorageState> {
  const sm = typeof navigator !== "undefined" ? navigator.storage : undefined;
  if (!sm) return { usage: null, quota: null, persisted: null };
  const [est, persisted] = await Promise.all([sm.estimate?.().catch(() => null), sm.persisted?.().catch(() => null)]);
  return { usage: est?.usage ?? null, quota: est?.quota ?? null, persisted: persisted ?? null };
}

/** Asks the browser to keep this site's storage when space runs low; resolves to whether it was granted. */
export async function requestPersistentStorage(): Promise<boolean | null> {
  const sm = typeof navigator !== "undefined" ? navigator.storage : undefined;
  if (!sm?.persist) return null;
  try {
    return await sm.persist();
  } catch {
    return false;
  }
}

export interface DownloadProgress {
  done: number;
  total: number;
  bytes: number;
  failed: number;
  empty: number;
}

/** A copy of the response without Date (a saved area must not look stale to the worker's expiry) and without Vary. */
async function storable(res: Response): Promise<{ res: Response; bytes: number }> {
  const body = await res.arrayBuffer();
  const headers = new Headers(res.headers);
  headers.delete("date");
  headers.delete("vary");
  headers.set("content-length", String(body.byteLength));
  return { res: new Response(body, { status: 200, statusText: res.statusText, headers }), bytes: body.byteLength };
}

/**
 * Downloads the tiles of `req` from `sources` into the tile cache, `concurrency` at a time, reporting progress;
 * `signal` cancels (tiles already stored stay, the area is not listed). Tiles already in the cache are kept as they are.
 * Returns the saved area (also added to the project's list).
 */
export async function downloadArea(
  projectId: string,
  name: string,
  req: AreaRequest,
  sources: OfflineTileSource[],
  { onProgress, signal, concurrency = 6 }: { onProgress?: (p: DownloadProgress) => void; signal?: AbortSignal; concurrency?: number } = {},
): Promise<SavedArea> {
  const plan = planArea(req, sources);
  if (plan.problem) throw new Error(plan.problem);
  const urls = planTileUrls(plan);
  const cache = await caches.open(MAP_TILE_CACHE);
  const p: DownloadProgress = { done: 0, total: urls.length, bytes: 0, failed: 0, empty: 0 };
  const t0 = performance.now();
  let next = 0;
  const worker = async () => {
    while (next < urls.length) {
      if (signal?.aborted) throw new DOMException("Download cancelled.", "AbortError");
      const url = new URL(urls[next++], location.origin).href;
      try {
        const have = await cache.match(url);
        if (have) {
          p.bytes += Number(have.headers.get("content-length")) || (await have.clone().arrayBuffer()).byteLength;
        } else {
          const res = await fetch(url, { credentials: "same-origin", headers: { [OFFLINE_AREA_HEADER]: "1" }, signal });
          if (res.status === 204 || res.status === 404) p.empty++;
          else if (!res.ok) p.failed++;
          else {
            const s = await storable(res);
            await cache.put(url, s.res);
            p.bytes += s.bytes;
          }
        }
      } catch (err) {
        if (signal?.aborted) throw new DOMException("Download cancelled.", "AbortError");
        if (err instanceof DOMException && err.name === "QuotaExceededError") throw new Error("The device's storage for this site is full; delete a saved area or choose fewer zoom levels.");
        p.failed++;
      }
      p.done++;
      onProgress?.({ ...p });
    }
  };
  await Promise.all(Array.from({ length: Math.min(concurrency, urls.length) }, worker));
  const area: SavedArea = {
    id: crypto.randomUUID(),
    name,
    bbox: req.bbox,
    minZoom: req.minZoom,
    maxZoom: req.maxZoom,
    sources: sources.map((s) => ({ id: s.id, name: s.name, template: s.template, minNativeZoom: s.minNativeZoom, maxNativeZoom: s.maxNativeZoom, bounds: s.bounds ?? null, bytesPerTile: s.bytesPerTile })),
    tiles: p.done - p.failed - p.empty,
    empty: p.empty,
    failed: p.failed,
    bytes: p.bytes,
    durationMs: Math.round(performance.now() - t0),
    savedAt: new Date().toISOString(),
  };
  writeSavedAreas(projectId, [area, ...listSavedAreas(projectId)]);
  return area;
}

/**
 * Deletes a saved area: its tiles leave the cache unless another saved area of the project still needs them.
 * `covered` restores the coverage test of the sources that have one (the bundled basemap).
 */
export async function deleteSavedArea(projectId: string, id: string, covered: Record<string, OfflineTileSource["covered"]> = {}): Promise<number> {
  const all = listSavedAreas(projectId);
  const area = all.find((a) => a.id === id);
  if (!area) return 0;
  const urlsOf = (a: SavedArea) => planTileUrls(planArea({ bbox: a.bbox, minZoom: a.minZoom, maxZoom: a.maxZoom }, a.sources.map((s) => ({ ...s, covered: covered[s.id] })), Number.MAX_SAFE_INTEGER));
  const keep = new Set(all.filter((a) => a.id !== id).flatMap(urlsOf));
  const cache = await caches.open(MAP_TILE_CACHE);
  let removed = 0;
  for (const u of urlsOf(area)) {
    if (keep.has(u)) continue;
    if (await cache.delete(new URL(u, location.origin).href)) removed++;
  }
  writeSavedAreas(projectId, all.filter((a) => a.id !== id));
  return removed;
}
