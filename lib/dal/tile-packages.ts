import "server-only";
import { randomUUID } from "node:crypto";
import { createReadStream, createWriteStream, existsSync } from "node:fs";
import { mkdir, mkdtemp, rename, rm } from "node:fs/promises";
import { tmpdir } from "node:os";
import { join, resolve } from "node:path";
import { Readable } from "node:stream";
import { pipeline } from "node:stream/promises";
import { and, desc, eq } from "drizzle-orm";
import { z } from "zod";
import { getDb } from "@/db";
import { tilePackages } from "@/db/schema";
import { MbtilesError, openMbtilesFile, parseTileAddress, rasterFormatOf, tileContentType, type MbtilesInspection, type MbtilesReader } from "@/lib/mbtiles";
import { runJob, TaskError } from "@/lib/workers/pool";
import { LocalDiskStorage, assertValidKey, getStorage, type BlobStorage } from "@/lib/storage";
import { authorize, type Actor } from "./actor";
import { audit } from "./audit";
import { AppError, invalid, notFound } from "./errors";
import { validateInput } from "./validate";

/** Largest package accepted, bytes: env LITHODEX_MAX_TILE_PACKAGE_BYTES, default 500 MiB (the route's body limit). */
export function maxTilePackageBytes(): number {
  const v = Number(process.env.LITHODEX_MAX_TILE_PACKAGE_BYTES);
  return Number.isFinite(v) && v > 0 ? v : 500 * 1024 ** 2;
}

export type TilePackageRow = typeof tilePackages.$inferSelect;

/** What clients see of a package (no storage key). */
export function publicTilePackage(p: TilePackageRow) {
  return {
    id: p.id,
    name: p.name,
    format: p.format,
    minZoom: p.minZoom,
    maxZoom: p.maxZoom,
    bounds: p.bounds,
    attribution: p.attribution,
    createdAt: p.createdAt.toISOString(),
  };
}

function tilePackageKey(projectId: string, pkgId: string): string {
  const key = `projects/${projectId}/tile-packages/${pkgId}.mbtiles`;
  assertValidKey(key);
  return key;
}

/**
 * A local file path for a stored package: the object itself on local-disk storage, otherwise a copy in a
 * cache folder (env LITHODEX_TILE_CACHE_DIR), fetched once. SQLite needs a real file.
 */
async function localPackagePath(storage: BlobStorage, key: string, pkgId: string): Promise<string> {
  if (storage instanceof LocalDiskStorage) return resolve(storage.root, key);
  const dir = process.env.LITHODEX_TILE_CACHE_DIR || join(tmpdir(), "lithodex-tile-cache");
  const path = join(dir, `${pkgId}.mbtiles`);
  if (existsSync(path)) return path;
  await mkdir(dir, { recursive: true });
  const part = `${path}.${randomUUID()}.part`;
  await pipeline(Readable.fromWeb((await storage.stream(key)) as import("node:stream/web").ReadableStream<Uint8Array>), createWriteStream(part));
  await rename(part, path);
  return path;
}

/** Open readers by package id (a few packages serve many tiles each). */
const READERS_MAX = 8;
const cache = globalThis as unknown as { __lithodexMbtiles?: Map<string, Promise<MbtilesReader>> };
const readers: Map<string, Promise<MbtilesReader>> = (cache.__lithodexMbtiles ??= new Map());

function dropReader(pkgId: string): void {
  const r = readers.get(pkgId);
  readers.delete(pkgId);
  void r?.then((x) => x.close()).catch(() => {});
}

async function readerFor(pkg: TilePackageRow): Promise<MbtilesReader> {
  let r = readers.get(pkg.id);
  if (r) {
    readers.delete(pkg.id);
    readers.set(pkg.id, r); // most recently used last
    return r;
  }
  r = localPackagePath(getStorage(), pkg.storageKey, pkg.id).then(openMbtilesFile);
  r.catch(() => readers.delete(pkg.id));
  readers.set(pkg.id, r);
  while (readers.size > READERS_MAX) dropReader(readers.keys().next().value!);
  return r;
}

const uploadSchema = z.object({ filename: z.string().trim().max(200, "The file name is too long.").optional() });

async function bodyToTempFile(body: ReadableStream<Uint8Array>, maxBytes: number): Promise<{ path: string; dir: string; size: number }> {
  const dir = await mkdtemp(join(tmpdir(), "lithodex-mbtiles-"));
  const path = join(dir, "upload.mbtiles");
  let size = 0;
  try {
    await pipeline(
      Readable.fromWeb(body as import("node:stream/web").ReadableStream<Uint8Array>),
      async function* (source: AsyncIterable<Uint8Array>) {
        for await (const chunk of source) {
          size += chunk.byteLength;
          if (size > maxBytes) throw new AppError("payload_too_large", `The package is larger than ${Math.round(maxBytes / 1024 ** 2)} MiB.`);
          yield chunk;
        }
      },
      createWriteStream(path),
    );
  } catch (err) {
    await rm(dir, { recursive: true, force: true });
    throw err;
  }
  return { path, dir, size };
}

/**
 * Stores an uploaded MBTiles package after checking it (MBTiles 1.3 metadata, a raster format, tiles
 * that match it). The body is streamed to a temporary file, never held in memory.
 */
export async function createTilePackage(actor: Actor, projectId: string, upload: { body: ReadableStream<Uint8Array> | null; filename?: string | null }) {
  await authorize(actor, projectId, "tiles.manage");
  const { filename } = validateInput(uploadSchema, { filename: upload.filename ?? undefined });
  if (!upload.body) throw invalid("Send the .mbtiles file as the request body.", { file: ["No file was sent."] });
  const tmp = await bodyToTempFile(upload.body, maxTilePackageBytes());
  try {
    if (tmp.size === 0) throw invalid("The file is empty.", { file: ["The file is empty."] });
    let info: MbtilesInspection;
    try {
      // Checked in the worker pool (schema first, bounded queries), with a time and memory limit per job.
      info = await runJob<MbtilesInspection>("mbtiles-inspect", { path: tmp.path }, { timeoutMs: 60_000, maxMemoryMb: 128 }, `Checking ${filename ?? "the package"}`);
    } catch (err) {
      if (err instanceof TaskError && err.remoteName === "MbtilesError") {
        throw invalid(`${filename ? `${filename}: ` : ""}not a usable MBTiles package.`, { file: err.issues ?? [err.message] });
      }
      throw err;
    }
    const m = info.metadata;
    const id = randomUUID();
    const key = tilePackageKey(projectId, id);
    const storage = getStorage();
    // Runtime paths (a temp file, the file store): keep them out of the build's file tracing.
    await storage.put(key, createReadStream(/* turbopackIgnore: true */ tmp.path));
    try {
      return await getDb().transaction(async (tx) => {
        const [row] = await tx
          .insert(tilePackages)
          .values({
            id,
            projectId,
            name: m.name,
            storageKey: key,
            format: m.format,
            minZoom: m.minZoom,
            maxZoom: m.maxZoom,
            bounds: m.bounds ? m.bounds.join(",") : null,
            attribution: m.attribution,
            uploadedBy: actor.userId,
          })
          .returning();
        await audit(tx, actor, { projectId, action: "create", entity: "tile_package", entityId: id, after: { ...publicTilePackage(row), filename, sizeBytes: tmp.size, tileCount: info.tileCount } });
        return publicTilePackage(row);
      });
    } catch (err) {
      await storage.delete(key).catch(() => {});
      throw err;
    }
  } finally {
    await rm(tmp.dir, { recursive: true, force: true });
  }
}

/** The project's packages, newest first (any member). */
export async function listTilePackages(actor: Actor, projectId: string) {
  await authorize(actor, projectId, "project.read");
  const rows = await getDb().select().from(tilePackages).where(eq(tilePackages.projectId, projectId)).orderBy(desc(tilePackages.createdAt));
  return { items: rows.map(publicTilePackage) };
}

async function packageOrThrow(projectId: string, pkgId: string): Promise<TilePackageRow> {
  const [row] = await getDb().select().from(tilePackages).where(and(eq(tilePackages.projectId, projectId), eq(tilePackages.id, pkgId)));
  if (!row) throw notFound("Tile package not found.");
  return row;
}

/** Removes a package and its file. */
export async function deleteTilePackage(actor: Actor, projectId: string, pkgId: string): Promise<void> {
  await authorize(actor, projectId, "tiles.manage");
  const row = await packageOrThrow(projectId, pkgId);
  await getDb().transaction(async (tx) => {
    await tx.delete(tilePackages).where(eq(tilePackages.id, row.id));
    await audit(tx, actor, { projectId, action: "delete", entity: "tile_package", entityId: row.id, before: publicTilePackage(row) });
  });
  dropReader(row.id);
  await getStorage().delete(row.storageKey);
}

/**
 * One tile of a package at an XYZ address (members only). Null when the package has no tile there
 * (including zooms outside its range); a malformed address is a 404.
 */
export async function getTilePackageTile(actor: Actor, projectId: string, pkgId: string, z: string, x: string, y: string): Promise<{ bytes: Uint8Array; contentType: string } | null> {
  await authorize(actor, projectId, "project.read");
  let address;
  try {
    address = parseTileAddress(z, x, y);
  } catch (err) {
    if (err instanceof MbtilesError) throw notFound(err.message);
    throw err;
  }
  const pkg = await packageOrThrow(projectId, pkgId);
  if ((pkg.minZoom !== null && address.z < pkg.minZoom) || (pkg.maxZoom !== null && address.z > pkg.maxZoom)) return null;
  const format = rasterFormatOf(pkg.format);
  if (!format) throw new AppError("internal", "The package has an unknown tile format.");
  const reader = await readerFor(pkg);
  const bytes = await reader.getTile(address);
  return bytes ? { bytes, contentType: tileContentType(format) } : null;
}
