import "server-only";
import { and, eq } from "drizzle-orm";
import { getDb } from "@/db";
import { projectMembers, projects, type ProjectRole } from "@/db/schema";
import { getAuth } from "@/lib/auth";
import { AppError, forbidden, notFound, unauthorized } from "./errors";
import { roleAllows, type Permission } from "./permissions";

/** The signed-in user as every DAL function sees it. */
export interface Actor {
  userId: string;
  name: string;
  email: string;
  isAdmin: boolean;
}

/** Reads the better-auth session from request headers; null when not signed in. */
/**
 * Whoever a record is written for: a signed-in actor, or someone without an account acting through a token (an
 * outside lab's link), who has a name but no user id.
 */
export interface Recorder {
  userId: string | null;
  name: string;
}

export async function getActor(headers: Headers): Promise<Actor | null> {
  const session = await getAuth().api.getSession({ headers });
  if (!session) return null;
  const u = session.user as { id: string; name: string; email: string; role?: string | null; banned?: boolean | null };
  if (u.banned) return null;
  return { userId: u.id, name: u.name, email: u.email, isAdmin: u.role === "admin" };
}

export async function requireActor(headers: Headers): Promise<Actor> {
  const actor = await getActor(headers);
  if (!actor) throw unauthorized();
  return actor;
}

/** Permissions that still work in an archived project. */
const READ_ONLY_OK = new Set<Permission>(["project.read", "export.read", "audit.read", "project.manage"]);

export interface ProjectAccess {
  projectId: string;
  projectCode: string;
  /** The member's role; site admins without membership act as "lead". */
  role: ProjectRole;
}

/**
 * The one access check: the actor must be a member of the project (else 404, so other projects stay
 * invisible) and the role must allow the permission (else 403). Site admins pass every check.
 */
export async function authorize(actor: Actor, projectId: string, permission: Permission): Promise<ProjectAccess> {
  const db = getDb();
  const [row] = await db
    .select({ id: projects.id, code: projects.code, role: projectMembers.role, archivedAt: projects.archivedAt })
    .from(projects)
    .leftJoin(projectMembers, and(eq(projectMembers.projectId, projects.id), eq(projectMembers.userId, actor.userId)))
    .where(eq(projects.id, projectId))
    .limit(1);
  if (!row) throw notFound("Project not found.");
  if (!actor.isAdmin && !row.role) throw notFound("Project not found.");
  const role = row.role ?? "lead";
  if (!actor.isAdmin && !roleAllows(role, permission)) throw forbidden();
  // An archived project is read-only: only reading, exporting, the audit and the settings (to unarchive) stay open.
  if (row.archivedAt && !READ_ONLY_OK.has(permission)) throw new AppError("conflict", "This project is archived and read-only. A lead can unarchive it in the project settings.", undefined, { archived: true });
  return { projectId: row.id, projectCode: row.code, role };
}
