import type { Metadata } from "next";
import { notFound } from "next/navigation";
import { AppHeader } from "@/components/layout/app-header";
import { Badge } from "@/components/ui/badge";
import { currentActor } from "@/lib/dal/session";
import { listOutbox, type OutboxMessage } from "@/lib/mail/outbox";

export const metadata: Metadata = { title: "Outbox" };
export const dynamic = "force-dynamic";

const URL_RE = /(https?:\/\/[^\s<>"]+)/g;

/** Plain text with its URLs turned into links (the HTML part is not rendered, so no markup from mail runs here). */
function Linkified({ text }: { text: string }) {
  const parts = text.split(URL_RE);
  return (
    <>
      {parts.map((p, i) =>
        i % 2 === 1 ? (
          <a key={i} href={p} className="break-all text-brand underline">
            {p}
          </a>
        ) : (
          <span key={i}>{p}</span>
        ),
      )}
    </>
  );
}

const addressedTo = (m: OutboxMessage, email: string) => [...m.to, ...m.cc, ...m.envelope.to].some((a) => a.toLowerCase() === email.toLowerCase());

/**
 * Local outbox: mail captured by the embedded transport or the fake SMTP server, newest first.
 * Off in production unless LITHODEX_SHOW_OUTBOX=1 (the demo sets it); a site admin sees all, others their own mail.
 */
export default async function OutboxPage() {
  if (process.env.NODE_ENV === "production" && process.env.LITHODEX_SHOW_OUTBOX !== "1") notFound();
  const actor = await currentActor();
  const all = await listOutbox();
  const messages = actor.isAdmin ? all : all.filter((m) => addressedTo(m, actor.email));
  return (
    <>
      <AppHeader actor={actor} />
      <main className="mx-auto max-w-4xl space-y-4 px-4 py-6">
        <div>
          <h1 className="text-2xl font-semibold">Outbox</h1>
          <p className="text-sm text-muted">
            E-mail captured on this machine instead of being delivered (development and demo only). {actor.isAdmin ? "As site admin you see every message." : `Messages to ${actor.email}.`}
          </p>
        </div>
        {messages.length === 0 && <p className="rounded-md border border-line bg-white p-4 text-sm text-muted">No messages yet.</p>}
        <ol className="space-y-3" aria-label="Messages, newest first">
          {messages.map((m) => (
            <li key={m.id}>
              <details className="rounded-lg border border-line bg-white p-3 shadow-sm" open={messages.length <= 3}>
                <summary className="cursor-pointer list-none">
                  <span className="flex flex-wrap items-center gap-2">
                    <span className="font-medium">{m.subject || "(no subject)"}</span>
                    <Badge>{m.via === "smtp" ? "via fake SMTP" : "embedded"}</Badge>
                  </span>
                  <span className="block text-xs text-muted">
                    {m.capturedAt.slice(0, 19).replace("T", " ")} UTC · from {m.from ?? "—"} · to {m.to.join(", ")}
                    {m.cc.length > 0 && ` · cc ${m.cc.join(", ")}`}
                  </span>
                </summary>
                <pre className="mt-2 whitespace-pre-wrap break-words font-sans text-sm">
                  <Linkified text={m.text ?? "(no text part)"} />
                </pre>
                {m.attachments && m.attachments.length > 0 && (
                  <p className="mt-2 text-xs text-muted" data-testid="outbox-attachments">
                    Attached: {m.attachments.map((a) => `${a.filename} (${a.contentType}, ${Math.max(1, Math.round(a.size / 1024))} KiB)`).join(", ")}
                  </p>
                )}
              </details>
            </li>
          ))}
        </ol>
      </main>
    </>
  );
}
