import "server-only";
import { and, count, eq } from "drizzle-orm";
import { getDb } from "@/db";
import { projectMembers, user } from "@/db/schema";
import { memberPatchSchema } from "@/lib/validation/invitation";
import { authorize, type Actor } from "./actor";
import { audit, type DbOrTx } from "./audit";
import { conflict, notFound } from "./errors";
import { roleAllows } from "./permissions";
import { listInvitations } from "./invitations";
import { validateInput } from "./validate";

/** The team: members with roles (any member), plus pending invitations for those who may manage the project. */
export async function listMembers(actor: Actor, projectId: string) {
  const access = await authorize(actor, projectId, "project.read");
  const canManage = actor.isAdmin || roleAllows(access.role, "project.manage");
  const members = await getDb()
    .select({ userId: user.id, name: user.name, email: user.email, role: projectMembers.role, since: projectMembers.createdAt })
    .from(projectMembers)
    .innerJoin(user, eq(user.id, projectMembers.userId))
    .where(eq(projectMembers.projectId, projectId))
    .orderBy(projectMembers.role, user.name);
  return { members, invitations: canManage ? await listInvitations(actor, projectId) : null, canManage };
}

async function leadCount(tx: DbOrTx, projectId: string) {
  const [{ n }] = await tx.select({ n: count() }).from(projectMembers).where(and(eq(projectMembers.projectId, projectId), eq(projectMembers.role, "lead")));
  return n;
}

/** Changes a member's role (lead only); the last lead cannot be demoted. */
export async function updateMemberRole(actor: Actor, projectId: string, userId: string, raw: unknown) {
  await authorize(actor, projectId, "project.manage");
  const { role } = validateInput(memberPatchSchema, raw);
  return getDb().transaction(async (tx) => {
    const [m] = await tx.select().from(projectMembers).where(and(eq(projectMembers.projectId, projectId), eq(projectMembers.userId, userId)));
    if (!m) throw notFound("Not a member of this project.");
    if (m.role === "lead" && role !== "lead" && (await leadCount(tx, projectId)) <= 1) throw conflict("A project needs at least one lead: make someone else lead first.");
    await tx.update(projectMembers).set({ role }).where(and(eq(projectMembers.projectId, projectId), eq(projectMembers.userId, userId)));
    await audit(tx, actor, { projectId, action: "role", entity: "member", entityId: userId, before: { role: m.role }, after: { role } });
    return { userId, role };
  });
}

/** Removes a member (lead only); the last lead cannot be removed. Their records stay, attributed to them. */
export async function removeMember(actor: Actor, projectId: string, userId: string) {
  await authorize(actor, projectId, "project.manage");
  return getDb().transaction(async (tx) => {
    const [m] = await tx.select().from(projectMembers).where(and(eq(projectMembers.projectId, projectId), eq(projectMembers.userId, userId)));
    if (!m) throw notFound("Not a member of this project.");
    if (m.role === "lead" && (await leadCount(tx, projectId)) <= 1) throw conflict("A project needs at least one lead: make someone else lead first.");
    await tx.delete(projectMembers).where(and(eq(projectMembers.projectId, projectId), eq(projectMembers.userId, userId)));
    await audit(tx, actor, { projectId, action: "remove", entity: "member", entityId: userId, before: { role: m.role } });
    return { userId };
  });
}
