import "server-only";
import { and, asc, desc, eq, inArray } from "drizzle-orm";
import { getDb } from "@/db";
import { phaseResults, processingRuns, referencePhases, scans, user } from "@/db/schema";
import { advanceSampleStatus } from "@/lib/jobs";
import { manualPhaseSchema, phaseDecisionSchema, scanNoteSchema, signOffSchema } from "@/lib/validation/scan";
import { authorize, type Actor } from "./actor";
import { audit, type DbOrTx } from "./audit";
import { conflict, invalid, notFound } from "./errors";
import { notifySignOff, type SignOffOutcome } from "./notifications";
import { otherHazardsOf } from "./reference-phases";
import { validateInput } from "./validate";

const SIGNED = "This scan is signed off; its results can no longer be changed.";

/** The scan (in the project) with its current run, refusing signed-off scans and runs that have not finished. */
async function reviewableScan(tx: DbOrTx, projectId: string, scanId: string) {
  const [scan] = await tx.select().from(scans).where(and(eq(scans.id, scanId), eq(scans.projectId, projectId)));
  if (!scan) throw notFound("Scan not found.");
  if (scan.status === "signed_off") throw conflict(SIGNED);
  if (!scan.currentRunId) throw conflict("This scan has not been processed yet.");
  const [run] = await tx.select({ id: processingRuns.id, status: processingRuns.status }).from(processingRuns).where(eq(processingRuns.id, scan.currentRunId));
  if (!run || run.status !== "done") throw conflict("The current run has not finished; wait for processing to complete.");
  return { scan, runId: run.id };
}

/**
 * Accepts or rejects a candidate of the scan's current run (or puts it back to candidate). Lab analysts only;
 * audited. A decision is not a confirmation: phases become confirmed when the scan is signed off.
 */
export async function decidePhase(actor: Actor, projectId: string, scanId: string, phaseResultId: string, raw: unknown) {
  await authorize(actor, projectId, "phase.review");
  const input = validateInput(phaseDecisionSchema, raw);
  const db = getDb();
  return db.transaction(async (tx) => {
    const { runId } = await reviewableScan(tx, projectId, scanId);
    const [before] = await tx.select().from(phaseResults).where(and(eq(phaseResults.id, phaseResultId), eq(phaseResults.scanId, scanId)));
    if (!before) throw notFound("Phase not found on this scan.");
    if (before.runId !== runId) throw conflict("This phase belongs to an earlier run; make that run current first.");
    const decided = input.status !== "candidate";
    const [row] = await tx
      .update(phaseResults)
      .set({
        status: input.status,
        decidedBy: decided ? actor.userId : null,
        decidedAt: decided ? new Date() : null,
        ...(input.note !== undefined && { note: input.note }),
      })
      .where(eq(phaseResults.id, phaseResultId))
      .returning();
    await audit(tx, actor, { projectId, action: `phase.${input.status}`, entity: "phase_result", entityId: phaseResultId, before: { status: before.status, note: before.note }, after: { status: row.status, note: row.note, scanId } });
    return row;
  });
}

/** Adds a phase from the reference library that the search did not propose; it is accepted by the analyst who adds it. */
export async function addManualPhase(actor: Actor, projectId: string, scanId: string, raw: unknown) {
  await authorize(actor, projectId, "phase.review");
  const input = validateInput(manualPhaseSchema, raw);
  const db = getDb();
  return db.transaction(async (tx) => {
    const { runId } = await reviewableScan(tx, projectId, scanId);
    const [ref] = await tx.select({ id: referencePhases.id, mineral: referencePhases.mineral }).from(referencePhases).where(eq(referencePhases.id, input.referencePhaseId));
    if (!ref) throw invalid("Unknown reference phase.", { referencePhaseId: ["No such phase in the reference library."] });
    const [existing] = await tx
      .select({ id: phaseResults.id, status: phaseResults.status })
      .from(phaseResults)
      .where(and(eq(phaseResults.runId, runId), eq(phaseResults.referencePhaseId, ref.id)));
    if (existing) throw conflict(`${ref.mineral} is already listed for this run (${existing.status}); change its status there.`, { phaseResultId: existing.id });
    const [row] = await tx
      .insert(phaseResults)
      .values({ runId, scanId, referencePhaseId: ref.id, source: "manual", status: "accepted", decidedBy: actor.userId, decidedAt: new Date(), note: input.note ?? null })
      .returning();
    await audit(tx, actor, { projectId, action: "phase.manual", entity: "phase_result", entityId: row.id, after: { scanId, mineral: ref.mineral, note: row.note } });
    return row;
  });
}

/** Sets the analyst's note on a scan (audited). Allowed until sign-off. */
export async function updateScanNote(actor: Actor, projectId: string, scanId: string, raw: unknown) {
  await authorize(actor, projectId, "phase.review");
  const { note } = validateInput(scanNoteSchema, raw);
  const db = getDb();
  return db.transaction(async (tx) => {
    const [scan] = await tx.select().from(scans).where(and(eq(scans.id, scanId), eq(scans.projectId, projectId)));
    if (!scan) throw notFound("Scan not found.");
    if (scan.status === "signed_off") throw conflict(SIGNED);
    const [row] = await tx.update(scans).set({ analystNote: note ?? null }).where(eq(scans.id, scanId)).returning();
    await audit(tx, actor, { projectId, action: "note", entity: "scan", entityId: scanId, before: { analystNote: scan.analystNote }, after: { analystNote: row.analystNote } });
    return { id: row.id, analystNote: row.analystNote };
  });
}

/**
 * Signs off the scan: the accepted phases of the current run become the sample's confirmed phases (candidates
 * left undecided stay unconfirmed), the scan is locked and the sample moves to "confirmed". Notifies the leads
 * afterwards (a mail failure does not undo the sign-off).
 */
export async function signOffScan(actor: Actor, projectId: string, scanId: string, raw: unknown): Promise<{ scanId: string; confirmed: string[]; notification: SignOffOutcome | null }> {
  await authorize(actor, projectId, "phase.review");
  const input = validateInput(signOffSchema, raw);
  const db = getDb();
  const result = await db.transaction(async (tx) => {
    const { scan, runId } = await reviewableScan(tx, projectId, scanId);
    const accepted = await tx
      .select({ id: phaseResults.id, mineral: referencePhases.mineral, wtPercent: phaseResults.wtPercent, source: phaseResults.source })
      .from(phaseResults)
      .innerJoin(referencePhases, eq(referencePhases.id, phaseResults.referencePhaseId))
      .where(and(eq(phaseResults.runId, runId), eq(phaseResults.status, "accepted")));
    if (accepted.length === 0) throw invalid("Accept at least one phase (or add one from the library) before signing off.", { phases: ["No accepted phase."] });
    const now = new Date();
    const note = input.note ?? scan.analystNote;
    const [row] = await tx
      .update(scans)
      .set({ status: "signed_off", signedOffBy: actor.userId, signedOffAt: now, analystNote: note ?? null })
      .where(and(eq(scans.id, scanId), eq(scans.status, scan.status)))
      .returning();
    if (!row) throw conflict("The scan changed while signing off; reload and try again.");
    await audit(tx, actor, {
      projectId,
      action: "sign_off",
      entity: "scan",
      entityId: scanId,
      before: { status: scan.status },
      after: { status: "signed_off", runId, confirmed: accepted.map((a) => ({ phaseResultId: a.id, mineral: a.mineral, wtPercent: a.wtPercent, source: a.source })), note },
    });
    await advanceSampleStatus(tx, scan.sampleId, "confirmed", actor.userId);
    return { sampleId: scan.sampleId, confirmed: accepted.map((a) => a.mineral) };
  });
  let notification: SignOffOutcome | null = null;
  try {
    notification = await notifySignOff({ projectId, scanId, sampleId: result.sampleId, signedOffBy: actor.userId });
  } catch (err) {
    console.error("sign-off notification failed:", err);
  }
  return { scanId, confirmed: result.confirmed, notification };
}

/** A phase as the sample page shows it. */
export interface SamplePhase {
  mineral: string;
  formula: string;
  hazard: "asbestos" | "crystalline_silica" | null;
  otherHazards: string[];
  wtPercent: number | null;
  scanId: string;
  scanName: string;
}

/**
 * Phases of a sample: confirmed ones (accepted on a signed-off scan's current run) apart from unconfirmed ones
 * (accepted-but-not-signed-off and the leading candidate of each scan still under review), with the scans.
 */
export async function getSamplePhases(actor: Actor, projectId: string, sampleId: string) {
  await authorize(actor, projectId, "project.read");
  const db = getDb();
  const scanRows = await db
    .select({
      id: scans.id,
      originalName: scans.originalName,
      status: scans.status,
      currentRunId: scans.currentRunId,
      signedOffAt: scans.signedOffAt,
      signedOffByName: user.name,
      createdAt: scans.createdAt,
      runStatus: processingRuns.status,
    })
    .from(scans)
    .leftJoin(user, eq(user.id, scans.signedOffBy))
    .leftJoin(processingRuns, eq(processingRuns.id, scans.currentRunId))
    .where(and(eq(scans.projectId, projectId), eq(scans.sampleId, sampleId)))
    .orderBy(desc(scans.createdAt));
  const runIds = scanRows.map((s) => s.currentRunId).filter((x): x is string => !!x);
  const rows = runIds.length
    ? await db
        .select({
          runId: phaseResults.runId,
          scanId: phaseResults.scanId,
          rank: phaseResults.rank,
          status: phaseResults.status,
          confident: phaseResults.confident,
          score: phaseResults.score,
          wtPercent: phaseResults.wtPercent,
          mineral: referencePhases.mineral,
          formula: referencePhases.formula,
          hazard: referencePhases.hazard,
          builtin: referencePhases.builtin,
        })
        .from(phaseResults)
        .innerJoin(referencePhases, eq(referencePhases.id, phaseResults.referencePhaseId))
        .where(inArray(phaseResults.runId, runIds))
        .orderBy(asc(phaseResults.rank))
    : [];
  const byScan = new Map(scanRows.map((s) => [s.id, s]));
  const toPhase = (r: (typeof rows)[number]): SamplePhase => ({
    mineral: r.mineral,
    formula: r.formula,
    hazard: r.hazard,
    otherHazards: r.builtin ? otherHazardsOf(r.mineral) : [],
    wtPercent: r.wtPercent,
    scanId: r.scanId,
    scanName: byScan.get(r.scanId)?.originalName ?? "",
  });
  const confirmed: SamplePhase[] = [];
  const unconfirmed: (SamplePhase & { kind: "accepted" | "leading"; score: number | null; confident: boolean })[] = [];
  for (const s of scanRows) {
    const list = rows.filter((r) => r.runId === s.currentRunId);
    if (s.status === "signed_off") {
      confirmed.push(...list.filter((r) => r.status === "accepted").map(toPhase));
      continue;
    }
    for (const r of list.filter((x) => x.status === "accepted")) unconfirmed.push({ ...toPhase(r), kind: "accepted", score: r.score, confident: r.confident });
    const lead = list.find((r) => r.status === "candidate" && r.rank != null);
    if (lead) unconfirmed.push({ ...toPhase(lead), kind: "leading", score: lead.score, confident: lead.confident });
  }
  return {
    confirmed,
    unconfirmed,
    scans: scanRows.map((s) => ({ id: s.id, originalName: s.originalName, status: s.status, runStatus: s.runStatus, signedOffAt: s.signedOffAt, signedOffByName: s.signedOffByName, createdAt: s.createdAt })),
  };
}
