import { mkdtempSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import type { OutboxMessage } from "@/lib/mail/outbox";
import { startFakeSmtp, type FakeSmtp } from "../../scripts/fake-smtp";

/**
 * Starts the real fake SMTP server for a test file and points the app's mail settings at it.
 * `messages` collects every captured message in arrival order.
 */
export async function useFakeSmtp(): Promise<{ smtp: FakeSmtp; messages: OutboxMessage[]; outbox: string; restore: () => Promise<void> }> {
  const outbox = mkdtempSync(join(tmpdir(), "lithodex-mail-"));
  const messages: OutboxMessage[] = [];
  const smtp = await startFakeSmtp({ port: 0, outbox, onMessage: (m) => messages.push(m) });
  const saved = { SMTP_HOST: process.env.SMTP_HOST, SMTP_PORT: process.env.SMTP_PORT, SMTP_SECURE: process.env.SMTP_SECURE };
  Object.assign(process.env, { SMTP_HOST: "127.0.0.1", SMTP_PORT: String(smtp.port), SMTP_SECURE: "false" });
  return {
    smtp,
    messages,
    outbox,
    restore: async () => {
      for (const [k, v] of Object.entries(saved)) {
        if (v === undefined) delete process.env[k];
        else process.env[k] = v;
      }
      await smtp.stop();
    },
  };
}

/** The first http(s) link in a text that contains `needle`. */
export function linkContaining(text: string | null, needle: string): string | undefined {
  return (text ?? "").match(/https?:\/\/[^\s"<>]+/g)?.find((u) => u.includes(needle));
}
