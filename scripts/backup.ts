/**
 * `npm run backup [-- --out DIR]`: a consistent copy of the database (VACUUM INTO) and the file store in one dated
 * .tar.gz with a manifest of SHA-256 hashes. Safe while the app runs. Default folder: backups/ (LITHODEX_BACKUP_DIR).
 */
import { databaseUrl } from "@/db";
import { createBackup } from "@/lib/backup";

const i = process.argv.indexOf("--out");
const outDir = i > 0 ? process.argv[i + 1] : process.env.LITHODEX_BACKUP_DIR || "backups";

createBackup({ databaseUrl: databaseUrl(), dataDir: process.env.LITHODEX_DATA_DIR || "data/files", outDir })
  .then(({ archive, manifest }) => {
    const rows = Object.values(manifest.database.tables).reduce((a, b) => a + b, 0);
    console.log(`Backup written: ${archive}\n  database: ${manifest.database.bytes} bytes, ${rows} rows in ${Object.keys(manifest.database.tables).length} tables\n  files: ${manifest.files.length}`);
  })
  .catch((err) => {
    console.error(`Backup failed: ${(err as Error).message}`);
    process.exit(1);
  });
