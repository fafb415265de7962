/** Small angle helpers shared by the geo modules. Pure. */

/** Degrees → radians. */
export const toRad = (deg: number): number => (deg * Math.PI) / 180;

/** Radians → degrees. */
export const toDeg = (rad: number): number => (rad * 180) / Math.PI;

/**
 * Wraps an azimuth into [0, 360) degrees; values within 1e-9° of 360 become 0.
 * @param deg - azimuth in degrees (any real number)
 */
export function normalizeAzimuth(deg: number): number {
  const a = ((deg % 360) + 360) % 360;
  return Math.abs(a - 360) < 1e-9 ? 0 : a;
}

/** Smallest absolute difference between two azimuths, in degrees (0–180). */
export function azimuthDifference(a: number, b: number): number {
  const d = Math.abs(normalizeAzimuth(a) - normalizeAzimuth(b));
  return d > 180 ? 360 - d : d;
}
