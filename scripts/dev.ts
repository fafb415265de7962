/** `npm run dev`: migrates, loads the demo when the database is empty, starts local services and `next dev`. */
import { spawn } from "node:child_process";
import { migrateDatabase } from "@/db/migrate";
import { seedDemo } from "@/db/seed/demo";
import { startLocalServices } from "./services";

async function main() {
  await migrateDatabase();
  await seedDemo();
  const services = await startLocalServices();
  const dev = spawn("npx", ["next", "dev", ...process.argv.slice(2)], { stdio: "inherit", env: { ...process.env, ...services.env, NEXT_TELEMETRY_DISABLED: "1" } });
  const stop = () => {
    dev.kill("SIGTERM");
    void services.stop().then(() => process.exit(0));
  };
  process.on("SIGINT", stop);
  process.on("SIGTERM", stop);
}

main().catch((err) => {
  console.error(err);
  process.exit(1);
});
