import { mkdtempSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { pathToFileURL } from "node:url";
import { createClient } from "@libsql/client";
import sharp from "sharp";

/** A tile to store, addressed in XYZ (the writer flips the row to TMS like MBTiles 1.3 requires). */
export interface FixtureTile {
  z: number;
  x: number;
  y: number;
  data: Uint8Array;
}

/** A plain-colour 256 px PNG, made with sharp. */
export async function solidPng(rgb: [number, number, number]): Promise<Uint8Array> {
  const buf = await sharp({ create: { width: 256, height: 256, channels: 3, background: { r: rgb[0], g: rgb[1], b: rgb[2] } } }).png().toBuffer();
  return new Uint8Array(buf);
}

/**
 * Writes a small MBTiles file with the schema of the MBTiles 1.3 spec:
 * `metadata(name text, value text)` and `tiles(zoom_level integer, tile_column integer, tile_row integer, tile_data blob)`,
 * tile_row = 2^z − 1 − y.
 */
export async function writeMbtiles(metadata: Record<string, string>, tiles: FixtureTile[], path?: string): Promise<string> {
  const file = path ?? join(mkdtempSync(join(tmpdir(), "mbtiles-")), "fixture.mbtiles");
  const client = createClient({ url: pathToFileURL(file).href });
  await client.batch(
    [
      "CREATE TABLE metadata (name text, value text)",
      "CREATE TABLE tiles (zoom_level integer, tile_column integer, tile_row integer, tile_data blob)",
      "CREATE UNIQUE INDEX tile_index on tiles (zoom_level, tile_column, tile_row)",
      ...Object.entries(metadata).map(([name, value]) => ({ sql: "INSERT INTO metadata (name, value) VALUES (?, ?)", args: [name, value] })),
      ...tiles.map((t) => ({
        sql: "INSERT INTO tiles (zoom_level, tile_column, tile_row, tile_data) VALUES (?, ?, ?, ?)",
        args: [t.z, t.x, 2 ** t.z - 1 - t.y, t.data],
      })),
    ],
    "write",
  );
  client.close();
  return file;
}
