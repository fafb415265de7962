/**
 * Backup → restore round trip (issue 12): the demo project is backed up while the database is open, restored into a
 * fresh location, and every row of every table and the SHA-256 of every stored file compared. A tampered archive is
 * refused before anything is replaced.
 */
import { execFileSync } from "node:child_process";
import { createHash } from "node:crypto";
import { mkdtempSync, readdirSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { pathToFileURL } from "node:url";
import { createClient } from "@libsql/client";
import { beforeAll, describe, expect, test } from "vitest";
import { databaseUrl } from "@/db";
import { seedDemo } from "@/db/seed/demo";
import { BackupError, createBackup, hashTree, localDatabasePath, restoreBackup, tableCounts } from "@/lib/backup";
import { getStorage } from "@/lib/storage";

const out = mkdtempSync(join(tmpdir(), "lithodex-bk-"));
let archive: string;

async function allRows(dbPath: string): Promise<Record<string, string>> {
  const c = createClient({ url: pathToFileURL(dbPath).href });
  try {
    const tables = (await c.execute("SELECT name FROM sqlite_master WHERE type = 'table' AND name NOT LIKE 'sqlite_%' ORDER BY name")).rows.map((r) => String(r.name));
    const out: Record<string, string> = {};
    for (const t of tables) {
      const rows = (await c.execute(`SELECT * FROM "${t}"`)).rows.map((r) => JSON.stringify(Object.entries(r).map(([k, v]) => [k, v instanceof ArrayBuffer ? Buffer.from(v).toString("base64") : v])));
      out[t] = createHash("sha256").update(rows.sort().join("\n")).digest("hex") + `:${rows.length}`;
    }
    return out;
  } finally {
    c.close();
  }
}

beforeAll(async () => {
  process.env.LITHODEX_JOBS = "manual";
  await seedDemo();
  // files in the store, as photos and scans leave them
  await getStorage().put("projects/demo/photos/a.jpg", new Uint8Array([0xff, 0xd8, 0xff, 1, 2, 3]));
  await getStorage().put("projects/demo/scans/b.xy", new TextEncoder().encode("10.0 100\n10.02 110\n"));
  archive = (await createBackup({ databaseUrl: databaseUrl(), dataDir: process.env.LITHODEX_DATA_DIR!, outDir: out })).archive;
}, 120_000);

describe("npm run backup / npm run restore", () => {
  test("the archive is dated and its manifest lists the database and every file with SHA-256", async () => {
    expect(archive).toMatch(/lithodex-\d{8}-\d{6}\.tar\.gz$/);
    const listing = execFileSync("tar", ["-tzf", archive], { encoding: "utf8" });
    expect(listing).toContain("manifest.json");
    expect(listing).toContain("database/lithodex.db");
    expect(listing).toContain("files/projects/demo/photos/a.jpg");
  });

  test("restore into a fresh place reproduces every row of every table and every file hash", async () => {
    const target = mkdtempSync(join(tmpdir(), "lithodex-rs-"));
    const dbUrl = `file:${join(target, "restored.db")}`;
    const files = join(target, "files");
    const m = await restoreBackup({ archive, databaseUrl: dbUrl, dataDir: files });
    const source = localDatabasePath(databaseUrl());
    expect(await allRows(localDatabasePath(dbUrl))).toEqual(await allRows(source));
    expect(await tableCounts(localDatabasePath(dbUrl))).toEqual(m.database.tables);
    expect(m.database.tables.samples).toBeGreaterThan(10); // the demo project is really in it
    expect(await hashTree(files)).toEqual(await hashTree(process.env.LITHODEX_DATA_DIR!));
  });

  test("an existing database is not replaced without --force", async () => {
    await expect(restoreBackup({ archive, databaseUrl: databaseUrl(), dataDir: join(out, "x") })).rejects.toThrow(/--force/);
  });

  test("a tampered archive fails its hash check and nothing is restored", async () => {
    const dir = mkdtempSync(join(tmpdir(), "lithodex-tamper-"));
    execFileSync("tar", ["-xzf", archive, "-C", dir]);
    writeFileSync(join(dir, "files/projects/demo/scans/b.xy"), "10.0 999\n");
    const bad = join(dir, "bad.tar.gz");
    execFileSync("tar", ["-czf", bad, "-C", dir, "manifest.json", "database", "files"]);
    const target = mkdtempSync(join(tmpdir(), "lithodex-rs-"));
    const err = await restoreBackup({ archive: bad, databaseUrl: `file:${join(target, "r.db")}`, dataDir: join(target, "files") }).catch((e: unknown) => e);
    expect(err).toBeInstanceOf(BackupError);
    expect((err as Error).message).toMatch(/files\/projects\/demo\/scans\/b\.xy: SHA-256 does not match/);
    expect(readdirSync(target)).toEqual([]);
  });
});
