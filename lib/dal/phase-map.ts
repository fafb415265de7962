import "server-only";
import { and, asc, eq, inArray, sql } from "drizzle-orm";
import { getDb } from "@/db";
import { samples, scans, stations } from "@/db/schema";
import { imaSymbol } from "@/lib/phase-map/ima-symbols";
import { comparePhases, registerFilterSchema, type MineralOption, type PhaseKind, type PhaseMapData, type PhaseMapStation, type RegisterFilter, type StationPhase } from "@/lib/phase-map";
import { authorize, type Actor } from "./actor";
import { notFound } from "./errors";
import { phaseCriterion, phasesOfSamples, registerWhere, samplePhaseFactsSql, type SamplePhases } from "./phase-facts";
import { sampleFilter } from "./samples";
import { validateInput } from "./validate";

type StationRow = {
  skey: string;
  station_id: string | null;
  code: string;
  name: string | null;
  lat: number | null;
  lon: number | null;
  n_all: number;
  n_match: number;
  lith: string | null;
  last: string | null;
};
type PhaseRow = { skey: string; mineral: string; grp: string | null; hazard: string | null; confirmed: number; n_all: number; n_match: number; wt_mean: number | null; wt_max: number | null };

const round1 = (v: number | null) => (v == null ? null : Math.round(v * 10) / 10);

/** Which kinds a phase filter displays. */
function showsKind(q: RegisterFilter, kind: PhaseKind): boolean {
  return q.phase === "any" || (q.phase === "confirmed" ? kind === "confirmed" : kind === "candidate");
}

/**
 * The phase map of a project under the register filter: per station (or unattached located sample) the
 * number of matching samples and, per mineral, how many of them have it confirmed or as a leading
 * candidate with mean/max wt%. Two aggregate queries (stations, phases), merged in one pass.
 *
 * With a mineral/group filter only stations with a matching sample are returned, and only the phases of
 * matching samples are counted. The mineral list (for the filter and the legend) ignores the
 * mineral/group filter so other minerals can still be chosen.
 */
export async function getPhaseMap(actor: Actor, projectId: string, rawQuery: unknown): Promise<PhaseMapData> {
  await authorize(actor, projectId, "project.read");
  const q = validateInput(registerFilterSchema, rawQuery);
  return phaseMapFor(projectId, q);
}

/** The phase map for an already authorised and validated filter (also used by exports and share links). */
export async function phaseMapFor(projectId: string, q: RegisterFilter): Promise<PhaseMapData> {
  const db = getDb();
  const crit = phaseCriterion(q);
  const f = sql`f AS (
    SELECT "samples"."id" AS sample_id,
      CASE WHEN "stations"."id" IS NOT NULL THEN "stations"."id" ELSE 'sample:' || "samples"."id" END AS skey,
      ${crit ? sql`CASE WHEN ${crit} THEN 1 ELSE 0 END` : sql`1`} AS m
    FROM "samples" LEFT JOIN "stations" ON "stations"."id" = "samples"."station_id"
    WHERE ${sampleFilter(projectId, q)})`;
  const stationSql = sql`WITH ${f}
    SELECT f.skey AS skey, max("stations"."id") AS station_id, coalesce(max("stations"."code"), max("samples"."code")) AS code,
      max("stations"."name") AS name, coalesce(max("stations"."lat"), max("samples"."lat")) AS lat, coalesce(max("stations"."lon"), max("samples"."lon")) AS lon,
      count(*) AS n_all, sum(f.m) AS n_match, coalesce(max("stations"."lithology"), max("samples"."lithology")) AS lith,
      max(CASE WHEN f.m = 1 THEN "samples"."collected_at" END) AS last
    FROM f JOIN "samples" ON "samples"."id" = f.sample_id LEFT JOIN "stations" ON "stations"."id" = "samples"."station_id"
    GROUP BY f.skey`;
  const phaseSql = sql`WITH ${f}, ph AS (${samplePhaseFactsSql(projectId, q.leading, sql`sc.sample_id IN (SELECT sample_id FROM f)`)})
    SELECT f.skey AS skey, ph.mineral AS mineral, max(ph.grp) AS grp, max(ph.hazard) AS hazard, ph.confirmed AS confirmed,
      count(*) AS n_all, sum(f.m) AS n_match,
      avg(CASE WHEN f.m = 1 THEN ph.wt END) AS wt_mean, max(CASE WHEN f.m = 1 THEN ph.wt END) AS wt_max
    FROM f JOIN ph ON ph.sample_id = f.sample_id
    GROUP BY f.skey, ph.mineral, ph.confirmed`;
  const [stationRows, phaseRows] = (await Promise.all([db.all(stationSql), db.all(phaseSql)])) as [StationRow[], PhaseRow[]];

  const byKey = new Map<string, PhaseMapStation>();
  let samplesTotal = 0;
  let unlocated = 0;
  for (const r of stationRows) {
    const n = crit ? Number(r.n_match) : Number(r.n_all);
    if (n === 0) continue;
    samplesTotal += n;
    if (r.lat == null || r.lon == null) {
      unlocated += n;
      continue;
    }
    byKey.set(r.skey, {
      key: r.skey,
      stationId: r.station_id,
      code: r.code,
      name: r.name,
      lat: r.lat,
      lon: r.lon,
      samples: n,
      lithology: r.lith,
      lastCollectedAt: r.last,
      phases: [],
    });
  }

  const minerals = new Map<string, { group: string | null; confirmed: Set<string>; candidate: Set<string> }>();
  for (const r of phaseRows) {
    const kind: PhaseKind = r.confirmed ? "confirmed" : "candidate";
    let m = minerals.get(r.mineral);
    if (!m) minerals.set(r.mineral, (m = { group: r.grp, confirmed: new Set(), candidate: new Set() }));
    (kind === "confirmed" ? m.confirmed : m.candidate).add(r.skey);
    const st = byKey.get(r.skey);
    const n = crit ? Number(r.n_match) : Number(r.n_all);
    if (!st || n === 0 || !showsKind(q, kind)) continue;
    const phase: StationPhase = {
      mineral: r.mineral,
      group: r.grp,
      symbol: imaSymbol(r.mineral),
      kind,
      samples: n,
      wtMean: round1(r.wt_mean),
      wtMax: round1(r.wt_max),
      hazard: r.hazard,
    };
    st.phases.push(phase);
  }
  const list = [...byKey.values()].sort((a, b) => (a.code < b.code ? -1 : a.code > b.code ? 1 : 0));
  for (const s of list) s.phases.sort(comparePhases);
  const mineralOptions: MineralOption[] = [...minerals.entries()]
    .map(([mineral, m]) => ({
      mineral,
      symbol: imaSymbol(mineral),
      group: m.group,
      confirmedStations: m.confirmed.size,
      candidateStations: [...m.candidate].filter((k) => !m.confirmed.has(k)).length,
    }))
    .sort((a, b) => (a.mineral < b.mineral ? -1 : 1));
  return { stations: list, minerals: mineralOptions, totals: { samples: samplesTotal, stations: list.length, unlocatedSamples: unlocated }, generatedAt: new Date().toISOString() };
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
  const list: StationSample[] = shown.map(({ lat: _lat, lon: _lon, ...r }) => ({
    ...r,
    phases: phases.get(r.id) ?? { confirmed: [], candidates: [] },
    scans: scanRows.filter((s) => s.sampleId === r.id).map(({ sampleId: _s, ...s }) => s),
  }));
  const first = rows[0];
  return {
    key,
    station: station ?? { id: null, code: first.code, name: null, lat: first.lat, lon: first.lon, lithology: first.lithology, description: null },
    samples: list,
    truncated: rows.length > STATION_SAMPLE_LIMIT,
  };
}
