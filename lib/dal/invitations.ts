import "server-only";
import { createHash, randomBytes } from "node:crypto";
import { and, eq, gt, isNull } from "drizzle-orm";
import { getDb } from "@/db";
import { invitations, projectMembers, projects, user } from "@/db/schema";
import { appBaseUrl, invitationMail, sendMail } from "@/lib/mail";
import { passwordProblem } from "@/lib/security/password";
import { createUserWithPassword } from "@/lib/users";
import { INVITATION_DAYS, invitationAcceptSchema, invitationCreateSchema } from "@/lib/validation/invitation";
import { authorize, type Actor } from "./actor";
import { audit } from "./audit";
import { AppError, conflict, invalid, notFound } from "./errors";
import { ROLE_LABELS } from "./permissions";
import { validateInput } from "./validate";

/** Tokens are stored as their SHA-256 (hex); the plain token exists only in the e-mail. */
export function hashToken(token: string): string {
  return createHash("sha256").update(token, "utf8").digest("hex");
}

const gone = (why: string) => new AppError("gone", why);

/**
 * Invites someone by e-mail with a role (lead only). A pending invitation for the same address is replaced
 * (its link stops working). The e-mail carries a single-use link valid for 7 days.
 */
export async function createInvitation(actor: Actor, projectId: string, raw: unknown) {
  await authorize(actor, projectId, "project.manage");
  const input = validateInput(invitationCreateSchema, raw);
  const db = getDb();
  const token = randomBytes(32).toString("base64url");
  const expiresAt = new Date(Date.now() + INVITATION_DAYS * 86_400_000);
  const { invitation, projectName } = await db.transaction(async (tx) => {
    const [member] = await tx
      .select({ role: projectMembers.role })
      .from(projectMembers)
      .innerJoin(user, eq(user.id, projectMembers.userId))
      .where(and(eq(projectMembers.projectId, projectId), eq(user.email, input.email)));
    if (member) throw conflict(`${input.email} is already a member of this project (${ROLE_LABELS[member.role]}).`, { field: "email" });
    await tx.delete(invitations).where(and(eq(invitations.projectId, projectId), eq(invitations.email, input.email), isNull(invitations.acceptedAt)));
    const [row] = await tx.insert(invitations).values({ projectId, email: input.email, role: input.role, tokenHash: hashToken(token), invitedBy: actor.userId, expiresAt }).returning();
    const [p] = await tx.select({ name: projects.name }).from(projects).where(eq(projects.id, projectId));
    await audit(tx, actor, { projectId, action: "invite", entity: "invitation", entityId: row.id, after: { email: row.email, role: row.role, expiresAt: row.expiresAt } });
    return { invitation: row, projectName: p.name };
  });
  const content = invitationMail({ baseUrl: appBaseUrl(), token, projectName, roleLabel: ROLE_LABELS[input.role], invitedBy: actor.name, expiresAt });
  let mail: { sent: boolean; to: string[]; error?: string };
  try {
    await sendMail({ to: input.email, replyTo: actor.email, ...content });
    mail = { sent: true, to: [input.email] };
  } catch (err) {
    mail = { sent: false, to: [input.email], error: (err as Error).message };
  }
  const { tokenHash: _omit, ...safe } = invitation;
  void _omit;
  return { invitation: safe, mail };
}

/** Pending invitations of a project (lead only). */
export async function listInvitations(actor: Actor, projectId: string) {
  await authorize(actor, projectId, "project.manage");
  return getDb()
    .select({ id: invitations.id, email: invitations.email, role: invitations.role, expiresAt: invitations.expiresAt, createdAt: invitations.createdAt, invitedByName: user.name })
    .from(invitations)
    .leftJoin(user, eq(user.id, invitations.invitedBy))
    .where(and(eq(invitations.projectId, projectId), isNull(invitations.acceptedAt)))
    .orderBy(invitations.createdAt);
}

/** Withdraws a pending invitation (lead only); its link stops working. */
export async function revokeInvitation(actor: Actor, projectId: string, invitationId: string) {
  await authorize(actor, projectId, "project.manage");
  const db = getDb();
  return db.transaction(async (tx) => {
    const [row] = await tx.delete(invitations).where(and(eq(invitations.id, invitationId), eq(invitations.projectId, projectId), isNull(invitations.acceptedAt))).returning();
    if (!row) throw notFound("Invitation not found (or already accepted).");
    await audit(tx, actor, { projectId, action: "revoke", entity: "invitation", entityId: row.id, before: { email: row.email, role: row.role } });
    return { id: row.id };
  });
}

async function findByToken(token: string) {
  const db = getDb();
  const [row] = await db
    .select({ invitation: invitations, projectName: projects.name })
    .from(invitations)
    .innerJoin(projects, eq(projects.id, invitations.projectId))
    .where(eq(invitations.tokenHash, hashToken(token)));
  if (!row) throw notFound("This invitation link is not valid. Ask the project lead for a new one.");
  if (row.invitation.acceptedAt) throw gone("This invitation was already used. Sign in with your account, or ask the project lead for a new link.");
  if (row.invitation.expiresAt.getTime() <= Date.now()) throw gone("This invitation has expired. Ask the project lead for a new one.");
  return row;
}

/** What the invitation page shows (public: the token is the credential). 404 unknown, 410 used or expired. */
export async function getInvitationByToken(token: string) {
  const { invitation, projectName } = await findByToken(token);
  const [existing] = await getDb().select({ id: user.id }).from(user).where(eq(user.email, invitation.email));
  return { projectId: invitation.projectId, projectName, email: invitation.email, role: invitation.role, roleLabel: ROLE_LABELS[invitation.role], expiresAt: invitation.expiresAt, existingAccount: !!existing };
}

/**
 * Accepts an invitation (public; single use). A new address gets an account with the given name and password;
 * an existing account just joins the project (its password is not touched). 404 unknown token, 410 used/expired.
 */
export async function acceptInvitation(token: string, raw: unknown) {
  const { invitation } = await findByToken(token);
  const db = getDb();
  const [existing] = await db.select({ id: user.id, name: user.name }).from(user).where(eq(user.email, invitation.email));
  const input = existing ? null : validateInput(invitationAcceptSchema, raw);
  if (input) {
    const weak = passwordProblem(input.password, [invitation.email, input.name]);
    if (weak) throw invalid("Choose another password.", { password: [weak] });
  }
  // Claim first: only one request can turn acceptedAt from null to a time.
  const [claimed] = await db
    .update(invitations)
    .set({ acceptedAt: new Date() })
    .where(and(eq(invitations.id, invitation.id), isNull(invitations.acceptedAt), gt(invitations.expiresAt, new Date())))
    .returning();
  if (!claimed) throw gone("This invitation was already used or has expired.");
  try {
    const userId = existing ? existing.id : (await createUserWithPassword({ email: invitation.email, name: input!.name, password: input!.password })).id;
    await db.transaction(async (tx) => {
      await tx.insert(projectMembers).values({ projectId: invitation.projectId, userId, role: invitation.role }).onConflictDoNothing();
      await audit(tx, null, { projectId: invitation.projectId, action: "accept", entity: "invitation", entityId: invitation.id, after: { userId, email: invitation.email, role: invitation.role, newAccount: !existing } });
    });
    return { projectId: invitation.projectId, email: invitation.email, role: invitation.role, newAccount: !existing };
  } catch (err) {
    await db.update(invitations).set({ acceptedAt: null }).where(eq(invitations.id, invitation.id));
    throw err;
  }
}
