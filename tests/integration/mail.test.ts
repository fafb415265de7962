import { readdirSync } from "node:fs";
import { mkdtempSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterAll, beforeAll, describe, expect, test } from "vitest";
import { mailConfig } from "@/lib/mail/config";
import { listOutbox, outboxDir } from "@/lib/mail/outbox";
import { MailError, sendMail } from "@/lib/mail/send";
import { startFakeSmtp, type FakeSmtp } from "../../scripts/fake-smtp";

// The fake SMTP server is checked through nodemailer, an independent SMTP client: what nodemailer sends
// (RFC 5321 envelope, RFC 5322 headers, RFC 2047 encoded subject, multipart/alternative body) must come back intact.

let smtp: FakeSmtp;
let dir: string;
beforeAll(async () => {
  dir = mkdtempSync(join(tmpdir(), "lithodex-mailtest-"));
  smtp = await startFakeSmtp({ port: 0, outbox: dir });
});
afterAll(async () => {
  await smtp.stop();
});

describe("mail transport", () => {
  test("SMTP through the fake server keeps envelope, headers, non-ASCII subject, text and html", async () => {
    const cfg = mailConfig({ SMTP_HOST: "127.0.0.1", SMTP_PORT: String(smtp.port), SMTP_SECURE: "false", MAIL_FROM: "Lithodex Test <noreply@example.test>" });
    expect(cfg).toMatchObject({ kind: "smtp", secure: false, port: smtp.port });
    const sent = await sendMail({ to: ["lab@example.test"], cc: "lead@example.test", subject: "Arroyo Pinar Cu–Zn: 3 samples", text: "Manifest: http://localhost:3000/x", html: '<p>Manifest: <a href="http://localhost:3000/x">open</a></p>' }, cfg);
    expect(sent.via).toBe("smtp");
    expect(sent.accepted.sort()).toEqual(["lab@example.test", "lead@example.test"]);
    const [m] = await listOutbox({ dir });
    expect(m.envelope).toEqual({ from: "noreply@example.test", to: ["lab@example.test", "lead@example.test"] });
    expect(m.subject).toBe("Arroyo Pinar Cu–Zn: 3 samples");
    // RFC 2047: a non-ASCII subject travels as an encoded word.
    expect(m.headers.subject).toMatch(/^=\?UTF-8\?[QB]\?/i);
    expect(m.headers["content-type"]).toMatch(/^multipart\/alternative/);
    expect(m.text?.trim()).toBe("Manifest: http://localhost:3000/x");
    expect(m.html).toContain('href="http://localhost:3000/x"');
    expect(m.cc).toEqual(["lead@example.test"]);
  });

  test("newest first across several messages", async () => {
    const cfg = mailConfig({ SMTP_HOST: "127.0.0.1", SMTP_PORT: String(smtp.port) });
    for (const k of [1, 2, 3]) await sendMail({ to: "a@example.test", subject: `n${k}`, text: "t", html: "<p>t</p>" }, cfg);
    const subjects = (await listOutbox({ dir })).map((m) => m.subject).slice(0, 3);
    expect(subjects).toEqual(["n3", "n2", "n1"]);
  });

  test("embedded mode (no SMTP_HOST) writes JSON into LITHODEX_DATA_DIR/outbox", async () => {
    expect(mailConfig({})).toEqual({ kind: "embedded", from: "Lithodex <no-reply@lithodex.example>" });
    expect(outboxDir()).toBe(join(process.env.LITHODEX_DATA_DIR!, "outbox"));
    const sent = await sendMail({ to: "x@example.test", subject: "embedded", text: "t", html: "<p>t</p>" }, mailConfig({}));
    expect(sent.via).toBe("embedded");
    expect(readdirSync(outboxDir()).filter((f) => f.endsWith(".json"))).toHaveLength(1);
    expect((await listOutbox())[0]).toMatchObject({ via: "embedded", subject: "embedded", to: ["x@example.test"] });
  });

  test("no recipient, a bad port or a dead server are clear errors", async () => {
    await expect(sendMail({ to: [], subject: "s", text: "t", html: "h" }, mailConfig({}))).rejects.toThrow("no recipient");
    expect(() => mailConfig({ SMTP_HOST: "mail.example.test", SMTP_PORT: "99999" })).toThrow(/SMTP_PORT must be a port number/);
    const closed = await startFakeSmtp({ port: 0, outbox: dir });
    await closed.stop();
    const err = await sendMail({ to: "a@example.test", subject: "s", text: "t", html: "h" }, mailConfig({ SMTP_HOST: "127.0.0.1", SMTP_PORT: String(closed.port) })).catch((e: unknown) => e);
    expect(err).toBeInstanceOf(MailError);
    expect((err as Error).message).toContain(`127.0.0.1:${closed.port} did not take the message`);
  });
});
