import "server-only";
import { createHash } from "node:crypto";
import { getDb } from "@/db";
import { auditLog } from "@/db/schema";
import { clientAddress } from "@/lib/security/client-address";
import { ACCOUNT_RULE, ADDRESS_RULE, signInThrottle, type ThrottleRule } from "@/lib/security/throttle";

/** Header better-auth's own per-address rate limit reads (set here from the real address; a client's copy is dropped). */
export const CLIENT_IP_HEADER = "x-lithodex-client-ip";

/** better-auth endpoints that check a password or start a reset: throttled and audited. */
const GUARDED = /\/api\/auth\/(sign-in\/email|request-password-reset|forget-password|reset-password)$/;

const sleep = (ms: number) => new Promise((r) => setTimeout(r, ms));

async function readEmail(req: Request): Promise<string | null> {
  try {
    const text = await req.clone().text();
    if (text.length > 64 * 1024) return null;
    const v = (JSON.parse(text) as { email?: unknown }).email;
    return typeof v === "string" ? v.trim().toLowerCase().slice(0, 320) : null;
  } catch {
    return null;
  }
}

async function auditAttempt(action: string, email: string | null, address: string, outcome: Record<string, unknown>, actorId: string | null) {
  // E-mail addresses are kept as typed (an audit trail for the account owner); unknown ones are not revealed to callers.
  await getDb()
    .insert(auditLog)
    .values({
      projectId: null,
      actorId,
      action,
      entity: "account",
      entityId: email ?? `unknown:${createHash("sha256").update(address).digest("hex").slice(0, 16)}`,
      beforeJson: null,
      afterJson: { address, ...outcome },
    })
    .catch((err) => console.error("sign-in audit failed:", err));
}

/**
 * Wraps better-auth's handler: sign-in and password-reset attempts are throttled per account and per real client
 * address (progressive delay, then a temporary lock answered 429 with Retry-After) and written to the audit log.
 */
export async function guardedAuthRequest(req: Request, handler: (req: Request) => Promise<Response>): Promise<Response> {
  const address = clientAddress(req.headers);
  const headers = new Headers(req.headers);
  headers.set(CLIENT_IP_HEADER, address);
  const path = new URL(req.url).pathname;
  const guarded = req.method === "POST" && GUARDED.test(path);
  if (!guarded) return handler(new Request(req, { headers, duplex: "half" } as RequestInit));

  const email = await readEmail(req);
  const action = path.endsWith("/sign-in/email") ? "sign_in" : "password_reset";
  const keys: [string, ThrottleRule][] = [[`addr:${address}`, ADDRESS_RULE]];
  if (email) keys.push([`acct:${email}`, ACCOUNT_RULE]);
  const throttle = signInThrottle();
  const verdict = throttle.check(keys, Date.now());
  if (verdict.locked) {
    const seconds = Math.ceil(verdict.retryAfterMs / 1000);
    await auditAttempt(`${action}_locked`, email, address, { retryAfterS: seconds }, null);
    return Response.json(
      { error: { code: "too_many_requests", message: `Too many failed attempts; try again in ${Math.ceil(seconds / 60)} minute${seconds > 60 ? "s" : ""}.` } },
      { status: 429, headers: { "retry-after": String(seconds) } },
    );
  }
  if (verdict.delayMs > 0) await sleep(verdict.delayMs);
  const res = await handler(new Request(req, { headers, duplex: "half" } as RequestInit));
  if (action === "sign_in") {
    if (res.ok) {
      let userId: string | null = null;
      try {
        userId = ((await res.clone().json()) as { user?: { id?: string } }).user?.id ?? null;
      } catch {
        // not JSON: keep null
      }
      if (email) throttle.succeed(`acct:${email}`);
      await auditAttempt("sign_in", email, address, { ok: true, delayedMs: verdict.delayMs }, userId);
    } else if (res.status === 401 || res.status === 403 || res.status === 400) {
      throttle.fail(keys, Date.now());
      await auditAttempt("sign_in_failed", email, address, { status: res.status, delayedMs: verdict.delayMs }, null);
    }
  } else {
    throttle.fail(keys, Date.now()); // every reset request counts, whatever the answer (it must not reveal accounts)
    await auditAttempt("password_reset_requested", email, address, { status: res.status }, null);
  }
  return res;
}
