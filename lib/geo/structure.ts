/**
 * Structural geology conversions: strike (right-hand rule) ⇄ dip direction, plane/line validation,
 * unit vectors, pole to plane, rake → trend/plunge and the "lineation lies in its plane" check.
 * Axes are East, North, Up. Angles in degrees. Pure.
 */
import { normalizeAzimuth, toDeg, toRad } from "./angles";

/** A plane as dip direction / dip (degrees). */
export interface Plane {
  /** azimuth of the dip direction, 0–360 */
  dipDirection: number;
  /** 0 (horizontal) – 90 (vertical) */
  dip: number;
}

/** A line as trend / plunge (degrees). */
export interface Line {
  /** azimuth of the down-plunge direction, 0–360 */
  trend: number;
  /** 0 (horizontal) – 90 (vertical) */
  plunge: number;
}

export type Vec3 = readonly [number, number, number];

/** Right-hand-rule strike → dip direction: `(strike + 90) mod 360`. 030/40 RHR dips toward 120. */
export const dipDirectionFromStrike = (strikeRhr: number): number => normalizeAzimuth(strikeRhr + 90);

/** Dip direction → right-hand-rule strike: `(dipDirection − 90) mod 360`. */
export const strikeFromDipDirection = (dipDirection: number): number => normalizeAzimuth(dipDirection - 90);

/** Why an azimuth is unusable (must be 0 ≤ a < 360, 360 is accepted as 0), or null. */
export function azimuthProblem(value: number, name = "Azimuth"): string | null {
  if (!Number.isFinite(value)) return `${name} must be a number.`;
  if (value < 0 || value > 360) return `${name} must be between 0 and 360° (got ${value}).`;
  return null;
}

/** Why an inclination (dip or plunge) is unusable (must be 0–90°), or null. */
export function inclinationProblem(value: number, name = "Dip"): string | null {
  if (!Number.isFinite(value)) return `${name} must be a number.`;
  if (value < 0 || value > 90) return `${name} must be between 0 and 90° (got ${value}).`;
  return null;
}

/** Why a rake (pitch) is unusable (0–180° from the strike direction), or null. */
export function rakeProblem(value: number): string | null {
  if (!Number.isFinite(value)) return "Rake must be a number.";
  if (value < 0 || value > 180) return `Rake must be between 0 and 180° from the strike direction (got ${value}).`;
  return null;
}

/** Unit vector of a line pointing down-plunge: (cos p sin t, cos p cos t, −sin p). */
export function lineVector({ trend, plunge }: Line): Vec3 {
  const t = toRad(trend);
  const p = toRad(plunge);
  return [Math.cos(p) * Math.sin(t), Math.cos(p) * Math.cos(t), -Math.sin(p)];
}

/** Upward unit normal of a plane: (sin δ sin dd, sin δ cos dd, cos δ). */
export function planeNormal({ dipDirection, dip }: Plane): Vec3 {
  const dd = toRad(dipDirection);
  const d = toRad(dip);
  return [Math.sin(d) * Math.sin(dd), Math.sin(d) * Math.cos(dd), Math.cos(d)];
}

/** A vector → trend/plunge of the line it spans (taken pointing down; horizontal lines keep their azimuth). */
export function lineFromVector(v: Vec3): Line {
  let [e, n, u] = v;
  const len = Math.hypot(e, n, u);
  if (len === 0) throw new RangeError("Zero vector has no direction.");
  [e, n, u] = [e / len, n / len, u / len];
  if (u > 0) [e, n, u] = [-e, -n, -u];
  const plunge = toDeg(Math.asin(Math.min(1, -u)));
  const trend = Math.hypot(e, n) < 1e-12 ? 0 : normalizeAzimuth(toDeg(Math.atan2(e, n)));
  return { trend, plunge };
}

/** Pole (normal) to a plane as a line: trend dd + 180, plunge 90 − δ. */
export function poleToPlane({ dipDirection, dip }: Plane): Line {
  return { trend: normalizeAzimuth(dipDirection + 180), plunge: 90 - dip };
}

/** The plane whose pole is this line: dip direction = trend + 180, dip = 90 − plunge. */
export function planeFromPole({ trend, plunge }: Line): Plane {
  return { dipDirection: normalizeAzimuth(trend + 180), dip: 90 - plunge };
}

/**
 * A line lying in a plane, `rake` degrees from the right-hand-rule strike direction measured down in the plane.
 * Plane 120/40 (strike 030) with rake 45 → trend ≈ 067.5, plunge ≈ 27.0.
 */
export function lineFromRake(plane: Plane, rake: number): Line {
  const strike = toRad(strikeFromDipDirection(plane.dipDirection));
  const s: Vec3 = [Math.sin(strike), Math.cos(strike), 0];
  const d = lineVector({ trend: plane.dipDirection, plunge: plane.dip });
  const r = toRad(rake);
  return lineFromVector([Math.cos(r) * s[0] + Math.sin(r) * d[0], Math.cos(r) * s[1] + Math.sin(r) * d[1], Math.cos(r) * s[2] + Math.sin(r) * d[2]]);
}

/** Angle between a line and a plane, degrees (0 = in the plane, 90 = along the pole). */
export function angleLineToPlane(line: Line, plane: Plane): number {
  const a = lineVector(line);
  const n = planeNormal(plane);
  const dot = Math.abs(a[0] * n[0] + a[1] * n[1] + a[2] * n[2]);
  const cross = Math.hypot(a[1] * n[2] - a[2] * n[1], a[2] * n[0] - a[0] * n[2], a[0] * n[1] - a[1] * n[0]);
  // 90° minus the angle to the normal; atan2 of |a×n| and |a·n| is precise at both ends.
  return 90 - toDeg(Math.atan2(cross, dot));
}

/**
 * Does a lineation measured on a plane lie in it? Requires |line·normal| < sin(tolerance).
 * @param toleranceDeg - allowed angle off the plane. @default 10
 */
export function lineLiesInPlane(line: Line, plane: Plane, toleranceDeg = 10): boolean {
  return angleLineToPlane(line, plane) < toleranceDeg;
}

/** "030/40" or "120/40": zero-padded three-digit azimuth / two-digit inclination. */
export function formatAttitude(azimuth: number, inclination: number): string {
  return `${String(Math.round(normalizeAzimuth(azimuth)) % 360).padStart(3, "0")}/${String(Math.round(inclination)).padStart(2, "0")}`;
}

/**
 * Quadrant bearing (import only): "N30E" → 30, "S45W" → 225, "N10W" → 350.
 * @returns azimuth in degrees, or null when the text is not a quadrant bearing
 */
export function parseQuadrantBearing(text: string): number | null {
  const m = /^\s*([NS])\s*(\d+(?:\.\d+)?)\s*°?\s*([EW])\s*$/i.exec(text);
  if (!m) return null;
  const a = Number(m[2]);
  if (a > 90) return null;
  const ns = m[1].toUpperCase();
  const ew = m[3].toUpperCase();
  if (ns === "N") return normalizeAzimuth(ew === "E" ? a : 360 - a);
  return ew === "E" ? 180 - a : 180 + a;
}
