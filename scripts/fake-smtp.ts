/**
 * A local stand-in for an SMTP server (development, demo, tests): accepts every message on 127.0.0.1 and
 * writes it into the outbox folder as JSON (envelope, headers, text, html) — nothing is relayed.
 * Run alone with `npx tsx scripts/fake-smtp.ts [port]`.
 */
import { fileURLToPath } from "node:url";
import PostalMime from "postal-mime";
import { SMTPServer } from "smtp-server";
import { outboxDir, writeOutboxMessage, type OutboxMessage } from "../lib/mail/outbox";

export interface FakeSmtp {
  port: number;
  stop: () => Promise<void>;
}

type Parsed = Awaited<ReturnType<typeof PostalMime.parse>>;
type Addr = NonNullable<Parsed["to"]>[number];

const addresses = (list: Addr[] | undefined): string[] =>
  (list ?? []).flatMap((a) => ("group" in a && a.group ? a.group.map((m) => m.address) : a.address ? [a.address] : []));

/**
 * Starts the fake SMTP server.
 * @param options.port - TCP port; 0 picks a free one. @default 0
 * @param options.outbox - folder the messages go to. @default outboxDir() (LITHODEX_DATA_DIR/outbox)
 * @param options.onMessage - called after each message is written (tests wait on it).
 */
export async function startFakeSmtp({ port = 0, outbox = outboxDir(), onMessage }: { port?: number; outbox?: string; onMessage?: (m: OutboxMessage) => void } = {}): Promise<FakeSmtp> {
  const server = new SMTPServer({
    authOptional: true,
    disabledCommands: ["STARTTLS"],
    banner: "Lithodex fake SMTP (local capture only)",
    logger: false,
    size: 25 * 1024 * 1024,
    onData(stream, session, callback) {
      const chunks: Buffer[] = [];
      stream.on("data", (c: Buffer) => chunks.push(c));
      stream.on("error", (err) => callback(err));
      stream.on("end", () => {
        void (async () => {
          const raw = Buffer.concat(chunks);
          const mail = await PostalMime.parse(raw);
          const headers: Record<string, string> = {};
          for (const h of mail.headers) headers[h.key] = headers[h.key] ? `${headers[h.key]}, ${h.value}` : h.value;
          const from = session.envelope.mailFrom ? session.envelope.mailFrom.address : null;
          const saved = await writeOutboxMessage(
            {
              via: "smtp",
              envelope: { from, to: session.envelope.rcptTo.map((r) => r.address) },
              from: mail.from && "address" in mail.from && mail.from.address ? mail.from.address : from,
              to: addresses(mail.to),
              cc: addresses(mail.cc),
              subject: mail.subject ?? "",
              text: mail.text ?? null,
              html: mail.html ?? null,
              headers,
              ...(mail.attachments.length && {
                attachments: mail.attachments.map((a) => {
                  const bytes = typeof a.content === "string" ? Buffer.from(a.content, "base64") : Buffer.from(a.content as ArrayBuffer);
                  return { filename: a.filename ?? "attachment", contentType: a.mimeType, size: bytes.byteLength, contentBase64: bytes.toString("base64") };
                }),
              }),
            },
            outbox,
          );
          onMessage?.(saved);
        })().then(
          () => callback(),
          (err: Error) => callback(err),
        );
      });
    },
  });
  await new Promise<void>((resolve, reject) => {
    server.once("error", reject);
    server.listen(port, "127.0.0.1", () => {
      server.off("error", reject);
      resolve();
    });
  });
  server.on("error", (err) => console.error("fake SMTP:", err.message));
  const addr = server.server.address();
  const actual = typeof addr === "object" && addr ? addr.port : port;
  return { port: actual, stop: () => new Promise<void>((resolve) => server.close(() => resolve())) };
}

if (process.argv[1] && fileURLToPath(import.meta.url) === process.argv[1]) {
  const smtp = await startFakeSmtp({ port: Number(process.argv[2] || process.env.SMTP_FAKE_PORT || 2525) });
  console.log(`Fake SMTP on 127.0.0.1:${smtp.port}, writing to ${outboxDir()}`);
  const stop = () => void smtp.stop().then(() => process.exit(0));
  process.on("SIGINT", stop);
  process.on("SIGTERM", stop);
}
