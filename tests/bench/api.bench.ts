/**
 * `npm run bench:api`: the API under load over HTTP. A fresh database with the demo scenario, the production build
 * (`next start`; built first when NEXT_DIST_DIR has none), then autocannon with 50 connections for 60 s, split over
 * three roles that mix reads and writes: lead (project, register, phase map, new stations), field geologist
 * (stations, register search, new samples), lab analyst (scans, reference library, submissions). Prints p50/p99
 * latency, requests per second, errors and non-2xx answers per role, then checks that the rows in the database grew by
 * exactly the number of writes answered 201.
 *
 *   npm run bench:api [-- --duration 60 --connections 50]
 */
import { spawn, spawnSync } from "node:child_process";
import { randomBytes } from "node:crypto";
import { existsSync, mkdtempSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import autocannon from "autocannon";
import { createClient } from "@libsql/client";

const arg = (name: string, def: number) => {
  const i = process.argv.indexOf(`--${name}`);
  return i > 0 ? Number(process.argv[i + 1]) : def;
};
const duration = arg("duration", Number(process.env.BENCH_DURATION || 60));
const connections = arg("connections", 50);
const port = Number(process.env.BENCH_PORT || 3200);
const base = `http://localhost:${port}`;
const dist = process.env.NEXT_DIST_DIR || ".next";
const dir = mkdtempSync(join(tmpdir(), "lithodex-bench-api-"));
const env = {
  ...process.env,
  NEXT_TELEMETRY_DISABLED: "1",
  NODE_ENV: "production" as const,
  DATABASE_URL: `file:${join(dir, "bench.db")}`,
  LITHODEX_DATA_DIR: join(dir, "files"),
  BETTER_AUTH_URL: base,
  BETTER_AUTH_SECRET: randomBytes(32).toString("base64"),
  LITHODEX_AUTH_RATE_LIMIT: "off",
  LITHODEX_JOBS: "manual",
  NEXT_DIST_DIR: dist,
};

const DEMO = {
  lead: ["lead@lithodex.example", "lead-demo-2026"],
  field: ["field@lithodex.example", "field-demo-2026"],
  lab: ["lab@lithodex.example", "lab-demo-2026"],
} as const;

async function signIn(role: keyof typeof DEMO): Promise<string> {
  const [email, password] = DEMO[role];
  const res = await fetch(`${base}/api/auth/sign-in/email`, { method: "POST", headers: { "content-type": "application/json", origin: base }, body: JSON.stringify({ email, password }) });
  if (!res.ok) throw new Error(`sign-in ${role}: ${res.status}`);
  return res.headers.getSetCookie().map((c) => c.split(";")[0]).join("; ");
}

async function rowCounts(): Promise<{ stations: number; samples: number }> {
  const c = createClient({ url: env.DATABASE_URL });
  try {
    const s = Number((await c.execute("SELECT count(*) AS n FROM stations")).rows[0].n);
    const m = Number((await c.execute("SELECT count(*) AS n FROM samples")).rows[0].n);
    return { stations: s, samples: m };
  } finally {
    c.close();
  }
}

type Req = autocannon.Request & { write?: "stations" | "samples" };

function run(title: string, cookie: string, conns: number, requests: Req[], created: { stations: number; samples: number }) {
  const reqs = requests.map((r) => ({
    ...r,
    headers: { cookie, origin: base, ...(r.body ? { "content-type": "application/json" } : {}) },
    onResponse: (status: number) => {
      if (r.write && status === 201) created[r.write]++;
    },
  }));
  return autocannon({ title, url: base, connections: conns, duration, requests: reqs as autocannon.Request[] });
}

async function main() {
  const r = (cmd: string, args: string[]) => {
    const x = spawnSync(cmd, args, { env, stdio: "inherit" });
    if (x.status !== 0) throw new Error(`${cmd} ${args.join(" ")} failed`);
  };
  r("npx", ["tsx", "db/seed/demo.ts"]);
  if (!existsSync(join(dist, "BUILD_ID"))) r("npx", ["next", "build"]);
  const server = spawn("npx", ["next", "start", "-p", String(port)], { env, stdio: ["ignore", "ignore", "inherit"], detached: true });
  try {
    for (let i = 0; ; i++) {
      try {
        if ((await fetch(`${base}/api/health`)).ok) break;
      } catch {
        // not up yet
      }
      if (i > 240) throw new Error("server did not start");
      await new Promise((res) => setTimeout(res, 250));
    }
    const cookies = { lead: await signIn("lead"), field: await signIn("field"), lab: await signIn("lab") };
    const projectId = ((await (await fetch(`${base}/api/projects`, { headers: { cookie: cookies.lead } })).json()) as { items: { id: string }[] }).items[0].id;
    const p = `/api/projects/${projectId}`;
    const before = await rowCounts();
    const created = { stations: 0, samples: 0 };
    let k = 0;
    const station = () => JSON.stringify({ name: `Bench outcrop ${k++}`, lat: 37.7 + Math.random() / 100, lon: -6.6 + Math.random() / 100 });
    const sample = () => JSON.stringify({ sampleType: "soil", description: `bench ${k++}` });
    const split = [Math.ceil(connections / 3), Math.ceil(connections / 3), connections - 2 * Math.ceil(connections / 3)];
    console.log(`bench:api — ${connections} connections (${split.join("/")} lead/field/lab), ${duration} s, demo scenario, next start`);
    const results = await Promise.all([
      run("lead", cookies.lead, split[0], [
        { method: "GET", path: p },
        { method: "GET", path: `${p}/samples?pageSize=50` },
        { method: "GET", path: `${p}/phase-map` },
        { method: "POST", path: `${p}/stations`, setupRequest: (req) => ({ ...req, body: station() }), body: "{}", write: "stations" },
      ], created),
      run("field", cookies.field, split[1], [
        { method: "GET", path: `${p}/stations` },
        { method: "GET", path: `${p}/samples?q=gossan` },
        { method: "POST", path: `${p}/samples`, setupRequest: (req) => ({ ...req, body: sample() }), body: "{}", write: "samples" },
      ], created),
      run("lab", cookies.lab, split[2], [
        { method: "GET", path: `${p}/scans` },
        { method: "GET", path: "/api/reference-phases?pageSize=20" },
        { method: "GET", path: `${p}/submissions` },
      ], created),
    ]);
    let totalReq = 0;
    let errors = 0;
    for (const res of results) {
      totalReq += res.requests.total;
      errors += res.errors + res.timeouts;
      console.log(
        `${(res.title ?? "").padEnd(6)} ${String(res.requests.total).padStart(7)} requests  ${res.requests.average.toFixed(0).padStart(5)} req/s  p50 ${res.latency.p50} ms  p99 ${res.latency.p99} ms  max ${res.latency.max} ms  errors ${res.errors}  timeouts ${res.timeouts}  non-2xx ${res.non2xx}`,
      );
    }
    const after = await rowCounts();
    // Writes still in flight when autocannon stops are completed by the server but not counted: at most one per
    // connection of the writing role. Fewer rows than 201 answers, or more than that margin, is a lost or phantom write.
    const within = (delta: number, ok201: number, conns: number) => delta >= ok201 && delta <= ok201 + conns;
    const ok = within(after.stations - before.stations, created.stations, split[0]) && within(after.samples - before.samples, created.samples, split[1]);
    console.log(`all    ${totalReq} requests, ${errors} errors/timeouts`);
    console.log(
      `row-count check: stations +${after.stations - before.stations} (201 answers: ${created.stations}), samples +${after.samples - before.samples} (201 answers: ${created.samples}; in-flight margin ${split[0]}/${split[1]}) → ${ok ? "OK" : "MISMATCH"}`,
    );
    if (!ok) process.exitCode = 1;
  } finally {
    if (server.pid) process.kill(-server.pid, "SIGTERM");
  }
}

main().catch((err) => {
  console.error(err);
  process.exit(1);
});
