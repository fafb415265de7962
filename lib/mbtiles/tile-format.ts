/**
 * Raster tile formats an MBTiles package may declare (MBTiles 1.3 `format`), their HTTP content types,
 * and recognition of a tile's format from its first bytes. Pure.
 */

/** Raster formats Lithodex serves as map layers. */
export const RASTER_TILE_FORMATS = ["png", "jpg", "webp"] as const;
export type RasterTileFormat = (typeof RASTER_TILE_FORMATS)[number];

const CONTENT_TYPES: Record<RasterTileFormat, string> = {
  png: "image/png",
  jpg: "image/jpeg",
  webp: "image/webp",
};

/** Media types MBTiles 1.3 allows in place of the short names. */
const MEDIA_TYPE_ALIASES: Record<string, RasterTileFormat> = {
  "image/png": "png",
  "image/jpeg": "jpg",
  "image/jpg": "jpg",
  jpeg: "jpg",
  "image/webp": "webp",
};

/**
 * The raster format a metadata `format` value names, or null when it is not one we can show.
 * Accepts the short names (`png`, `jpg`, `webp`) and their media types, case-insensitively.
 */
export function rasterFormatOf(value: string): RasterTileFormat | null {
  const v = value.trim().toLowerCase();
  if ((RASTER_TILE_FORMATS as readonly string[]).includes(v)) return v as RasterTileFormat;
  return MEDIA_TYPE_ALIASES[v] ?? null;
}

/** HTTP `Content-Type` for a tile of this format. */
export function tileContentType(format: RasterTileFormat): string {
  return CONTENT_TYPES[format];
}

/**
 * Recognises a tile image from its signature: PNG `89 50 4E 47 0D 0A 1A 0A`, JPEG `FF D8 FF`,
 * WebP `RIFF····WEBP` (file signatures from the PNG spec, JPEG/JFIF and the RIFF/WebP container spec);
 * gzip `1F 8B` marks a (vector) pbf tile. Null when unrecognised.
 */
export function sniffTileFormat(bytes: Uint8Array): RasterTileFormat | "pbf" | null {
  const b = bytes;
  if (b.length >= 8 && b[0] === 0x89 && b[1] === 0x50 && b[2] === 0x4e && b[3] === 0x47 && b[4] === 0x0d && b[5] === 0x0a && b[6] === 0x1a && b[7] === 0x0a) return "png";
  if (b.length >= 3 && b[0] === 0xff && b[1] === 0xd8 && b[2] === 0xff) return "jpg";
  if (b.length >= 12 && ascii(b, 0, 4) === "RIFF" && ascii(b, 8, 12) === "WEBP") return "webp";
  if (b.length >= 2 && b[0] === 0x1f && b[1] === 0x8b) return "pbf";
  return null;
}

function ascii(b: Uint8Array, from: number, to: number): string {
  return String.fromCharCode(...b.subarray(from, to));
}
