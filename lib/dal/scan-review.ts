import "server-only";
import { and, asc, desc, eq, inArray, sql } from "drizzle-orm";
import { alias } from "drizzle-orm/sqlite-core";
import { getDb } from "@/db";
import { phaseResults, processingRuns, projects, referencePhases, samples, scanSignOffs, scans, submissionSamples, submissions, user } from "@/db/schema";
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
import { writeSampleEvent } from "@/lib/jobs/sample-status";
import { MAX_REFIT_PHASES, manualPhaseSchema, phaseDecisionSchema, refitSchema, reopenSchema, scanNoteSchema, signOffSchema } from "@/lib/validation/scan";
import { authorize, type Actor } from "./actor";
import { audit, type DbOrTx } from "./audit";
import { AppError, conflict, forbidden, invalid, notFound } from "./errors";
import { roleAllows } from "./permissions";
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
  phases: {
    phaseResultId: string;
    referencePhaseId: string;
    mineral: string;
    wtPercent: number | null;
    wtSigma: number | null;
    fitted: boolean;
    source: "auto" | "manual";
    /** Why the phase has no wt% (e.g. no structure model), when it has none. */
    wtNote?: string | null;
  }[];
  /** Version of this sign-off of the scan (1, 2, … after reopening); absent in records made before versions existed. */
  version?: number;
  /** The wt% of exactly the accepted phases were recomputed together by a whole-pattern fit before signing (issue 11 §5). */
  recomputed?: boolean;
}

/**
 * Signs off the scan: the accepted phases of the current run become the sample's confirmed phases (candidates
 * left undecided stay unconfirmed), the fit statistics are recorded with them (SignOffRecord), the scan is locked
 * and the sample moves to "confirmed". Notifies the leads
 * afterwards (a mail failure does not undo the sign-off).
 */
export async function signOffScan(actor: Actor, projectId: string, scanId: string, raw: unknown): Promise<{ scanId: string; confirmed: string[]; version: number; recomputed: boolean; notification: SignOffOutcome | null }> {
  await authorize(actor, projectId, "phase.review");
  const input = validateInput(signOffSchema, raw);
  const db = getDb();
  const recomputed = await recomputeAcceptedTogether(actor, projectId, scanId);
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
        fit: phaseResults.fitJson,
        hasStructure: referencePhases.fitJson,
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
      phases: accepted.map((a) => ({
        phaseResultId: a.id,
        referencePhaseId: a.referencePhaseId,
        mineral: a.mineral,
        wtPercent: a.wtPercent,
        wtSigma: a.wtSigma,
        fitted: a.fitted,
        source: a.source,
        wtNote: a.wtPercent != null ? null : whyNoWt(a, recomputed),
      })),
      version: 0,
      recomputed: recomputed.done,
    };
    const [{ last }] = await tx.select({ last: sql<number>`coalesce(max(${scanSignOffs.version}), 0)` }).from(scanSignOffs).where(eq(scanSignOffs.scanId, scanId));
    record.version = last + 1;
    const [row] = await tx
      .update(scans)
      .set({ status: "signed_off", signedOffBy: actor.userId, signedOffAt: now, analystNote: note ?? null, signOffJson: record as unknown as Record<string, unknown> })
      .where(and(eq(scans.id, scanId), eq(scans.status, scan.status)))
      .returning();
    if (!row) throw conflict("The scan changed while signing off; reload and try again.");
    // Every sign-off is kept as a version; reopening marks it, a new sign-off adds the next one.
    await tx.insert(scanSignOffs).values({ scanId, projectId, version: record.version!, runId, recordJson: record as unknown as Record<string, unknown>, note: note ?? null, signedBy: actor.userId, signedAt: now });
    await audit(tx, actor, {
      projectId,
      action: "sign_off",
      entity: "scan",
      entityId: scanId,
      before: { status: scan.status },
      after: { status: "signed_off", runId, version: record.version, recomputed: record.recomputed, fit: record.fit, confirmed: record.phases, note },
    });
    await advanceSampleStatus(tx, scan.sampleId, "confirmed", actor.userId, { scanId, note: `Sign-off version ${record.version}` });
    return { sampleId: scan.sampleId, confirmed: accepted.map((a) => a.mineral), version: record.version! };
  });
  let notification: SignOffOutcome | null = null;
  try {
    notification = await notifySignOff({ projectId, scanId, sampleId: result.sampleId, signedOffBy: actor.userId });
  } catch (err) {
    console.error("sign-off notification failed:", err);
  }
  return { scanId, confirmed: result.confirmed, version: result.version, recomputed: recomputed.done, notification };
}

/** What recomputing the accepted phases together did before a sign-off. */
interface Recompute {
  done: boolean;
  /** Why it was not done, when it was needed but could not be. */
  skipped?: string;
}

/**
 * "The wt% of the accepted phases are recomputed together" (issue 11 §5): when the accepted phases are not exactly the
 * phases the current run's whole-pattern fit quantified — the analyst rejected a fitted phase, accepted a ranked
 * candidate the fit left out, or added one by hand — the pattern is refitted with exactly the accepted phases
 * (refitScan: the whole-pattern fit with options.phaseIds), which makes a new current run whose accepted phases carry
 * wt% ± σ normalised over the accepted set only. Nothing to do when they already match.
 */
async function recomputeAcceptedTogether(actor: Actor, projectId: string, scanId: string): Promise<Recompute> {
  const db = getDb();
  const { runId } = await reviewableScan(db, projectId, scanId);
  const rows = await db
    .select({ referencePhaseId: phaseResults.referencePhaseId, status: phaseResults.status, fitted: phaseResults.fitted, wtPercent: phaseResults.wtPercent })
    .from(phaseResults)
    .where(eq(phaseResults.runId, runId));
  const accepted = rows.filter((r) => r.status === "accepted");
  if (accepted.length === 0) return { done: false };
  const quantified = rows.filter((r) => r.fitted && r.wtPercent != null);
  const same = quantified.length === accepted.length && accepted.every((a) => a.fitted && a.wtPercent != null);
  if (same) return { done: false };
  if (accepted.length > MAX_REFIT_PHASES) return { done: false, skipped: `more than ${MAX_REFIT_PHASES} accepted phases: not refitted together` };
  try {
    await refitScan(actor, projectId, scanId, { phaseIds: accepted.map((a) => a.referencePhaseId) });
    return { done: true };
  } catch (err) {
    // A scan whose stored file or run cannot be refitted is signed off with the wt% it has, saying why.
    if (err instanceof AppError && (err.code === "not_found" || err.code === "validation_failed")) return { done: false, skipped: err.message };
    throw err;
  }
}

/** Why an accepted phase has no wt% in a sign-off. */
function whyNoWt(a: { fitted: boolean; fit: unknown; hasStructure: unknown; source: "auto" | "manual" }, r: Recompute): string {
  const note = (a.fit as { wtNote?: string } | null)?.wtNote;
  if (note) return note;
  if (!a.hasStructure) return "no structure model for this phase (no calculated pattern to fit)";
  if (r.skipped) return `wt% not recomputed (${r.skipped})`;
  if (!a.fitted) return "the whole-pattern fit gave it no measurable share";
  return "the fit gave no wt% for this phase";
}

/**
 * Reopens a signed-off scan (issue 11 §5): a project lead, a site admin or the analyst who signed it, with a reason.
 * The sign-off stays in the history (its version is marked reopened, with who, when and why); the scan is under review
 * again and its phases stop counting as confirmed until the next sign-off, which becomes the next version. The sample
 * goes back to "candidates ready" unless another signed-off scan still confirms phases on it. Audited.
 */
export async function reopenScan(actor: Actor, projectId: string, scanId: string, raw: unknown) {
  const access = await authorize(actor, projectId, "project.read");
  const db = getDb();
  const [scan] = await db.select().from(scans).where(and(eq(scans.id, scanId), eq(scans.projectId, projectId)));
  if (!scan) throw notFound("Scan not found.");
  const mayReopen = actor.isAdmin || access.role === "lead" || (scan.signedOffBy === actor.userId && roleAllows(access.role, "phase.review"));
  if (!mayReopen) throw forbidden("Only a project lead or the analyst who signed off can reopen a sign-off.");
  const { reason } = validateInput(reopenSchema, raw);
  if (scan.status !== "signed_off") throw conflict("This scan is not signed off; there is nothing to reopen.");
  const [project] = await db.select({ archivedAt: projects.archivedAt }).from(projects).where(eq(projects.id, projectId));
  if (project?.archivedAt) throw conflict("This project is archived and read-only. A lead can unarchive it in the project settings.");
  return db.transaction(async (tx) => {
    const [latest] = await tx.select().from(scanSignOffs).where(eq(scanSignOffs.scanId, scanId)).orderBy(desc(scanSignOffs.version)).limit(1);
    const now = new Date();
    if (latest) await tx.update(scanSignOffs).set({ reopenedAt: now, reopenedBy: actor.userId, reopenReason: reason }).where(eq(scanSignOffs.id, latest.id));
    const [row] = await tx
      .update(scans)
      .set({ status: "processed", signedOffBy: null, signedOffAt: null, signOffJson: null })
      .where(and(eq(scans.id, scanId), eq(scans.status, "signed_off")))
      .returning({ id: scans.id });
    if (!row) throw conflict("The scan changed while reopening; reload and try again.");
    const [other] = await tx
      .select({ id: scans.id })
      .from(scans)
      .where(and(eq(scans.sampleId, scan.sampleId), eq(scans.status, "signed_off")))
      .limit(1);
    const [sample] = await tx.select({ status: samples.status }).from(samples).where(eq(samples.id, scan.sampleId));
    const back = !other && !!sample && (sample.status === "confirmed" || sample.status === "reported");
    await writeSampleEvent(tx, {
      sampleId: scan.sampleId,
      event: "reopened",
      actorId: actor.userId,
      actorName: actor.name,
      scanId,
      note: `Sign-off version ${latest?.version ?? 1} reopened: ${reason}`,
      policy: back ? "reset" : "keep",
      action: "status",
    });
    await audit(tx, actor, {
      projectId,
      action: "reopen",
      entity: "scan",
      entityId: scanId,
      before: { status: "signed_off", version: latest?.version ?? null, signedOffBy: scan.signedOffBy },
      after: { status: "processed", reason },
    });
    const reopenedSubmissions = await reopenReportedSubmissions(tx, actor, projectId, scan, reason);
    return { scanId, status: "processed" as const, reopenedVersion: latest?.version ?? null, reopenedSubmissions };
  });
}

/**
 * A submission reported on the strength of this scan's sign-off is no longer fully reported once the sign-off is
 * reopened: it goes back to "in progress" (the report already sent stays in the audit trail), and the next sign-off
 * of all its samples reports it again, with a new e-mail to the leads.
 */
async function reopenReportedSubmissions(tx: DbOrTx, actor: Actor, projectId: string, scan: { id: string; sampleId: string; createdAt: Date }, reason: string): Promise<string[]> {
  const reported = await tx
    .select({ id: submissions.id, code: submissions.code, sentAt: submissions.sentAt, reportedAt: submissions.reportedAt })
    .from(submissionSamples)
    .innerJoin(submissions, eq(submissions.id, submissionSamples.submissionId))
    .where(and(eq(submissionSamples.sampleId, scan.sampleId), eq(submissions.status, "reported")));
  // Only results made for that submission counted towards its report (scans made after it was sent).
  const affected = reported.filter((s) => (s.sentAt?.getTime() ?? 0) <= scan.createdAt.getTime());
  for (const sub of affected) {
    await tx.update(submissions).set({ status: "in_progress", reportedAt: null }).where(eq(submissions.id, sub.id));
    await audit(tx, actor, {
      projectId,
      action: "reopen",
      entity: "submission",
      entityId: sub.id,
      before: { status: "reported", reportedAt: sub.reportedAt?.toISOString() ?? null },
      after: { status: "in_progress", reason: `A sign-off of one of its scans was reopened: ${reason}` },
    });
  }
  return affected.map((s) => s.code);
}

/** The scan's sign-offs, newest first, with who signed, who reopened and why (any member). */
export async function listSignOffs(actor: Actor, projectId: string, scanId: string) {
  const access = await authorize(actor, projectId, "project.read");
  const db = getDb();
  const [scan] = await db.select({ id: scans.id, status: scans.status, signedOffBy: scans.signedOffBy }).from(scans).where(and(eq(scans.id, scanId), eq(scans.projectId, projectId)));
  if (!scan) throw notFound("Scan not found.");
  const signer = alias(user, "signer");
  const reopener = alias(user, "reopener");
  const rows = await db
    .select({
      id: scanSignOffs.id,
      version: scanSignOffs.version,
      runId: scanSignOffs.runId,
      record: scanSignOffs.recordJson,
      note: scanSignOffs.note,
      signedAt: scanSignOffs.signedAt,
      signedByName: signer.name,
      reopenedAt: scanSignOffs.reopenedAt,
      reopenedByName: reopener.name,
      reopenReason: scanSignOffs.reopenReason,
    })
    .from(scanSignOffs)
    .leftJoin(signer, eq(signer.id, scanSignOffs.signedBy))
    .leftJoin(reopener, eq(reopener.id, scanSignOffs.reopenedBy))
    .where(eq(scanSignOffs.scanId, scanId))
    .orderBy(desc(scanSignOffs.version));
  const canReopen = scan.status === "signed_off" && (actor.isAdmin || access.role === "lead" || (scan.signedOffBy === actor.userId && roleAllows(access.role, "phase.review")));
  return { items: rows.map((r) => ({ ...r, record: r.record as unknown as SignOffRecord, current: scan.status === "signed_off" && !r.reopenedAt })), canReopen };
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
