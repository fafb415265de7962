import "server-only";
import { and, count, eq, sql } from "drizzle-orm";
import { getDb } from "@/db";
import { phaseResults, projectMembers, projects, samples, scans, stations, submissions, user } from "@/db/schema";
import type { Actor } from "./actor";
import { authorize } from "./actor";

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
