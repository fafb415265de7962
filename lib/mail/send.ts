import nodemailer, { type Transporter } from "nodemailer";
import { mailConfig, type MailConfig } from "./config";
import { writeOutboxMessage } from "./outbox";

export interface MailMessage {
  to: string | string[];
  cc?: string | string[];
  subject: string;
  text: string;
  html: string;
  replyTo?: string;
  /** Files sent with the message (e.g. the submission manifest as PDF). */
  attachments?: MailAttachment[];
}

export interface MailAttachment {
  filename: string;
  contentType: string;
  content: Uint8Array;
}

export interface SentMail {
  via: "smtp" | "embedded";
  messageId: string;
  accepted: string[];
}

/** A message could not be handed to the mail server. */
export class MailError extends Error {
  constructor(message: string, readonly cause?: unknown) {
    super(message);
    this.name = "MailError";
  }
}

const list = (v: string | string[] | undefined) => (v === undefined ? [] : Array.isArray(v) ? v : [v]).map((s) => s.trim()).filter(Boolean);

const transports = new Map<string, Transporter>();

function smtpTransport(cfg: Extract<MailConfig, { kind: "smtp" }>): Transporter {
  const key = JSON.stringify(cfg);
  let t = transports.get(key);
  if (!t) {
    t = nodemailer.createTransport({
      host: cfg.host,
      port: cfg.port,
      secure: cfg.secure,
      ...(cfg.user && { auth: { user: cfg.user, pass: cfg.pass ?? "" } }),
      connectionTimeout: 10_000,
      greetingTimeout: 10_000,
      socketTimeout: 20_000,
    });
    transports.set(key, t);
  }
  return t;
}

/**
 * Sends one message through SMTP (SMTP_HOST set) or writes it to the outbox ("embedded", the default).
 * @throws MailError when there are no recipients or the server refuses the message.
 */
export async function sendMail(msg: MailMessage, cfg: MailConfig = mailConfig()): Promise<SentMail> {
  const to = list(msg.to);
  const cc = list(msg.cc);
  if (to.length === 0) throw new MailError("The message has no recipient.");
  if (cfg.kind === "embedded") {
    const saved = await writeOutboxMessage({
      via: "embedded",
      envelope: { from: cfg.from, to: [...to, ...cc] },
      from: cfg.from,
      to,
      cc,
      subject: msg.subject,
      text: msg.text,
      html: msg.html,
      headers: { subject: msg.subject, ...(msg.replyTo && { "reply-to": msg.replyTo }) },
      ...(msg.attachments?.length && { attachments: msg.attachments.map((a) => ({ filename: a.filename, contentType: a.contentType, size: a.content.byteLength, contentBase64: Buffer.from(a.content).toString("base64") })) }),
    });
    return { via: "embedded", messageId: saved.id, accepted: [...to, ...cc] };
  }
  try {
    const attachments = msg.attachments?.map((a) => ({ filename: a.filename, contentType: a.contentType, content: Buffer.from(a.content) }));
    const info = await smtpTransport(cfg).sendMail({ from: cfg.from, to, cc, subject: msg.subject, text: msg.text, html: msg.html, replyTo: msg.replyTo, ...(attachments?.length && { attachments }) });
    return { via: "smtp", messageId: info.messageId, accepted: (info.accepted as (string | { address: string })[]).map((a) => (typeof a === "string" ? a : a.address)) };
  } catch (err) {
    throw new MailError(`The mail server at ${cfg.host}:${cfg.port} did not take the message: ${(err as Error).message}`, err);
  }
}
