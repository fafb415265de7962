import "server-only";
import { createHash, randomBytes } from "node:crypto";
import { and, asc, count, eq, gt, isNull, like, or, sql } from "drizzle-orm";
import { z } from "zod";
import { getDb } from "@/db";
import { passwordTokens, session, user } from "@/db/schema";
import { appBaseUrl, appLink, escapeHtml, sendMail } from "@/lib/mail";
import { passwordProblem } from "@/lib/security/password";
import { createUserWithPassword, setPassword } from "@/lib/users";
import type { Actor } from "./actor";
import { audit } from "./audit";
import { AppError, conflict, forbidden, invalid, notFound } from "./errors";
import { validateInput } from "./validate";

/**
 * Site administration of accounts (issue 11 §1): list, invite, disable and enable, force sign-out, send a password
 * reset link. Site admins only (403 for everyone else). Disabling keeps the account and everything it recorded;
 * accounts are never deleted. The last active site admin can be neither disabled nor demoted.
 */

export function requireSiteAdmin(actor: Actor): void {
  if (!actor.isAdmin) throw forbidden("Only a site admin can manage accounts.");
}

/** Days a password link (invitation or reset) works. */
export const PASSWORD_LINK_DAYS = { invite: 7, reset: 1 } as const;

const hash = (token: string) => createHash("sha256").update(token, "utf8").digest("hex");

const email = z.string({ error: "E-mail is required." }).trim().toLowerCase().pipe(z.email("Not an e-mail address."));
const inviteSchema = z
  .object({ email, name: z.string({ error: "A name is required." }).trim().min(1, "A name is required.").max(120), siteAdmin: z.boolean().optional() })
  .strict();
const patchSchema = z
  .object({
    disabled: z.boolean().optional(),
    siteAdmin: z.boolean().optional(),
    reason: z.string().trim().max(200).optional(),
  })
  .strict()
  .refine((v) => v.disabled !== undefined || v.siteAdmin !== undefined, { message: "Say what to change: disabled or siteAdmin." });
const listSchema = z.object({ q: z.string().trim().max(100).optional() });

/** Accounts with their site role, state, projects and last sign-in, by name (site admin). */
export async function listUsers(actor: Actor, raw: unknown = {}) {
  requireSiteAdmin(actor);
  const { q } = validateInput(listSchema, raw);
  const db = getDb();
  const rows = await db
    .select({
      id: user.id,
      name: user.name,
      email: user.email,
      role: user.role,
      banned: user.banned,
      banReason: user.banReason,
      createdAt: user.createdAt,
      projects: sql<number>`(select count(*) from "project_members" pm where pm."user_id" = "user"."id")`,
      lastSeen: sql<number | null>`(select max(s."updated_at") from "session" s where s."user_id" = "user"."id")`,
      sessions: sql<number>`(select count(*) from "session" s where s."user_id" = "user"."id" and s."expires_at" > ${Date.now()})`,
      pendingInvite: sql<number>`(select count(*) from "password_tokens" t where t."user_id" = "user"."id" and t."purpose" = 'invite' and t."used_at" is null and t."expires_at" > ${Date.now()})`,
    })
    .from(user)
    .where(q ? or(like(user.name, `%${q}%`), like(user.email, `%${q}%`)) : undefined)
    .orderBy(asc(user.name));
  return rows.map((r) => ({ ...r, siteAdmin: r.role === "admin", disabled: !!r.banned, lastSeen: r.lastSeen ? new Date(r.lastSeen) : null, pendingInvite: r.pendingInvite > 0 }));
}

async function activeAdmins(): Promise<number> {
  const [{ n }] = await getDb()
    .select({ n: count() })
    .from(user)
    .where(and(eq(user.role, "admin"), or(isNull(user.banned), eq(user.banned, false))));
  return n;
}

/** Issues a single-use password link for an account and e-mails it. Returns whether the mail went out. */
async function sendPasswordLink(actor: Actor, target: { id: string; name: string; email: string }, purpose: "invite" | "reset") {
  const token = randomBytes(32).toString("base64url");
  const expiresAt = new Date(Date.now() + PASSWORD_LINK_DAYS[purpose] * 86_400_000);
  await getDb().transaction(async (tx) => {
    // Earlier unused links of the same account stop working.
    await tx.update(passwordTokens).set({ usedAt: new Date() }).where(and(eq(passwordTokens.userId, target.id), isNull(passwordTokens.usedAt)));
    await tx.insert(passwordTokens).values({ userId: target.id, purpose, tokenHash: hash(token), expiresAt, createdBy: actor.userId });
    await audit(tx, actor, { projectId: null, action: purpose === "invite" ? "invite" : "password_reset", entity: "user", entityId: target.id, after: { email: target.email, expiresAt } });
  });
  const url = appLink(appBaseUrl(), `/set-password/${token}`);
  const until = `${expiresAt.toISOString().slice(0, 16).replace("T", " ")} UTC`;
  const subject = purpose === "invite" ? `${actor.name} created a Lithodex account for you` : "Set a new Lithodex password";
  const lead = purpose === "invite" ? `${actor.name} created a Lithodex account for you (${target.email}).` : `${actor.name} (site admin) sent you a link to set a new Lithodex password.`;
  const text = [lead, "", `Set your password: ${url}`, "", `The link works once and expires on ${until}. If you did not expect this, ignore this message.`].join("\n");
  const html = `<!doctype html><html><body style="font-family:Arial,Helvetica,sans-serif;color:#17313a;line-height:1.45;max-width:640px"><p>${escapeHtml(lead)}</p><p><a href="${escapeHtml(url)}">Set your password</a></p><p style="font-size:13px">The link works once and expires on ${escapeHtml(until)}. If you did not expect this, ignore this message.</p></body></html>`;
  try {
    await sendMail({ to: target.email, subject, text, html });
    return { sent: true, to: [target.email] };
  } catch (err) {
    return { sent: false, to: [target.email], error: (err as Error).message };
  }
}

/** Creates an account and e-mails a link to set its password (site admin). The account has no usable password until then. */
export async function inviteUser(actor: Actor, raw: unknown) {
  requireSiteAdmin(actor);
  const input = validateInput(inviteSchema, raw);
  const [existing] = await getDb().select({ id: user.id }).from(user).where(eq(user.email, input.email));
  if (existing) throw conflict(`${input.email} already has an account.`, { field: "email" });
  // A random password nobody knows, until the invitee sets their own through the link.
  const created = await createUserWithPassword({ email: input.email, name: input.name, password: randomBytes(24).toString("base64url"), siteRole: input.siteAdmin ? "admin" : "user" });
  const mail = await sendPasswordLink(actor, { id: created.id, name: input.name, email: input.email }, "invite");
  return { user: { id: created.id, name: input.name, email: input.email, siteAdmin: !!input.siteAdmin }, mail };
}

/**
 * Disables or enables an account (disabled accounts cannot sign in and are signed out everywhere), or grants or
 * withdraws the site-admin role. The last active site admin is kept (409). Audited.
 */
export async function updateUser(actor: Actor, userId: string, raw: unknown) {
  requireSiteAdmin(actor);
  const input = validateInput(patchSchema, raw);
  const db = getDb();
  const [before] = await db.select().from(user).where(eq(user.id, userId));
  if (!before) throw notFound("No such account.");
  const losesAdmin = before.role === "admin" && !before.banned && (input.disabled === true || input.siteAdmin === false);
  if (losesAdmin && (await activeAdmins()) <= 1) {
    throw conflict(before.id === actor.userId ? "You are the last site admin: make someone else a site admin first." : "This is the last site admin: make someone else a site admin first.");
  }
  return db.transaction(async (tx) => {
    const set: Partial<typeof user.$inferInsert> = {};
    if (input.disabled !== undefined) Object.assign(set, { banned: input.disabled, banReason: input.disabled ? (input.reason ?? "Disabled by a site admin") : null });
    if (input.siteAdmin !== undefined) set.role = input.siteAdmin ? "admin" : "user";
    const [row] = await tx.update(user).set(set).where(eq(user.id, userId)).returning();
    if (input.disabled) await tx.delete(session).where(eq(session.userId, userId));
    await audit(tx, actor, {
      projectId: null,
      action: input.disabled === true ? "disable" : input.disabled === false ? "enable" : "site_role",
      entity: "user",
      entityId: userId,
      before: { banned: !!before.banned, role: before.role },
      after: { banned: !!row.banned, role: row.role, reason: input.reason ?? null },
    });
    return { id: row.id, disabled: !!row.banned, siteAdmin: row.role === "admin" };
  });
}

/** Ends every session of an account at once (site admin). Audited. */
export async function signOutEverywhere(actor: Actor, userId: string) {
  requireSiteAdmin(actor);
  const db = getDb();
  const [u] = await db.select({ id: user.id }).from(user).where(eq(user.id, userId));
  if (!u) throw notFound("No such account.");
  return db.transaction(async (tx) => {
    const ended = await tx.delete(session).where(eq(session.userId, userId)).returning({ id: session.id });
    await audit(tx, actor, { projectId: null, action: "sign_out", entity: "user", entityId: userId, after: { sessionsEnded: ended.length } });
    return { sessionsEnded: ended.length };
  });
}

/** E-mails a single-use link to set a new password (site admin); the current password keeps working until then. */
export async function sendPasswordReset(actor: Actor, userId: string) {
  requireSiteAdmin(actor);
  const [u] = await getDb().select({ id: user.id, name: user.name, email: user.email, banned: user.banned }).from(user).where(eq(user.id, userId));
  if (!u) throw notFound("No such account.");
  if (u.banned) throw conflict("This account is disabled: enable it first.");
  return { mail: await sendPasswordLink(actor, u, "reset") };
}

async function findToken(token: string) {
  if (!/^[A-Za-z0-9_-]{43}$/.test(token)) throw notFound("This link is not valid.");
  const [row] = await getDb()
    .select({ t: passwordTokens, email: user.email, name: user.name, banned: user.banned })
    .from(passwordTokens)
    .innerJoin(user, eq(user.id, passwordTokens.userId))
    .where(eq(passwordTokens.tokenHash, hash(token)));
  if (!row) throw notFound("This link is not valid.");
  if (row.t.usedAt) throw new AppError("gone", "This link was already used (or replaced by a newer one). Ask a site admin for a new one.");
  if (row.t.expiresAt.getTime() <= Date.now()) throw new AppError("gone", "This link has expired. Ask a site admin for a new one.");
  if (row.banned) throw new AppError("gone", "This account is disabled.");
  return row;
}

/** What the set-password page shows (public: the token is the credential). */
export async function getPasswordLink(token: string) {
  const row = await findToken(token);
  return { email: row.email, name: row.name, purpose: row.t.purpose, expiresAt: row.t.expiresAt };
}

/**
 * Sets the password through a link (public, single use): the password rules apply (lib/security/password.ts); every
 * session of the account ends. 404 unknown, 410 used or expired.
 */
export async function redeemPasswordLink(token: string, raw: unknown) {
  const row = await findToken(token);
  const { password } = validateInput(z.object({ password: z.string({ error: "A password is required." }) }).strict(), raw);
  const weak = passwordProblem(password, [row.email, row.name]);
  if (weak) throw invalid("Choose another password.", { password: [weak] });
  const db = getDb();
  const [claimed] = await db
    .update(passwordTokens)
    .set({ usedAt: new Date() })
    .where(and(eq(passwordTokens.id, row.t.id), isNull(passwordTokens.usedAt), gt(passwordTokens.expiresAt, new Date())))
    .returning();
  if (!claimed) throw new AppError("gone", "This link was just used.");
  await setPassword(row.t.userId, password);
  await db.transaction(async (tx) => {
    await tx.delete(session).where(eq(session.userId, row.t.userId));
    await audit(tx, { userId: row.t.userId }, { projectId: null, action: "password_set", entity: "user", entityId: row.t.userId, after: { via: row.t.purpose } });
  });
  return { email: row.email };
}
