import "server-only";
import { createHash, randomBytes } from "node:crypto";
import { and, asc, count, desc, eq, sql } from "drizzle-orm";
import { getDb } from "@/db";
import { projects, samples, shareLinks, stations, user } from "@/db/schema";
import { shareLinkCreateSchema } from "@/lib/export/share-link-schema";
import type { RegisterExport } from "@/lib/export/types";
import { filterParams, registerFilterSchema, type RegisterFilter } from "@/lib/phase-map";
import { authorize, type Actor } from "./actor";
import { audit } from "./audit";
import { AppError, notFound } from "./errors";
import { phasesOfSamples, registerWhere, type SamplePhases } from "./phase-facts";
import { registerExportFor } from "./register-export";
import { validateInput } from "./validate";

/** Random bytes in a token (256 bits), written as base64url (43 characters). */
export const SHARE_TOKEN_BYTES = 32;
const TOKEN_RE = /^[A-Za-z0-9_-]{43}$/;

/** SHA-256 of the token, hex: what the database keeps (a leaked table does not reveal working links). */
export function hashShareToken(token: string): string {
  return createHash("sha256").update(token, "utf8").digest("hex");
}

export type ShareLinkState = "active" | "expired" | "revoked";
const stateOf = (l: { revokedAt: Date | null; expiresAt: Date }, now = Date.now()): ShareLinkState => (l.revokedAt ? "revoked" : l.expiresAt.getTime() <= now ? "expired" : "active");

/**
 * Creates a read-only, time-limited link to the register under a filter (leads only). The token is
 * returned once, here; only its hash is stored.
 */
export async function createShareLink(actor: Actor, projectId: string, raw: unknown) {
  await authorize(actor, projectId, "share.manage");
  const input = validateInput(shareLinkCreateSchema, raw);
  // The filter is checked like any register query, then stored without paging.
  const filter = filterParams(validateInput(registerFilterSchema, input.filter) as unknown as Record<string, unknown>);
  const token = randomBytes(SHARE_TOKEN_BYTES).toString("base64url");
  const expiresAt = new Date(Date.now() + input.expiresInDays * 86_400_000);
  const db = getDb();
  return db.transaction(async (tx) => {
    const [row] = await tx
      .insert(shareLinks)
      .values({ projectId, tokenHash: hashShareToken(token), filterJson: filter, label: input.label ?? null, expiresAt, createdBy: actor.userId })
      .returning();
    await audit(tx, actor, { projectId, action: "create", entity: "share_link", entityId: row.id, after: { label: row.label, filter, expiresAt } });
    return { id: row.id, token, label: row.label, filter, expiresAt: row.expiresAt, createdAt: row.createdAt, state: "active" as ShareLinkState };
  });
}

/** The project's share links, newest first, with their state (leads only; tokens are never shown again). */
export async function listShareLinks(actor: Actor, projectId: string) {
  await authorize(actor, projectId, "share.manage");
  const rows = await getDb()
    .select({ id: shareLinks.id, label: shareLinks.label, filter: shareLinks.filterJson, expiresAt: shareLinks.expiresAt, revokedAt: shareLinks.revokedAt, createdAt: shareLinks.createdAt, createdByName: user.name })
    .from(shareLinks)
    .leftJoin(user, eq(user.id, shareLinks.createdBy))
    .where(eq(shareLinks.projectId, projectId))
    .orderBy(desc(shareLinks.createdAt));
  const now = Date.now();
  return rows.map((r) => ({ ...r, state: stateOf(r, now) }));
}

/** Revokes a link at once (leads only; audited). Revoking a revoked link changes nothing. */
export async function revokeShareLink(actor: Actor, projectId: string, linkId: string) {
  await authorize(actor, projectId, "share.manage");
  const db = getDb();
  return db.transaction(async (tx) => {
    const [before] = await tx.select().from(shareLinks).where(and(eq(shareLinks.id, linkId), eq(shareLinks.projectId, projectId)));
    if (!before) throw notFound("Share link not found.");
    if (before.revokedAt) return { id: before.id, revokedAt: before.revokedAt, state: "revoked" as ShareLinkState };
    const [row] = await tx.update(shareLinks).set({ revokedAt: new Date() }).where(eq(shareLinks.id, linkId)).returning();
    await audit(tx, actor, { projectId, action: "revoke", entity: "share_link", entityId: linkId, before: { revokedAt: null }, after: { revokedAt: row.revokedAt } });
    return { id: row.id, revokedAt: row.revokedAt, state: "revoked" as ShareLinkState };
  });
}

/**
 * The link behind a token, for a visitor without an account: unknown (or malformed) → 404, revoked or
 * expired → 410 (gone, with the reason in details.reason).
 */
export async function resolveShareToken(token: string) {
  if (!TOKEN_RE.test(token)) throw notFound("This share link does not exist.");
  const db = getDb();
  const [row] = await db
    .select({ link: shareLinks, project: { id: projects.id, code: projects.code, name: projects.name, region: projects.region, description: projects.description } })
    .from(shareLinks)
    .innerJoin(projects, eq(projects.id, shareLinks.projectId))
    .where(eq(shareLinks.tokenHash, hashShareToken(token)));
  if (!row) throw notFound("This share link does not exist.");
  const state = stateOf(row.link);
  if (state === "revoked") throw new AppError("gone", "This share link was revoked by the project lead.", undefined, { reason: "revoked" });
  if (state === "expired") throw new AppError("gone", `This share link expired on ${row.link.expiresAt.toISOString().slice(0, 10)}.`, undefined, { reason: "expired", expiredAt: row.link.expiresAt.toISOString() });
  // The stored filter was validated at creation; parsing again fills the defaults.
  const filter: RegisterFilter = registerFilterSchema.parse(row.link.filterJson ?? {});
  return { link: row.link, project: row.project, filter };
}

/** Export of a shared register (the link's filter; the visitor cannot widen it). */
export async function prepareSharedExport(token: string): Promise<RegisterExport> {
  const { link, project, filter } = await resolveShareToken(token);
  return registerExportFor(project.id, filter, { kind: "share", label: link.label, expiresAt: link.expiresAt });
}

/** Rows per page of the public register page. */
export const SHARED_PAGE_ROWS = 100;

/** One page of a shared register for the public page: project, link, total and rows with phases. */
export async function getSharedRegister(token: string, rawPage: unknown) {
  const { link, project, filter } = await resolveShareToken(token);
  const page = Math.max(1, Math.min(100_000, Number.parseInt(String(rawPage ?? "1"), 10) || 1));
  const db = getDb();
  const where = registerWhere(project.id, filter);
  const [[{ total }], rows] = await Promise.all([
    db.select({ total: count() }).from(samples).where(where),
    db
      .select({
        id: samples.id,
        code: samples.code,
        stationCode: stations.code,
        sampleType: samples.sampleType,
        lithology: samples.lithology,
        collectedAt: samples.collectedAt,
        lat: sql<number | null>`coalesce(${samples.lat}, ${stations.lat})`,
        lon: sql<number | null>`coalesce(${samples.lon}, ${stations.lon})`,
        suspectedAsbestos: samples.suspectedAsbestos,
      })
      .from(samples)
      .leftJoin(stations, eq(stations.id, samples.stationId))
      .where(where)
      .orderBy(asc(samples.code))
      .limit(SHARED_PAGE_ROWS)
      .offset((page - 1) * SHARED_PAGE_ROWS),
  ]);
  const phases = await phasesOfSamples(
    project.id,
    rows.map((r) => r.id),
    filter.leading,
  );
  const empty: SamplePhases = { confirmed: [], candidates: [] };
  return {
    project: { name: project.name, code: project.code, region: project.region },
    link: { label: link.label, expiresAt: link.expiresAt },
    filter,
    total,
    page,
    pageSize: SHARED_PAGE_ROWS,
    rows: rows.map(({ id, ...r }) => ({ ...r, phases: phases.get(id) ?? empty })),
  };
}
