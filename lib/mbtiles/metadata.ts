/**
 * Validation of an MBTiles package's `metadata` table against the MBTiles 1.3 specification
 * (github.com/mapbox/mbtiles-spec, 1.3/spec.md): `name` and `format` are required; `bounds`
 * (left,bottom,right,top in WGS84 degrees), `center` (lon,lat,zoom), `minzoom` and `maxzoom` are
 * optional but must be well formed when present. Pure.
 */
import { MbtilesError } from "./errors";
import { rasterFormatOf, type RasterTileFormat } from "./tile-format";

/** What Lithodex keeps from a package's metadata. */
export interface MbtilesMetadata {
  name: string;
  format: RasterTileFormat;
  /** [west, south, east, north], degrees WGS84; null when the package does not say. */
  bounds: [number, number, number, number] | null;
  /** [lon, lat, zoom]; null when absent. */
  center: [number, number, number] | null;
  minZoom: number | null;
  maxZoom: number | null;
  attribution: string | null;
  description: string | null;
  /** `overlay` or `baselayer` (MBTiles 1.3 `type`); null when absent. */
  type: "overlay" | "baselayer" | null;
}

/** Longest metadata value kept for display fields (name, attribution, description). */
const MAX_TEXT = 500;

function numbers(value: string): number[] {
  return value.split(",").map((p) => (p.trim() === "" ? Number.NaN : Number(p.trim())));
}

function zoom(value: string | undefined, key: string, issues: string[]): number | null {
  if (value === undefined || value.trim() === "") return null;
  const z = Number(value.trim());
  if (!Number.isInteger(z) || z < 0 || z > 30) {
    issues.push(`metadata ${key} must be an integer zoom level from 0 to 30, got "${value}".`);
    return null;
  }
  return z;
}

/**
 * Checks the `metadata` name/value pairs and returns the typed metadata; throws {@link MbtilesError}
 * listing every problem when the package cannot be used.
 *
 * @param entries - the rows of the `metadata` table as `{ name: value }`
 */
export function validateMbtilesMetadata(entries: Record<string, string>): MbtilesMetadata {
  const issues: string[] = [];
  const get = (k: string) => (typeof entries[k] === "string" ? entries[k] : undefined);

  const name = get("name")?.trim();
  if (!name) issues.push('metadata "name" is required (MBTiles 1.3).');

  const formatRaw = get("format")?.trim();
  let format: RasterTileFormat | null = null;
  if (!formatRaw) issues.push('metadata "format" is required (MBTiles 1.3): png, jpg or webp for raster tiles.');
  else if (formatRaw.toLowerCase() === "pbf") issues.push('metadata "format" is pbf (vector tiles); only raster packages (png, jpg, webp) can be shown as map layers.');
  else {
    format = rasterFormatOf(formatRaw);
    if (!format) issues.push(`metadata "format" must be png, jpg or webp, got "${formatRaw}".`);
  }

  let bounds: MbtilesMetadata["bounds"] = null;
  const b = get("bounds");
  if (b !== undefined && b.trim() !== "") {
    const [w, s, e, n, ...rest] = numbers(b);
    const ok = rest.length === 0 && [w, s, e, n].every(Number.isFinite);
    if (!ok) issues.push(`metadata "bounds" must be four numbers left,bottom,right,top, got "${b}".`);
    else if (w < -180 || e > 180 || s < -90 || n > 90) issues.push(`metadata "bounds" must lie within −180…180° longitude and −90…90° latitude, got "${b}".`);
    else if (!(w < e) || !(s < n)) issues.push(`metadata "bounds" must have left < right and bottom < top, got "${b}".`);
    else bounds = [w, s, e, n];
  }

  let center: MbtilesMetadata["center"] = null;
  const c = get("center");
  if (c !== undefined && c.trim() !== "") {
    const parts = numbers(c);
    const [lon, lat, z] = parts;
    if (parts.length !== 3 || !parts.every(Number.isFinite) || Math.abs(lon) > 180 || Math.abs(lat) > 90 || !Number.isInteger(z) || z < 0) {
      issues.push(`metadata "center" must be lon,lat,zoom (degrees, integer zoom), got "${c}".`);
    } else center = [lon, lat, z];
  }

  const minZoom = zoom(get("minzoom"), "minzoom", issues);
  const maxZoom = zoom(get("maxzoom"), "maxzoom", issues);
  if (minZoom !== null && maxZoom !== null && minZoom > maxZoom) issues.push(`metadata minzoom (${minZoom}) is above maxzoom (${maxZoom}).`);

  const typeRaw = get("type")?.trim().toLowerCase();
  const type = typeRaw === "overlay" || typeRaw === "baselayer" ? typeRaw : null;

  if (issues.length) throw new MbtilesError(`Not a usable MBTiles package: ${issues.join(" ")}`, issues);
  const text = (k: string) => {
    const v = get(k)?.trim();
    return v ? v.slice(0, MAX_TEXT) : null;
  };
  return {
    name: name!.slice(0, MAX_TEXT),
    format: format!,
    bounds,
    center,
    minZoom,
    maxZoom,
    attribution: text("attribution"),
    description: text("description"),
    type,
  };
}
