/**
 * Backup and restore of a Lithodex installation: a consistent copy of the SQLite database (`VACUUM INTO`, which
 * writes a transaction-consistent snapshot while the app keeps running; sqlite.org/lang_vacuum.html#vacuuminto) and
 * the file store (photos, scans, tile packages), in one dated .tar.gz with a manifest of SHA-256 hashes. Restore
 * checks every hash before it touches anything, then replaces the database and the file store.
 */
import { createHash, randomUUID } from "node:crypto";
import { createReadStream, existsSync } from "node:fs";
import { cp, mkdir, mkdtemp, readdir, readFile, rename, rm, stat, writeFile } from "node:fs/promises";
import { tmpdir } from "node:os";
import { dirname, join, relative, resolve, sep } from "node:path";
import { pathToFileURL } from "node:url";
import { createClient } from "@libsql/client";
import * as tar from "tar";

export const MANIFEST = "manifest.json";
const DB_ENTRY = "database/lithodex.db";
const FILES_DIR = "files";

export interface ManifestEntry {
  path: string;
  bytes: number;
  sha256: string;
}

export interface BackupManifest {
  format: "lithodex-backup/1";
  createdAt: string;
  database: ManifestEntry & { tables: Record<string, number> };
  files: ManifestEntry[];
}

async function sha256File(path: string): Promise<string> {
  const h = createHash("sha256");
  for await (const chunk of createReadStream(path)) h.update(chunk as Buffer);
  return h.digest("hex");
}

async function listFiles(root: string): Promise<string[]> {
  if (!existsSync(root)) return [];
  const out: string[] = [];
  for (const e of await readdir(root, { withFileTypes: true, recursive: true })) {
    if (e.isFile()) out.push(join(e.parentPath ?? (e as unknown as { path: string }).path, e.name));
  }
  return out.sort();
}

/** Path of a local database from its URL (file:…), or an error for a remote libSQL server. */
export function localDatabasePath(url: string): string {
  if (!url.startsWith("file:")) throw new Error(`Backups cover local SQLite files; ${url.split("://")[0]}:// databases are backed up by their server.`);
  return resolve(url.slice("file:".length));
}

/** Row counts of every table, for the manifest and the round-trip check. */
export async function tableCounts(dbPath: string): Promise<Record<string, number>> {
  const c = createClient({ url: pathToFileURL(dbPath).href });
  try {
    const { rows } = await c.execute("SELECT name FROM sqlite_master WHERE type = 'table' AND name NOT LIKE 'sqlite_%' ORDER BY name");
    const out: Record<string, number> = {};
    for (const r of rows) {
      const name = String(r.name);
      out[name] = Number((await c.execute(`SELECT count(*) AS n FROM "${name.replace(/"/g, '""')}"`)).rows[0].n);
    }
    return out;
  } finally {
    c.close();
  }
}

const stamp = (d: Date) => d.toISOString().replace(/[-:]/g, "").replace(/\..*$/, "").replace("T", "-");

/**
 * Writes `lithodex-YYYYMMDD-HHMMSS.tar.gz` into `outDir`.
 * @returns the archive path and its manifest
 */
export async function createBackup(opts: { databaseUrl: string; dataDir: string; outDir: string; now?: Date }): Promise<{ archive: string; manifest: BackupManifest }> {
  const now = opts.now ?? new Date();
  const dbPath = localDatabasePath(opts.databaseUrl);
  const work = await mkdtemp(join(tmpdir(), "lithodex-backup-"));
  try {
    const snapshot = join(work, DB_ENTRY);
    await mkdir(dirname(snapshot), { recursive: true });
    const c = createClient({ url: pathToFileURL(dbPath).href, timeout: 10_000 });
    try {
      await c.execute({ sql: "VACUUM INTO ?", args: [snapshot] });
    } finally {
      c.close();
    }
    const dataDir = resolve(opts.dataDir);
    const files: ManifestEntry[] = [];
    for (const f of await listFiles(dataDir)) {
      const rel = relative(dataDir, f).split(sep).join("/");
      const target = join(work, FILES_DIR, rel);
      await mkdir(dirname(target), { recursive: true });
      await cp(f, target);
      files.push({ path: `${FILES_DIR}/${rel}`, bytes: (await stat(target)).size, sha256: await sha256File(target) });
    }
    const manifest: BackupManifest = {
      format: "lithodex-backup/1",
      createdAt: now.toISOString(),
      database: { path: DB_ENTRY, bytes: (await stat(snapshot)).size, sha256: await sha256File(snapshot), tables: await tableCounts(snapshot) },
      files,
    };
    await writeFile(join(work, MANIFEST), JSON.stringify(manifest, null, 2));
    await mkdir(opts.outDir, { recursive: true });
    const archive = resolve(opts.outDir, `lithodex-${stamp(now)}.tar.gz`);
    const entries = [MANIFEST, DB_ENTRY, ...(files.length ? [FILES_DIR] : [])];
    await tar.c({ gzip: true, file: `${archive}.part`, cwd: work, portable: true }, entries);
    await rename(`${archive}.part`, archive);
    return { archive, manifest };
  } finally {
    await rm(work, { recursive: true, force: true });
  }
}

export class BackupError extends Error {
  constructor(message: string) {
    super(message);
    this.name = "BackupError";
  }
}

/** Extracts an archive to a temporary folder and checks every hash of its manifest; nothing else is touched. */
export async function verifyBackup(archive: string): Promise<{ dir: string; manifest: BackupManifest }> {
  const dir = await mkdtemp(join(tmpdir(), "lithodex-restore-"));
  try {
    // tar refuses absolute paths and ".." entries by default (strict path handling of node-tar).
    await tar.x({ file: archive, cwd: dir, strict: true });
    const manifest = JSON.parse(await readFile(join(dir, MANIFEST), "utf8")) as BackupManifest;
    if (manifest.format !== "lithodex-backup/1") throw new BackupError(`Unknown backup format "${manifest.format}".`);
    const problems: string[] = [];
    for (const e of [manifest.database, ...manifest.files]) {
      const p = join(dir, e.path);
      if (!existsSync(p)) problems.push(`${e.path}: missing from the archive`);
      else if ((await sha256File(p)) !== e.sha256) problems.push(`${e.path}: SHA-256 does not match the manifest`);
    }
    const listed = new Set(manifest.files.map((f) => f.path));
    for (const f of await listFiles(join(dir, FILES_DIR))) {
      const rel = `${FILES_DIR}/${relative(join(dir, FILES_DIR), f).split(sep).join("/")}`;
      if (!listed.has(rel)) problems.push(`${rel}: in the archive but not in the manifest`);
    }
    if (problems.length) throw new BackupError(`The backup failed its check; nothing was restored:\n  ${problems.join("\n  ")}`);
    return { dir, manifest };
  } catch (err) {
    await rm(dir, { recursive: true, force: true });
    throw err;
  }
}

/**
 * Restores an archive after checking it: the database file is replaced (its -wal/-shm removed) and the file store
 * folder swapped. The app must be stopped. Without `force`, an existing non-empty database is kept and refused.
 */
export async function restoreBackup(opts: { archive: string; databaseUrl: string; dataDir: string; force?: boolean }): Promise<BackupManifest> {
  const dbPath = localDatabasePath(opts.databaseUrl);
  if (!opts.force && existsSync(dbPath) && (await stat(dbPath)).size > 0) {
    throw new BackupError(`${dbPath} exists; stop the app and run restore with --force to replace it.`);
  }
  const { dir, manifest } = await verifyBackup(opts.archive);
  try {
    await mkdir(dirname(dbPath), { recursive: true });
    const part = `${dbPath}.${randomUUID()}.restore`;
    await cp(join(dir, manifest.database.path), part);
    for (const suffix of ["-wal", "-shm", "-journal"]) await rm(`${dbPath}${suffix}`, { force: true });
    await rename(part, dbPath);
    const dataDir = resolve(opts.dataDir);
    const incoming = join(dir, FILES_DIR);
    if (existsSync(dataDir)) await rm(dataDir, { recursive: true, force: true });
    await mkdir(dirname(dataDir), { recursive: true });
    if (existsSync(incoming)) await cp(incoming, dataDir, { recursive: true });
    else await mkdir(dataDir, { recursive: true });
    return manifest;
  } finally {
    await rm(dir, { recursive: true, force: true });
  }
}

/** SHA-256 of every file under a folder, keyed by relative path (for comparisons). */
export async function hashTree(root: string): Promise<Record<string, string>> {
  const out: Record<string, string> = {};
  for (const f of await listFiles(root)) out[relative(root, f).split(sep).join("/")] = await sha256File(f);
  return out;
}
