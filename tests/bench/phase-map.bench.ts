/**
 * Time to compute the phase map of a 20,000-sample register (the DAL's two aggregate queries plus the
 * merge), against a fresh SQLite file migrated from the committed migrations. Deterministic invented data.
 *
 *   npx tsx --conditions=react-server tests/bench/phase-map.bench.ts [samples]
 *
 * Target: < 300 ms per request on 2 cores.
 */
import { mkdtempSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";

const count = Number(process.argv[2] ?? 20_000);
const dir = mkdtempSync(join(tmpdir(), "lithodex-bench-"));
process.env.DATABASE_URL = `file:${join(dir, "bench.db")}`;

async function main() {
  const { migrateDatabase } = await import("@/db/migrate");
  const { seedRegister } = await import("./seed-register");
  const { getPhaseMap } = await import("@/lib/dal/phase-map");
  await migrateDatabase();
  const t0 = performance.now();
  const seeded = await seedRegister(count);
  const seedMs = performance.now() - t0;
  console.log(`phase-map bench: ${seeded.samples} samples, ${seeded.stations} stations, ${seeded.scans} scans, ${seeded.phaseResults} phase results (seeded in ${(seedMs / 1000).toFixed(1)} s)`);
  const cases: [string, Record<string, string>][] = [
    ["no filter (confirmed)", {}],
    ["phase=any (with candidates)", { phase: "any" }],
    ["mineral=pyrite", { mineral: "pyrite" }],
    ["mineral=pyrite&phase=any", { mineral: "pyrite", phase: "any" }],
    ["group=sulfide&lithology=gossan", { group: "sulfide", lithology: "gossan" }],
    ["from/to one week", { from: "2026-03-05", to: "2026-03-11" }],
  ];
  const rows: string[][] = [];
  for (const [name, q] of cases) {
    const times: number[] = [];
    const cpu: number[] = [];
    let stations = 0;
    let bytes = 0;
    for (let i = 0; i < 7; i++) {
      const c0 = process.cpuUsage();
      const s = performance.now();
      // What the route does: the DAL call plus serialising the JSON body.
      const data = await getPhaseMap(seeded.actor, seeded.projectId, q);
      const body = JSON.stringify(data);
      times.push(performance.now() - s);
      const c = process.cpuUsage(c0);
      cpu.push((c.user + c.system) / 1000);
      stations = data.stations.length;
      bytes = body.length;
    }
    const median = (xs: number[]) => xs.slice(1).sort((a, b) => a - b)[Math.floor((xs.length - 1) / 2)];
    rows.push([name, String(stations), `${(bytes / 1024).toFixed(0)} KiB`, times[0].toFixed(0), median(times).toFixed(0), Math.max(...times.slice(1)).toFixed(0), median(cpu).toFixed(0)]);
  }
  const head = ["query", "stations", "JSON", "first ms", "median ms", "max ms", "median CPU ms"];
  const widths = head.map((h, i) => Math.max(h.length, ...rows.map((r) => r[i].length)));
  const line = (r: string[]) => r.map((c, i) => (i === 0 ? c.padEnd(widths[i]) : c.padStart(widths[i]))).join("  ");
  console.log(line(head));
  for (const r of rows) console.log(line(r));
  const [load1] = (await import("node:os")).loadavg();
  console.log(`(wall times include waiting for the CPU: 1-minute load average ${load1.toFixed(1)} on ${(await import("node:os")).cpus().length} cores)`);
  const worst = Math.max(...rows.map((r) => Number(r[4])));
  console.log(worst < 300 ? `OK: every median below 300 ms (worst ${worst} ms)` : `SLOW: worst median ${worst} ms exceeds 300 ms`);
  if (worst >= 300) process.exitCode = 1;
}

main()
  .catch((err) => {
    console.error(err);
    process.exitCode = 1;
  })
  .finally(() => rmSync(dir, { recursive: true, force: true }));
