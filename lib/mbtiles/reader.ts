/**
 * Reads an MBTiles 1.3 package (an SQLite file) from local disk with @libsql/client.
 * The file is treated as untrusted input: it is opened on one connection with `PRAGMA query_only`, its schema is
 * checked before any query touches `tiles` (no triggers, no virtual tables, no generated columns, no view except the
 * deduplicated tiles view MBTiles writers commonly emit), and every query is bounded (LIMIT), so no query can run
 * for longer than a scan of the file itself.
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

/** Most `metadata` rows read (MBTiles 1.3 defines about a dozen names). */
export const MAX_METADATA_ROWS = 1000;

/**
 * The one view accepted: `tiles` over `map` and `images` (the deduplicating layout written by common MBTiles tools;
 * MBTiles 1.3 allows `tiles` to be a view). Compared after collapsing whitespace and case.
 */
const DEDUP_TILES_VIEW =
  "create view tiles as select map.zoom_level as zoom_level, map.tile_column as tile_column, map.tile_row as tile_row, images.tile_data as tile_data from map join images on images.tile_id = map.tile_id";

const normalSql = (s: string) =>
  s
    .toLowerCase()
    .replace(/["`\[\]]/g, "")
    .replace(/\s+/g, " ")
    .replace(/\s*([(),=;])\s*/g, "$1")
    .replace(/,/g, ", ")
    .replace(/;$/, "")
    .trim();

interface SchemaRow {
  type: string;
  name: string;
  sql: string | null;
}

/**
 * Checks `sqlite_master` before anything else is queried: a trigger, a virtual table or a view (other than the
 * deduplicated tiles view over plain tables) could make a read run for hours or write; a generated column is computed
 * on every read. Throws {@link MbtilesError} naming the object.
 */
export async function assertSafeSchema(client: Client): Promise<void> {
  let rows: SchemaRow[];
  try {
    rows = (await client.execute("SELECT type, name, sql FROM sqlite_master LIMIT 10001")).rows as unknown as SchemaRow[];
  } catch (err) {
    throw new MbtilesError(`The SQLite schema could not be read: ${(err as Error).message}`);
  }
  if (rows.length > 10000) throw new MbtilesError("The package has more than 10000 schema objects; an MBTiles package has a handful.");
  const byName = new Map(rows.map((r) => [String(r.name).toLowerCase(), r]));
  const issues: string[] = [];
  for (const r of rows) {
    const type = String(r.type);
    const sqlText = String(r.sql ?? "");
    if (type === "trigger") issues.push(`The package contains a trigger ("${r.name}"); MBTiles packages have none and triggers are refused.`);
    else if (type === "view") {
      if (String(r.name).toLowerCase() !== "tiles" || normalSql(sqlText) !== normalSql(DEDUP_TILES_VIEW)) {
        issues.push(`The package contains a view ("${r.name}") other than the deduplicated tiles view (tiles over map and images); views are refused.`);
      } else {
        for (const base of ["map", "images"]) {
          if (byName.get(base)?.type !== "table") issues.push(`The tiles view reads "${base}", which is not a plain table.`);
        }
      }
    } else if (type === "table" && /^\s*create\s+virtual\s+table/i.test(sqlText)) {
      issues.push(`"${r.name}" is a virtual table; MBTiles tables must be plain tables.`);
    } else if (type === "table" && /\b(generated\s+always|as\s*\()/i.test(sqlText.replace(/^[^(]*\(/, ""))) {
      issues.push(`"${r.name}" has a generated column; MBTiles tables hold plain values.`);
    }
  }
  if (!byName.has("metadata")) issues.push('The package has no "metadata" table (MBTiles 1.3).');
  if (!byName.has("tiles")) issues.push('The package has no "tiles" table or view (MBTiles 1.3).');
  if (issues.length) throw new MbtilesError(issues[0], issues);
}

async function readMetadata(client: Client): Promise<Record<string, string>> {
  let rows;
  try {
    rows = (await client.execute(`SELECT name, value FROM metadata LIMIT ${MAX_METADATA_ROWS + 1}`)).rows;
  } catch {
    throw new MbtilesError('The package has no readable "metadata" table with name and value columns (MBTiles 1.3).');
  }
  if (rows.length > MAX_METADATA_ROWS) throw new MbtilesError(`The "metadata" table has more than ${MAX_METADATA_ROWS} rows; MBTiles 1.3 defines about a dozen names.`);
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

/** Opens the file on a single connection that refuses writes (libsql has no read-only open flag; query_only is per connection). */
async function openClient(path: string): Promise<Client> {
  assertSqliteFile(path);
  let client: Client;
  try {
    client = createClient({ url: pathToFileURL(resolve(path)).href, concurrency: 1 });
  } catch {
    throw new MbtilesError("The SQLite file could not be opened.");
  }
  try {
    await client.execute("PRAGMA query_only = 1");
    await assertSafeSchema(client);
  } catch (err) {
    client.close();
    if (err instanceof MbtilesError) throw err;
    throw new MbtilesError(`The SQLite file could not be opened: ${(err as Error).message}`);
  }
  return client;
}

/**
 * Fully checks a package: SQLite header, `metadata` per MBTiles 1.3, a `tiles` table with at least one
 * tile, and that the first tile really is in the declared format. Throws {@link MbtilesError}.
 *
 * @param path - local file path of the package
 */
export async function inspectMbtilesFile(path: string): Promise<MbtilesInspection> {
  const client = await openClient(path);
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
  const client = await openClient(path);
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
