import "server-only";
import { and, asc, desc, eq, inArray } from "drizzle-orm";
import { getDb } from "@/db";
import { phaseResults, processingRuns, referencePhases, scans, user } from "@/db/schema";
import {
  advanceSampleStatus,
  fitOptionsOf,
  insertRunResults,
  loadReferenceLibrary,
  phaseRowsOf,
  PIPELINE_VERSION,
  runProfileOf,
  unexplainedOf,
  type PhaseRowInsert,
  type RunParams,
  type RunProfile,
  type SearchRow,
  type StoredMatch,
} from "@/lib/jobs";
import { analyseInWorker } from "@/lib/jobs/analyse-in-worker";
import { getStorage, StorageError } from "@/lib/storage";
import { manualPhaseSchema, phaseDecisionSchema, refitSchema, scanNoteSchema, signOffSchema } from "@/lib/validation/scan";
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

/** What a refit returns: the new current run and its fit. */
export interface RefitResult {
  runId: string;
  fromRunId: string;
  stats: { rwp: number; rexp: number; gof: number; points: number; parameters: number };
  noConfidentMatch: boolean;
  phases: { referencePhaseId: string; mineral: string; wtPercent: number | null; wtSigma: number | null }[];
  /** Phases whose acceptance was withdrawn because they left the fit. */
  withdrawn: string[];
  /** Server time of the refit (read, process, fit, store), ms. */
  elapsedMs: number;
}

type ParentRow = typeof phaseResults.$inferSelect;

/**
 * The analyst's decision carried from the refitted run to the new one. A change of fit membership resets it: a phase
 * removed from the fit is no longer accepted, and a rejected phase the analyst puts into the fit is undecided again.
 * Phases added by hand keep their decision.
 */
function carriedDecision(parent: ParentRow | undefined, fitted: boolean): Pick<PhaseRowInsert, "status" | "decidedBy" | "decidedAt" | "note" | "source"> {
  if (!parent || parent.status === "candidate") return { status: "candidate", decidedBy: null, decidedAt: null, note: parent?.note ?? null, source: parent?.source ?? "auto" };
  const keep = { status: parent.status, decidedBy: parent.decidedBy, decidedAt: parent.decidedAt, note: parent.note, source: parent.source };
  if (parent.source === "manual") return keep;
  if (parent.status === "accepted" && parent.fitted && !fitted) return { status: "candidate", decidedBy: null, decidedAt: null, note: parent.note, source: parent.source };
  if (parent.status === "rejected" && !parent.fitted && fitted) return { status: "candidate", decidedBy: null, decidedAt: null, note: parent.note, source: parent.source };
  return keep;
}

/**
 * Refits the whole pattern of the scan's current run with exactly the analyst's phases (1–10 reference phases):
 * re-processes the stored file with the run's parameters, fits, and stores the result as a new run that becomes
 * current (earlier runs are kept). The search's ranked list, added phases and decisions carry over (see
 * carriedDecision). Lab analysts only; audited. The fitted phases stay candidates until sign-off.
 */
export async function refitScan(actor: Actor, projectId: string, scanId: string, raw: unknown): Promise<RefitResult> {
  await authorize(actor, projectId, "phase.review");
  const input = validateInput(refitSchema, raw);
  const started = performance.now();
  const db = getDb();
  const { scan, runId } = await reviewableScan(db, projectId, scanId);
  const library = await loadReferenceLibrary();
  const known = new Set(library.map((p) => p.id));
  const unknown = input.phaseIds.map((id, i) => ({ id, i })).filter((x) => !known.has(x.id));
  if (unknown.length) {
    throw invalid(
      `Not in the reference library: ${unknown.map((u) => u.id).join(", ")}.`,
      Object.fromEntries(unknown.map((u) => [`phaseIds.${u.i}`, ["No such phase in the reference library."]])),
    );
  }
  const [run] = await db.select({ params: processingRuns.paramsJson, profile: processingRuns.profileJson }).from(processingRuns).where(eq(processingRuns.id, runId));
  const params = (run?.params ?? {}) as unknown as RunParams;
  const requested = params.requested ?? {};
  let text: string;
  try {
    text = new TextDecoder("utf-8").decode(await getStorage().get(scan.fileKey));
  } catch (err) {
    if (err instanceof StorageError && err.code === "not_found") throw notFound("The stored file is missing.");
    throw err;
  }
  const options = fitOptionsOf(requested, input.phaseIds);
  const { processed, fit } = await analyseInWorker({ text, requested, scanRow: scan, library: [...library], fitOptions: options, search: false }, scan.originalName);
  const parentProfile = (run?.profile ?? null) as RunProfile | null;
  const profile = runProfileOf(processed, fit, { mixture: parentProfile?.mixture ?? [], broadFeatures: parentProfile?.broadFeatures ?? [] }, "analyst");
  const byId = new Map(library.map((p) => [p.id, p]));

  const result = await db.transaction(async (tx) => {
    // The scan may have changed while fitting (another refit, a new run, a sign-off).
    const [now] = await tx.select({ status: scans.status, currentRunId: scans.currentRunId }).from(scans).where(eq(scans.id, scanId));
    if (!now || now.status === "signed_off") throw conflict(SIGNED);
    if (now.currentRunId !== runId) throw conflict("The scan's current run changed while refitting; reload and try again.");
    const parentRows = await tx.select().from(phaseResults).where(eq(phaseResults.runId, runId));
    const parentBy = new Map(parentRows.map((r) => [r.referencePhaseId, r]));
    const search: SearchRow[] = parentRows
      .filter((r) => r.rank != null)
      .sort((a, b) => a.rank! - b.rank!)
      .map((r) => ({ referencePhaseId: r.referencePhaseId, rank: r.rank!, score: r.score ?? 0, confident: r.confident, matchedJson: (r.matchedJson ?? []) as StoredMatch[] }));
    const computed = phaseRowsOf(fit, search);
    const rows: PhaseRowInsert[] = computed.map((r) => ({ ...r, ...carriedDecision(parentBy.get(r.referencePhaseId), r.fitted) }));
    const inRows = new Set(rows.map((r) => r.referencePhaseId));
    for (const m of parentRows.filter((r) => r.source === "manual" && !inRows.has(r.referencePhaseId))) {
      rows.push({ referencePhaseId: m.referencePhaseId, rank: null, score: null, confident: false, wtPercent: null, wtSigma: null, fitted: false, fitJson: null, matchedJson: null, source: "manual", status: m.status, decidedBy: m.decidedBy, decidedAt: m.decidedAt, note: m.note });
    }
    const withdrawn = rows.filter((r) => r.status === "candidate" && parentBy.get(r.referencePhaseId)?.status === "accepted").map((r) => byId.get(r.referencePhaseId)?.mineral ?? r.referencePhaseId);
    const elapsed = Math.round(performance.now() - started);
    const [created] = await tx
      .insert(processingRuns)
      .values({
        scanId,
        paramsJson: {
          requested,
          refit: { fromRunId: runId, phaseIds: input.phaseIds },
          resolved: { processing: processed.params, ...(params.resolved?.identify ? { identify: params.resolved.identify } : {}), wholePattern: options },
        } satisfies RunParams as unknown as Record<string, unknown>,
        softwareVersion: PIPELINE_VERSION,
        status: "done",
        profileJson: profile as unknown as Record<string, unknown>,
        unexplainedJson: unexplainedOf(fit),
        durationMs: elapsed,
        createdBy: actor.userId,
      })
      .returning({ id: processingRuns.id });
    await insertRunResults(tx, created.id, scanId, processed.peaks, rows);
    await tx.update(scans).set({ currentRunId: created.id, status: "processed", error: null }).where(eq(scans.id, scanId));
    const minerals = (ids: string[]) => ids.map((id) => byId.get(id)?.mineral ?? id);
    await audit(tx, actor, {
      projectId,
      action: "refit",
      entity: "scan",
      entityId: scanId,
      before: { currentRunId: runId, phases: minerals(parentRows.filter((r) => r.fitted).map((r) => r.referencePhaseId)), rwp: parentProfile?.fit?.stats.rwp ?? null, gof: parentProfile?.fit?.stats.gof ?? null },
      after: { currentRunId: created.id, phases: minerals(input.phaseIds), rwp: fit.stats.rwp, gof: fit.stats.gof, withdrawn },
    });
    return { runId: created.id, withdrawn };
  });
  return {
    runId: result.runId,
    fromRunId: runId,
    stats: fit.stats,
    noConfidentMatch: fit.noConfidentMatch,
    phases: fit.phases.map((p) => ({ referencePhaseId: p.referenceId, mineral: p.mineral, wtPercent: p.wtPercent, wtSigma: p.wtSigma })),
    withdrawn: result.withdrawn,
    elapsedMs: Math.round(performance.now() - started),
  };
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

/** What a sign-off records (scans.sign_off_json and the audit entry): the run, its fit statistics and the phases. */
export interface SignOffRecord {
  runId: string;
  /** The whole-pattern fit the confirmed phases rest on (null for runs made before the fit existed). */
  fit: {
    rwp: number;
    rexp: number;
    gof: number;
    points: number;
    parameters: number;
    quantification: string;
    semiQuantitative: boolean;
    chosenBy: "fit" | "analyst";
    noConfidentMatch: boolean;
  } | null;
  phases: { phaseResultId: string; referencePhaseId: string; mineral: string; wtPercent: number | null; wtSigma: number | null; fitted: boolean; source: "auto" | "manual" }[];
}

/**
 * Signs off the scan: the accepted phases of the current run become the sample's confirmed phases (candidates
 * left undecided stay unconfirmed), the fit statistics are recorded with them (SignOffRecord), the scan is locked
 * and the sample moves to "confirmed". Notifies the leads
 * afterwards (a mail failure does not undo the sign-off).
 */
export async function signOffScan(actor: Actor, projectId: string, scanId: string, raw: unknown): Promise<{ scanId: string; confirmed: string[]; notification: SignOffOutcome | null }> {
  await authorize(actor, projectId, "phase.review");
  const input = validateInput(signOffSchema, raw);
  const db = getDb();
  const result = await db.transaction(async (tx) => {
    const { scan, runId } = await reviewableScan(tx, projectId, scanId);
    const accepted = await tx
      .select({
        id: phaseResults.id,
        referencePhaseId: phaseResults.referencePhaseId,
        mineral: referencePhases.mineral,
        wtPercent: phaseResults.wtPercent,
        wtSigma: phaseResults.wtSigma,
        fitted: phaseResults.fitted,
        source: phaseResults.source,
      })
      .from(phaseResults)
      .innerJoin(referencePhases, eq(referencePhases.id, phaseResults.referencePhaseId))
      .where(and(eq(phaseResults.runId, runId), eq(phaseResults.status, "accepted")));
    if (accepted.length === 0) throw invalid("Accept at least one phase (or add one from the library) before signing off.", { phases: ["No accepted phase."] });
    const now = new Date();
    const note = input.note ?? scan.analystNote;
    const [run] = await tx.select({ profile: processingRuns.profileJson }).from(processingRuns).where(eq(processingRuns.id, runId));
    const fit = ((run?.profile ?? null) as RunProfile | null)?.fit;
    const record: SignOffRecord = {
      runId,
      fit: fit
        ? { ...fit.stats, quantification: fit.quantification.method, semiQuantitative: fit.quantification.semiQuantitative, chosenBy: fit.chosenBy, noConfidentMatch: fit.noConfidentMatch }
        : null,
      phases: accepted.map((a) => ({ phaseResultId: a.id, referencePhaseId: a.referencePhaseId, mineral: a.mineral, wtPercent: a.wtPercent, wtSigma: a.wtSigma, fitted: a.fitted, source: a.source })),
    };
    const [row] = await tx
      .update(scans)
      .set({ status: "signed_off", signedOffBy: actor.userId, signedOffAt: now, analystNote: note ?? null, signOffJson: record as unknown as Record<string, unknown> })
      .where(and(eq(scans.id, scanId), eq(scans.status, scan.status)))
      .returning();
    if (!row) throw conflict("The scan changed while signing off; reload and try again.");
    await audit(tx, actor, {
      projectId,
      action: "sign_off",
      entity: "scan",
      entityId: scanId,
      before: { status: scan.status },
      after: { status: "signed_off", runId, fit: record.fit, confirmed: record.phases, note },
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
 * (accepted-but-not-signed-off, the phases of the whole-pattern fit, or — when the fit kept none — the search's
 * leading candidate, for each scan still under review), with the scans.
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
          fitted: phaseResults.fitted,
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
  const unconfirmed: (SamplePhase & { kind: "accepted" | "fitted" | "leading"; score: number | null; confident: boolean })[] = [];
  for (const s of scanRows) {
    const list = rows.filter((r) => r.runId === s.currentRunId);
    if (s.status === "signed_off") {
      confirmed.push(...list.filter((r) => r.status === "accepted").map(toPhase));
      continue;
    }
    for (const r of list.filter((x) => x.status === "accepted")) unconfirmed.push({ ...toPhase(r), kind: "accepted", score: r.score, confident: r.confident });
    // The whole-pattern fit's phases; runs without a fit (or with nothing fitted) show the search's leading candidate.
    const fitted = list.filter((r) => r.status === "candidate" && r.fitted).sort((a, b) => (b.wtPercent ?? -1) - (a.wtPercent ?? -1));
    for (const r of fitted) unconfirmed.push({ ...toPhase(r), kind: "fitted", score: r.score, confident: r.confident });
    const lead = fitted.length === 0 && !list.some((r) => r.fitted) ? list.find((r) => r.status === "candidate" && r.rank != null) : undefined;
    if (lead) unconfirmed.push({ ...toPhase(lead), kind: "leading", score: lead.score, confident: lead.confident });
  }
  return {
    confirmed,
    unconfirmed,
    scans: scanRows.map((s) => ({ id: s.id, originalName: s.originalName, status: s.status, runStatus: s.runStatus, signedOffAt: s.signedOffAt, signedOffByName: s.signedOffByName, createdAt: s.createdAt })),
  };
}
