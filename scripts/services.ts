/**
 * Local stand-ins for hosted services, started by `npm run dev` and `npm run demo`.
 * Each returns the environment the app needs to reach it.
 */
import { startFakeSmtp } from "./fake-smtp";

export interface LocalServices {
  env: Record<string, string>;
  stop: () => Promise<void>;
}

export async function startLocalServices(): Promise<LocalServices> {
  const stops: (() => Promise<void>)[] = [];
  const env: Record<string, string> = {};
  // Fake SMTP unless a real server is configured: mail lands in LITHODEX_DATA_DIR/outbox, readable at /dev/outbox.
  if (!process.env.SMTP_HOST) {
    const wanted = Number(process.env.SMTP_FAKE_PORT || 2525);
    const smtp = await startFakeSmtp({ port: wanted }).catch(() => startFakeSmtp({ port: 0 }));
    stops.push(smtp.stop);
    Object.assign(env, { SMTP_HOST: "127.0.0.1", SMTP_PORT: String(smtp.port), SMTP_SECURE: "false" });
    env.LITHODEX_SHOW_OUTBOX = process.env.LITHODEX_SHOW_OUTBOX || "1";
    console.log(`Fake SMTP on 127.0.0.1:${smtp.port}: e-mails are captured, not sent (see /dev/outbox).`);
  }
  return { env, stop: async () => void (await Promise.all(stops.map((s) => s()))) };
}
