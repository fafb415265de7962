import "server-only";
import { and, asc, eq, inArray, sql } from "drizzle-orm";
import { getDb } from "@/db";
import { samples, scans, stations } from "@/db/schema";
import { imaSymbol } from "@/lib/phase-map/ima-symbols";
import { comparePhases, registerFilterSchema, type MineralOption, type PhaseKind, type PhaseMapData, type PhaseMapStation, type RegisterFilter } from "@/lib/phase-map";
import { authorize, type Actor } from "./actor";
import { notFound } from "./errors";
import { CONFIRMED_RESULT, countsAsResult, phasesOfSamples, registerWhere, type SamplePhases } from "./phase-facts";
import { sampleFilter } from "./samples";
import { validateInput } from "./validate";

type StationRow = { skey: string; station_id: string | null; code: string; name: string | null; lat: number | null; lon: number | null; n: number; lith: string | null; last: string | null };
/** [mineral, group, hazard, samples with it, of which confirmed, wt conf mean, wt conf max, wt cand mean, wt cand max] */
type PhaseTuple = [string, string | null, string | null, number, number, number | null, number | null, number | null, number | null];

const round1 = (v: number | null) => (v == null ? null : Math.round(v * 10) / 10);

/** Which kinds a phase filter displays. */
function showsKind(q: RegisterFilter, kind: PhaseKind): boolean {
  return q.phase === "any" || (q.phase === "confirmed" ? kind === "confirmed" : kind === "candidate");
}

const maxOf = (a: number | null, b: number | null) => (a == null ? b : b == null ? a : Math.max(a, b));

/**
 * The phase map of a project under the register filter: per station (or unattached located sample) the
 * number of matching samples and, per mineral, how many of them have it confirmed or as a leading
 * candidate, with mean/max wt%. Two aggregate queries (stations; phases packed as one JSON array per
 * station) merged in one pass. With a mineral/group filter only matching samples count, so only stations
 * where the mineral was found (with the chosen status) are returned.
 */
export async function getPhaseMap(actor: Actor, projectId: string, rawQuery: unknown): Promise<PhaseMapData> {
  await authorize(actor, projectId, "project.read");
  const q = validateInput(registerFilterSchema, rawQuery);
  return phaseMapFor(projectId, q);
}

/** The phase map for an already authorised and validated filter (also used by exports and share links). */
export async function phaseMapFor(projectId: string, q: RegisterFilter): Promise<PhaseMapData> {
  const db = getDb();
  const where = registerWhere(projectId, q);
  // Stationed samples grouped by station (index order), unattached samples one by one.
  const stationSql = sql`SELECT a.skey AS skey, a.station_id AS station_id, coalesce(st.code, a.code) AS code, st.name AS name,
      coalesce(st.lat, a.lat) AS lat, coalesce(st.lon, a.lon) AS lon, a.n AS n, coalesce(st.lithology, a.lith) AS lith, a.last AS last
    FROM (SELECT "samples"."station_id" AS skey, "samples"."station_id" AS station_id, NULL AS code, NULL AS lat, NULL AS lon, NULL AS lith, count(*) AS n, max("samples"."collected_at") AS last
        FROM "samples" WHERE ${where} AND "samples"."station_id" IS NOT NULL GROUP BY "samples"."station_id"
      UNION ALL
      SELECT 'sample:' || "samples"."id", NULL, "samples"."code", "samples"."lat", "samples"."lon", "samples"."lithology", 1, "samples"."collected_at"
        FROM "samples" WHERE ${where} AND "samples"."station_id" IS NULL) a
    LEFT JOIN "stations" st ON st.id = a.station_id`;
  const phaseSql = sql`SELECT CASE WHEN x.st IS NULL THEN 'sample:' || x.own ELSE x.st END AS skey,
      json_group_array(json_array(rp.mineral, rp.mineral_group, rp.hazard, x.na, x.nc, x.wc, x.wcm, x.wk, x.wkm)) AS j
    FROM (SELECT "samples"."station_id" AS st, CASE WHEN "samples"."station_id" IS NULL THEN "samples"."id" END AS own, pr.reference_phase_id AS ref,
        count(DISTINCT "samples"."id") AS na, count(DISTINCT CASE WHEN ${CONFIRMED_RESULT} THEN "samples"."id" END) AS nc,
        round(avg(CASE WHEN ${CONFIRMED_RESULT} THEN pr.wt_percent END), 1) AS wc, max(CASE WHEN ${CONFIRMED_RESULT} THEN pr.wt_percent END) AS wcm,
        round(avg(CASE WHEN NOT ${CONFIRMED_RESULT} THEN pr.wt_percent END), 1) AS wk, max(CASE WHEN NOT ${CONFIRMED_RESULT} THEN pr.wt_percent END) AS wkm
      FROM "samples" JOIN scans sc ON sc.sample_id = "samples"."id" JOIN phase_results pr ON pr.run_id = sc.current_run_id
      WHERE ${where} AND ${q.phase === "confirmed" ? CONFIRMED_RESULT : countsAsResult(q.leading)}
      GROUP BY 1, 2, 3) x
    JOIN reference_phases rp ON rp.id = x.ref
    GROUP BY x.st, x.own`;
  const stationRows = (await db.all(stationSql)) as StationRow[];
  const phaseRows = (await db.all(phaseSql)) as { skey: string; j: string }[];

  const byKey = new Map<string, PhaseMapStation>();
  let samplesTotal = 0;
  let unlocated = 0;
  for (const r of stationRows) {
    const n = Number(r.n);
    samplesTotal += n;
    if (r.lat == null || r.lon == null) {
      unlocated += n;
      continue;
    }
    byKey.set(r.skey, { key: r.skey, stationId: r.station_id, code: r.code, name: r.name, lat: r.lat, lon: r.lon, samples: n, lithology: r.lith, lastCollectedAt: r.last, phases: [] });
  }
  const showConfirmed = showsKind(q, "confirmed");
  const showCandidates = showsKind(q, "candidate");
  for (const row of phaseRows) {
    const st = byKey.get(row.skey);
    if (!st) continue;
    // Two reference structures of one mineral (shipped and imported) are one phase on the map.
    const merged = new Map<string, PhaseTuple>();
    for (const t of JSON.parse(row.j) as PhaseTuple[]) {
      const m = merged.get(t[0]);
      if (!m) merged.set(t[0], t);
      else merged.set(t[0], [t[0], m[1] ?? t[1], m[2] ?? t[2], m[3] + t[3], m[4] + t[4], maxOf(m[5], t[5]), maxOf(m[6], t[6]), maxOf(m[7], t[7]), maxOf(m[8], t[8])]);
    }
    for (const [mineral, group, hazard, na, nc, wc, wcm, wk, wkm] of merged.values()) {
      const symbol = imaSymbol(mineral);
      if (nc > 0 && showConfirmed) st.phases.push({ mineral, group, symbol, kind: "confirmed", samples: nc, wtMean: round1(wc), wtMax: round1(wcm), hazard });
      if (na - nc > 0 && showCandidates) st.phases.push({ mineral, group, symbol, kind: "candidate", samples: na - nc, wtMean: round1(wk), wtMax: round1(wkm), hazard });
    }
  }
  const list = [...byKey.values()].sort((a, b) => (a.code < b.code ? -1 : a.code > b.code ? 1 : 0));
  for (const s of list) s.phases.sort(comparePhases);
  return { stations: list, totals: { samples: samplesTotal, stations: list.length, unlocatedSamples: unlocated }, generatedAt: new Date().toISOString() };
}

/**
 * Minerals found in the project under the register filter (its mineral/group/phase criteria ignored, so
 * the list offers every mineral), with how many stations have each confirmed and how many only as a
 * leading candidate. One aggregate query; the phase-map filter and legend use it.
 */
export async function getPhaseMapMinerals(actor: Actor, projectId: string, rawQuery: unknown): Promise<MineralOption[]> {
  await authorize(actor, projectId, "project.read");
  const q = validateInput(registerFilterSchema, rawQuery);
  return mineralsFor(projectId, q);
}

export async function mineralsFor(projectId: string, q: RegisterFilter): Promise<MineralOption[]> {
  const where = sampleFilter(projectId, { ...q });
  const skey = sql`coalesce("samples"."station_id", 'sample:' || "samples"."id")`;
  const rows = (await getDb().all(sql`SELECT rp.mineral AS mineral, max(rp.mineral_group) AS grp,
      count(DISTINCT CASE WHEN ${CONFIRMED_RESULT} THEN ${skey} END) AS conf, count(DISTINCT ${skey}) AS anyst
    FROM "samples" JOIN scans sc ON sc.sample_id = "samples"."id" JOIN phase_results pr ON pr.run_id = sc.current_run_id JOIN reference_phases rp ON rp.id = pr.reference_phase_id
    WHERE ${where} AND ${countsAsResult(q.leading)}
    GROUP BY rp.mineral ORDER BY rp.mineral`)) as { mineral: string; grp: string | null; conf: number; anyst: number }[];
  return rows.map((r) => ({ mineral: r.mineral, symbol: imaSymbol(r.mineral), group: r.grp, confirmedStations: Number(r.conf), candidateStations: Number(r.anyst) - Number(r.conf) }));
}

/** A sample at a station as the station panel shows it. */
export interface StationSample {
  id: string;
  code: string;
  sampleType: string;
  lithology: string | null;
  status: string;
  collectedAt: string | null;
  collectorName: string | null;
  suspectedAsbestos: boolean;
  phases: SamplePhases;
  scans: { id: string; originalName: string; status: string }[];
}

/** Most samples listed in one station panel. */
export const STATION_SAMPLE_LIMIT = 200;

/**
 * One station of the phase map: its matching samples (up to {@link STATION_SAMPLE_LIMIT}), their confirmed
 * phases and leading candidates, and their scans. `key` is a station id or "sample:<id>".
 */
export async function getPhaseMapStation(actor: Actor, projectId: string, key: string, rawQuery: unknown) {
  await authorize(actor, projectId, "project.read");
  const q = validateInput(registerFilterSchema, rawQuery);
  const db = getDb();
  const where = registerWhere(projectId, q);
  const own = key.startsWith("sample:") ? key.slice("sample:".length) : null;
  const [station] = own
    ? []
    : await db
        .select({ id: stations.id, code: stations.code, name: stations.name, lat: stations.lat, lon: stations.lon, lithology: stations.lithology, description: stations.description })
        .from(stations)
        .where(and(eq(stations.projectId, projectId), eq(stations.id, key)));
  if (!own && !station) throw notFound("Station not found.");
  const rows = await db
    .select({
      id: samples.id,
      code: samples.code,
      sampleType: samples.sampleType,
      lithology: samples.lithology,
      status: samples.status,
      collectedAt: samples.collectedAt,
      collectorName: samples.collectorName,
      suspectedAsbestos: samples.suspectedAsbestos,
      lat: samples.lat,
      lon: samples.lon,
    })
    .from(samples)
    .where(and(where, own ? eq(samples.id, own) : eq(samples.stationId, key)))
    .orderBy(asc(samples.code))
    .limit(STATION_SAMPLE_LIMIT + 1);
  if (own && rows.length === 0) throw notFound("Sample not found.");
  const shown = rows.slice(0, STATION_SAMPLE_LIMIT);
  const ids = shown.map((r) => r.id);
  const [phases, scanRows] = await Promise.all([
    phasesOfSamples(projectId, ids, q.leading),
    ids.length
      ? db.select({ id: scans.id, sampleId: scans.sampleId, originalName: scans.originalName, status: scans.status }).from(scans).where(and(eq(scans.projectId, projectId), inArray(scans.sampleId, ids))).orderBy(asc(scans.createdAt))
      : Promise.resolve([]),
  ]);
  const list: StationSample[] = shown.map((r) => ({
    id: r.id,
    code: r.code,
    sampleType: r.sampleType,
    lithology: r.lithology,
    status: r.status,
    collectedAt: r.collectedAt,
    collectorName: r.collectorName,
    suspectedAsbestos: r.suspectedAsbestos,
    phases: phases.get(r.id) ?? { confirmed: [], candidates: [] },
    scans: scanRows.filter((s) => s.sampleId === r.id).map((s) => ({ id: s.id, originalName: s.originalName, status: s.status })),
  }));
  const first = rows[0];
  return {
    key,
    station: station ?? { id: null, code: first.code, name: null, lat: first.lat, lon: first.lon, lithology: first.lithology, description: null },
    samples: list,
    truncated: rows.length > STATION_SAMPLE_LIMIT,
  };
}
