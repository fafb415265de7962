/**
 * The azimuth a photo was taken toward, as a person types it in the gallery: degrees clockwise from north, 0–360
 * (the range of EXIF GPSImgDirection, CIPA DC-008-2012 "Exif 2.3", tag 0x0011). Empty means none. Pure.
 */
/** Azimuth as typed: a number of degrees 0–360 (clockwise from north), empty for none; or the reason it is refused. */
export function parseAzimuth(text: string): { ok: true; value: number | null } | { ok: false; error: string } {
  const t = text.trim().replace(",", ".").replace(/°$/, "");
  if (t === "") return { ok: true, value: null };
  const n = Number(t);
  if (!Number.isFinite(n)) return { ok: false, error: `"${text}" is not a number of degrees.` };
  if (n < 0 || n > 360) return { ok: false, error: `Azimuth ${n}° is outside 0–360° (degrees clockwise from north).` };
  return { ok: true, value: n };
}

