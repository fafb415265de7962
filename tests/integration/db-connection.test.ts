/**
 * SQLite connection settings (issue 12: the database ran in journal_mode=delete although a comment said WAL).
 * Checked on several pooled connections at once: each concurrent transaction borrows its own.
 */
import { describe, expect, test } from "vitest";
import { BUSY_TIMEOUT_MS, dbReady, getClient } from "@/db";

describe("connection pragmas", () => {
  test("journal_mode = wal, busy_timeout = 5000 ms, foreign_keys on — on every connection of the pool", async () => {
    await dbReady();
    const client = getClient();
    const txs = await Promise.all([0, 1, 2].map(() => client.transaction("read")));
    try {
      for (const tx of txs) {
        expect((await tx.execute("PRAGMA journal_mode")).rows[0][0]).toBe("wal");
        expect(Number((await tx.execute("PRAGMA busy_timeout")).rows[0][0])).toBe(BUSY_TIMEOUT_MS);
        expect(Number((await tx.execute("PRAGMA foreign_keys")).rows[0][0])).toBe(1);
      }
    } finally {
      for (const tx of txs) tx.close();
    }
  });

  test("a row pointing at a missing parent is refused (foreign keys enforced)", async () => {
    await expect(getClient().execute("INSERT INTO stations (id, project_id, code, lat, lon) VALUES ('s-orphan', 'no-such-project', 'X', 0, 0)")).rejects.toThrow(/FOREIGN KEY/);
  });
});
