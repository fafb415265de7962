import { migrate } from "drizzle-orm/libsql/migrator";
import { fileURLToPath } from "node:url";
import { dbReady, getDb, databaseUrl } from "./index";

export const MIGRATIONS_FOLDER = fileURLToPath(new URL("./migrations", import.meta.url));

/** Applies the committed drizzle-kit migrations to the configured database. */
export async function migrateDatabase(): Promise<void> {
  await dbReady();
  await migrate(getDb(), { migrationsFolder: MIGRATIONS_FOLDER });
}

if (process.argv[1] && fileURLToPath(import.meta.url) === process.argv[1]) {
  migrateDatabase()
    .then(() => console.log(`Migrations applied to ${databaseUrl()}`))
    .catch((err) => {
      console.error(err);
      process.exit(1);
    });
}
