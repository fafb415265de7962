/**
 * The one date/time formatter of the app and its exports (issue 11 §6). Pages show instants in the project's time
 * zone as "YYYY-MM-DD HH:mm" followed by the zone's abbreviation (UTC, CET, GMT-3…); dates alone are the local
 * calendar date in that zone. Files (CSV, JSON, GeoJSON) carry ISO 8601 instants in UTC (isoUtc). Pure; works in the
 * browser and on the server (Intl with full ICU, Node ≥ 13).
 */

export type DateInput = string | number | Date | null | undefined;

function toDate(v: DateInput): Date | null {
  if (v === null || v === undefined || v === "") return null;
  const d = v instanceof Date ? v : new Date(v);
  return Number.isNaN(d.getTime()) ? null : d;
}

/** A zone Intl knows, else UTC (a stored zone may be missing or mistyped). */
export function safeZone(zone: string | null | undefined): string {
  if (!zone) return "UTC";
  try {
    new Intl.DateTimeFormat("en", { timeZone: zone });
    return zone;
  } catch {
    return "UTC";
  }
}

const partsCache = new Map<string, Intl.DateTimeFormat>();
function formatter(zone: string): Intl.DateTimeFormat {
  let f = partsCache.get(zone);
  if (!f) {
    f = new Intl.DateTimeFormat("en-GB", { timeZone: zone, hourCycle: "h23", year: "numeric", month: "2-digit", day: "2-digit", hour: "2-digit", minute: "2-digit", timeZoneName: "short" });
    partsCache.set(zone, f);
  }
  return f;
}

/** Calendar and clock fields of an instant in a zone, and the zone's short name at that instant. */
export function zonedParts(d: Date, zone: string): { date: string; time: string; zoneName: string } {
  const z = safeZone(zone);
  const parts = formatter(z).formatToParts(d);
  const get = (t: Intl.DateTimeFormatPartTypes) => parts.find((p) => p.type === t)?.value ?? "";
  const zoneName = z === "UTC" ? "UTC" : get("timeZoneName");
  return { date: `${get("year")}-${get("month")}-${get("day")}`, time: `${get("hour")}:${get("minute")}`, zoneName };
}

/** "2026-03-20 10:00 CET": an instant on a page, in the project's zone (UTC when none). "—" for nothing. */
export function formatDateTime(v: DateInput, zone?: string | null): string {
  const d = toDate(v);
  if (!d) return v ? String(v) : "—";
  const p = zonedParts(d, zone ?? "UTC");
  return `${p.date} ${p.time} ${p.zoneName}`;
}

/** "2026-03-20": the local calendar date of an instant in the zone (a sample collected at 23:30 local keeps its day). */
export function formatLocalDate(v: DateInput, zone?: string | null): string {
  const d = toDate(v);
  if (!d) return v ? String(v) : "—";
  return zonedParts(d, zone ?? "UTC").date;
}

/** ISO 8601 instant in UTC with seconds ("2026-03-20T09:00:00Z") for files; "" for nothing. */
export function isoUtc(v: DateInput): string {
  const d = toDate(v);
  return d ? `${d.toISOString().slice(0, 19)}Z` : "";
}
