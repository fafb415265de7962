/**
 * What the bundled offline basemap (`public/tiles-offline/{z}/{x}/{y}.png`) covers.
 *
 * The tiles are generated once by `npx tsx scripts/make-offline-tiles.ts`, which reads this
 * coverage, so the map, the generator and the tests agree on which tiles exist. Pure data and
 * arithmetic: no I/O.
 */
import { MERCATOR_MAX_LAT, tileRangeForBBox, type LonLatBBox, type TileRange } from "./tiles";

/** One block of the coverage: every tile intersecting `bbox` at each zoom `minZoom … maxZoom`. */
export interface OfflineCoverageBlock {
  /** Short name used in logs and the folder README. */
  name: "world" | "iberia" | "surroundings" | "district";
  minZoom: number;
  maxZoom: number;
  /** Degrees WGS84. */
  bbox: LonLatBBox;
}

/** The demo district (Iberian Pyrite Belt, Huelva province, Spain), degrees WGS84. */
export const OFFLINE_DISTRICT_BBOX: LonLatBBox = { west: -6.78, south: 37.58, east: -6.42, north: 37.78 };

/**
 * Blocks generated, from coarse to fine. Each finer block lies inside the coarser ones, so zooming
 * in over the district never hits a missing tile.
 */
export const OFFLINE_TILE_COVERAGE: readonly OfflineCoverageBlock[] = [
  {
    name: "world",
    minZoom: 0,
    maxZoom: 5,
    bbox: { west: -180, south: -MERCATOR_MAX_LAT, east: 180, north: MERCATOR_MAX_LAT },
  },
  { name: "iberia", minZoom: 6, maxZoom: 9, bbox: { west: -10, south: 35.5, east: 4.5, north: 44 } },
  { name: "surroundings", minZoom: 10, maxZoom: 12, bbox: { west: -7.6, south: 36.9, east: -5.6, north: 38.4 } },
  { name: "district", minZoom: 13, maxZoom: 15, bbox: OFFLINE_DISTRICT_BBOX },
];

/** Lowest and highest zoom with offline tiles. */
export const OFFLINE_MIN_ZOOM = 0;
export const OFFLINE_MAX_ZOOM = 15;

/** URL template of the tiles as served from `public/` (XYZ, y = 0 at the north edge). */
export const OFFLINE_TILE_URL_TEMPLATE = "/tiles-offline/{z}/{x}/{y}.png";

/** Tile edge, pixels. */
export const OFFLINE_TILE_SIZE = 256;

/** Attribution to show with the basemap. */
export const OFFLINE_TILE_ATTRIBUTION =
  "Basemap: Lithodex offline tiles from Natural Earth (public domain) and GSHHG rivers (LGPL); UTM 29N grid (WGS84)";

/** The tile range at each generated zoom level, ascending by zoom. */
export function offlineTileRanges(): TileRange[] {
  const ranges: TileRange[] = [];
  for (const block of OFFLINE_TILE_COVERAGE) {
    for (let z = block.minZoom; z <= block.maxZoom; z++) ranges.push(tileRangeForBBox(block.bbox, z));
  }
  return ranges.sort((a, b) => a.z - b.z);
}

/** Whether the offline basemap has tile `z/x/y` (XYZ scheme). */
export function hasOfflineTile(z: number, x: number, y: number): boolean {
  return offlineTileRanges().some((r) => r.z === z && x >= r.xMin && x <= r.xMax && y >= r.yMin && y <= r.yMax);
}

/** Number of tiles the coverage promises, in total and per zoom level. */
export function offlineTileCount(): { total: number; perZoom: Record<number, number> } {
  const perZoom: Record<number, number> = {};
  let total = 0;
  for (const r of offlineTileRanges()) {
    const count = (r.xMax - r.xMin + 1) * (r.yMax - r.yMin + 1);
    perZoom[r.z] = count;
    total += count;
  }
  return { total, perZoom };
}
