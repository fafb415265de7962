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

function open(url: string): { client: Client; db: Db } {
  if (url.startsWith("file:")) {
    // libsql cannot create missing folders; next build imports this module too.
    mkdirSync(dirname(url.slice("file:".length)), { recursive: true });
  }
  const client = createClient({ url, authToken: process.env.DATABASE_AUTH_TOKEN });
  return { client, db: drizzle(client, { schema }) };
}

const globalForDb = globalThis as unknown as { __lithodexDb?: { url: string; client: Client; db: Db } };

/** One client per process (and per DATABASE_URL, so tests can switch files). */
export function getDb(): Db {
  const url = databaseUrl();
  const cached = globalForDb.__lithodexDb;
  if (cached && cached.url === url) return cached.db;
  const opened = open(url);
  if (url.startsWith("file:")) {
    // WAL lets readers proceed during a write; busy_timeout waits instead of failing on a lock.
    void opened.client.execute("PRAGMA busy_timeout = 5000").catch(() => {});
  }
  globalForDb.__lithodexDb = { url, ...opened };
  return opened.db;
}

export function getClient(): Client {
  getDb();
  return globalForDb.__lithodexDb!.client;
}

export { schema };
