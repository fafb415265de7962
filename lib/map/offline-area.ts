/**
 * "Make this area available offline": which tile URLs a box and zoom range need from each tile source the map shows,
 * how many there are, roughly how many bytes, and whether that fits the per-area cap. Pure: no I/O, no framework.
 *
 * A source mirrors a Leaflet tile layer: below `minNativeZoom` or above `maxNativeZoom` Leaflet asks for the tiles of
 * the nearest native zoom and scales them, so those are the tiles to keep; `bounds` and `covered` skip tiles the layer
 * would never request (outside the package's bounds, outside the bundled basemap's coverage).
 */
import { tileRangeForBBox, type LonLatBBox, type TileRange } from "./tiles";

export interface OfflineTileSource {
  /** Stable id ("basemap", "pkg:<id>"). */
  id: string;
  /** Shown in the dialog. */
  name: string;
  /** Same-origin URL template with {z}, {x}, {y} (XYZ rows). */
  template: string;
  minNativeZoom: number;
  maxNativeZoom: number;
  /** Degrees WGS84; tiles wholly outside are not requested by the layer. */
  bounds?: LonLatBBox | null;
  /** Typical bytes per tile, for the estimate before download. */
  bytesPerTile: number;
  /** Whether the source has tile z/x/y at all (the bundled basemap's coverage); default: every tile. */
  covered?: (z: number, x: number, y: number) => boolean;
}

/** Largest number of tiles one saved area may hold (all sources together). */
export const MAX_AREA_TILES = 5000;

/** Highest zoom the dialog offers (the map's maxZoom). */
export const MAX_AREA_ZOOM = 19;

export interface AreaRequest {
  /** Degrees WGS84, west < east, south < north. */
  bbox: LonLatBBox;
  minZoom: number;
  maxZoom: number;
}

export interface AreaSourcePlan {
  source: OfflineTileSource;
  /** Tile ranges actually requested (native zooms, clipped to the source's bounds), one per native zoom. */
  ranges: TileRange[];
  /** Number of tiles in the ranges (before coverage filtering). */
  tiles: number;
}

export interface AreaPlan {
  sources: AreaSourcePlan[];
  /** Tiles over all sources (before coverage filtering: an upper bound). */
  tiles: number;
  /** Estimated bytes (tiles × each source's typical tile size). */
  estimatedBytes: number;
  /** Why the area cannot be saved, or null. */
  problem: string | null;
}

const rangeSize = (r: TileRange) => (r.xMax - r.xMin + 1) * (r.yMax - r.yMin + 1);

function intersect(a: LonLatBBox, b: LonLatBBox): LonLatBBox | null {
  const w = Math.max(a.west, b.west);
  const e = Math.min(a.east, b.east);
  const s = Math.max(a.south, b.south);
  const n = Math.min(a.north, b.north);
  return w < e && s < n ? { west: w, south: s, east: e, north: n } : null;
}

/** Checks the request; returns the first problem as a sentence, or null. */
export function areaRequestProblem({ bbox, minZoom, maxZoom }: AreaRequest): string | null {
  const { west, south, east, north } = bbox;
  if (![west, south, east, north].every(Number.isFinite)) return "The area's corners are not numbers.";
  if (!(west < east) || !(south < north)) return "The area is empty: draw a box with some width and height.";
  if (west < -180 || east > 180 || south < -90 || north > 90) return "The area runs off the map (longitude −180…180°, latitude −90…90°).";
  if (!Number.isInteger(minZoom) || !Number.isInteger(maxZoom) || minZoom < 0 || maxZoom > MAX_AREA_ZOOM) return `Zoom levels must be whole numbers from 0 to ${MAX_AREA_ZOOM}.`;
  if (minZoom > maxZoom) return `The lowest zoom (${minZoom}) is above the highest (${maxZoom}).`;
  return null;
}

/**
 * The tiles a box and zoom range need from each source, with counts, an estimate and the cap check.
 * Counting is arithmetic on ranges, so a continent at z19 is refused without listing its tiles.
 */
export function planArea(req: AreaRequest, sources: readonly OfflineTileSource[], maxTiles = MAX_AREA_TILES): AreaPlan {
  const problem = areaRequestProblem(req);
  if (problem) return { sources: [], tiles: 0, estimatedBytes: 0, problem };
  const plans: AreaSourcePlan[] = [];
  for (const source of sources) {
    const box = source.bounds ? intersect(req.bbox, source.bounds) : req.bbox;
    if (!box) continue;
    const zooms = new Set<number>();
    for (let z = req.minZoom; z <= req.maxZoom; z++) zooms.add(Math.min(source.maxNativeZoom, Math.max(source.minNativeZoom, z)));
    const ranges = [...zooms].sort((a, b) => a - b).map((z) => tileRangeForBBox(box, z));
    const tiles = ranges.reduce((n, r) => n + rangeSize(r), 0);
    if (tiles > 0) plans.push({ source, ranges, tiles });
  }
  const tiles = plans.reduce((n, p) => n + p.tiles, 0);
  const estimatedBytes = plans.reduce((n, p) => n + p.tiles * p.source.bytesPerTile, 0);
  const tooBig =
    tiles > maxTiles
      ? `This area needs ${tiles.toLocaleString("en")} tiles; one saved area may hold at most ${maxTiles.toLocaleString("en")}. Draw a smaller box or lower the highest zoom (each zoom level up needs about four times the tiles of the one below).`
      : tiles === 0
        ? "No map layer has tiles in this area at these zoom levels."
        : null;
  return { sources: plans, tiles, estimatedBytes, problem: tooBig };
}

/** One tile URL from a template. */
export const tileUrl = (template: string, z: number, x: number, y: number): string =>
  template.replace("{z}", String(z)).replace("{x}", String(x)).replace("{y}", String(y));

/** Every tile URL of a plan, source by source, coarse zooms first, skipping tiles a source does not cover. */
export function planTileUrls(plan: AreaPlan): string[] {
  const out: string[] = [];
  for (const { source, ranges } of plan.sources) {
    for (const r of ranges) {
      for (let x = r.xMin; x <= r.xMax; x++) {
        for (let y = r.yMin; y <= r.yMax; y++) {
          if (!source.covered || source.covered(r.z, x, y)) out.push(tileUrl(source.template, r.z, x, y));
        }
      }
    }
  }
  return out;
}

/** Bytes for people: "840 KB", "12.4 MB", "1.20 GB" (SI units, as storage is sold). */
export function formatBytes(bytes: number): string {
  if (!Number.isFinite(bytes) || bytes < 0) return "—";
  if (bytes < 1000) return `${Math.round(bytes)} B`;
  if (bytes < 1e6) return `${Math.round(bytes / 1e3)} KB`;
  if (bytes < 1e9) return `${(bytes / 1e6).toFixed(bytes < 1e7 ? 2 : 1)} MB`;
  return `${(bytes / 1e9).toFixed(2)} GB`;
}

/** Whether `bytes` more fit the browser's storage budget (StorageManager estimate), keeping `reserve` (10 %) free. */
export function fitsStorage(bytes: number, estimate: { usage?: number; quota?: number } | null, reserve = 0.1): boolean | null {
  if (!estimate?.quota) return null;
  return (estimate.usage ?? 0) + bytes <= estimate.quota * (1 - reserve);
}

/** The Cache Storage cache the service worker serves map tiles from (lib/pwa/sw.ts); saved areas go into it too. */
export const MAP_TILE_CACHE = "map-tiles";

/** Request header marking an area download: the service worker lets it through untouched (the page stores the tile). */
export const OFFLINE_AREA_HEADER = "x-lithodex-offline-area";
