/**
 * Reading single CSV cells into typed values, with a message saying why a cell is refused. Pure.
 */

/** A parsed cell: the value, or the reason it could not be read. */
export type CellResult<T> = { ok: true; value: T } | { ok: false; message: string };

const ok = <T>(value: T): CellResult<T> => ({ ok: true, value });
const fail = (message: string): CellResult<never> => ({ ok: false, message });

/**
 * A decimal number. With `decimalComma` a comma is the decimal separator ("37,7123"); a point is
 * accepted too when the cell has no comma. Thousands separators, units and exponents are refused
 * rather than guessed. The Unicode minus sign (U+2212) is read as "-".
 *
 * @param raw - the cell text (already trimmed)
 * @param decimalComma - whether "," is the decimal separator. @default false
 */
export function parseDecimal(raw: string, decimalComma = false): CellResult<number> {
  const s = raw.replace(/\u2212/g, "-");
  if (/^[+-]?\d+(\.\d+)?$/.test(s)) return ok(Number(s));
  if (/^[+-]?\d+,\d+$/.test(s)) {
    return decimalComma ? ok(Number(s.replace(",", "."))) : fail(`"${raw}" uses a decimal comma; use a point (37.5) or choose "decimal comma" for this file.`);
  }
  if (/^[+-]?\.\d+$/.test(s)) return ok(Number(s));
  return fail(`"${raw}" is not a plain decimal number.`);
}

const TRUE = new Set(["true", "yes", "y", "1", "x"]);
const FALSE = new Set(["false", "no", "n", "0"]);

/** yes/no, true/false, y/n, 1/0 (case-insensitive); "x" counts as a tick. */
export function parseBoolean(raw: string): CellResult<boolean> {
  const v = raw.toLowerCase();
  if (TRUE.has(v)) return ok(true);
  if (FALSE.has(v)) return ok(false);
  return fail(`"${raw}" is not yes/no (also accepted: true/false, y/n, 1/0).`);
}

/** A value from a code list, matched case-insensitively against keys and labels. */
export function parseEnum(raw: string, values: Record<string, string>): CellResult<string> {
  const v = values[raw.toLowerCase().replace(/\s+/g, " ")];
  if (v) return ok(v);
  const keys = [...new Set(Object.values(values))];
  return fail(`"${raw}" is not one of: ${keys.join(", ")}.`);
}

/** Whether the runtime knows an IANA zone name. */
export function isKnownZone(tz: string): boolean {
  let known = zoneCache.get(tz);
  if (known === undefined) {
    try {
      new Intl.DateTimeFormat("en", { timeZone: tz });
      known = true;
    } catch {
      known = false;
    }
    if (zoneCache.size < 1000) zoneCache.set(tz, known);
  }
  return known;
}

/** Building an Intl formatter costs ~0.1 ms; an import asks about the same few zones thousands of times. */
const zoneCache = new Map<string, boolean>();
const formatterCache = new Map<string, Intl.DateTimeFormat>();

function zoneFormatter(tz: string): Intl.DateTimeFormat {
  let f = formatterCache.get(tz);
  if (!f) {
    f = new Intl.DateTimeFormat("en-US", { timeZone: tz, hourCycle: "h23", year: "numeric", month: "2-digit", day: "2-digit", hour: "2-digit", minute: "2-digit", second: "2-digit" });
    if (formatterCache.size < 100) formatterCache.set(tz, f);
  }
  return f;
}

/** Offset of `tz` from UTC at instant `utcMs`, in milliseconds (positive east of Greenwich). */
function zoneOffsetMs(utcMs: number, tz: string): number {
  const parts = zoneFormatter(tz).formatToParts(new Date(utcMs));
  const n = (t: string) => Number(parts.find((p) => p.type === t)?.value);
  const asUtc = Date.UTC(n("year"), n("month") - 1, n("day"), n("hour"), n("minute"), n("second"));
  return asUtc - Math.floor(utcMs / 1000) * 1000;
}

/**
 * UTC instant of a wall-clock time in an IANA zone. A time skipped by a daylight-saving jump is
 * refused; an ambiguous one (the repeated hour) takes the earlier instant.
 *
 * @returns epoch milliseconds, or null when that local time does not exist in the zone
 */
export function zonedLocalToUtcMs(y: number, mo: number, d: number, h: number, mi: number, s: number, tz: string): number | null {
  const local = Date.UTC(y, mo - 1, d, h, mi, s);
  const candidates = new Set<number>();
  for (const probe of [local - 86_400_000, local, local + 86_400_000]) candidates.add(local - zoneOffsetMs(probe, tz));
  const hits = [...candidates].filter((t) => t + zoneOffsetMs(t, tz) === local).sort((a, b) => a - b);
  return hits.length ? hits[0] : null;
}

const WITH_OFFSET = /^\d{4}-\d{2}-\d{2}[T ]\d{2}:\d{2}(:\d{2}(\.\d+)?)?(Z|[+-]\d{2}:\d{2})$/i;
const LOCAL = /^(\d{4})-(\d{2})-(\d{2})[T ](\d{2}):(\d{2})(?::(\d{2}))?$/;

/**
 * A collection instant as ISO 8601 UTC. Accepts a date-time with offset ("2026-03-14T10:05:00+01:00",
 * "…Z"), or a local date-time without offset when the row names its IANA time zone. A bare date is
 * refused: inventing a time would be silent nonsense.
 *
 * @param raw - the cell text (already trimmed)
 * @param tz - the row's IANA zone, if any
 */
export function parseInstant(raw: string, tz: string | null): CellResult<string> {
  if (WITH_OFFSET.test(raw)) {
    const t = Date.parse(raw.replace(" ", "T"));
    if (Number.isNaN(t)) return fail(`"${raw}" is not a real date-time.`);
    return ok(new Date(t).toISOString().replace(".000Z", "Z"));
  }
  const m = LOCAL.exec(raw);
  if (m) {
    if (!tz) return fail(`"${raw}" has no UTC offset; add one (e.g. ${raw.replace(" ", "T")}+01:00) or give the row a collected_tz such as Europe/Madrid.`);
    const [y, mo, d, h, mi, s] = m.slice(1).map((v) => Number(v ?? 0));
    if (mo < 1 || mo > 12 || d < 1 || d > 31 || h > 23 || mi > 59 || s > 59) return fail(`"${raw}" is not a real date-time.`);
    const probe = new Date(Date.UTC(y, mo - 1, d));
    if (probe.getUTCMonth() !== mo - 1) return fail(`"${raw}" is not a real date.`);
    const t = zonedLocalToUtcMs(y, mo, d, h, mi, s, tz);
    if (t === null) return fail(`${raw} does not exist in ${tz} (clocks jumped forward).`);
    return ok(new Date(t).toISOString().replace(".000Z", "Z"));
  }
  if (/^\d{4}-\d{2}-\d{2}$/.test(raw)) return fail(`"${raw}" is a date without a time; give the time too, e.g. ${raw}T10:00:00Z, or leave the cell empty.`);
  return fail(`"${raw}" is not an ISO 8601 date-time such as 2026-03-14T10:05:00Z.`);
}
