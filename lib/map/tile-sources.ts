/**
 * The tile sources the project map shows, described for "make this area available offline": the bundled offline
 * basemap (public/tiles-offline, only where it has tiles) and each imported MBTiles package (served by the tile-package
 * route, within its bounds and native zooms). Both are same-origin, so the service worker can serve them offline.
 * No online layer is configured in this product. Pure.
 */
import type { OfflineTileSource } from "./offline-area";
import { OFFLINE_MAX_ZOOM, OFFLINE_MIN_ZOOM, OFFLINE_TILE_URL_TEMPLATE, offlineTileRanges } from "./offline-tiles";

/**
 * Mean size of a bundled basemap tile, bytes: 13,743,223 B over 3,639 PNG tiles (measured on public/tiles-offline,
 * December 2026); the estimate before a download, the download reports real bytes.
 */
export const BASEMAP_BYTES_PER_TILE = 3800;

/** Assumed size of an imported raster tile (256 px JPEG/PNG imagery or a scanned map), bytes — an estimate only. */
export const PACKAGE_BYTES_PER_TILE = 20_000;

const RANGES = new Map(offlineTileRanges().map((r) => [r.z, r]));

/** Whether the bundled basemap has tile z/x/y. */
export function basemapCovers(z: number, x: number, y: number): boolean {
  const r = RANGES.get(z);
  return !!r && x >= r.xMin && x <= r.xMax && y >= r.yMin && y <= r.yMax;
}

export const BASEMAP_SOURCE_ID = "basemap";

export function basemapSource(): OfflineTileSource {
  return {
    id: BASEMAP_SOURCE_ID,
    name: "Offline basemap",
    template: OFFLINE_TILE_URL_TEMPLATE,
    minNativeZoom: OFFLINE_MIN_ZOOM,
    maxNativeZoom: OFFLINE_MAX_ZOOM,
    bytesPerTile: BASEMAP_BYTES_PER_TILE,
    covered: basemapCovers,
  };
}

export interface PackageLike {
  id: string;
  name: string;
  minZoom: number | null;
  maxZoom: number | null;
  /** "w,s,e,n" */
  bounds: string | null;
}

/** An imported MBTiles package as a tile source (the map's TileLayer uses the same URL, native zooms and bounds). */
export function packageSource(projectId: string, p: PackageLike): OfflineTileSource {
  const b = p.bounds?.split(",").map(Number);
  const bounds = b && b.length === 4 && b.every(Number.isFinite) ? { west: b[0], south: b[1], east: b[2], north: b[3] } : null;
  return {
    id: `pkg:${p.id}`,
    name: p.name,
    template: `/api/projects/${projectId}/tile-packages/${p.id}/tiles/{z}/{x}/{y}`,
    minNativeZoom: p.minZoom ?? 0,
    maxNativeZoom: p.maxZoom ?? 19,
    bounds,
    bytesPerTile: PACKAGE_BYTES_PER_TILE,
  };
}
