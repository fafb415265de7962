/**
 * Time to preview and commit a 5,000-row register CSV through the import DAL, against a fresh SQLite
 * file migrated from the committed migrations. Deterministic invented input (no randomness).
 *
 *   npx tsx --conditions=react-server tests/bench/csv-import.bench.ts [rows]
 *
 * (`react-server` lets the DAL's `import "server-only"` resolve outside Next, as in a route handler.)
 */
import { mkdtempSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";

const rows = Number(process.argv[2] ?? 5000);
const dir = mkdtempSync(join(tmpdir(), "lithodex-bench-"));
process.env.DATABASE_URL = `file:${join(dir, "bench.db")}`;

async function main() {
  const { migrateDatabase } = await import("@/db/migrate");
  const { getDb } = await import("@/db");
  const { organisations, projects, stations, user } = await import("@/db/schema");
  const { commitSampleImport, previewSampleImport } = await import("@/lib/dal/sample-import");
  const { count, eq } = await import("drizzle-orm");
  const { samples } = await import("@/db/schema");
  await migrateDatabase();
  const db = getDb();
  const [u] = await db.insert(user).values({ id: "bench-user", name: "Bench", email: "bench@example.test", role: "admin" }).returning();
  const [org] = await db.insert(organisations).values({ name: "Bench org" }).returning();
  const [project] = await db.insert(projects).values({ organisationId: org.id, code: "BEN", name: "Bench project" }).returning();
  for (let i = 1; i <= 50; i++) await db.insert(stations).values({ projectId: project.id, code: `BEN-ST-${String(i).padStart(3, "0")}`, lat: 37.6 + i * 0.003, lon: -6.7 + i * 0.004 });
  const actor = { userId: u.id, name: u.name, email: u.email, isAdmin: true };

  const lines = ["code,station_code,sample_type,lithology,alteration,description,collected_at,collected_tz,collector,lat,lon,elevation_m,horizontal_accuracy_m,status,suspected_asbestos,weight_kg"];
  const types = ["hand_sample", "chip", "soil", "stream_sediment", "float"];
  for (let i = 1; i <= rows; i++) {
    const st = i % 4 === 0 ? `BEN-ST-${String((i % 50) + 1).padStart(3, "0")}` : "";
    lines.push(
      [
        `BEN-${String(i).padStart(6, "0")}`,
        st,
        types[i % types.length],
        i % 2 ? "rhyolite" : "shale",
        i % 3 ? "sericitic" : "",
        `"Bench row ${i}, invented"`,
        `2026-0${(i % 9) + 1}-1${i % 10}T${String(8 + (i % 9)).padStart(2, "0")}:15:00Z`,
        "Europe/Madrid",
        "A. Geologist",
        (37.6 + (i % 997) * 0.0002).toFixed(6),
        (-6.75 + (i % 991) * 0.0003).toFixed(6),
        String(100 + (i % 300)),
        "5",
        "collected",
        "no",
        (0.5 + (i % 20) * 0.1).toFixed(1),
      ].join(","),
    );
  }
  const csv = lines.join("\n") + "\n";

  const t0 = performance.now();
  const preview = await previewSampleImport(actor, project.id, { csv });
  const t1 = performance.now();
  const result = await commitSampleImport(actor, project.id, { csv });
  const t2 = performance.now();
  const [{ n }] = await db.select({ n: count() }).from(samples).where(eq(samples.projectId, project.id));

  console.log(`csv-import bench: ${rows} rows, ${(csv.length / 1e6).toFixed(2)} MB`);
  console.log(`  preview: ${(t1 - t0).toFixed(0)} ms (valid ${preview.validRowCount}, errors ${preview.errorCount})`);
  console.log(`  commit:  ${(t2 - t1).toFixed(0)} ms (imported ${result.imported}; ${n} rows in the table)`);
  console.log(`  preview + commit: ${(t2 - t0).toFixed(0)} ms`);
  if (n !== rows || preview.errorCount !== 0) throw new Error("bench import did not write every row");
}

main()
  .catch((err) => {
    console.error(err);
    process.exitCode = 1;
  })
  .finally(() => rmSync(dir, { recursive: true, force: true }));
