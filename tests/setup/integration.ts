import { mkdtempSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { beforeAll, vi } from "vitest";

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
