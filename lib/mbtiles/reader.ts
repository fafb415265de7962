/**
 * Reads an MBTiles 1.3 package (an SQLite file) from local disk with @libsql/client.
 * The file is treated as untrusted input: its header, tables and metadata are checked before use.
 */
import { closeSync, existsSync, openSync, readSync } from "node:fs";
import { resolve } from "node:path";
import { pathToFileURL } from "node:url";
import { createClient, type Client } from "@libsql/client";
import { MbtilesError } from "./errors";
import { validateMbtilesMetadata, type MbtilesMetadata } from "./metadata";
import { mbtilesRow, type TileAddress } from "./tile-address";
import { sniffTileFormat } from "./tile-format";

/** The first 16 bytes of every SQLite 3 database file (sqlite.org/fileformat.html §1.3.1). */
const SQLITE_HEADER = "SQLite format 3\u0000";

/** An open package. */
export interface MbtilesReader {
  /** Validated metadata; minZoom/maxZoom fall back to the zoom levels present in `tiles`. */
  metadata: MbtilesMetadata;
  /** Tile bytes at an XYZ address (row flipped to TMS here), or null when the package has none. */
  getTile(address: TileAddress): Promise<Uint8Array | null>;
  close(): void;
}

/** Summary of a package checked on upload. */
export interface MbtilesInspection {
  metadata: MbtilesMetadata;
  tileCount: number;
}

function assertSqliteFile(path: string): void {
  if (!existsSync(path)) throw new MbtilesError("The MBTiles file does not exist.");
  const fd = openSync(path, "r");
  try {
    const head = Buffer.alloc(16);
    const n = readSync(fd, head, 0, 16, 0);
    if (n < 16 || head.toString("latin1") !== SQLITE_HEADER) {
      throw new MbtilesError("The file is not an SQLite database, so it cannot be an MBTiles package.");
    }
  } finally {
    closeSync(fd);
  }
}

function toBytes(v: unknown): Uint8Array | null {
  if (v instanceof ArrayBuffer) return new Uint8Array(v);
  if (ArrayBuffer.isView(v)) return new Uint8Array(v.buffer, v.byteOffset, v.byteLength);
  return null;
}

async function readMetadata(client: Client): Promise<Record<string, string>> {
  let rows;
  try {
    rows = (await client.execute("SELECT name, value FROM metadata")).rows;
  } catch {
    throw new MbtilesError('The package has no readable "metadata" table with name and value columns (MBTiles 1.3).');
  }
  const out: Record<string, string> = {};
  for (const r of rows) if (typeof r.name === "string" && r.value != null) out[r.name] = String(r.value);
  return out;
}

async function zoomRangeOfTiles(client: Client): Promise<{ min: number | null; max: number | null; count: number }> {
  try {
    const { rows } = await client.execute("SELECT min(zoom_level) AS lo, max(zoom_level) AS hi, count(*) AS n FROM tiles");
    const r = rows[0];
    return { min: r.lo == null ? null : Number(r.lo), max: r.hi == null ? null : Number(r.hi), count: Number(r.n) };
  } catch {
    throw new MbtilesError('The package has no readable "tiles" table (zoom_level, tile_column, tile_row, tile_data; MBTiles 1.3).');
  }
}

function openClient(path: string): Client {
  assertSqliteFile(path);
  try {
    return createClient({ url: pathToFileURL(resolve(path)).href });
  } catch {
    throw new MbtilesError("The SQLite file could not be opened.");
  }
}

/**
 * Fully checks a package: SQLite header, `metadata` per MBTiles 1.3, a `tiles` table with at least one
 * tile, and that the first tile really is in the declared format. Throws {@link MbtilesError}.
 *
 * @param path - local file path of the package
 */
export async function inspectMbtilesFile(path: string): Promise<MbtilesInspection> {
  const client = openClient(path);
  try {
    const metadata = validateMbtilesMetadata(await readMetadata(client));
    const range = await zoomRangeOfTiles(client);
    if (range.count === 0) throw new MbtilesError("The package contains no tiles.");
    const { rows } = await client.execute("SELECT tile_data FROM tiles LIMIT 1");
    const first = toBytes(rows[0]?.tile_data);
    const sniffed = first ? sniffTileFormat(first) : null;
    if (sniffed !== metadata.format) {
      throw new MbtilesError(`metadata "format" says ${metadata.format}, but the tiles are ${sniffed ?? "not a recognised image format"}.`);
    }
    return {
      metadata: { ...metadata, minZoom: metadata.minZoom ?? range.min, maxZoom: metadata.maxZoom ?? range.max },
      tileCount: range.count,
    };
  } catch (err) {
    if (err instanceof MbtilesError) throw err;
    throw new MbtilesError(`The package could not be read as MBTiles: ${(err as Error).message}`);
  } finally {
    client.close();
  }
}

/**
 * Opens a package for serving tiles. Checks header and metadata; keep the reader open and reuse it.
 *
 * @param path - local file path of the package
 */
export async function openMbtilesFile(path: string): Promise<MbtilesReader> {
  const client = openClient(path);
  try {
    const metadata = validateMbtilesMetadata(await readMetadata(client));
    const range = metadata.minZoom === null || metadata.maxZoom === null ? await zoomRangeOfTiles(client) : null;
    const resolved = { ...metadata, minZoom: metadata.minZoom ?? range?.min ?? null, maxZoom: metadata.maxZoom ?? range?.max ?? null };
    return {
      metadata: resolved,
      async getTile({ z, x, y }) {
        const { rows } = await client.execute({
          sql: "SELECT tile_data FROM tiles WHERE zoom_level = ? AND tile_column = ? AND tile_row = ? LIMIT 1",
          args: [z, x, mbtilesRow(y, z)],
        });
        return rows.length ? toBytes(rows[0].tile_data) : null;
      },
      close: () => client.close(),
    };
  } catch (err) {
    client.close();
    if (err instanceof MbtilesError) throw err;
    throw new MbtilesError(`The package could not be read as MBTiles: ${(err as Error).message}`);
  }
}
