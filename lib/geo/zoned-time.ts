/**
 * Wall-clock time at a place (IANA zone) ⇄ UTC instant, with Intl only (no tz database bundled). Pure.
 * Used for "collected at 10:05 local time in Europe/Madrid" → 2026-03-14T09:05:00Z.
 */

/** Offset of a zone from UTC at an instant, minutes (e.g. +60 for Europe/Madrid in winter). */
export function zoneOffsetMinutes(instantMs: number, timeZone: string): number {
  const parts = new Intl.DateTimeFormat("en-US", {
    timeZone,
    hourCycle: "h23",
    year: "numeric",
    month: "2-digit",
    day: "2-digit",
    hour: "2-digit",
    minute: "2-digit",
    second: "2-digit",
  }).formatToParts(new Date(instantMs));
  const get = (t: string) => Number(parts.find((p) => p.type === t)?.value);
  const asUtc = Date.UTC(get("year"), get("month") - 1, get("day"), get("hour"), get("minute"), get("second"));
  return Math.round((asUtc - Math.floor(instantMs / 1000) * 1000) / 60_000);
}

/**
 * "2026-03-14T10:05" (local wall time, seconds optional) in `timeZone` → "2026-03-14T09:05:00Z".
 * In a spring-forward gap the time is read with the offset in force the day before; in the repeated
 * autumn hour the earlier instant is chosen. Returns null for an unparseable time.
 */
export function zonedLocalToUtc(local: string, timeZone: string): string | null {
  const m = /^(\d{4})-(\d{2})-(\d{2})T(\d{2}):(\d{2})(?::(\d{2}))?$/.exec(local.trim());
  if (!m) return null;
  const wall = Date.UTC(+m[1], +m[2] - 1, +m[3], +m[4], +m[5], m[6] ? +m[6] : 0);
  if (Number.isNaN(wall)) return null;
  // Try the offsets in force around the wall time; keep those that reproduce it.
  const offsets = [...new Set([zoneOffsetMinutes(wall - 86_400_000, timeZone), zoneOffsetMinutes(wall, timeZone), zoneOffsetMinutes(wall + 86_400_000, timeZone)])];
  const valid = offsets.map((o) => wall - o * 60_000).filter((c) => wall - c === zoneOffsetMinutes(c, timeZone) * 60_000);
  // Repeated autumn hour → the earlier instant; spring-forward gap (none valid) → the offset before the change.
  const t = valid.length ? Math.min(...valid) : wall - offsets[0] * 60_000;
  return new Date(t).toISOString().replace(".000Z", "Z");
}

/** UTC instant → "YYYY-MM-DDTHH:MM" wall time in `timeZone` (for datetime-local inputs). */
export function utcToZonedLocal(iso: string, timeZone: string): string | null {
  const t = Date.parse(iso);
  if (Number.isNaN(t)) return null;
  const local = new Date(t + zoneOffsetMinutes(t, timeZone) * 60_000);
  return local.toISOString().slice(0, 16);
}
