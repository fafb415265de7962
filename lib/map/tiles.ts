/**
 * Web Mercator (EPSG:3857, spherical) tile arithmetic for XYZ-addressed raster tiles.
 *
 * The projection formulas come from @mapbox/tilebelt (`pointToTileFraction`, `tileToBBOX`); this module keeps the
 * input checks, the clamping at the edges of the square world and the inclusive box → tile ranges its callers rely on.
 * Pure functions: no I/O, no framework imports. Longitudes and latitudes in decimal degrees (WGS84),
 * tile columns `x` from the antimeridian eastwards, rows `y` from the north edge (XYZ / "slippy map"
 * addressing); `tmsRow` converts to TMS / MBTiles rows, which count from the south.
 */

import { pointToTileFraction, tileToBBOX } from "@mapbox/tilebelt";

/** Northern/southern limit of the square Web Mercator world, degrees: atan(sinh(π)). */
export const MERCATOR_MAX_LAT = (Math.atan(Math.sinh(Math.PI)) * 180) / Math.PI;

/** Highest zoom level accepted by these helpers (2^30 tiles per axis still fits a safe integer). */
export const MAX_TILE_ZOOM = 30;

/** A tile address in XYZ scheme (y = 0 at the north edge). */
export interface TileXY {
  x: number;
  y: number;
}

/** A geographic position, decimal degrees WGS84. */
export interface LonLat {
  lon: number;
  lat: number;
}

/** A longitude/latitude box, decimal degrees WGS84 (west < east; no antimeridian crossing). */
export interface LonLatBBox {
  west: number;
  south: number;
  east: number;
  north: number;
}

/** Inclusive range of tile columns and rows at one zoom level. */
export interface TileRange {
  z: number;
  xMin: number;
  xMax: number;
  yMin: number;
  yMax: number;
}

function assertZoom(z: number): void {
  if (!Number.isInteger(z) || z < 0 || z > MAX_TILE_ZOOM) {
    throw new RangeError(`zoom must be an integer from 0 to ${MAX_TILE_ZOOM}, got ${z}`);
  }
}

function assertLonLat(lon: number, lat: number): void {
  if (!Number.isFinite(lon) || lon < -180 || lon > 180) {
    throw new RangeError(`longitude must be a number from -180 to 180 degrees, got ${lon}`);
  }
  if (!Number.isFinite(lat) || lat < -90 || lat > 90) {
    throw new RangeError(`latitude must be a number from -90 to 90 degrees, got ${lat}`);
  }
}

function assertTile(x: number, y: number, z: number): void {
  assertZoom(z);
  const n = 2 ** z;
  if (!Number.isInteger(x) || x < 0 || x >= n) {
    throw new RangeError(`tile column x must be an integer from 0 to ${n - 1} at zoom ${z}, got ${x}`);
  }
  if (!Number.isInteger(y) || y < 0 || y >= n) {
    throw new RangeError(`tile row y must be an integer from 0 to ${n - 1} at zoom ${z}, got ${y}`);
  }
}

/**
 * Fractional Web Mercator position in "world pixels" at zoom `z`: the whole world is
 * `tileSize · 2^z` pixels square, origin at the north-west corner (lon −180°, lat +85.0511°).
 * Latitudes beyond ±{@link MERCATOR_MAX_LAT} are clamped to the edge of the square world.
 *
 * @param lon - longitude, degrees (−180 … 180)
 * @param lat - latitude, degrees (−90 … 90)
 * @param z - zoom level (integer 0 … 30)
 * @param tileSize - tile edge in pixels. @default 256
 * @returns `{ px, py }` in pixels, `py` growing southwards
 */
export function lonLatToWorldPixel(
  lon: number,
  lat: number,
  z: number,
  tileSize = 256,
): { px: number; py: number } {
  assertLonLat(lon, lat);
  assertZoom(z);
  const n = 2 ** z;
  const [fx, fy] = pointToTileFraction(lon, Math.max(-MERCATOR_MAX_LAT, Math.min(MERCATOR_MAX_LAT, lat)), z);
  // tilebelt wraps x into [0, 2^z); lon 180° is the east edge of the world here, not its west edge.
  const x = lon === 180 ? n : fx;
  return { px: x * tileSize, py: Math.min(n, Math.max(0, fy)) * tileSize };
}

/**
 * Tile containing a position: `x = ⌊(lon+180)/360 · 2^z⌋`, `y = ⌊(1 − asinh(tan φ)/π)/2 · 2^z⌋`.
 * A point on the east edge (lon 180°) or at/after the Mercator limit falls in the last column/row.
 *
 * @param lon - longitude, degrees (−180 … 180)
 * @param lat - latitude, degrees (−90 … 90; clamped to ±85.0511°)
 * @param z - zoom level (integer 0 … 30)
 */
export function lonLatToTile(lon: number, lat: number, z: number): TileXY {
  const { px, py } = lonLatToWorldPixel(lon, lat, z, 1);
  const last = 2 ** z - 1;
  return {
    x: Math.min(last, Math.max(0, Math.floor(px))),
    y: Math.min(last, Math.max(0, Math.floor(py))),
  };
}

/**
 * Position of a tile's north-west corner (the inverse of {@link lonLatToTile} at tile corners).
 * `x` and `y` may be `2^z` to address the east/south edge of the world.
 *
 * @param x - tile column (0 … 2^z)
 * @param y - tile row, XYZ scheme (0 … 2^z)
 * @param z - zoom level (integer 0 … 30)
 * @returns corner longitude and latitude, degrees
 */
export function tileToLonLat(x: number, y: number, z: number): LonLat {
  assertZoom(z);
  const n = 2 ** z;
  if (!Number.isFinite(x) || x < 0 || x > n) {
    throw new RangeError(`tile column x must be from 0 to ${n} at zoom ${z}, got ${x}`);
  }
  if (!Number.isFinite(y) || y < 0 || y > n) {
    throw new RangeError(`tile row y must be from 0 to ${n} at zoom ${z}, got ${y}`);
  }
  const lon = (x / n) * 360 - 180;
  const lat = (Math.atan(Math.sinh(Math.PI * (1 - (2 * y) / n))) * 180) / Math.PI;
  return { lon, lat };
}

/**
 * Geographic bounds of one tile.
 *
 * @param x - tile column (integer 0 … 2^z − 1)
 * @param y - tile row, XYZ scheme (integer 0 … 2^z − 1)
 * @param z - zoom level (integer 0 … 30)
 * @returns west/east longitudes and south/north latitudes, degrees
 */
export function tileBounds(x: number, y: number, z: number): LonLatBBox {
  assertTile(x, y, z);
  const [west, south, east, north] = tileToBBOX([x, y, z]);
  return { west, south, east, north };
}

/**
 * TMS / MBTiles row of an XYZ row: `row = 2^z − 1 − y` (TMS counts rows from the south edge).
 * The mapping is its own inverse.
 *
 * @param y - tile row, XYZ scheme (integer 0 … 2^z − 1)
 * @param z - zoom level (integer 0 … 30)
 */
export function tmsRow(y: number, z: number): number {
  assertTile(0, y, z);
  return 2 ** z - 1 - y;
}

/**
 * Inclusive range of tiles that intersect a longitude/latitude box at one zoom level.
 *
 * @param bbox - box in degrees; `west < east`, `south < north`
 * @param z - zoom level (integer 0 … 30)
 */
export function tileRangeForBBox(bbox: LonLatBBox, z: number): TileRange {
  const { west, south, east, north } = bbox;
  if (!(west < east) || !(south < north)) {
    throw new RangeError(
      `bbox must have west < east and south < north, got W ${west} S ${south} E ${east} N ${north}`,
    );
  }
  const nw = lonLatToTile(west, north, z);
  const se = lonLatToTile(east, south, z);
  // A box edge lying exactly on a tile edge does not pull in the next tile.
  const n = 2 ** z;
  const xEnd = ((east + 180) / 360) * n;
  const yEnd = lonLatToWorldPixel(east, south, z, 1).py;
  const xMax = Number.isInteger(xEnd) && xEnd > nw.x ? xEnd - 1 : se.x;
  const yMax = Number.isInteger(yEnd) && yEnd > nw.y ? yEnd - 1 : se.y;
  return { z, xMin: nw.x, xMax: Math.min(xMax, n - 1), yMin: nw.y, yMax: Math.min(yMax, n - 1) };
}
