import "server-only";
import { and, asc, count, desc, eq, gte, inArray, isNull, like, lt, or, sql, type SQL } from "drizzle-orm";
import { getDb } from "@/db";
import { auditLog, projects, samples, scans, stations, submissions, user } from "@/db/schema";
import { diffEntry, type AuditCsvRow } from "@/lib/audit/diff";
import { auditQuerySchema, type AuditQuery } from "@/lib/validation/audit";
import { authorize, type Actor } from "./actor";
import { validateInput } from "./validate";

/**
 * Reading the audit log (audit.read: lead, consultant, site admin). There is no update or delete here or anywhere
 * in the DAL — entries are only appended by audit() (lib/dal/audit.ts) — and the database refuses both (migration
 * 0006 triggers).
 */

/** Start of a day in UTC (the project's zone is applied by the caller's dates when it has one). */
const dayStart = (d: string) => new Date(`${d}T00:00:00Z`);

function auditWhere(projectId: string, q: Partial<AuditQuery>, zoneOffset: (d: Date) => number = () => 0): SQL {
  const parts: (SQL | undefined)[] = [eq(auditLog.projectId, projectId)];
  if (q.entity) parts.push(eq(auditLog.entity, q.entity));
  if (q.entityId) parts.push(eq(auditLog.entityId, q.entityId));
  if (q.actorId) parts.push(q.actorId === "system" ? isNull(auditLog.actorId) : eq(auditLog.actorId, q.actorId));
  if (q.action) parts.push(or(eq(auditLog.action, q.action), like(auditLog.action, `${q.action}.%`)));
  if (q.from) {
    const t = dayStart(q.from);
    parts.push(gte(auditLog.createdAt, new Date(t.getTime() - zoneOffset(t))));
  }
  if (q.to) {
    const t = new Date(dayStart(q.to).getTime() + 86_400_000);
    parts.push(lt(auditLog.createdAt, new Date(t.getTime() - zoneOffset(t))));
  }
  return and(...parts)!;
}

/** Offset of a zone from UTC at an instant, ms (e.g. +3 600 000 for Europe/Madrid in winter). */
export function zoneOffsetMs(zone: string, at: Date): number {
  const parts = new Intl.DateTimeFormat("en-US", { timeZone: zone, hourCycle: "h23", year: "numeric", month: "2-digit", day: "2-digit", hour: "2-digit", minute: "2-digit", second: "2-digit" }).formatToParts(at);
  const get = (t: string) => Number(parts.find((p) => p.type === t)?.value);
  const asUtc = Date.UTC(get("year"), get("month") - 1, get("day"), get("hour"), get("minute"), get("second"));
  return asUtc - Math.floor(at.getTime() / 1000) * 1000;
}

const columns = {
  id: auditLog.id,
  createdAt: auditLog.createdAt,
  action: auditLog.action,
  entity: auditLog.entity,
  entityId: auditLog.entityId,
  before: auditLog.beforeJson,
  after: auditLog.afterJson,
  actorId: auditLog.actorId,
  actorName: user.name,
  actorEmail: user.email,
};

type Row = { id: string; createdAt: Date; action: string; entity: string; entityId: string; before: unknown; after: unknown; actorId: string | null; actorName: string | null; actorEmail: string | null };

/** Human names of the records in some rows: sample, station and submission codes, scan file names, people. */
async function recordLabels(projectId: string, rows: Row[]): Promise<Map<string, string>> {
  const db = getDb();
  const ids = (entity: string) => [...new Set(rows.filter((r) => r.entity === entity).map((r) => r.entityId))];
  const out = new Map<string, string>();
  const put = (entity: string, list: { id: string; label: string | null }[]) => list.forEach((x) => x.label && out.set(`${entity}:${x.id}`, x.label));
  const [sa, st, su, sc, us] = await Promise.all([
    ids("sample").length ? db.select({ id: samples.id, label: samples.code }).from(samples).where(and(eq(samples.projectId, projectId), inArray(samples.id, ids("sample")))) : [],
    ids("station").length ? db.select({ id: stations.id, label: stations.code }).from(stations).where(and(eq(stations.projectId, projectId), inArray(stations.id, ids("station")))) : [],
    ids("submission").length ? db.select({ id: submissions.id, label: submissions.code }).from(submissions).where(and(eq(submissions.projectId, projectId), inArray(submissions.id, ids("submission")))) : [],
    ids("scan").length
      ? db
          .select({ id: scans.id, label: sql<string>`${samples.code} || ' · ' || ${scans.originalName}` })
          .from(scans)
          .innerJoin(samples, eq(samples.id, scans.sampleId))
          .where(and(eq(scans.projectId, projectId), inArray(scans.id, ids("scan"))))
      : [],
    ids("member").length ? db.select({ id: user.id, label: user.name }).from(user).where(inArray(user.id, ids("member"))) : [],
  ]);
  put("sample", sa);
  put("station", st);
  put("submission", su);
  put("scan", sc);
  put("member", us);
  return out;
}

async function projectZone(projectId: string): Promise<string> {
  const [p] = await getDb().select({ timeZone: projects.timeZone }).from(projects).where(eq(projects.id, projectId));
  return p?.timeZone || "UTC";
}

/** One page of the project's audit log, newest first, filtered; each entry with its field-by-field changes. */
export async function listAudit(actor: Actor, projectId: string, raw: unknown) {
  await authorize(actor, projectId, "audit.read");
  const q = validateInput(auditQuerySchema, raw);
  const db = getDb();
  const zone = await projectZone(projectId);
  const where = auditWhere(projectId, q, (d) => zoneOffsetMs(zone, d));
  const [rows, [{ total }]] = await Promise.all([
    db
      .select(columns)
      .from(auditLog)
      .leftJoin(user, eq(user.id, auditLog.actorId))
      .where(where)
      .orderBy(desc(auditLog.createdAt), desc(sql`${auditLog}.rowid`))
      .limit(q.pageSize)
      .offset((q.page - 1) * q.pageSize),
    db.select({ total: count() }).from(auditLog).where(where),
  ]);
  const labels = await recordLabels(projectId, rows);
  return {
    items: rows.map((r) => ({ ...r, record: labels.get(`${r.entity}:${r.entityId}`) ?? null, changes: diffEntry(r.before, r.after) })),
    total,
    page: q.page,
    pageSize: q.pageSize,
    timeZone: zone,
  };
}

/** What the filter menus offer: the people, record types and action families found in the project's log. */
export async function auditFacets(actor: Actor, projectId: string) {
  await authorize(actor, projectId, "audit.read");
  const db = getDb();
  const [people, entities, actions] = await Promise.all([
    db
      .selectDistinct({ id: auditLog.actorId, name: user.name, email: user.email })
      .from(auditLog)
      .leftJoin(user, eq(user.id, auditLog.actorId))
      .where(eq(auditLog.projectId, projectId))
      .orderBy(asc(user.name)),
    db.selectDistinct({ entity: auditLog.entity }).from(auditLog).where(eq(auditLog.projectId, projectId)).orderBy(asc(auditLog.entity)),
    db.selectDistinct({ action: auditLog.action }).from(auditLog).where(eq(auditLog.projectId, projectId)).orderBy(asc(auditLog.action)),
  ]);
  const families = [...new Set(actions.map((a) => a.action.split(".")[0]))].sort();
  return {
    people: people.map((p) => ({ id: p.id ?? "system", name: p.id ? (p.name ?? "(removed account)") : "Lithodex (automatic)", email: p.email ?? null })),
    entities: entities.map((e) => e.entity),
    actions: [...new Set([...families, ...actions.map((a) => a.action)])].sort(),
  };
}

/** Entries per chunk of the CSV export. */
const EXPORT_CHUNK = 1000;

/** The filtered log for a CSV download (all pages), oldest first, fetched chunk by chunk as the client reads. */
export async function prepareAuditExport(actor: Actor, projectId: string, raw: unknown): Promise<{ projectCode: string; chunks: () => AsyncGenerator<AuditCsvRow[]> }> {
  const access = await authorize(actor, projectId, "audit.read");
  const q = validateInput(auditQuerySchema, raw);
  const zone = await projectZone(projectId);
  const where = auditWhere(projectId, q, (d) => zoneOffsetMs(zone, d));
  async function* chunks() {
    for (let offset = 0; ; offset += EXPORT_CHUNK) {
      const rows = await getDb()
        .select(columns)
        .from(auditLog)
        .leftJoin(user, eq(user.id, auditLog.actorId))
        .where(where)
        .orderBy(asc(auditLog.createdAt), asc(sql`${auditLog}.rowid`))
        .limit(EXPORT_CHUNK)
        .offset(offset);
      if (rows.length === 0) return;
      const labels = await recordLabels(projectId, rows);
      yield rows.map((r) => ({
        at: r.createdAt.toISOString(),
        actorName: r.actorId ? r.actorName : "Lithodex (automatic)",
        actorEmail: r.actorEmail,
        action: r.action,
        entity: r.entity,
        entityId: r.entityId,
        record: labels.get(`${r.entity}:${r.entityId}`) ?? null,
        before: r.before,
        after: r.after,
      }));
      if (rows.length < EXPORT_CHUNK) return;
    }
  }
  return { projectCode: access.projectCode, chunks };
}
