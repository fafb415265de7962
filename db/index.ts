import { mkdirSync } from "node:fs";
import { dirname } from "node:path";
import { createClient, type Client } from "@libsql/client";
import { drizzle, type LibSQLDatabase } from "drizzle-orm/libsql";
import * as schema from "./schema";

export type Db = LibSQLDatabase<typeof schema>;

/** The database URL: a file under data/ by default, or a libSQL server (libsql://, http://). */
export function databaseUrl(): string {
  return process.env.DATABASE_URL || "file:./data/lithodex.db";
}

/** How long a local connection waits for a lock before SQLITE_BUSY, ms. */
export const BUSY_TIMEOUT_MS = 5000;

/**
 * Connection settings of a local file database. busy_timeout is per connection: libsql's `timeout` option applies
 * it to every connection its pool opens (transactions borrow their own). journal_mode=WAL is stored in the file, so
 * setting it once per process is enough (readers then proceed during a write). foreign_keys is on by default in
 * libsql; the test in tests/integration/db-connection.test.ts checks all three on several pooled connections.
 */
function open(url: string): { client: Client; db: Db; ready: Promise<void> } {
  const local = url.startsWith("file:");
  if (local) {
    // libsql cannot create missing folders; next build imports this module too.
    mkdirSync(dirname(url.slice("file:".length)), { recursive: true });
  }
  const client = createClient({ url, authToken: process.env.DATABASE_AUTH_TOKEN, ...(local && { timeout: BUSY_TIMEOUT_MS }) });
  const ready = local
    ? client
        .execute("PRAGMA journal_mode = WAL")
        .then(() => client.execute("PRAGMA foreign_keys = ON"))
        .then(() => undefined)
        .catch((err) => console.error("could not set SQLite pragmas:", err))
    : Promise.resolve();
  return { client, db: drizzle(client, { schema }), ready };
}

const globalForDb = globalThis as unknown as { __lithodexDb?: { url: string; client: Client; db: Db; ready: Promise<void> } };

/** One client per process (and per DATABASE_URL, so tests can switch files). */
export function getDb(): Db {
  const url = databaseUrl();
  const cached = globalForDb.__lithodexDb;
  if (cached && cached.url === url) return cached.db;
  const opened = open(url);
  globalForDb.__lithodexDb = { url, ...opened };
  return opened.db;
}

/** Resolves once the connection pragmas (WAL) are applied. */
export function dbReady(): Promise<void> {
  getDb();
  return globalForDb.__lithodexDb!.ready;
}

export function getClient(): Client {
  getDb();
  return globalForDb.__lithodexDb!.client;
}

export { schema };
