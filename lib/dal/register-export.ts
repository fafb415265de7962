import "server-only";
import { asc, desc, eq, sql } from "drizzle-orm";
import { getDb } from "@/db";
import { projects, samples, stations } from "@/db/schema";
import type { ExportRow, RegisterExport, RegisterReportData } from "@/lib/export/types";
import { imaSymbol } from "@/lib/phase-map/ima-symbols";
import { registerFilterSchema, type RegisterFilter } from "@/lib/phase-map";
import { authorize, type Actor } from "./actor";
import { CONFIRMED_RESULT, countsAsResult, phasesOfSamples, registerWhere } from "./phase-facts";
import { phaseMapFor } from "./phase-map";
import { SAMPLE_SORT_COLUMNS } from "./samples";
import { validateInput } from "./validate";

/** Rows read per page while streaming an export (memory stays bounded whatever the register size). */
export const REGISTER_EXPORT_PAGE_ROWS = 1000;

const columns = {
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


/**
 * Prepares an export of the register for a member: the caller needs `export.read` in the project (404 for
 * non-members, 403 otherwise), then the query is validated with the register filter schema (the sample
 * register's parameters plus phase filters; paging is ignored: every matching sample is exported).
 * Checked before any byte is streamed, so a refused request still gets a JSON error.
 */
export async function prepareRegisterExport(actor: Actor, projectId: string, rawQuery: unknown): Promise<RegisterExport> {
  await authorize(actor, projectId, "export.read");
  const filter = validateInput(registerFilterSchema, rawQuery);
  return registerExportFor(projectId, filter, { kind: "member", name: actor.name });
}

/**
 * The export of a validated filter, for a caller already authorised (a member through
 * {@link prepareRegisterExport}, or a share-link holder through lib/dal/share-links).
 */
export async function registerExportFor(projectId: string, filter: RegisterFilter, source: RegisterExport["source"]): Promise<RegisterExport> {
  const db = getDb();
  const [project] = await db
    .select({ id: projects.id, code: projects.code, name: projects.name, region: projects.region, description: projects.description, timeZone: projects.timeZone })
    .from(projects)
    .where(eq(projects.id, projectId));
  const where = registerWhere(projectId, filter);
  const col = SAMPLE_SORT_COLUMNS[filter.sort];
  const order = filter.dir === "desc" ? desc(col) : asc(col);

  async function* pages(): AsyncGenerator<ExportRow[]> {
    // Keyset paging would need a unique sort key per sort column; OFFSET over an index-backed order is
    // fast enough at these sizes and keeps every sort the register offers.
    for (let offset = 0; ; offset += REGISTER_EXPORT_PAGE_ROWS) {
      const rows = await db
        .select(columns)
        .from(samples)
        .leftJoin(stations, eq(stations.id, samples.stationId))
        .where(where)
        .orderBy(order, asc(samples.code))
        .limit(REGISTER_EXPORT_PAGE_ROWS)
        .offset(offset);
      if (rows.length === 0) return;
      const phases = await phasesOfSamples(
        projectId,
        rows.map((r) => r.id),
        filter.leading,
      );
      yield rows.map((r) => {
        const p = phases.get(r.id);
        return { ...r, confirmed: p?.confirmed ?? [], candidates: p?.candidates ?? [] };
      });
      if (rows.length < REGISTER_EXPORT_PAGE_ROWS) return;
    }
  }

  return { project, filter, generatedAt: new Date(), source, pages, report: () => reportData(projectId, filter) };
}

/** Summary, methods and map stations for the PDF report: a handful of aggregate queries. */
async function reportData(projectId: string, filter: RegisterFilter): Promise<RegisterReportData> {
  const db = getDb();
  const where = registerWhere(projectId, filter);
  const facts = sql`FROM "samples" JOIN scans sc ON sc.sample_id = "samples"."id" JOIN phase_results pr ON pr.run_id = sc.current_run_id JOIN reference_phases rp ON rp.id = pr.reference_phase_id WHERE ${where}`;
  const [totals] = (await db.all(sql`SELECT count(*) AS samples,
      sum(CASE WHEN coalesce("samples"."lat", st.lat) IS NOT NULL THEN 1 ELSE 0 END) AS located,
      count(DISTINCT "samples"."station_id") AS stations
    FROM "samples" LEFT JOIN stations st ON st.id = "samples"."station_id" WHERE ${where}`)) as { samples: number; located: number; stations: number }[];
  const summary = (await db.all(sql`SELECT rp.mineral AS mineral, max(rp.mineral_group) AS grp, max(rp.hazard) AS hazard, count(DISTINCT "samples"."id") AS n,
      avg(pr.wt_percent) AS wmean, min(pr.wt_percent) AS wmin, max(pr.wt_percent) AS wmax
    ${facts} AND ${CONFIRMED_RESULT} GROUP BY rp.mineral ORDER BY n DESC, rp.mineral`)) as { mineral: string; grp: string | null; hazard: string | null; n: number; wmean: number | null; wmin: number | null; wmax: number | null }[];
  const withConfirmed = (await db.all(sql`SELECT count(DISTINCT "samples"."id") AS n ${facts} AND ${CONFIRMED_RESULT}`)) as { n: number }[];
  const candidateOnly = (await db.all(sql`SELECT rp.mineral AS mineral, count(DISTINCT "samples"."id") AS n ${facts} AND ${countsAsResult(filter.leading)} AND NOT ${CONFIRMED_RESULT}
      AND NOT EXISTS (SELECT 1 FROM scans sc2 JOIN phase_results pr2 ON pr2.run_id = sc2.current_run_id JOIN reference_phases rp2 ON rp2.id = pr2.reference_phase_id
        WHERE sc2.sample_id = "samples"."id" AND rp2.mineral = rp.mineral AND sc2.status = 'signed_off' AND pr2.status = 'accepted')
    GROUP BY rp.mineral ORDER BY n DESC, rp.mineral`)) as { mineral: string; n: number }[];
  const withCandidatesOnly = (await db.all(sql`SELECT count(DISTINCT "samples"."id") AS n ${facts} AND ${countsAsResult(filter.leading)}
      AND NOT EXISTS (SELECT 1 FROM scans sc2 JOIN phase_results pr2 ON pr2.run_id = sc2.current_run_id WHERE sc2.sample_id = "samples"."id" AND sc2.status = 'signed_off' AND pr2.status = 'accepted')`)) as { n: number }[];
  const signed = sql`FROM "samples" JOIN scans sc ON sc.sample_id = "samples"."id" WHERE ${where} AND sc.status = 'signed_off'`;
  const anodes = (await db.all(sql`SELECT sc.anode AS anode, sc.wavelength_a AS wl, count(*) AS n ${signed} GROUP BY sc.anode, sc.wavelength_a ORDER BY n DESC`)) as { anode: string | null; wl: number; n: number }[];
  const instruments = (await db.all(sql`SELECT DISTINCT sc.instrument AS instrument ${signed} AND sc.instrument IS NOT NULL ORDER BY 1 LIMIT 20`)) as { instrument: string }[];
  const processing = (await db.all(sql`SELECT run.params_json AS params, run.software_version AS version, count(*) AS n
    FROM "samples" JOIN scans sc ON sc.sample_id = "samples"."id" JOIN processing_runs run ON run.id = sc.current_run_id
    WHERE ${where} AND sc.status = 'signed_off' GROUP BY run.params_json, run.software_version ORDER BY n DESC LIMIT 8`)) as { params: string; version: string; n: number }[];
  const references = (await db.all(sql`SELECT DISTINCT rp.mineral AS mineral, rp.formula AS formula, rp.space_group AS sg, rp.citation AS citation, rp.builtin AS builtin
    ${facts} AND ${CONFIRMED_RESULT} ORDER BY rp.mineral`)) as { mineral: string; formula: string; sg: string; citation: string; builtin: number }[];
  const map = await phaseMapFor(projectId, { ...filter, phase: filter.phase });
  const parse = (s: string): Record<string, unknown> => {
    try {
      const v = JSON.parse(s);
      return v && typeof v === "object" ? v : { value: v };
    } catch {
      return { value: s };
    }
  };
  const r1 = (v: number | null) => (v == null ? null : Math.round(v * 10) / 10);
  return {
    totals: {
      samples: Number(totals.samples),
      located: Number(totals.located ?? 0),
      withConfirmed: Number(withConfirmed[0]?.n ?? 0),
      withCandidatesOnly: Number(withCandidatesOnly[0]?.n ?? 0),
      stations: Number(totals.stations),
    },
    phaseSummary: summary.map((s) => ({ mineral: s.mineral, symbol: imaSymbol(s.mineral), group: s.grp, hazard: s.hazard, samples: Number(s.n), wtMean: r1(s.wmean), wtMin: r1(s.wmin), wtMax: r1(s.wmax) })),
    candidateSummary: candidateOnly.map((c) => ({ mineral: c.mineral, symbol: imaSymbol(c.mineral), samples: Number(c.n) })),
    methods: {
      anodes: anodes.map((a) => ({ anode: a.anode, wavelengthA: a.wl, scans: Number(a.n) })),
      instruments: instruments.map((i) => i.instrument),
      processing: processing.map((p) => ({ params: parse(p.params), softwareVersion: p.version, runs: Number(p.n) })),
      references: references.map((r) => ({ mineral: r.mineral, formula: r.formula, spaceGroup: r.sg, citation: r.citation, builtin: Boolean(r.builtin) })),
    },
    stations: map.stations,
  };
}
