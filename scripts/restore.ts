/**
 * `npm run restore -- ARCHIVE [--force]`: checks every SHA-256 of the archive's manifest, then replaces the database
 * and the file store. Stop the app first. --force replaces an existing database.
 */
import { databaseUrl } from "@/db";
import { restoreBackup } from "@/lib/backup";

const args = process.argv.slice(2);
const archive = args.find((a) => !a.startsWith("--"));
if (!archive) {
  console.error("Usage: npm run restore -- ARCHIVE [--force]");
  process.exit(2);
}

restoreBackup({ archive, databaseUrl: databaseUrl(), dataDir: process.env.LITHODEX_DATA_DIR || "data/files", force: args.includes("--force") })
  .then((m) => console.log(`Restored the backup of ${m.createdAt}: database and ${m.files.length} files. Start the app again.`))
  .catch((err) => {
    console.error((err as Error).message);
    process.exit(1);
  });
