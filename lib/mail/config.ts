/** How the app sends mail, read from the environment. */
export type MailConfig =
  | { kind: "smtp"; host: string; port: number; secure: boolean; user?: string; pass?: string; from: string }
  | { kind: "embedded"; from: string };

/** @default from "Lithodex <no-reply@lithodex.example>" */
export const DEFAULT_MAIL_FROM = "Lithodex <no-reply@lithodex.example>";

/**
 * SMTP when SMTP_HOST is set (SMTP_PORT default 587, or 465 when SMTP_SECURE=true; SMTP_USER/SMTP_PASS optional),
 * otherwise "embedded": messages are written to the outbox folder and nothing leaves the machine.
 */
export function mailConfig(env: Record<string, string | undefined> = process.env): MailConfig {
  const from = env.MAIL_FROM || DEFAULT_MAIL_FROM;
  const host = env.SMTP_HOST?.trim();
  if (!host || host === "embedded") return { kind: "embedded", from };
  const secure = env.SMTP_SECURE === "true" || env.SMTP_SECURE === "1";
  const port = env.SMTP_PORT ? Number(env.SMTP_PORT) : secure ? 465 : 587;
  if (!Number.isInteger(port) || port < 1 || port > 65535) throw new Error(`SMTP_PORT must be a port number (1–65535), got "${env.SMTP_PORT}".`);
  return { kind: "smtp", host, port, secure, user: env.SMTP_USER || undefined, pass: env.SMTP_PASS || undefined, from };
}

/** Public base URL of the app for links in e-mails (BETTER_AUTH_URL), without a trailing slash. */
export function appBaseUrl(env: Record<string, string | undefined> = process.env): string {
  return (env.BETTER_AUTH_URL || "http://localhost:3000").replace(/\/+$/, "");
}
