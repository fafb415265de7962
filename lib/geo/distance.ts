import { toRad } from "./angles";
import type { LatLon } from "./coordinates";

/** Mean Earth radius R1 = (2a + b)/3 of WGS84, in metres (IUGG). */
export const EARTH_MEAN_RADIUS_M = 6_371_008.8;

/**
 * Great-circle distance between two positions on a sphere of mean Earth radius (haversine formula).
 * Good to ~0.5 % against the ellipsoid, which is plenty for "is this photo near its station?".
 * @returns metres
 */
export function greatCircleDistanceM(a: LatLon, b: LatLon, radiusM = EARTH_MEAN_RADIUS_M): number {
  const dLat = toRad(b.lat - a.lat);
  const dLon = toRad(b.lon - a.lon);
  const h = Math.sin(dLat / 2) ** 2 + Math.cos(toRad(a.lat)) * Math.cos(toRad(b.lat)) * Math.sin(dLon / 2) ** 2;
  // atan2 keeps precision near the antipode where asin(√h) does not.
  return 2 * radiusM * Math.atan2(Math.sqrt(h), Math.sqrt(Math.max(0, 1 - h)));
}

/** "85 m", "1.24 km": a distance for people. */
export function formatDistance(m: number): string {
  if (m < 1000) return `${Math.round(m)} m`;
  return `${(m / 1000).toFixed(m < 10_000 ? 2 : 1)} km`;
}
