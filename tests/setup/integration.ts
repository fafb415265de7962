import { mkdtempSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterAll, beforeAll, vi } from "vitest";

// Each integration test file gets its own SQLite file, migrated from the committed migrations.
const dir = mkdtempSync(join(tmpdir(), "lithodex-it-"));
process.env.DATABASE_URL = `file:${join(dir, "test.db")}`;
process.env.LITHODEX_DATA_DIR = join(dir, "files");
process.env.BETTER_AUTH_URL = "http://localhost:3000";

vi.mock("server-only", () => ({}));

beforeAll(async () => {
  const { migrateDatabase } = await import("@/db/migrate");
  await migrateDatabase();
});

afterAll(async () => {
  // Worker threads of the job pool (CIF, MBTiles, CSV) would keep the test worker alive.
  const { closeWorkerPools } = await import("@/lib/workers/pool");
  await closeWorkerPools();
});
