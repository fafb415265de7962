import { defineConfig } from "drizzle-kit";

/**
 * A local SQLite file uses drizzle-kit's "sqlite" dialect; a libSQL server (libsql://, http(s)://, ws(s)://, as
 * the README offers for teams) uses the "turso" dialect, which talks to the server with DATABASE_AUTH_TOKEN.
 */
const url = process.env.DATABASE_URL || "file:./data/lithodex.db";
const remote = /^(libsql|https?|wss?):\/\//i.test(url);

export default remote
  ? defineConfig({
      dialect: "turso",
      schema: "./db/schema/index.ts",
      out: "./db/migrations",
      dbCredentials: { url, authToken: process.env.DATABASE_AUTH_TOKEN },
    })
  : defineConfig({
      dialect: "sqlite",
      schema: "./db/schema/index.ts",
      out: "./db/migrations",
      dbCredentials: { url },
    });
