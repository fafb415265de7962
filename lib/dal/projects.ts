import "server-only";
import { and, count, eq, sql } from "drizzle-orm";
import { getDb } from "@/db";
import { organisations, phaseResults, projectMembers, projects, samples, scans, stations, submissions, user } from "@/db/schema";
import { projectArchiveSchema, projectCreateSchema, projectPatchSchema } from "@/lib/validation/project";
import type { Actor } from "./actor";
import { authorize } from "./actor";
import { audit } from "./audit";
import { conflict, forbidden, notFound } from "./errors";
import { isUniqueViolation } from "./samples";
import { validateInput } from "./validate";

/** Projects the actor is a member of (all projects for a site admin), with the actor's role. */
export async function listProjects(actor: Actor) {
  const db = getDb();
  const rows = await db
    .select({
      id: projects.id,
      code: projects.code,
      name: projects.name,
      region: projects.region,
      description: projects.description,
      archivedAt: projects.archivedAt,
      role: projectMembers.role,
      sampleCount: sql<number>`(select count(*) from ${samples} where ${samples.projectId} = ${projects.id})`,
    })
    .from(projects)
    .leftJoin(projectMembers, and(eq(projectMembers.projectId, projects.id), eq(projectMembers.userId, actor.userId)))
    .orderBy(projects.name);
  return rows.filter((r) => actor.isAdmin || r.role !== null).map((r) => ({ ...r, role: r.role ?? ("lead" as const) }));
}

export async function getProject(actor: Actor, projectId: string) {
  const access = await authorize(actor, projectId, "project.read");
  const db = getDb();
  const [project] = await db.select().from(projects).where(eq(projects.id, projectId));
  return { ...project, role: access.role };
}

/** Counts for the project overview. */
export async function getProjectOverview(actor: Actor, projectId: string) {
  const project = await getProject(actor, projectId);
  const db = getDb();
  const [[st], [sa], [sc], [su], byStatus, [confirmed], members] = await Promise.all([
    db.select({ n: count() }).from(stations).where(eq(stations.projectId, projectId)),
    db.select({ n: count() }).from(samples).where(eq(samples.projectId, projectId)),
    db.select({ n: count() }).from(scans).where(eq(scans.projectId, projectId)),
    db.select({ n: count() }).from(submissions).where(eq(submissions.projectId, projectId)),
    db
      .select({ status: samples.status, n: count() })
      .from(samples)
      .where(eq(samples.projectId, projectId))
      .groupBy(samples.status),
    db
      .select({ n: sql<number>`count(distinct ${scans.sampleId})` })
      .from(phaseResults)
      .innerJoin(scans, eq(scans.id, phaseResults.scanId))
      .where(and(eq(scans.projectId, projectId), eq(scans.status, "signed_off"), eq(phaseResults.status, "accepted"))),
    db
      .select({ name: user.name, email: user.email, role: projectMembers.role })
      .from(projectMembers)
      .innerJoin(user, eq(user.id, projectMembers.userId))
      .where(eq(projectMembers.projectId, projectId))
      .orderBy(projectMembers.role, user.name),
  ]);
  return {
    project,
    counts: { stations: st.n, samples: sa.n, scans: sc.n, submissions: su.n, samplesWithConfirmedPhases: confirmed.n },
    byStatus: Object.fromEntries(byStatus.map((r) => [r.status, r.n])) as Record<string, number>,
    members,
  };
}

/** Whether the actor may create projects: site admins, or anyone when the site allows it (LITHODEX_OPEN_PROJECTS=1). */
export function canCreateProjects(actor: Actor): boolean {
  return actor.isAdmin || process.env.LITHODEX_OPEN_PROJECTS === "1";
}

const codeTaken = (code: string) => conflict(`Project code ${code} is already used by another project.`, { field: "code" });

/**
 * Creates a project (site admin, or any user when the site allows it); the creator becomes its lead. Audited.
 * A taken code is a 409 naming the field.
 */
export async function createProject(actor: Actor, raw: unknown) {
  if (!canCreateProjects(actor)) throw forbidden("Only a site admin can create projects on this site.");
  const input = validateInput(projectCreateSchema, raw);
  const db = getDb();
  try {
    return await db.transaction(async (tx) => {
      let [org] = await tx.select({ id: organisations.id }).from(organisations).orderBy(organisations.createdAt).limit(1);
      if (!org) [org] = await tx.insert(organisations).values({ name: "Our organisation" }).returning({ id: organisations.id });
      const [row] = await tx.insert(projects).values({ ...input, labInHouse: input.labInHouse ?? false, organisationId: org.id, createdBy: actor.userId }).returning();
      await tx.insert(projectMembers).values({ projectId: row.id, userId: actor.userId, role: "lead" });
      await audit(tx, actor, { projectId: row.id, action: "create", entity: "project", entityId: row.id, after: row });
      return row;
    });
  } catch (err) {
    if (isUniqueViolation(err, "projects.code")) throw codeTaken(input.code);
    throw err;
  }
}

/** The settings form's record (lead, site admin). */
export async function getProjectSettings(actor: Actor, projectId: string) {
  await authorize(actor, projectId, "project.manage");
  const db = getDb();
  const [[project], [{ n }]] = await Promise.all([
    db.select().from(projects).where(eq(projects.id, projectId)),
    db.select({ n: count() }).from(samples).where(eq(samples.projectId, projectId)),
  ]);
  return { ...project, sampleCount: n, codeLocked: n > 0 };
}

/**
 * Edits the project settings (lead, site admin) if the form's version is current (409 with the current record
 * otherwise). The code prefixes sample codes, so it can change only while the project has no samples. Audited.
 */
export async function updateProject(actor: Actor, projectId: string, raw: unknown) {
  await authorize(actor, projectId, "project.manage");
  const { version, ...changes } = validateInput(projectPatchSchema, raw);
  const db = getDb();
  try {
    return await db.transaction(async (tx) => {
      const [before] = await tx.select().from(projects).where(eq(projects.id, projectId));
      if (!before) throw notFound("Project not found.");
      if (before.version !== version) throw conflict("The settings were changed by someone else since you opened them. Review their version and apply your changes again.", { current: before });
      if (changes.code && changes.code !== before.code) {
        const [{ n }] = await tx.select({ n: count() }).from(samples).where(eq(samples.projectId, projectId));
        if (n > 0) throw conflict(`The code prefixes the ${n} sample codes already issued, so it cannot change now.`, { field: "code" });
      }
      const [row] = await tx
        .update(projects)
        .set({ ...changes, version: before.version + 1 })
        .where(and(eq(projects.id, projectId), eq(projects.version, version)))
        .returning();
      if (!row) throw conflict("The settings were changed by someone else just now.");
      await audit(tx, actor, { projectId, action: "update", entity: "project", entityId: projectId, before, after: row });
      return row;
    });
  } catch (err) {
    if (isUniqueViolation(err, "projects.code")) throw codeTaken(String(changes.code));
    throw err;
  }
}

/** Archives a project (read-only from then on) or brings it back (lead, site admin). Audited. */
export async function setProjectArchived(actor: Actor, projectId: string, raw: unknown) {
  await authorize(actor, projectId, "project.manage");
  const { archived } = validateInput(projectArchiveSchema, raw);
  const db = getDb();
  return db.transaction(async (tx) => {
    const [before] = await tx.select().from(projects).where(eq(projects.id, projectId));
    if (!before) throw notFound("Project not found.");
    if (!!before.archivedAt === archived) return before;
    const [row] = await tx
      .update(projects)
      .set({ archivedAt: archived ? new Date() : null, version: before.version + 1 })
      .where(eq(projects.id, projectId))
      .returning();
    await audit(tx, actor, { projectId, action: archived ? "archive" : "unarchive", entity: "project", entityId: projectId, before: { archivedAt: before.archivedAt }, after: { archivedAt: row.archivedAt } });
    return row;
  });
}
