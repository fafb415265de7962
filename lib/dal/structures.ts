import "server-only";
import { and, asc, eq } from "drizzle-orm";
import { z } from "zod";
import { getDb } from "@/db";
import { stations, structures } from "@/db/schema";
import { angleLineToPlane, dipDirectionFromStrike, formatAttitude, lineFromRake, normalizeAzimuth } from "@/lib/geo";
import { structureCreateSchema, type StructureCreateInput } from "@/lib/validation/structure";
import { authorize, type Actor } from "./actor";
import { audit, type DbOrTx } from "./audit";
import { conflict, invalid, notFound } from "./errors";
import { createOnce, idempotencyFor } from "./idempotency";
import { validateInput } from "./validate";

export type StructureRow = typeof structures.$inferSelect;

/** Largest angle between a lineation and the plane it was measured on (common practice: |line·normal| < sin 10°). */
export const LINE_IN_PLANE_TOLERANCE_DEG = 10;

async function stationInProject(db: DbOrTx, projectId: string, stationId: string) {
  const [st] = await db.select({ id: stations.id }).from(stations).where(and(eq(stations.id, stationId), eq(stations.projectId, projectId)));
  if (!st) throw notFound("Station not found.");
}

/** The structural measurements of a station, oldest first. */
export async function listStructures(actor: Actor, projectId: string, stationId: string): Promise<StructureRow[]> {
  await authorize(actor, projectId, "project.read");
  const db = getDb();
  await stationInProject(db, projectId, stationId);
  return db.select().from(structures).where(eq(structures.stationId, stationId)).orderBy(asc(structures.createdAt));
}

type StoredValues = Pick<typeof structures.$inferInsert, "kind" | "dipDirection" | "dip" | "trend" | "plunge" | "rake" | "planeId" | "rawAzimuth" | "declinationDeg" | "declinationApplied">;

/** Turns the entry (any convention, magnetic or true) into stored true-north dip direction/dip or trend/plunge. */
async function toStored(db: DbOrTx, stationId: string, input: StructureCreateInput): Promise<StoredValues> {
  const magnetic = input.azimuthRef === "magnetic";
  const decl = magnetic ? (input.declinationDeg ?? 0) : 0;
  const declination = { declinationDeg: input.declinationDeg ?? null, declinationApplied: magnetic };
  const toTrue = (azimuth: number) => normalizeAzimuth(azimuth + decl);
  switch (input.convention) {
    case "rhr":
      return { kind: "planar", dipDirection: dipDirectionFromStrike(toTrue(input.strike)), dip: input.dip, rawAzimuth: input.strike, ...declination };
    case "dip_dipdir":
      return { kind: "planar", dipDirection: toTrue(input.dipDirection), dip: input.dip, rawAzimuth: input.dipDirection, ...declination };
    case "trend_plunge": {
      const line = { trend: toTrue(input.trend), plunge: input.plunge };
      if (input.planeId) {
        const plane = await loadPlane(db, stationId, input.planeId);
        const off = angleLineToPlane(line, plane);
        if (off >= LINE_IN_PLANE_TOLERANCE_DEG) {
          const msg = `Lineation ${formatAttitude(line.trend, line.plunge)} is ${off.toFixed(1)}° off plane ${formatAttitude(plane.dipDirection, plane.dip)}; a line measured on a plane must lie within ${LINE_IN_PLANE_TOLERANCE_DEG}° of it. Check the reading or the plane.`;
          throw invalid("The lineation does not lie in its plane.", { trend: [msg], plunge: [msg] });
        }
      }
      return { kind: "linear", ...line, planeId: input.planeId ?? null, rawAzimuth: input.trend, ...declination };
    }
    case "rake": {
      const plane = await loadPlane(db, stationId, input.planeId);
      const line = lineFromRake(plane, input.rake);
      return { kind: "linear", trend: line.trend, plunge: line.plunge, rake: input.rake, planeId: input.planeId, rawAzimuth: null, declinationDeg: null, declinationApplied: false };
    }
  }
}

async function loadPlane(db: DbOrTx, stationId: string, planeId: string) {
  const [p] = await db.select().from(structures).where(and(eq(structures.id, planeId), eq(structures.stationId, stationId)));
  if (!p || p.kind !== "planar" || p.dipDirection == null || p.dip == null) {
    throw invalid("Unknown plane.", { planeId: ["No such plane at this station; measure the plane first."] });
  }
  return { dipDirection: p.dipDirection, dip: p.dip };
}

/**
 * Adds a structural measurement to a station (lead, field geologist). Stored as true-north dip
 * direction/dip or trend/plunge; a lineation on a plane must lie in it (within 10°).
 */
export async function createStructure(actor: Actor, projectId: string, stationId: string, raw: unknown, opts: { idempotencyKey?: string | null } = {}): Promise<StructureRow> {
  await authorize(actor, projectId, "station.write");
  const input = validateInput(structureCreateSchema, raw);
  const db = getDb();
  const idem = idempotencyFor(projectId, `structure.create:${stationId}`, opts.idempotencyKey, input.id, input);
  return createOnce<StructureRow>(db, actor, idem, "structures.id", "measurement", (remember) => db.transaction(async (tx) => {
    await stationInProject(tx, projectId, stationId);
    const stored = await toStored(tx, stationId, input);
    const [row] = await tx
      .insert(structures)
      .values({
        ...(input.id ? { id: input.id } : {}),
        stationId,
        feature: input.feature,
        convention: input.convention,
        generation: input.generation ?? null,
        overturned: input.overturned ?? false,
        quality: input.quality ?? null,
        note: input.note ?? null,
        createdBy: actor.userId,
        ...stored,
      })
      .returning();
    await audit(tx, actor, { projectId, action: "create", entity: "structure", entityId: row.id, after: row });
    await remember(tx, row);
    return row;
  }));
}

/** Removes a measurement; lineations measured on a removed plane keep their trend/plunge but lose the link. */
export async function deleteStructure(actor: Actor, projectId: string, stationId: string, structureId: string): Promise<void> {
  await authorize(actor, projectId, "station.write");
  const db = getDb();
  await db.transaction(async (tx) => {
    await stationInProject(tx, projectId, stationId);
    const [before] = await tx.select().from(structures).where(and(eq(structures.id, structureId), eq(structures.stationId, stationId)));
    if (!before) throw notFound("Measurement not found.");
    await tx.update(structures).set({ planeId: null }).where(eq(structures.planeId, structureId));
    await tx.delete(structures).where(eq(structures.id, structureId));
    await audit(tx, actor, { projectId, action: "delete", entity: "structure", entityId: structureId, before });
  });
}

/** One measurement with its station's code and position, for the project map's strike/dip symbols. */
export interface MapStructure {
  id: string;
  stationId: string;
  stationCode: string;
  lat: number;
  lon: number;
  kind: "planar" | "linear";
  feature: string;
  dipDirection: number | null;
  dip: number | null;
  trend: number | null;
  plunge: number | null;
  overturned: boolean;
  generation: string | null;
}

/** Every structural measurement of the project's stations (any member), for the map. */
export async function listProjectStructures(actor: Actor, projectId: string): Promise<MapStructure[]> {
  await authorize(actor, projectId, "project.read");
  return getDb()
    .select({
      id: structures.id,
      stationId: structures.stationId,
      stationCode: stations.code,
      lat: stations.lat,
      lon: stations.lon,
      kind: structures.kind,
      feature: structures.feature,
      dipDirection: structures.dipDirection,
      dip: structures.dip,
      trend: structures.trend,
      plunge: structures.plunge,
      overturned: structures.overturned,
      generation: structures.generation,
    })
    .from(structures)
    .innerJoin(stations, eq(structures.stationId, stations.id))
    .where(eq(stations.projectId, projectId))
    .orderBy(asc(stations.code), asc(structures.createdAt));
}

const versionOnly = z.object({ version: z.number({ error: "version is required." }).int().min(1, "version is required.") });

/**
 * Re-enters a measurement (any convention, as on create) if the client's version is current; a stale version gets
 * 409 with the current record, so an edit made offline is shown beside the newer one instead of overwriting it.
 */
export async function updateStructure(actor: Actor, projectId: string, stationId: string, structureId: string, raw: unknown): Promise<StructureRow> {
  await authorize(actor, projectId, "station.write");
  const { version } = validateInput(versionOnly, raw);
  const { version: _v, ...rest } = raw as Record<string, unknown>; // eslint-disable-line @typescript-eslint/no-unused-vars
  const input = validateInput(structureCreateSchema, rest);
  if (input.id && input.id !== structureId) throw invalid("The id cannot change.", { id: ["The id cannot change."] });
  const db = getDb();
  return db.transaction(async (tx) => {
    await stationInProject(tx, projectId, stationId);
    const [before] = await tx.select().from(structures).where(and(eq(structures.id, structureId), eq(structures.stationId, stationId)));
    if (!before) throw notFound("Measurement not found.");
    if (before.version !== version) {
      throw conflict("This measurement was changed by someone else since you opened it. Review their version and apply your changes again.", { current: before });
    }
    if (input.convention === "trend_plunge" || input.convention === "rake") {
      if (input.planeId === structureId) throw invalid("A line cannot be measured on itself.", { planeId: ["Choose a plane."] });
    }
    const stored = await toStored(tx, stationId, input);
    const [row] = await tx
      .update(structures)
      .set({
        feature: input.feature,
        convention: input.convention,
        generation: input.generation ?? null,
        overturned: input.overturned ?? false,
        quality: input.quality ?? null,
        note: input.note ?? null,
        dipDirection: null,
        dip: null,
        trend: null,
        plunge: null,
        rake: null,
        planeId: null,
        ...stored,
        version: before.version + 1,
      })
      .where(and(eq(structures.id, structureId), eq(structures.version, version)))
      .returning();
    if (!row) throw conflict("This measurement was changed by someone else since you opened it.");
    await audit(tx, actor, { projectId, action: "update", entity: "structure", entityId: structureId, before, after: row });
    return row;
  });
}
