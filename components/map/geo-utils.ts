/** Small map helpers. Degrees WGS84. */
import type { BBox } from "./types";

/** Great-circle distance on a sphere of radius 6 371 008.8 m (IUGG mean Earth radius), metres (haversine). */
export function distanceM(lat1: number, lon1: number, lat2: number, lon2: number): number {
  const r = 6_371_008.8;
  const rad = Math.PI / 180;
  const dLat = (lat2 - lat1) * rad;
  const dLon = (lon2 - lon1) * rad;
  const a = Math.sin(dLat / 2) ** 2 + Math.cos(lat1 * rad) * Math.cos(lat2 * rad) * Math.sin(dLon / 2) ** 2;
  return 2 * r * Math.asin(Math.min(1, Math.sqrt(a)));
}

/** "w,s,e,n" clamped to the world and rounded to 6 decimals — the register's bbox parameter. */
export function bboxParam([w, s, e, n]: BBox): string {
  const c = (v: number, lo: number, hi: number) => (Math.min(hi, Math.max(lo, v))).toFixed(6);
  return [c(w, -180, 180), c(s, -90, 90), c(e, -180, 180), c(n, -90, 90)].join(",");
}

export function inBBox(lat: number, lon: number, [w, s, e, n]: BBox): boolean {
  return lat >= s && lat <= n && lon >= w && lon <= e;
}

export function formatDistance(m: number): string {
  return m < 1000 ? `${Math.round(m)} m` : `${(m / 1000).toFixed(2)} km`;
}

/** Escapes text for Leaflet's attribution control, which inserts HTML. */
export function escapeHtml(s: string): string {
  return s.replace(/[&<>"']/g, (c) => ({ "&": "&amp;", "<": "&lt;", ">": "&gt;", '"': "&quot;", "'": "&#39;" })[c]!);
}
