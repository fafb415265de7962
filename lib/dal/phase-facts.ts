import "server-only";
import { and, sql, type SQL } from "drizzle-orm";
import { getDb } from "@/db";
import { imaSymbol } from "@/lib/phase-map/ima-symbols";
import type { PhaseKind, RegisterFilter } from "@/lib/phase-map";
import { sampleFilter } from "./samples";

/**
 * SQL shared by the phase map and the register exports: which phase results count as confirmed and as
 * candidates, and the register WHERE clause with the phase filters.
 *
 * Confirmed = accepted on the current run of a signed-off scan. Candidate = on the current run of a scan
 * not yet signed off: accepted by the analyst, kept by the whole-pattern fit, or undecided within the first
 * `leading` ranks of the search. Rejected results never count.
 */

/** Condition on `sc` (scans) and `pr` (phase_results) for a confirmed result. */
const CONFIRMED = sql.raw(`(sc.status = 'signed_off' AND pr.status = 'accepted')`);
/** Condition for a leading candidate (unconfirmed). */
const candidate = (leading: number) => sql`(sc.status <> 'signed_off' AND (pr.status = 'accepted' OR (pr.status = 'candidate' AND (pr.fitted = 1 OR (pr.rank IS NOT NULL AND pr.rank <= ${leading})))))`;

/** FROM part joining a sample's scans to their current runs' results and reference phases. */
const FACTS_FROM = sql.raw(`scans sc JOIN phase_results pr ON pr.run_id = sc.current_run_id JOIN reference_phases rp ON rp.id = pr.reference_phase_id`);

function phaseMatch(q: Pick<RegisterFilter, "mineral" | "group">): SQL {
  const parts: SQL[] = [];
  if (q.mineral) parts.push(sql`rp.mineral = ${q.mineral}`);
  if (q.group) parts.push(sql`lower(rp.mineral_group) = ${q.group}`);
  return parts.length ? and(...parts)! : sql`1`;
}

/**
 * Sample-level phase criterion as a sub-SELECT of sample ids: samples with the filter's mineral/group
 * confirmed ("confirmed"), confirmed or as a candidate ("any"), or only as a candidate ("candidate": a
 * candidate whose mineral is not confirmed on the same sample). Null when the filter names no mineral or
 * group. Driven by the phase_results reference index, so it reads only the results of that mineral.
 */
export function phaseCriterion(projectId: string, q: Pick<RegisterFilter, "mineral" | "group" | "phase" | "leading">): SQL | null {
  if (!q.mineral && !q.group) return null;
  const match = phaseMatch(q);
  const select = (kind: SQL, extra: SQL = sql``) =>
    sql`SELECT sc.sample_id FROM reference_phases rp JOIN phase_results pr ON pr.reference_phase_id = rp.id JOIN scans sc ON sc.id = pr.scan_id AND sc.current_run_id = pr.run_id
      WHERE sc.project_id = ${projectId} AND ${match} AND ${kind} ${extra}`;
  if (q.phase === "confirmed") return select(CONFIRMED);
  if (q.phase === "any") return select(sql`(${CONFIRMED} OR ${candidate(q.leading)})`);
  return select(
    candidate(q.leading),
    sql`AND NOT EXISTS (SELECT 1 FROM scans sc2 JOIN phase_results pr2 ON pr2.run_id = sc2.current_run_id JOIN reference_phases rp2 ON rp2.id = pr2.reference_phase_id
      WHERE sc2.sample_id = sc.sample_id AND rp2.mineral = rp.mineral AND sc2.status = 'signed_off' AND pr2.status = 'accepted')`,
  );
}

/** The register WHERE clause (on `samples`) of a filter: the register's own filters plus the phase criterion. */
export function registerWhere(projectId: string, q: RegisterFilter): SQL {
  const crit = phaseCriterion(projectId, q);
  const base = sampleFilter(projectId, q);
  return crit ? and(base, sql`"samples"."id" IN (${crit})`)! : base;
}

/** Condition on `sc`/`pr` for a result that counts at all (confirmed or leading candidate). */
export const countsAsResult = (leading: number) => sql`(${CONFIRMED} OR ${candidate(leading)})`;
/** Condition on `sc`/`pr` for a confirmed result. */
export const CONFIRMED_RESULT = CONFIRMED;

/**
 * SELECT yielding one row per (sample, mineral) with the sample-level kind (confirmed wins over a
 * candidate of the same mineral in another scan) and wt%: columns sample_id, mineral, grp, hazard,
 * confirmed (0/1), wt, scan_id, rank. Restricted to the project's scans.
 */
export function samplePhaseFactsSql(projectId: string, leading: number, sampleCondition: SQL = sql`1`): SQL {
  return sql`SELECT sc.sample_id AS sample_id, rp.mineral AS mineral, max(rp.mineral_group) AS grp, max(rp.hazard) AS hazard,
      max(CASE WHEN ${CONFIRMED} THEN 1 ELSE 0 END) AS confirmed,
      coalesce(max(CASE WHEN ${CONFIRMED} THEN pr.wt_percent END), CASE WHEN max(CASE WHEN ${CONFIRMED} THEN 1 ELSE 0 END) = 0 THEN max(pr.wt_percent) END) AS wt,
      coalesce(max(CASE WHEN ${CONFIRMED} THEN sc.id END), max(sc.id)) AS scan_id,
      min(pr.rank) AS rank
    FROM ${FACTS_FROM}
    WHERE sc.project_id = ${projectId} AND (${CONFIRMED} OR ${candidate(leading)}) AND ${sampleCondition}
    GROUP BY sc.sample_id, rp.mineral`;
}

/** One phase of one sample as exports and station details show it. */
export interface SamplePhaseCell {
  mineral: string;
  symbol: string;
  group: string | null;
  hazard: string | null;
  kind: PhaseKind;
  /** Semi-quantitative estimate, wt% (null when not estimated). */
  wtPercent: number | null;
  scanId: string;
  /** Rank among the run's candidates (candidates only). */
  rank: number | null;
}

export interface SamplePhases {
  confirmed: SamplePhaseCell[];
  candidates: SamplePhaseCell[];
}

const byWt = (a: SamplePhaseCell, b: SamplePhaseCell) => (b.wtPercent ?? -1) - (a.wtPercent ?? -1) || (a.rank ?? 99) - (b.rank ?? 99) || (a.mineral < b.mineral ? -1 : 1);

/** Confirmed phases and leading candidates of some samples (one query), by sample id. */
export async function phasesOfSamples(projectId: string, sampleIds: readonly string[], leading: number): Promise<Map<string, SamplePhases>> {
  const out = new Map<string, SamplePhases>();
  if (sampleIds.length === 0) return out;
  const ids = sql.join(
    sampleIds.map((id) => sql`${id}`),
    sql`, `,
  );
  const rows = (await getDb().all(samplePhaseFactsSql(projectId, leading, sql`sc.sample_id IN (${ids})`))) as {
    sample_id: string;
    mineral: string;
    grp: string | null;
    hazard: string | null;
    confirmed: number;
    wt: number | null;
    scan_id: string;
    rank: number | null;
  }[];
  for (const r of rows) {
    let e = out.get(r.sample_id);
    if (!e) out.set(r.sample_id, (e = { confirmed: [], candidates: [] }));
    const cell: SamplePhaseCell = {
      mineral: r.mineral,
      symbol: imaSymbol(r.mineral),
      group: r.grp,
      hazard: r.hazard,
      kind: r.confirmed ? "confirmed" : "candidate",
      wtPercent: r.wt,
      scanId: r.scan_id,
      rank: r.confirmed ? null : r.rank,
    };
    (r.confirmed ? e.confirmed : e.candidates).push(cell);
  }
  for (const e of out.values()) {
    e.confirmed.sort(byWt);
    e.candidates.sort(byWt);
  }
  return out;
}
