/** WGS84 latitude/longitude checks and plain decimal formatting. Pure. */

/** A WGS84 position in decimal degrees (EPSG:4326; latitude first). */
export interface LatLon {
  /** degrees, −90 (south) … 90 (north) */
  lat: number;
  /** degrees, −180 (west) … 180 (east) */
  lon: number;
}

/** Why a latitude is unusable, or null when it is fine. */
export function latitudeProblem(lat: number): string | null {
  if (!Number.isFinite(lat)) return "Latitude must be a number.";
  if (lat < -90 || lat > 90) return `Latitude ${lat} is outside −90…90°.`;
  return null;
}

/** Why a longitude is unusable, or null when it is fine. */
export function longitudeProblem(lon: number): string | null {
  if (!Number.isFinite(lon)) return "Longitude must be a number.";
  if (lon < -180 || lon > 180) return `Longitude ${lon} is outside −180…180°.`;
  return null;
}

/** True when both numbers form a valid WGS84 position. */
export function isValidLatLon(lat: number, lon: number): boolean {
  return latitudeProblem(lat) === null && longitudeProblem(lon) === null;
}

/**
 * Rounds to a fixed number of decimals (6 decimals ≈ 0.11 m of latitude).
 * @param decimals - @default 6
 */
export function roundDegrees(deg: number, decimals = 6): number {
  const f = 10 ** decimals;
  return Math.round(deg * f) / f;
}

/**
 * "37.741194, -6.621306": signed decimal degrees, latitude first, as typed into most tools.
 * @param decimals - @default 6
 */
export function formatDecimalPair(lat: number, lon: number, decimals = 6): string {
  return `${lat.toFixed(decimals)}, ${lon.toFixed(decimals)}`;
}
