/**
 * Tile addresses as a map client asks for them (XYZ: row 0 at the north edge) and as MBTiles stores
 * them (TMS: row 0 at the south edge). Pure.
 */
import { MbtilesError } from "./errors";

/** Highest zoom level accepted in a request. */
export const MAX_REQUEST_ZOOM = 24;

/** A validated XYZ tile address. */
export interface TileAddress {
  z: number;
  x: number;
  y: number;
}

/**
 * MBTiles `tile_row` of an XYZ row: `2^z − 1 − y` (MBTiles 1.3 uses the TMS scheme, rows counted from
 * the south). The mapping is its own inverse, so it also turns a stored row back into XYZ.
 *
 * @param y - XYZ row, integer 0 … 2^z − 1
 * @param z - zoom level, integer 0 … {@link MAX_REQUEST_ZOOM}
 */
export function mbtilesRow(y: number, z: number): number {
  return 2 ** z - 1 - y;
}

/**
 * Parses `z`, `x`, `y` path segments (the `y` may carry an image extension such as `.png`) into an
 * XYZ address, or throws {@link MbtilesError} naming the first bad part.
 */
export function parseTileAddress(z: string, x: string, y: string): TileAddress {
  const yDigits = y.replace(/\.(png|jpe?g|webp)$/i, "");
  const parts = { z, x, y: yDigits };
  for (const [name, v] of Object.entries(parts)) {
    if (!/^\d{1,8}$/.test(v)) throw new MbtilesError(`Tile ${name} must be a non-negative integer, got "${v}".`);
  }
  const zz = Number(z);
  const xx = Number(x);
  const yy = Number(yDigits);
  if (zz > MAX_REQUEST_ZOOM) throw new MbtilesError(`Zoom must be at most ${MAX_REQUEST_ZOOM}, got ${zz}.`);
  const n = 2 ** zz;
  if (xx >= n) throw new MbtilesError(`Tile x must be below ${n} at zoom ${zz}, got ${xx}.`);
  if (yy >= n) throw new MbtilesError(`Tile y must be below ${n} at zoom ${zz}, got ${yy}.`);
  return { z: zz, x: xx, y: yy };
}
