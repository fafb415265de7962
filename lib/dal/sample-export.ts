import "server-only";
import { asc, desc, eq } from "drizzle-orm";
import { getDb } from "@/db";
import { samples, stations } from "@/db/schema";
import { sampleListQuerySchema, type SampleListQuery } from "@/lib/validation/sample";
import { authorize, type Actor } from "./actor";
import { sampleFilter } from "./samples";
import { validateInput } from "./validate";

/** Rows read per page while streaming an export (memory stays bounded whatever the register size). */
export const EXPORT_PAGE_ROWS = 1000;

const exportColumns = {
  id: samples.id,
  code: samples.code,
  igsn: samples.igsn,
  stationCode: stations.code,
  stationLat: stations.lat,
  stationLon: stations.lon,
  sampleType: samples.sampleType,
  lithology: samples.lithology,
  alteration: samples.alteration,
  alterationIntensity: samples.alterationIntensity,
  description: samples.description,
  collectedAt: samples.collectedAt,
  collectedTz: samples.collectedTz,
  collectorName: samples.collectorName,
  lat: samples.lat,
  lon: samples.lon,
  elevationM: samples.elevationM,
  horizontalAccuracyM: samples.horizontalAccuracyM,
  locationSource: samples.locationSource,
  storageLocation: samples.storageLocation,
  status: samples.status,
  suspectedAsbestos: samples.suspectedAsbestos,
  weightKg: samples.weightKg,
};

export type SampleExportRow = {
  [K in keyof typeof exportColumns]: (typeof exportColumns)[K]["_"]["data"] | (K extends "stationCode" | "stationLat" | "stationLon" ? null : never);
};

const SORT = {
  code: samples.code,
  collectedAt: samples.collectedAt,
  sampleType: samples.sampleType,
  lithology: samples.lithology,
  status: samples.status,
  station: stations.code,
  updatedAt: samples.updatedAt,
} as const;

export interface SampleExport {
  projectCode: string;
  query: SampleListQuery;
  /** Pages of rows in register order, read lazily. */
  pages: () => AsyncGenerator<SampleExportRow[]>;
}

/**
 * Prepares an export of the register under the same query parameters as the register list (filters
 * and sort; paging is ignored: every matching sample is exported). Access is checked here, before any
 * byte is streamed, so a refused request still gets a JSON error.
 */
export async function prepareSampleExport(actor: Actor, projectId: string, rawQuery: unknown): Promise<SampleExport> {
  const access = await authorize(actor, projectId, "export.read");
  const query = validateInput(sampleListQuerySchema, rawQuery);
  const where = sampleFilter(projectId, query);
  const col = SORT[query.sort];
  const order = query.dir === "desc" ? desc(col) : asc(col);
  async function* pages(): AsyncGenerator<SampleExportRow[]> {
    const db = getDb();
    for (let offset = 0; ; offset += EXPORT_PAGE_ROWS) {
      const rows = await db
        .select(exportColumns)
        .from(samples)
        .leftJoin(stations, eq(stations.id, samples.stationId))
        .where(where)
        .orderBy(order, asc(samples.code))
        .limit(EXPORT_PAGE_ROWS)
        .offset(offset);
      if (rows.length) yield rows as SampleExportRow[];
      if (rows.length < EXPORT_PAGE_ROWS) return;
    }
  }
  return { projectCode: access.projectCode, query, pages };
}
