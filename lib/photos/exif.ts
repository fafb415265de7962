/**
 * Reads what a field photo's EXIF says about when, where and which way it was taken. Broken or missing
 * EXIF never throws: the photo still uploads and the problem is reported in `warnings`.
 */
import exifr from "exifr";

/** GPS position from EXIF (WGS84 unless GPSMapDatum says otherwise). */
export interface PhotoGps {
  /** degrees, negative south */
  lat: number;
  /** degrees, negative west */
  lon: number;
  /** metres; negative below sea level (GPSAltitudeRef 1). EXIF defines it against sea level. */
  altitudeM: number | null;
  /** GPSHPositioningError, metres (Exif 2.31+) */
  horizontalErrorM: number | null;
  /** GPSImgDirection, degrees 0–360 */
  imgDirection: number | null;
  /** GPSImgDirectionRef: T (true north) or M (magnetic north) */
  imgDirectionRef: "T" | "M" | null;
  /** GPSMapDatum as written, e.g. "WGS-84" */
  datum: string | null;
  /** GPSDateStamp + GPSTimeStamp as a UTC instant */
  fixAt: string | null;
}

export interface PhotoMetadata {
  /** Instant taken, ISO 8601 UTC — only when the offset (OffsetTimeOriginal) is known. */
  takenAt: string | null;
  /** DateTimeOriginal as local wall time "YYYY-MM-DDTHH:MM:SS" (no zone; EXIF does not carry one). */
  takenLocal: string | null;
  /** OffsetTimeOriginal, e.g. "+01:00" */
  takenOffset: string | null;
  gps: PhotoGps | null;
  /** EXIF Orientation 1–8 (1 upright, 6 rotate 90° clockwise to display, …) */
  orientation: number | null;
  camera: string | null;
  warnings: string[];
}

type Raw = Record<string, unknown>;

const num = (v: unknown): number | null => {
  if (typeof v === "number" && Number.isFinite(v)) return v;
  if (v instanceof Uint8Array && v.length) return v[0];
  if (Array.isArray(v) && typeof v[0] === "number") return v[0];
  return null;
};
const str = (v: unknown): string | null => (typeof v === "string" && v.trim() ? v.trim().replace(/\0+$/, "") : null);

/** [deg, min, sec] → decimal degrees (EXIF stores three rationals; CIPA DC-008, Exif 2.32). */
function dmsArray(v: unknown): number | null {
  if (typeof v === "number") return v;
  if (!Array.isArray(v) || v.length === 0 || !v.every((x) => typeof x === "number" && Number.isFinite(x))) return null;
  const [d, m = 0, s = 0] = v as number[];
  return d + m / 60 + s / 3600;
}

/** "2026:03:14 10:05:22" → "2026-03-14T10:05:22", or null when not an EXIF date. */
export function exifLocalDateTime(v: unknown): string | null {
  const s = str(v);
  const m = s && /^(\d{4})[:-](\d{2})[:-](\d{2})[ T](\d{2}):(\d{2}):(\d{2})/.exec(s);
  if (!m || m[1] === "0000") return null;
  const iso = `${m[1]}-${m[2]}-${m[3]}T${m[4]}:${m[5]}:${m[6]}`;
  return Number.isNaN(Date.parse(`${iso}Z`)) ? null : iso;
}

/** Local wall time + offset ("+01:00") → UTC instant "…Z". */
export function localToUtc(local: string, offset: string): string | null {
  if (!/^[+-]\d{2}:\d{2}$/.test(offset)) return null;
  const t = Date.parse(`${local}${offset}`);
  return Number.isNaN(t) ? null : new Date(t).toISOString().replace(".000Z", "Z");
}

function readGps(r: Raw, warnings: string[]): PhotoGps | null {
  let lat = dmsArray(r.GPSLatitude);
  let lon = dmsArray(r.GPSLongitude);
  if (lat === null || lon === null) {
    if (r.GPSLatitude !== undefined || r.GPSLongitude !== undefined) warnings.push("The photo's GPS tags are incomplete; no position was read.");
    return null;
  }
  const latRef = str(r.GPSLatitudeRef)?.toUpperCase();
  const lonRef = str(r.GPSLongitudeRef)?.toUpperCase();
  if (latRef === "S") lat = -Math.abs(lat);
  if (lonRef === "W") lon = -Math.abs(lon);
  if (Math.abs(lat) > 90 || Math.abs(lon) > 180) {
    warnings.push(`The photo's GPS position (${lat}, ${lon}) is out of range and was ignored.`);
    return null;
  }
  if (lat === 0 && lon === 0) {
    warnings.push("The photo's GPS position is 0°, 0° (the camera had no fix); it was ignored.");
    return null;
  }
  let altitudeM = num(r.GPSAltitude);
  if (altitudeM !== null && num(r.GPSAltitudeRef) === 1) altitudeM = -altitudeM;
  const dir = num(r.GPSImgDirection);
  const dirRef = str(r.GPSImgDirectionRef)?.toUpperCase();
  let fixAt: string | null = null;
  const date = str(r.GPSDateStamp);
  const time = r.GPSTimeStamp;
  if (date && Array.isArray(time) && time.length === 3) {
    const [h, mi, s] = time as number[];
    const d = /^(\d{4})[:-](\d{2})[:-](\d{2})$/.exec(date);
    if (d) {
      const t = Date.UTC(+d[1], +d[2] - 1, +d[3], h, mi, Math.floor(s), Math.round((s % 1) * 1000));
      if (!Number.isNaN(t)) fixAt = new Date(t).toISOString();
    }
  }
  return {
    lat,
    lon,
    altitudeM,
    horizontalErrorM: num(r.GPSHPositioningError),
    imgDirection: dir !== null && dir >= 0 && dir <= 360 ? dir % 360 : null,
    imgDirectionRef: dirRef === "T" || dirRef === "M" ? dirRef : null,
    datum: str(r.GPSMapDatum),
    fixAt,
  };
}

/** EXIF time taken (with offset when present), GPS position/altitude/direction and orientation of an image. */
export async function readPhotoMetadata(bytes: Uint8Array): Promise<PhotoMetadata> {
  const warnings: string[] = [];
  let r: Raw | undefined;
  try {
    // reviveValues:false keeps DateTimeOriginal as the written string: exifr would otherwise turn the
    // zone-less time into a Date in the server's own zone.
    r = (await exifr.parse(Buffer.from(bytes.buffer, bytes.byteOffset, bytes.byteLength), {
      tiff: true,
      exif: true,
      gps: true,
      ifd1: false,
      xmp: false,
      icc: false,
      iptc: false,
      jfif: false,
      ihdr: false,
      translateValues: false,
      reviveValues: false,
      mergeOutput: true,
    })) as Raw | undefined;
  } catch (err) {
    warnings.push(`The photo's EXIF could not be read (${(err as Error).message}); it was stored without time and position.`);
  }
  const empty: PhotoMetadata = { takenAt: null, takenLocal: null, takenOffset: null, gps: null, orientation: null, camera: null, warnings };
  if (!r) return empty;
  if (Array.isArray(r.errors) && r.errors.length) {
    warnings.push(`Part of the photo's EXIF is damaged (${String((r.errors[0] as Error)?.message ?? r.errors[0]).split("\n")[0]}).`);
  }
  const takenLocal = exifLocalDateTime(r.DateTimeOriginal) ?? exifLocalDateTime(r.CreateDate);
  const offsetRaw = str(r.OffsetTimeOriginal) ?? str(r.OffsetTime);
  const takenOffset = offsetRaw && /^[+-]\d{2}:\d{2}$/.test(offsetRaw) ? offsetRaw : null;
  const orientation = num(r.Orientation);
  const camera = [str(r.Make), str(r.Model)].filter(Boolean).join(" ") || null;
  return {
    takenAt: takenLocal && takenOffset ? localToUtc(takenLocal, takenOffset) : null,
    takenLocal,
    takenOffset,
    gps: readGps(r, warnings),
    orientation: orientation !== null && orientation >= 1 && orientation <= 8 ? orientation : null,
    camera,
    warnings,
  };
}
