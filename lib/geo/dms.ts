/**
 * Degrees–minutes–seconds: parse what geologists type (decimal degrees, DMS, degrees + decimal minutes,
 * hemisphere letters before or after, typographic primes) and format it back. Pure.
 */

export type Axis = "lat" | "lon";

export type ParseResult<T> = ({ ok: true } & T) | { ok: false; error: string };

/** One parsed angle: signed decimal degrees and the axis its hemisphere letter names, if any. */
export interface ParsedAngle {
  value: number;
  axis: Axis | null;
}

const HEMI_AXIS: Record<string, Axis> = { N: "lat", S: "lat", E: "lon", W: "lon" };

/** Unifies look-alike symbols: primes/quotes, ordinal and ring marks, "deg", decimal commas inside a number part. */
function normalize(text: string): string {
  return text
    .trim()
    .toUpperCase()
    .replace(/[\u2032\u2019\u2018\u00B4`]/g, "'")
    .replace(/[\u2033\u201D\u201C]/g, '"')
    .replace(/''/g, '"')
    .replace(/[\u00BA\u02DA\u030A]/g, "°")
    .replace(/\s*DEG(REES?)?\s*/g, "°")
    .replace(/[\u2212\u2013]/g, "-")
    .replace(/\s+/g, " ");
}

const SLOT_OF: Record<string, 0 | 1 | 2> = { "°": 0, "'": 1, '"': 2 };

/**
 * Parses one angle such as `37°44'28.3"N`, `N37 44.471`, `-6.621306`, `6°37'16.7" W`.
 * @param axis - when given, a hemisphere letter of the other axis is an error and the range is checked
 */
export function parseAngle(text: string, axis?: Axis): ParseResult<ParsedAngle> {
  const r = parseAngleUnchecked(text, axis);
  if (!r.ok) return r;
  const rangeAxis = axis ?? r.axis;
  if (rangeAxis === "lat" && Math.abs(r.value) > 90) return { ok: false, error: `Latitude ${r.value.toFixed(6)} is outside −90…90°.` };
  if (rangeAxis === "lon" && Math.abs(r.value) > 180) return { ok: false, error: `Longitude ${r.value.toFixed(6)} is outside −180…180°.` };
  if (Math.abs(r.value) > 180) return { ok: false, error: `${r.value.toFixed(6)}° is not a latitude or longitude.` };
  return r;
}

/** parseAngle without the range check (the pair parser checks ranges once it knows which part is which). */
function parseAngleUnchecked(text: string, axis?: Axis): ParseResult<ParsedAngle> {
  let s = normalize(text).replace(/:/g, " ");
  if (!s) return { ok: false, error: "Empty coordinate." };
  let hemi: string | null = null;
  const lead = /^([NSEW])\s*/.exec(s);
  if (lead) {
    hemi = lead[1];
    s = s.slice(lead[0].length);
  }
  const trail = /\s*([NSEW])$/.exec(s);
  if (trail) {
    if (hemi && hemi !== trail[1]) return { ok: false, error: `"${text.trim()}" has two hemisphere letters (${hemi} and ${trail[1]}).` };
    hemi = trail[1];
    s = s.slice(0, s.length - trail[0].length);
  }
  let sign = 1;
  const signMatch = /^([+-])\s*/.exec(s);
  if (signMatch) {
    if (hemi) return { ok: false, error: `"${text.trim()}": use either a sign or a hemisphere letter (${hemi}), not both.` };
    sign = signMatch[1] === "-" ? -1 : 1;
    s = s.slice(signMatch[0].length);
  }
  const parts: (number | undefined)[] = [undefined, undefined, undefined];
  const raw: string[] = ["", "", ""];
  let next = 0;
  let rest = s.trim();
  const token = /^(\d+(?:[.,]\d+)?)\s*([°'"])?\s*/;
  while (rest.length) {
    const m = token.exec(rest);
    if (!m) return { ok: false, error: `"${text.trim()}" is not a coordinate: unexpected "${rest}". Use e.g. 37°44'28.3"N or 37.741194.` };
    const slot = m[2] ? SLOT_OF[m[2]] : next;
    if (slot > 2 || slot < next) return { ok: false, error: `"${text.trim()}": degrees, minutes and seconds must come in that order.` };
    parts[slot] = Number(m[1].replace(",", "."));
    raw[slot] = m[1];
    next = slot + 1;
    rest = rest.slice(m[0].length);
  }
  const [d, mnt, sec] = parts;
  if (d === undefined) return { ok: false, error: `"${text.trim()}" has no degrees.` };
  const given = parts.map((p) => p !== undefined);
  if (given[2] && !given[1]) return { ok: false, error: `"${text.trim()}": seconds without minutes.` };
  const last = given[2] ? 2 : given[1] ? 1 : 0;
  for (let i = 0; i < last; i++) {
    if (/[.,]/.test(raw[i])) return { ok: false, error: `"${text.trim()}": only the last part (degrees, minutes or seconds) may have decimals.` };
  }
  if (mnt !== undefined && mnt >= 60) return { ok: false, error: `"${text.trim()}": minutes must be below 60 (got ${mnt}).` };
  if (sec !== undefined && sec >= 60) return { ok: false, error: `"${text.trim()}": seconds must be below 60 (got ${sec}).` };
  let value = d + (mnt ?? 0) / 60 + (sec ?? 0) / 3600;
  if (hemi === "S" || hemi === "W") value = -value;
  value *= sign;
  const found: Axis | null = hemi ? HEMI_AXIS[hemi] : null;
  if (axis && found && found !== axis) {
    return { ok: false, error: `"${text.trim()}" is a ${found === "lat" ? "latitude (N/S)" : "longitude (E/W)"}, expected a ${axis === "lat" ? "latitude" : "longitude"}.` };
  }
  return { ok: true, value, axis: found };
}

/** Splits a typed position into its latitude and longitude parts, or explains why it cannot. */
function splitPair(s: string): string[] | string {
  if (s.includes(";")) return s.split(";");
  const commas = (s.match(/,/g) ?? []).length;
  if (commas === 1) return s.split(",");
  if (commas > 1) return "Use one comma between latitude and longitude, and dots for decimals.";
  const letters = [...s.matchAll(/[NSEW]/g)];
  if (letters.length === 2) {
    const first = letters[0].index!;
    const cut = first === 0 ? letters[1].index! : first + 1;
    return [s.slice(0, cut), s.slice(cut)];
  }
  if (letters.length === 1 || letters.length > 2) return "Give hemisphere letters for both latitude and longitude (N/S and E/W), or neither.";
  const tokens = s.split(" ").filter(Boolean);
  const degIdx = tokens.map((t, i) => (t.includes("°") ? i : -1)).filter((i) => i >= 0);
  if (degIdx.length === 2 && degIdx[0] === 0) return [tokens.slice(0, degIdx[1]).join(" "), tokens.slice(degIdx[1]).join(" ")];
  if (tokens.length === 2) return tokens;
  const numeric = tokens.every((t) => /^[+-]?\d+(\.\d+)?$/.test(t));
  if (numeric && [2, 4, 6].includes(tokens.length)) {
    const h = tokens.length / 2;
    return [tokens.slice(0, h).join(" "), tokens.slice(h).join(" ")];
  }
  return "Could not tell latitude from longitude. Type e.g. 37.741194, -6.621306 or 37°44'28.3\"N 6°37'16.7\"W.";
}

/**
 * Parses a position typed as decimal degrees or DMS, latitude first unless hemisphere letters say otherwise.
 * Accepts `37.741194, -6.621306`, `37°44'28.3"N 6°37'16.7"W`, `N37 44.471 W6 37.278`, `6°37'16.7"W 37°44'28.3"N`.
 */
export function parseLatLon(text: string): ParseResult<{ lat: number; lon: number }> {
  const s = normalize(text);
  if (!s) return { ok: false, error: "Type a position, e.g. 37.741194, -6.621306." };
  const split = splitPair(s);
  if (typeof split === "string") return { ok: false, error: split };
  const [a, b] = split.map((p) => parseAngleUnchecked(p));
  if (!a.ok) return a;
  if (!b.ok) return b;
  let lat: ParsedAngle;
  let lon: ParsedAngle;
  if (a.axis === "lon" || b.axis === "lat") [lat, lon] = [b, a];
  else [lat, lon] = [a, b];
  if (lat.axis === "lon" || lon.axis === "lat") return { ok: false, error: "Both parts name the same axis: give one latitude (N/S) and one longitude (E/W)." };
  if (Math.abs(lat.value) > 90) return { ok: false, error: `Latitude ${lat.value.toFixed(6)} is outside −90…90°.` };
  if (Math.abs(lon.value) > 180) return { ok: false, error: `Longitude ${lon.value.toFixed(6)} is outside −180…180°.` };
  return { ok: true, lat: lat.value, lon: lon.value };
}

/** Degrees, minutes and seconds of |value|, with rounding carried (59.96″ → next minute). */
export function toDms(value: number, secondDecimals = 1): { deg: number; min: number; sec: number } {
  const f = 10 ** secondDecimals;
  let totalSec = Math.round(Math.abs(value) * 3600 * f) / f;
  const deg = Math.floor(totalSec / 3600 + 1e-12);
  totalSec -= deg * 3600;
  const min = Math.floor(totalSec / 60 + 1e-12);
  const sec = Math.round((totalSec - min * 60) * f) / f;
  return { deg, min, sec };
}

/**
 * `37°44'28.3"N` — one angle in DMS with its hemisphere letter.
 * @param secondDecimals - decimals of the seconds; 1 ≈ 3 m. @default 1
 */
export function formatDms(value: number, axis: Axis, secondDecimals = 1): string {
  const { deg, min, sec } = toDms(value, secondDecimals);
  const hemi = axis === "lat" ? (value < 0 ? "S" : "N") : value < 0 ? "W" : "E";
  return `${deg}°${String(min).padStart(2, "0")}'${sec.toFixed(secondDecimals).padStart(secondDecimals ? 3 + secondDecimals : 2, "0")}"${hemi}`;
}

/** `37°44'28.3"N 6°37'16.7"W` */
export function formatDmsPair(lat: number, lon: number, secondDecimals = 1): string {
  return `${formatDms(lat, "lat", secondDecimals)} ${formatDms(lon, "lon", secondDecimals)}`;
}
