/**
 * `npm run demo`: prepares the database with the demo scenario (only when empty), builds the app and
 * serves it, printing the URL and the demo accounts. Local services the app needs (the fake SMTP
 * server) are started by scripts/services.ts alongside.
 */
import { spawn, spawnSync } from "node:child_process";
import { randomBytes } from "node:crypto";
import { existsSync, mkdirSync, readFileSync, writeFileSync } from "node:fs";
import { dirname, join } from "node:path";
import { migrateDatabase } from "@/db/migrate";
import { printDemoAccounts, seedDemo } from "@/db/seed/demo";
import { startLocalServices } from "./services";

const port = Number(process.env.PORT || 3000);
// Production refuses to start without a session secret: the demo makes one and keeps it beside the database, so
// sessions survive a restart of the demo.
if (!process.env.BETTER_AUTH_SECRET) {
  const file = join(process.env.LITHODEX_DATA_DIR ? dirname(process.env.LITHODEX_DATA_DIR) : "data", ".auth-secret");
  if (!existsSync(file)) {
    mkdirSync(dirname(file), { recursive: true });
    writeFileSync(file, randomBytes(32).toString("base64"), { mode: 0o600 });
  }
  process.env.BETTER_AUTH_SECRET = readFileSync(file, "utf8").trim();
}
process.env.BETTER_AUTH_URL ||= `http://localhost:${port}`;
process.env.NEXT_TELEMETRY_DISABLED = "1";

async function main() {
  await migrateDatabase();
  const seeded = await seedDemo();
  console.log(seeded ? "Demo scenario loaded." : "Database already has data; kept it (npm run db:reset reloads the demo).");
  if (!process.env.DEMO_SKIP_BUILD) {
    const build = spawnSync("npx", ["next", "build"], { stdio: "inherit", env: process.env });
    if (build.status !== 0) process.exit(build.status ?? 1);
  }
  const services = await startLocalServices();
  const server = spawn("npx", ["next", "start", "-p", String(port)], { stdio: "inherit", env: { ...process.env, ...services.env } });
  for (let i = 0; i < 120; i++) {
    try {
      if ((await fetch(`http://localhost:${port}/api/health`)).ok) break;
    } catch {
      // not up yet
    }
    await new Promise((r) => setTimeout(r, 250));
  }
  printDemoAccounts(process.env.BETTER_AUTH_URL);
  const stop = () => {
    server.kill("SIGTERM");
    void services.stop().then(() => process.exit(0));
  };
  process.on("SIGINT", stop);
  process.on("SIGTERM", stop);
  server.on("exit", (code) => void services.stop().then(() => process.exit(code ?? 0)));
}

main().catch((err) => {
  console.error(err);
  process.exit(1);
});
