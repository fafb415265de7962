import { spawn, spawnSync, type ChildProcess } from "node:child_process";
import { randomBytes } from "node:crypto";
import { mkdtempSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import type { TestProject } from "vitest/node";
import { startLocalServices } from "../../scripts/services";

declare module "vitest" {
  export interface ProvidedContext {
    baseUrl: string;
    dataDir: string;
  }
}

/**
 * Browser tests run against the real production build: a fresh database seeded with the demo
 * scenario, `next start` on a free port. Set E2E_SKIP_BUILD=1 to reuse an existing build.
 */
export default async function setup(project: TestProject) {
  const port = Number(process.env.E2E_PORT || 3100);
  const baseUrl = `http://localhost:${port}`;
  const dir = mkdtempSync(join(tmpdir(), "lithodex-e2e-"));
  const env = {
    ...process.env,
    NEXT_TELEMETRY_DISABLED: "1",
    DATABASE_URL: `file:${join(dir, "e2e.db")}`,
    LITHODEX_DATA_DIR: join(dir, "files"),
    BETTER_AUTH_URL: baseUrl,
    NODE_ENV: "production" as const,
    LITHODEX_AUTH_RATE_LIMIT: "off",
    // production refuses to start without a session secret (instrumentation.ts)
    BETTER_AUTH_SECRET: process.env.BETTER_AUTH_SECRET || randomBytes(32).toString("base64"),
  };
  const run = (cmd: string, args: string[]) => {
    const r = spawnSync(cmd, args, { env, stdio: "inherit" });
    if (r.status !== 0) throw new Error(`${cmd} ${args.join(" ")} failed with ${r.status}`);
  };
  run("npx", ["tsx", "db/seed/demo.ts"]);
  if (!process.env.E2E_SKIP_BUILD) run("npx", ["next", "build"]);
  // Fake SMTP: mail lands in LITHODEX_DATA_DIR/outbox and /dev/outbox shows it (LITHODEX_SHOW_OUTBOX=1).
  const services = await startLocalServices({ dataDir: env.LITHODEX_DATA_DIR });
  const server: ChildProcess = spawn("npx", ["next", "start", "-p", String(port)], { env: { ...env, ...services.env }, stdio: ["ignore", "pipe", "inherit"], detached: true });
  const deadline = Date.now() + 60_000;
  for (;;) {
    try {
      const res = await fetch(`${baseUrl}/api/health`);
      if (res.ok) break;
    } catch {
      // not up yet
    }
    if (Date.now() > deadline) throw new Error("next start did not answer /api/health within 60 s");
    await new Promise((r) => setTimeout(r, 250));
  }
  project.provide("baseUrl", baseUrl);
  project.provide("dataDir", dir);
  return () => {
    void services.stop();
    if (server.pid) process.kill(-server.pid, "SIGTERM");
  };
}
