import "server-only";
import { and, asc, count, eq, sql } from "drizzle-orm";
import { getDb } from "@/db";
import { photos, projects, samples, stations, structures } from "@/db/schema";
import { stationCreateSchema, stationListQuerySchema, stationPatchSchema } from "@/lib/validation/station";
import { authorize, type Actor } from "./actor";
import { audit, type DbOrTx } from "./audit";
import { conflict, notFound } from "./errors";
import { createOnce, idempotencyFor } from "./idempotency";
import { isUniqueViolation } from "./samples";
import { validateInput } from "./validate";

export type StationRow = typeof stations.$inferSelect;

/** Station code from the project prefix and station sequence, e.g. APR-ST-016. */
export function formatStationCode(projectCode: string, seq: number): string {
  return `${projectCode}-ST-${String(seq).padStart(3, "0")}`;
}

/** The code the next station would get (for the form; the real one is issued on save). */
export async function nextStationCode(actor: Actor, projectId: string): Promise<string> {
  const access = await authorize(actor, projectId, "project.read");
  const [p] = await getDb().select({ seq: projects.stationSeq }).from(projects).where(eq(projects.id, projectId));
  return formatStationCode(access.projectCode, p.seq + 1);
}

/** All stations of a project (sorted by code) with counts of samples, structures and photos. */
export async function listStations(actor: Actor, projectId: string, rawQuery: unknown = {}) {
  await authorize(actor, projectId, "project.read");
  const q = validateInput(stationListQuerySchema, rawQuery);
  const db = getDb();
  const where = q.q
    ? and(eq(stations.projectId, projectId), sql`(${stations.code} LIKE ${`%${q.q}%`} OR ${stations.name} LIKE ${`%${q.q}%`} OR ${stations.lithology} LIKE ${`%${q.q}%`})`)
    : eq(stations.projectId, projectId);
  const items = await db
    .select({
      id: stations.id,
      code: stations.code,
      name: stations.name,
      lat: stations.lat,
      lon: stations.lon,
      elevationM: stations.elevationM,
      elevationRef: stations.elevationRef,
      horizontalAccuracyM: stations.horizontalAccuracyM,
      lithology: stations.lithology,
      observedAt: stations.observedAt,
      version: stations.version,
      // Table-qualified by hand: drizzle leaves single-table selects unqualified, and a bare "id" would bind to the subquery's table.
      sampleCount: sql<number>`(select count(*) from ${samples} where "samples"."station_id" = "stations"."id")`,
      structureCount: sql<number>`(select count(*) from ${structures} where "structures"."station_id" = "stations"."id")`,
      photoCount: sql<number>`(select count(*) from ${photos} where "photos"."station_id" = "stations"."id")`,
    })
    .from(stations)
    .where(where)
    .orderBy(asc(stations.code))
    .limit(q.limit);
  const [{ total }] = await db.select({ total: count() }).from(stations).where(where);
  return { items, total };
}

/** One station with its structural measurements and samples. */
export async function getStationOrThrow(actor: Actor, projectId: string, stationId: string) {
  const access = await authorize(actor, projectId, "project.read");
  const db = getDb();
  const [station] = await db.select().from(stations).where(and(eq(stations.id, stationId), eq(stations.projectId, projectId)));
  if (!station) throw notFound("Station not found.");
  const [structs, stationSamples] = await Promise.all([
    db.select().from(structures).where(eq(structures.stationId, stationId)).orderBy(asc(structures.createdAt)),
    db
      .select({
        id: samples.id,
        code: samples.code,
        sampleType: samples.sampleType,
        status: samples.status,
        lithology: samples.lithology,
        lat: samples.lat,
        lon: samples.lon,
        collectedAt: samples.collectedAt,
        suspectedAsbestos: samples.suspectedAsbestos,
      })
      .from(samples)
      .where(and(eq(samples.projectId, projectId), eq(samples.stationId, stationId)))
      .orderBy(asc(samples.code)),
  ]);
  return { ...station, structures: structs, samples: stationSamples, role: access.role };
}

/** Issues the next free code from the station sequence (skipping codes someone typed by hand). */
async function issueStationCode(tx: DbOrTx, projectId: string, projectCode: string): Promise<string> {
  for (let i = 0; i < 1000; i++) {
    const [p] = await tx
      .update(projects)
      .set({ stationSeq: sql`${projects.stationSeq} + 1` })
      .where(eq(projects.id, projectId))
      .returning({ seq: projects.stationSeq });
    const code = formatStationCode(projectCode, p.seq);
    const [taken] = await tx.select({ id: stations.id }).from(stations).where(and(eq(stations.projectId, projectId), eq(stations.code, code)));
    if (!taken) return code;
  }
  throw conflict("Could not find a free station code; give one by hand.");
}

function mapUnique(err: unknown, code: string | undefined): never {
  if (isUniqueViolation(err, "stations.code")) throw conflict(`Station code ${code} is already used in this project.`, { field: "code" });
  throw err;
}

/**
 * Creates a station (lead, field geologist); the code comes from the station sequence when omitted. A client id
 * and/or idempotency key make it replay-safe: the same request again returns the first response, no duplicate.
 */
export async function createStation(actor: Actor, projectId: string, raw: unknown, opts: { idempotencyKey?: string | null } = {}): Promise<StationRow> {
  const access = await authorize(actor, projectId, "station.write");
  const input = validateInput(stationCreateSchema, raw);
  const db = getDb();
  const idem = idempotencyFor(projectId, "station.create", opts.idempotencyKey, input.id, input);
  try {
    return await createOnce<StationRow>(db, actor, idem, "stations.id", "station", (remember) =>
      db.transaction(async (tx) => {
        const code = input.code ?? (await issueStationCode(tx, projectId, access.projectCode));
        const [row] = await tx
          .insert(stations)
          .values({ ...input, code, projectId, createdBy: actor.userId })
          .returning();
        await audit(tx, actor, { projectId, action: "create", entity: "station", entityId: row.id, after: row });
        await remember(tx, row);
        return row;
      }),
    );
  } catch (err) {
    mapUnique(err, input.code);
  }
}

/**
 * Edits or moves a station if the client's version is current; a stale version gets 409 with the
 * current record (details.current) so the form can show both and keep what was typed.
 */
export async function updateStation(actor: Actor, projectId: string, stationId: string, raw: unknown): Promise<StationRow> {
  await authorize(actor, projectId, "station.write");
  const patch = validateInput(stationPatchSchema, raw);
  const { version, ...changes } = patch;
  const db = getDb();
  try {
    return await db.transaction(async (tx) => {
      const [before] = await tx.select().from(stations).where(and(eq(stations.id, stationId), eq(stations.projectId, projectId)));
      if (!before) throw notFound("Station not found.");
      if (before.version !== version) {
        throw conflict("This station was changed by someone else since you opened it. Review their version and apply your changes again.", { current: before });
      }
      const [row] = await tx
        .update(stations)
        .set({ ...changes, version: before.version + 1 })
        .where(and(eq(stations.id, stationId), eq(stations.version, version)))
        .returning();
      if (!row) throw conflict("This station was changed by someone else since you opened it.");
      const moved = (changes.lat !== undefined && changes.lat !== before.lat) || (changes.lon !== undefined && changes.lon !== before.lon);
      await audit(tx, actor, { projectId, action: moved ? "move" : "update", entity: "station", entityId: stationId, before, after: row });
      return row;
    });
  } catch (err) {
    mapUnique(err, changes.code);
  }
}
