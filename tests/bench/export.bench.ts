/**
 * Streaming exports of a 20,000-sample register: time, size and peak memory (RSS and V8 heap, sampled
 * every 10 ms and after every chunk) for CSV, XLSX, GeoJSON and KML, each measured in a fresh child
 * process reading the same seeded SQLite file, so one format's garbage does not inflate the next. Each child
 * runs with a 96 MiB V8 old-space limit: an export that held the whole register in memory would fail.
 *
 *   npx tsx --conditions=react-server tests/bench/export.bench.ts [samples]
 */
import { execFileSync } from "node:child_process";
import { mkdtempSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { fileURLToPath } from "node:url";

const self = fileURLToPath(import.meta.url);
const MiB = 1024 * 1024;
/** Old-space limit of each child, MiB. */
const HEAP_LIMIT_MIB = 96;

async function child(format: string, projectId: string) {
  const { registerExportFor } = await import("@/lib/dal/register-export");
  const { exportResponse } = await import("@/lib/export/respond");
  const { registerFilterSchema } = await import("@/lib/phase-map");
  const base = process.memoryUsage();
  let peakRss = base.rss;
  let peakHeap = base.heapUsed;
  const sample = () => {
    const m = process.memoryUsage();
    peakRss = Math.max(peakRss, m.rss);
    peakHeap = Math.max(peakHeap, m.heapUsed);
  };
  const timer = setInterval(sample, 10);
  const t0 = performance.now();
  const exp = await registerExportFor(projectId, registerFilterSchema.parse({}), { kind: "member", name: "Bench" });
  const res = exportResponse(exp, format as "csv", { sampleUrl: (id) => `http://localhost/projects/${projectId}/samples/${id}` });
  const reader = res.body!.getReader();
  let bytes = 0;
  let firstByteMs = 0;
  for (;;) {
    const { value, done } = await reader.read();
    if (done) break;
    if (!bytes) firstByteMs = performance.now() - t0;
    bytes += value.byteLength;
    sample();
  }
  clearInterval(timer);
  const ms = performance.now() - t0;
  console.log(JSON.stringify({ format, ms, firstByteMs, bytes, baseRss: base.rss, peakRss, baseHeap: base.heapUsed, peakHeap }));
}

async function main() {
  const count = Number(process.argv[2] ?? 20_000);
  const dir = mkdtempSync(join(tmpdir(), "lithodex-bench-"));
  const db = join(dir, "bench.db");
  process.env.DATABASE_URL = `file:${db}`;
  try {
    const { migrateDatabase } = await import("@/db/migrate");
    const { seedRegister } = await import("./seed-register");
    await migrateDatabase();
    const seeded = await seedRegister(count);
    console.log(`export bench: ${seeded.samples} samples, ${seeded.scans} scans, ${seeded.phaseResults} phase results`);
    const rows: string[][] = [];
    for (const format of ["csv", "xlsx", "geojson", "kml"]) {
      // A small V8 heap limit: an export that kept the whole register in memory would run out of heap.
      const out = execFileSync(process.execPath, [...process.execArgv, `--max-old-space-size=${HEAP_LIMIT_MIB}`, self, "--child", format, seeded.projectId], { env: { ...process.env, DATABASE_URL: `file:${db}` }, encoding: "utf8", maxBuffer: 16 * MiB });
      const r = JSON.parse(out.trim().split("\n").pop()!);
      rows.push([format, (r.ms / 1000).toFixed(1), r.firstByteMs.toFixed(0), (r.bytes / MiB).toFixed(1), (r.baseRss / MiB).toFixed(0), (r.peakRss / MiB).toFixed(0), (r.baseHeap / MiB).toFixed(0), (r.peakHeap / MiB).toFixed(0)]);
    }
    const head = ["format", "time s", "first byte ms", "size MiB", "RSS before MiB", "peak RSS MiB", "heap before MiB", "peak heap MiB"];
    const widths = head.map((h, i) => Math.max(h.length, ...rows.map((r) => r[i].length)));
    const line = (r: string[]) => r.map((c, i) => (i === 0 ? c.padEnd(widths[i]) : c.padStart(widths[i]))).join("  ");
    console.log(line(head));
    for (const r of rows) console.log(line(r));
    const { loadavg, cpus } = await import("node:os");
    console.log(`(each format in its own process with --max-old-space-size=${HEAP_LIMIT_MIB}; 1-minute load average ${loadavg()[0].toFixed(1)} on ${cpus().length} cores)`);
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
}

if (process.argv[2] === "--child") {
  child(process.argv[3], process.argv[4]).catch((err) => {
    console.error(err);
    process.exit(1);
  });
} else {
  main().catch((err) => {
    console.error(err);
    process.exitCode = 1;
  });
}
