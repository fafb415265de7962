import { mkdir, readdir, readFile, writeFile } from "node:fs/promises";
import { join } from "node:path";

/**
 * The outbox: every message the app sends in "embedded" mode, and every message the local fake SMTP
 * server captures, as one JSON file. Plain Node (no Next imports) so scripts can use it too.
 */
export interface OutboxMessage {
  id: string;
  /** ISO 8601 instant the message was written. */
  capturedAt: string;
  /** "embedded" = written directly by the app; "smtp" = received by the fake SMTP server. */
  via: "embedded" | "smtp";
  envelope: { from: string | null; to: string[] };
  from: string | null;
  to: string[];
  cc: string[];
  subject: string;
  text: string | null;
  html: string | null;
  headers: Record<string, string>;
  /** Attached files, content as base64. */
  attachments?: OutboxAttachment[];
}

export interface OutboxAttachment {
  filename: string;
  contentType: string;
  size: number;
  contentBase64: string;
}

/** Folder of captured mail: LITHODEX_DATA_DIR/outbox (LITHODEX_DATA_DIR defaults to data/files). */
export function outboxDir(): string {
  return join(process.env.LITHODEX_DATA_DIR || "data/files", "outbox");
}

/** Writes one message; the file name sorts by time so listing newest first is a reverse sort. */
export async function writeOutboxMessage(msg: Omit<OutboxMessage, "id" | "capturedAt">, dir = outboxDir()): Promise<OutboxMessage> {
  await mkdir(dir, { recursive: true });
  const now = new Date();
  const id = `${now.toISOString().replace(/[-:.]/g, "")}-${crypto.randomUUID().slice(0, 8)}`;
  const full: OutboxMessage = { id, capturedAt: now.toISOString(), ...msg };
  await writeFile(join(dir, `${id}.json`), JSON.stringify(full, null, 2), "utf8");
  return full;
}

/** Captured messages, newest first. Unreadable files are skipped rather than breaking the list. */
export async function listOutbox({ dir = outboxDir(), limit = 200 }: { dir?: string; limit?: number } = {}): Promise<OutboxMessage[]> {
  let names: string[];
  try {
    names = (await readdir(/* turbopackIgnore: true */ dir)).filter((n) => n.endsWith(".json"));
  } catch {
    return [];
  }
  names.sort().reverse();
  const out: OutboxMessage[] = [];
  for (const name of names.slice(0, limit)) {
    try {
      out.push(JSON.parse(await readFile(join(/* turbopackIgnore: true */ dir, name), "utf8")) as OutboxMessage);
    } catch {
      // a half-written or foreign file: skip it
    }
  }
  return out;
}
