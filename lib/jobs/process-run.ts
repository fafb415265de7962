import { and, eq, ne } from "drizzle-orm";
import { getDb, type Db } from "@/db";
import { peaks as peaksTable, phaseResults, processingRuns, scans } from "@/db/schema";
import { getStorage } from "@/lib/storage";
import type { Peak } from "@/lib/science/types";
import {
  fitOptionsOf,
  phaseRowsOf,
  runProfileOf,
  searchRows,
  unexplainedOf,
  type ComputedPhaseRow,
  type RunParams,
} from "./analyse-scan";
import { analyseInWorker } from "./analyse-in-worker";
import { loadReferenceLibrary } from "./reference-library";
import { advanceSampleStatus } from "./sample-status";

export {
  expandSparse,
  identifyProcessed,
  processScanText,
  type RunFit,
  type RunParams,
  type RunProfile,
  type SparseCurve,
  type StoredFit,
  type StoredMatch,
  type StoredUnexplained,
} from "./analyse-scan";

/** Version of the processing pipeline recorded with every run. */
export const PIPELINE_VERSION =
  "lithodex-xrd 0.2 (SG smoothing, SNIP, Rachinger, pseudo-Voigt peak fit, strong-line search–match for the ranked list; whole-pattern fit: NNLS selection by BIC, Levenberg–Marquardt refinement, Hill & Howard wt%)";

/** Stages of a run, in order; the queue reports the current one as progress. */
export const RUN_STAGES = ["reading", "processing", "identifying", "fitting", "saving"] as const;
export type RunStage = (typeof RUN_STAGES)[number];

/** Hands the event loop back so requests are served between the CPU-heavy stages. */
export const yieldToEventLoop = () => new Promise<void>((resolve) => setImmediate(resolve));

export function peakRow(runId: string, p: Peak) {
  return {
    runId,
    twoTheta: p.twoTheta,
    d: p.d,
    height: p.height,
    area: Number.isFinite(p.area) ? p.area : null,
    fwhm: Number.isFinite(p.fwhm) ? p.fwhm : null,
    fwhmEsd: p.fwhmEsd ?? null,
    relIntensity: p.intensity,
    crystalliteNm: p.crystalliteNm ?? null,
  };
}

type Tx = Parameters<Parameters<Db["transaction"]>[0]>[0];

/** A phase row to insert for a run: the computed fields plus source and the analyst's decision. */
export type PhaseRowInsert = ComputedPhaseRow & Pick<typeof phaseResults.$inferInsert, "source" | "status" | "decidedBy" | "decidedAt" | "note">;

/** Inserts a run's peaks and phase rows (chunked: SQLite limits bound variables per statement). */
export async function insertRunResults(tx: Tx, runId: string, scanId: string, peaks: readonly Peak[], rows: readonly PhaseRowInsert[]): Promise<void> {
  for (let i = 0; i < peaks.length; i += 80) await tx.insert(peaksTable).values(peaks.slice(i, i + 80).map((p) => peakRow(runId, p)));
  for (let i = 0; i < rows.length; i += 40) {
    await tx.insert(phaseResults).values(
      rows.slice(i, i + 40).map((r) => ({
        ...r,
        runId,
        scanId,
        fitJson: r.fitJson as unknown as Record<string, unknown> | null,
      })),
    );
  }
}

function failureMessage(err: unknown): string {
  if (err instanceof RangeError || err instanceof TypeError || (err instanceof Error && err.name === "ScanParseError")) return err.message;
  if (err instanceof Error && err.name === "StorageError") return `The stored scan file could not be read (${err.message}).`;
  return "Processing failed on the server; see the server log.";
}

/**
 * Executes a claimed (status "running") run: reads the stored file, processes it, ranks candidates by the
 * peak-list search, fits the whole pattern against the reference library (the deciding step: its phases are the
 * run's fitted phases, with wt% ± σ and evidence), and stores peaks, phases and curves. The run ends "done" or "failed" (never throws for
 * bad data). Yields to the event loop between stages.
 * @param onStage - called as each stage starts (progress for the client)
 */
export async function executeRun(runId: string, onStage: (stage: RunStage) => void = () => {}): Promise<"done" | "failed"> {
  const db = getDb();
  const started = performance.now();
  const [row] = await db
    .select({ run: processingRuns, scan: scans })
    .from(processingRuns)
    .innerJoin(scans, eq(scans.id, processingRuns.scanId))
    .where(eq(processingRuns.id, runId));
  if (!row) return "failed";
  const { run, scan } = row;
  const requested = ((run.paramsJson ?? {}) as unknown as RunParams).requested ?? {};
  try {
    if (scan.currentRunId === runId && scan.status !== "signed_off") {
      await db.update(scans).set({ status: "processing" }).where(and(eq(scans.id, scan.id), ne(scans.status, "signed_off")));
    }
    onStage("reading");
    const bytes = await getStorage().get(scan.fileKey);
    const text = new TextDecoder("utf-8").decode(bytes);
    const library = await loadReferenceLibrary();
    await yieldToEventLoop();
    onStage("processing");
    // Parse, process, search and fit in a worker thread with a time and memory limit: the server keeps answering.
    const fitOptions = fitOptionsOf(requested);
    const { processed, identification: searched, fit } = await analyseInWorker(
      { text, requested, scanRow: scan, library: [...library], fitOptions, search: true },
      scan.originalName,
    );
    const identification = searched!;
    onStage("saving");
    const profile = runProfileOf(processed, fit, identification, "fit");
    const rows = phaseRowsOf(fit, searchRows(identification, library));
    const resolvedParams: RunParams = { requested, resolved: { processing: processed.params, identify: identification.params, wholePattern: fitOptions } };
    const durationMs = Math.round(performance.now() - started);
    await db.transaction(async (tx) => {
      await insertRunResults(tx, runId, scan.id, processed.peaks, rows.map((r) => ({ ...r, source: "auto" as const, status: "candidate" as const })));
      await tx
        .update(processingRuns)
        .set({
          status: "done",
          error: null,
          paramsJson: resolvedParams as unknown as Record<string, unknown>,
          profileJson: profile as unknown as Record<string, unknown>,
          unexplainedJson: unexplainedOf(fit),
          durationMs,
        })
        .where(eq(processingRuns.id, runId));
      const [cur] = await tx.select({ currentRunId: scans.currentRunId, status: scans.status }).from(scans).where(eq(scans.id, scan.id));
      if (cur && cur.currentRunId === runId && cur.status !== "signed_off") {
        await tx.update(scans).set({ status: "processed", error: null }).where(and(eq(scans.id, scan.id), ne(scans.status, "signed_off")));
        await advanceSampleStatus(tx, scan.sampleId, "processed", null);
      }
    });
    return "done";
  } catch (err) {
    if (!(err instanceof RangeError || err instanceof TypeError || (err instanceof Error && ["ScanParseError", "StorageError"].includes(err.name)))) console.error(err);
    const message = failureMessage(err);
    await db.transaction(async (tx) => {
      await tx
        .update(processingRuns)
        .set({ status: "failed", error: message, durationMs: Math.round(performance.now() - started) })
        .where(eq(processingRuns.id, runId));
      await tx
        .update(scans)
        .set({ status: "failed", error: message })
        .where(and(eq(scans.id, scan.id), eq(scans.currentRunId, runId), ne(scans.status, "signed_off")));
    });
    return "failed";
  }
}
