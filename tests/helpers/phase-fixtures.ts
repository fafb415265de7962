/**
 * Scan and phase fixtures for phase-map and export tests, written straight to the test database: a scan
 * with one finished processing run whose phase results are given (candidate / accepted / rejected, rank,
 * wt%), optionally signed off. Minerals come from the shipped reference library (real names, groups and
 * structure citations); the scans themselves are invented.
 */
import { eq } from "drizzle-orm";
import { getDb } from "@/db";
import { phaseResults, processingRuns, referencePhases, scans } from "@/db/schema";
import { findLibraryPhase } from "@/lib/science/minerals";

const refIds = new Map<string, string>();

/** The reference_phases id of a library mineral, inserting a row (metadata only) the first time. */
export async function referencePhaseId(mineral: string): Promise<string> {
  const known = refIds.get(mineral);
  if (known) return known;
  const db = getDb();
  const [existing] = await db.select({ id: referencePhases.id }).from(referencePhases).where(eq(referencePhases.mineral, mineral));
  if (existing) {
    refIds.set(mineral, existing.id);
    return existing.id;
  }
  const p = findLibraryPhase(mineral);
  if (!p) throw new Error(`no library phase ${mineral}`);
  const hazard = p.hazards.find((h): h is "asbestos" | "crystalline_silica" => h === "asbestos" || h === "crystalline_silica") ?? null;
  const [row] = await db
    .insert(referencePhases)
    .values({
      mineral: p.mineral,
      formula: p.formula,
      mineralGroup: p.group,
      crystalSystem: p.crystalSystem,
      spaceGroup: p.spaceGroup ?? "unknown",
      cellA: p.cell.a,
      cellB: p.cell.b,
      cellC: p.cell.c,
      cellAlpha: p.cell.alpha,
      cellBeta: p.cell.beta,
      cellGamma: p.cell.gamma,
      elements: p.elements.join(","),
      hazard,
      citation: p.citation || p.source,
      cifText: "",
      patternJson: [],
      rir: p.rir,
      builtin: true,
    })
    .returning({ id: referencePhases.id });
  refIds.set(mineral, row.id);
  return row.id;
}

export interface FixturePhase {
  mineral: string;
  status: "candidate" | "accepted" | "rejected";
  rank?: number | null;
  wt?: number | null;
}

/** Adds a scan of `sampleId` with one done run carrying `phases`; signed off when asked. Returns the scan id. */
export async function addScan(
  projectId: string,
  sampleId: string,
  opts: { signedOff: boolean; phases: FixturePhase[]; anode?: "Cu" | "Co"; params?: Record<string, unknown>; name?: string },
): Promise<string> {
  const db = getDb();
  const [scan] = await db
    .insert(scans)
    .values({
      projectId,
      sampleId,
      fileKey: `fixtures/${sampleId}.xy`,
      originalName: opts.name ?? `${sampleId.slice(0, 8)}.xy`,
      sha256: "0".repeat(64),
      format: "xy",
      anode: opts.anode ?? "Cu",
      wavelengthA: opts.anode === "Co" ? 1.78901 : 1.540593,
      twoThetaStart: 5,
      twoThetaEnd: 70,
      stepDeg: 0.02,
      pointCount: 3251,
      status: opts.signedOff ? "signed_off" : "processed",
      signedOffAt: opts.signedOff ? new Date("2026-04-02T10:00:00Z") : null,
    })
    .returning({ id: scans.id });
  const [run] = await db
    .insert(processingRuns)
    .values({ scanId: scan.id, paramsJson: opts.params ?? { smoothing: { method: "savitzky-golay", window: 11, order: 2 }, background: { method: "snip", iterations: 24 } }, softwareVersion: "test", status: "done" })
    .returning({ id: processingRuns.id });
  await db.update(scans).set({ currentRunId: run.id }).where(eq(scans.id, scan.id));
  for (const p of opts.phases) {
    await db.insert(phaseResults).values({
      runId: run.id,
      scanId: scan.id,
      referencePhaseId: await referencePhaseId(p.mineral),
      rank: p.rank ?? null,
      score: p.rank ? 1 / p.rank : null,
      wtPercent: p.wt ?? null,
      status: p.status,
      source: p.rank ? "auto" : "manual",
    });
  }
  return scan.id;
}
