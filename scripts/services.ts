/**
 * Local stand-ins for hosted services, started by `npm run dev` and `npm run demo`.
 * Each returns the environment the app needs to reach it.
 */
import { join } from "node:path";
import { startFakeSmtp } from "./fake-smtp";

export interface LocalServices {
  env: Record<string, string>;
  stop: () => Promise<void>;
}

/**
 * Starts what is not configured: today the fake SMTP server (unless SMTP_HOST is set).
 * @param options.dataDir - the app's LITHODEX_DATA_DIR, where captured mail goes (outbox/). @default process.env.LITHODEX_DATA_DIR or data/files
 */
export async function startLocalServices({ dataDir = process.env.LITHODEX_DATA_DIR || "data/files" }: { dataDir?: string } = {}): Promise<LocalServices> {
  const stops: (() => Promise<void>)[] = [];
  const env: Record<string, string> = {};
  // Fake SMTP unless a real server is configured: mail lands in LITHODEX_DATA_DIR/outbox, readable at /dev/outbox.
  if (!process.env.SMTP_HOST) {
    const wanted = Number(process.env.SMTP_FAKE_PORT || 2525);
    const outbox = join(dataDir, "outbox");
    const smtp = await startFakeSmtp({ port: wanted, outbox }).catch(() => startFakeSmtp({ port: 0, outbox }));
    stops.push(smtp.stop);
    Object.assign(env, { SMTP_HOST: "127.0.0.1", SMTP_PORT: String(smtp.port), SMTP_SECURE: "false" });
    env.LITHODEX_SHOW_OUTBOX = process.env.LITHODEX_SHOW_OUTBOX || "1";
    console.log(`Fake SMTP on 127.0.0.1:${smtp.port}: e-mails are captured, not sent (see /dev/outbox).`);
  }
  return { env, stop: async () => void (await Promise.all(stops.map((s) => s()))) };
}
