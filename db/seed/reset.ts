import { rmSync } from "node:fs";
import { getClient, databaseUrl } from "@/db";
import { migrateDatabase } from "@/db/migrate";
import { printDemoAccounts, seedDemo } from "./demo";

/** Drops every table (file or libSQL server), re-applies migrations and reloads the demo scenario. */
async function reset() {
  const url = databaseUrl();
  const client = getClient();
  const { rows } = await client.execute("select name from sqlite_master where type = 'table' and name not like 'sqlite_%'");
  await client.execute("PRAGMA foreign_keys = OFF");
  for (const r of rows) await client.execute(`DROP TABLE IF EXISTS "${String(r.name)}"`);
  await client.execute("PRAGMA foreign_keys = ON");
  const dataDir = process.env.LITHODEX_DATA_DIR || "data/files";
  if (url.startsWith("file:")) rmSync(dataDir, { recursive: true, force: true });
  await migrateDatabase();
  await seedDemo();
  console.log(`Database ${url} reset and demo scenario loaded.`);
  printDemoAccounts();
}

reset().catch((err) => {
  console.error(err);
  process.exit(1);
});
