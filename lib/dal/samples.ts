import "server-only";
import { and, asc, count, desc, eq, gte, lt, or, sql, type AnyColumn, type SQL } from "drizzle-orm";
import { getDb } from "@/db";
import { custodyEvents, projectMembers, samples, stations } from "@/db/schema";
import { formatCodeFromPattern } from "@/lib/validation/project";
import { sampleCreateSchema, samplePatchSchema, type SampleListQuery } from "@/lib/validation/sample";
import { authorize, type Actor } from "./actor";
import { audit } from "./audit";
import { checkReservedCode, nextFreeSampleCode } from "./code-blocks";
import { conflict, invalid, notFound, type AppError } from "./errors";
import { createOnce, idempotencyFor } from "./idempotency";
import { validateInput } from "./validate";

export type SampleRow = typeof samples.$inferSelect;

/** Zero-padded code from the project prefix and sequence, e.g. APR-000042 (the default pattern). */
export function formatSampleCode(projectCode: string, seq: number): string {
  return formatCodeFromPattern(null, projectCode, seq);
}

function escapeLike(s: string): string {
  return s.replace(/[\\%_]/g, (c) => `\\${c}`);
}

/** WHERE clause of the register for a query (shared by list, export and map). */
export function sampleFilter(projectId: string, q: Partial<SampleListQuery>): SQL {
  const parts: (SQL | undefined)[] = [eq(samples.projectId, projectId)];
  const contains = (col: AnyColumn, v: string) => sql`${col} LIKE ${`%${escapeLike(v)}%`} ESCAPE '\\'`;
  if (q.q) {
    const v = q.q;
    parts.push(or(contains(samples.code, v), contains(samples.description, v), contains(samples.lithology, v), contains(samples.igsn, v)));
  }
  if (q.code) parts.push(contains(samples.code, q.code.toUpperCase()));
  if (q.status) parts.push(eq(samples.status, q.status));
  if (q.sampleType) parts.push(eq(samples.sampleType, q.sampleType));
  if (q.stationId) parts.push(eq(samples.stationId, q.stationId));
  if (q.lithology) parts.push(contains(samples.lithology, q.lithology));
  if (q.alteration) parts.push(contains(samples.alteration, q.alteration));
  if (q.collector) parts.push(contains(samples.collectorName, q.collector));
  if (q.from) parts.push(gte(samples.collectedAt, q.from));
  if (q.to) {
    const next = new Date(Date.parse(`${q.to}T00:00:00Z`) + 86_400_000).toISOString().slice(0, 10);
    parts.push(lt(samples.collectedAt, next));
  }
  if (q.bbox) {
    const [w, s, e, n] = q.bbox.split(",").map(Number);
    parts.push(sql`${samples.lat} BETWEEN ${s} AND ${n}`);
    parts.push(w <= e ? sql`${samples.lon} BETWEEN ${w} AND ${e}` : sql`(${samples.lon} >= ${w} OR ${samples.lon} <= ${e})`);
  }
  return and(...parts)!;
}

export const SAMPLE_SORT_COLUMNS = {
  code: samples.code,
  collectedAt: samples.collectedAt,
  sampleType: samples.sampleType,
  lithology: samples.lithology,
  status: samples.status,
  station: stations.code,
  updatedAt: samples.updatedAt,
} as const;

export const sampleListColumns = {
  id: samples.id,
  code: samples.code,
  igsn: samples.igsn,
  sampleType: samples.sampleType,
  lithology: samples.lithology,
  alteration: samples.alteration,
  status: samples.status,
  collectedAt: samples.collectedAt,
  collectedTz: samples.collectedTz,
  collectorName: samples.collectorName,
  lat: samples.lat,
  lon: samples.lon,
  stationId: samples.stationId,
  stationCode: stations.code,
  suspectedAsbestos: samples.suspectedAsbestos,
  version: samples.version,
};

/** One page of the register, sorted and filtered on the server. */
export async function listSamples(actor: Actor, projectId: string, q: SampleListQuery) {
  await authorize(actor, projectId, "project.read");
  const db = getDb();
  const where = sampleFilter(projectId, q);
  const col = SAMPLE_SORT_COLUMNS[q.sort];
  const order = q.dir === "desc" ? desc(col) : asc(col);
  const [items, [{ total }]] = await Promise.all([
    db
      .select(sampleListColumns)
      .from(samples)
      .leftJoin(stations, eq(stations.id, samples.stationId))
      .where(where)
      .orderBy(order, asc(samples.code))
      .limit(q.pageSize)
      .offset((q.page - 1) * q.pageSize),
    db.select({ total: count() }).from(samples).where(where),
  ]);
  return { items, total, page: q.page, pageSize: q.pageSize };
}

export async function getSampleOrThrow(actor: Actor, projectId: string, sampleId: string) {
  const access = await authorize(actor, projectId, "project.read");
  const db = getDb();
  const [row] = await db
    .select({ sample: samples, station: { id: stations.id, code: stations.code, name: stations.name, lat: stations.lat, lon: stations.lon } })
    .from(samples)
    .leftJoin(stations, eq(stations.id, samples.stationId))
    .where(and(eq(samples.projectId, projectId), eq(samples.id, sampleId)));
  if (!row) throw notFound("Sample not found.");
  return { ...row.sample, station: row.station?.id ? row.station : null, role: access.role };
}

async function assertStationInProject(tx: Pick<ReturnType<typeof getDb>, "select">, projectId: string, stationId: string | null | undefined) {
  if (!stationId) return;
  const [st] = await tx.select({ id: stations.id }).from(stations).where(and(eq(stations.id, stationId), eq(stations.projectId, projectId)));
  if (!st) throw invalid("Unknown station.", { stationId: ["No such station in this project."] });
}

/** True when a write failed on the unique index over `column` (SQLite names it table.column). */
export function isUniqueViolation(err: unknown, column: string): boolean {
  const msg = `${(err as Error)?.message ?? ""} ${(err as { cause?: Error })?.cause?.message ?? ""}`;
  return msg.includes("UNIQUE") && msg.includes(column);
}

/**
 * Creates a sample; issues the next free code from the project sequence when none is given (codes reserved for a
 * device are skipped). A code reserved for a device is accepted only from that device's account (lib/dal/code-blocks.ts).
 * Replay-safe with a client id or idempotency key (lib/dal/idempotency.ts).
 */
export async function createSample(actor: Actor, projectId: string, raw: unknown, opts: { idempotencyKey?: string | null; deviceId?: string | null } = {}): Promise<SampleRow> {
  const access = await authorize(actor, projectId, "sample.write");
  const input = validateInput(sampleCreateSchema, raw);
  const db = getDb();
  const idem = idempotencyFor(projectId, "sample.create", opts.idempotencyKey, input.id, input);
  try {
    return await createOnce<SampleRow>(db, actor, idem, "samples.id", "sample", (remember) => db.transaction(async (tx) => {
      await assertStationInProject(tx, projectId, input.stationId);
      const code = input.code || (await nextFreeSampleCode(tx, projectId, access.projectCode));
      if (input.code) await checkReservedCode(tx, actor, projectId, input.code, opts.deviceId ?? null);
      const { planned, ...fields } = input;
      const status = planned ? ("planned" as const) : ("collected" as const);
      const [row] = await tx
        .insert(samples)
        .values({ ...fields, code, projectId, status, createdBy: actor.userId, collectorId: input.collectorName ? null : actor.userId })
        .returning();
      if (input.code) await checkReservedCode(tx, actor, projectId, input.code, opts.deviceId ?? null, { sampleId: row.id });
      // The status follows the events: a sample registered as taken gets its collection event in the same write.
      if (!planned) {
        await tx.insert(custodyEvents).values({
          sampleId: row.id,
          event: "collected",
          actorId: actor.userId,
          actorName: input.collectorName || actor.name,
          occurredAt: input.collectedAt ?? new Date().toISOString(),
          note: "Registered as collected",
          statusAfter: "collected",
        });
      }
      await audit(tx, actor, { projectId, action: "create", entity: "sample", entityId: row.id, after: row });
      await remember(tx, row);
      return row;
    }));
  } catch (err) {
    if (isUniqueViolation(err, "samples.code")) {
      throw conflict(`Sample code ${input.code} is already used in this project.`, { field: "code" });
    }
    if (isUniqueViolation(err, "samples.igsn")) throw await igsnTaken(actor, input.igsn ?? null);
    throw err;
  }
}

/** The answer for an IGSN that is not accepted, the same whether it is malformed or registered where the caller cannot see. */
export const IGSN_NOT_ACCEPTED = "This IGSN is not accepted; check it against the IGSNs allocated to your project.";

/**
 * A unique-index hit on the IGSN: 409 naming the sample when the caller can see the project that holds it, otherwise
 * the same 422 as an invalid value, so that IGSNs of other projects stay invisible (no existence oracle).
 */
async function igsnTaken(actor: Actor, igsn: string | null): Promise<AppError> {
  if (igsn) {
    const [holder] = await getDb().select({ projectId: samples.projectId, code: samples.code }).from(samples).where(eq(samples.igsn, igsn)).limit(1);
    if (holder) {
      const member = await getDb()
        .select({ userId: projectMembers.userId })
        .from(projectMembers)
        .where(and(eq(projectMembers.projectId, holder.projectId), eq(projectMembers.userId, actor.userId)))
        .limit(1);
      if (actor.isAdmin || member.length > 0) return conflict(`That IGSN is already registered to sample ${holder.code}.`, { field: "igsn" });
    }
  }
  return invalid(IGSN_NOT_ACCEPTED, { igsn: [IGSN_NOT_ACCEPTED] });
}

/**
 * Edits a sample if the client's version is current; a stale version gets 409 with the current record,
 * so the form can show both and nothing typed is lost.
 */
export async function updateSample(actor: Actor, projectId: string, sampleId: string, raw: unknown): Promise<SampleRow> {
  await authorize(actor, projectId, "sample.write");
  const patch = validateInput(samplePatchSchema, raw);
  const db = getDb();
  const { version, ...changes } = patch;
  try {
    return await db.transaction(async (tx) => {
      const [before] = await tx.select().from(samples).where(and(eq(samples.id, sampleId), eq(samples.projectId, projectId)));
      if (!before) throw notFound("Sample not found.");
      if (before.version !== version) {
        throw conflict("This sample was changed by someone else since you opened it. Review their version and apply your changes again.", {
          current: before,
        });
      }
      await assertStationInProject(tx, projectId, changes.stationId);
      if (changes.code && changes.code !== before.code) await checkReservedCode(tx, actor, projectId, changes.code, null, { sampleId });
      const lat = changes.lat !== undefined ? changes.lat : before.lat;
      const lon = changes.lon !== undefined ? changes.lon : before.lon;
      if ((lat == null) !== (lon == null)) throw invalid("Give both latitude and longitude, or neither.", { lon: ["Give both latitude and longitude, or neither."] });
      const [row] = await tx
        .update(samples)
        .set({ ...changes, version: before.version + 1 })
        .where(and(eq(samples.id, sampleId), eq(samples.version, version)))
        .returning();
      if (!row) throw conflict("This sample was changed by someone else since you opened it.");
      await audit(tx, actor, { projectId, action: "update", entity: "sample", entityId: sampleId, before, after: row });
      return row;
    });
  } catch (err) {
    if (isUniqueViolation(err, "samples.code")) {
      throw conflict(`Sample code ${changes.code} is already used in this project.`, { field: "code" });
    }
    if (isUniqueViolation(err, "samples.igsn")) throw await igsnTaken(actor, changes.igsn ?? null);
    throw err;
  }
}
