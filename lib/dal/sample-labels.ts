import "server-only";
import { and, asc, eq, inArray } from "drizzle-orm";
import { z } from "zod";
import { getDb } from "@/db";
import { projects, samples, stations } from "@/db/schema";
import { sampleListQuerySchema } from "@/lib/validation/sample";
import { authorize, type Actor } from "./actor";
import { sampleFilter } from "./samples";
import { validateInput } from "./validate";

/** At most this many labels per print run (20 sheets of 24). */
export const MAX_LABELS = 480;

export interface SampleLabel {
  id: string;
  code: string;
  sampleType: string;
  collectedAt: string | null;
  collectedTz: string | null;
  stationCode: string | null;
  igsn: string | null;
  suspectedAsbestos: boolean;
}

const idsSchema = z.array(z.string().trim().min(1).max(64)).min(1, "Choose at least one sample.").max(MAX_LABELS, `Print at most ${MAX_LABELS} labels at a time.`);

/**
 * Samples to print labels for: the given ids (in code order), or every sample matching register
 * filters (same query parameters as the register; at most {@link MAX_LABELS}).
 */
export async function listSampleLabels(actor: Actor, projectId: string, input: { ids?: unknown; query?: unknown }) {
  await authorize(actor, projectId, "project.read");
  const db = getDb();
  const [project] = await db.select({ code: projects.code, name: projects.name }).from(projects).where(eq(projects.id, projectId));
  const cols = {
    id: samples.id,
    code: samples.code,
    sampleType: samples.sampleType,
    collectedAt: samples.collectedAt,
    collectedTz: samples.collectedTz,
    stationCode: stations.code,
    igsn: samples.igsn,
    suspectedAsbestos: samples.suspectedAsbestos,
  };
  let where;
  if (input.ids !== undefined) {
    const ids = validateInput(idsSchema, input.ids);
    where = and(eq(samples.projectId, projectId), inArray(samples.id, ids));
  } else {
    where = sampleFilter(projectId, validateInput(sampleListQuerySchema, input.query ?? {}));
  }
  const rows = await db
    .select(cols)
    .from(samples)
    .leftJoin(stations, eq(stations.id, samples.stationId))
    .where(where)
    .orderBy(asc(samples.code))
    .limit(MAX_LABELS + 1);
  return { project, labels: rows.slice(0, MAX_LABELS) as SampleLabel[], truncated: rows.length > MAX_LABELS };
}
