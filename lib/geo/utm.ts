/**
 * WGS84 ⇄ UTM with proj4, with the zone rules field maps use: standard 6° zones, the Norway (32V) and
 * Svalbard (31X/33X/35X/37X) exceptions, latitude bands C…X, and an explicit hemisphere (band "S" is
 * northern!). Pure: proj4 is plain JavaScript, so this runs in the browser too.
 */
import proj4 from "proj4";

export type Hemisphere = "N" | "S";

/** A UTM coordinate. Easting/northing in metres. */
export interface Utm {
  /** 1–60 */
  zone: number;
  /** Latitude band letter C…X (no I or O); X spans 72–84° N. */
  band: string;
  /** Hemisphere, stated explicitly: N (false northing 0) or S (false northing 10 000 000 m). */
  hemisphere: Hemisphere;
  /** metres, false easting 500 000 */
  easting: number;
  /** metres */
  northing: number;
  /** EPSG code of the zone: 326zz (north) or 327zz (south). */
  epsg: number;
}

/** UTM is defined from 80° S to 84° N; beyond are the polar (UPS) grids. */
export const UTM_MIN_LAT = -80;
export const UTM_MAX_LAT = 84;

const BANDS = "CDEFGHJKLMNPQRSTUVWX";

export class UtmRangeError extends RangeError {
  constructor(message: string) {
    super(message);
    this.name = "UtmRangeError";
  }
}

function checkLatLon(lat: number, lon: number): void {
  if (!Number.isFinite(lat) || !Number.isFinite(lon)) throw new UtmRangeError("Latitude and longitude must be numbers.");
  if (lon < -180 || lon > 180) throw new UtmRangeError(`Longitude ${lon} is outside −180…180°.`);
  if (lat < UTM_MIN_LAT || lat > UTM_MAX_LAT) {
    throw new UtmRangeError(`UTM covers 80° S to 84° N; latitude ${lat} needs the polar (UPS) grid.`);
  }
}

/** Latitude band letter (8° bands from 80° S; X is 12° tall, 72–84° N). */
export function utmBand(lat: number): string {
  if (lat < UTM_MIN_LAT || lat > UTM_MAX_LAT) throw new UtmRangeError(`No UTM band at latitude ${lat}.`);
  return BANDS[Math.min(19, Math.floor((lat + 80) / 8))];
}

/**
 * The UTM zone of a position: `floor((lon + 180) / 6) + 1`, with the Norway and Svalbard exceptions.
 * Longitude 180 belongs to zone 60.
 */
export function utmZone(lat: number, lon: number): number {
  checkLatLon(lat, lon);
  let zone = Math.min(60, Math.floor((lon + 180) / 6) + 1);
  // Norway: band V, 3–12° E is zone 32.
  if (lat >= 56 && lat < 64 && lon >= 3 && lon < 12) zone = 32;
  // Svalbard: band X, zones 32, 34 and 36 are not used.
  if (lat >= 72) {
    if (lon >= 0 && lon < 9) zone = 31;
    else if (lon >= 9 && lon < 21) zone = 33;
    else if (lon >= 21 && lon < 33) zone = 35;
    else if (lon >= 33 && lon < 42) zone = 37;
  }
  return zone;
}

/** Central meridian of a zone, degrees: 6·zone − 183. */
export const utmCentralMeridian = (zone: number): number => 6 * zone - 183;

/** EPSG code of a WGS84 UTM zone: 326zz north, 327zz south. */
export const utmEpsg = (zone: number, hemisphere: Hemisphere): number => (hemisphere === "N" ? 32600 : 32700) + zone;

/** proj4 definition string of a WGS84 UTM zone. */
export function utmProjDef(zone: number, hemisphere: Hemisphere): string {
  return `+proj=utm +zone=${zone}${hemisphere === "S" ? " +south" : ""} +datum=WGS84 +units=m +no_defs`;
}

const converters = new Map<string, proj4.Converter>();
function converter(zone: number, hemisphere: Hemisphere): proj4.Converter {
  const key = `${zone}${hemisphere}`;
  let c = converters.get(key);
  if (!c) {
    c = proj4("EPSG:4326", utmProjDef(zone, hemisphere));
    converters.set(key, c);
  }
  return c;
}

function checkZone(zone: number): void {
  if (!Number.isInteger(zone) || zone < 1 || zone > 60) throw new UtmRangeError(`UTM zone must be a whole number 1–60 (got ${zone}).`);
}

export interface ToUtmOptions {
  /** Force a zone (e.g. to keep a project on one zone across a boundary). @default the zone of the position */
  zone?: number;
  /** Force a hemisphere (e.g. a site straddling the equator kept on the northern grid). @default N for lat ≥ 0, else S */
  hemisphere?: Hemisphere;
}

/** WGS84 latitude/longitude (degrees) → UTM easting/northing (metres). */
export function toUtm(lat: number, lon: number, options: ToUtmOptions = {}): Utm {
  checkLatLon(lat, lon);
  const { zone = utmZone(lat, lon), hemisphere = lat >= 0 ? "N" : "S" } = options;
  checkZone(zone);
  const [easting, northing] = converter(zone, hemisphere).forward([lon, lat]);
  return { zone, band: utmBand(lat), hemisphere, easting, northing, epsg: utmEpsg(zone, hemisphere) };
}

/** UTM (zone, explicit hemisphere, metres) → WGS84 latitude/longitude in degrees. */
export function fromUtm(zone: number, hemisphere: Hemisphere, easting: number, northing: number): { lat: number; lon: number } {
  checkZone(zone);
  if (hemisphere !== "N" && hemisphere !== "S") throw new UtmRangeError(`Hemisphere must be N or S (got ${String(hemisphere)}).`);
  if (!Number.isFinite(easting) || easting < 100_000 || easting > 900_000) {
    throw new UtmRangeError(`Easting ${easting} m is outside a UTM zone (about 160 000–840 000 m; never below 100 000 or above 900 000).`);
  }
  if (!Number.isFinite(northing) || northing < 0 || northing > 10_000_000) throw new UtmRangeError(`Northing ${northing} m is outside 0–10 000 000 m.`);
  const [lon, lat] = converter(zone, hemisphere).inverse([easting, northing]);
  return { lat, lon };
}

/**
 * "29 N · E 725 031 · N 4 180 512" — zone with the hemisphere spelled out (never the band letter alone).
 * @param decimals - decimals of the metres. @default 0
 */
export function formatUtm(u: Utm, decimals = 0): string {
  const m = (v: number) => v.toLocaleString("en-US", { minimumFractionDigits: decimals, maximumFractionDigits: decimals }).replace(/,/g, "\u2009");
  return `${u.zone} ${u.hemisphere === "N" ? "north" : "south"} (band ${u.band}) · E ${m(u.easting)} · N ${m(u.northing)}`;
}
