import { and, eq, ne } from "drizzle-orm";
import { getDb } from "@/db";
import { peaks as peaksTable, phaseResults, processingRuns, scans } from "@/db/schema";
import { getStorage } from "@/lib/storage";
import { identifyPhases, type IdentificationResult } from "@/lib/science/identify";
import { parseScan } from "@/lib/science/scan";
import { processScan, type ProcessParams, type ProcessedScan } from "@/lib/science/signal";
import type { Peak, ReferencePattern } from "@/lib/science/types";
import type { ProcessParamsInput } from "@/lib/validation/scan";
import { loadReferenceLibrary } from "./reference-library";
import { advanceSampleStatus } from "./sample-status";

/** Version of the processing pipeline recorded with every run. */
export const PIPELINE_VERSION = "lithodex-xrd 0.1 (SG smoothing, SNIP, Rachinger, pseudo-Voigt, strong-line search–match, RIR)";

/** Stages of a run, in order; the queue reports the current one as progress. */
export const RUN_STAGES = ["reading", "processing", "identifying", "saving"] as const;
export type RunStage = (typeof RUN_STAGES)[number];

/** What a run stores in processing_runs.params_json. */
export interface RunParams {
  requested: ProcessParamsInput;
  resolved?: { processing: ProcessedScan["params"]; identify: IdentificationResult["params"] };
}

/** A matched line as stored in phase_results.matched_json. */
export interface StoredMatch {
  twoTheta: number;
  d: number;
  dRef: number;
  intensity: number;
  intensityRef: number;
  hkl: [number, number, number] | null;
}

/** What a run stores in processing_runs.profile_json: the curves for the diffractogram and the identification summary. */
export interface RunProfile {
  wavelength: number;
  twoTheta: number[];
  raw: number[];
  background: number[];
  /** Background + Kα1-only processed signal. */
  processed: number[];
  /** Background + fitted peak model. */
  fitted: number[];
  warnings: string[];
  noConfidentMatch: boolean;
  quantification: string;
  /** Phases the search accepted into the mixture, with semi-quantitative wt% (RIR). */
  mixture: { referencePhaseId: string; mineral: string; wtPercent: number | null; rir: number | null; scale: number; zeroShift: number }[];
  broadFeatures: { twoTheta: number; d: number; fwhm: number }[];
}

const round = (x: number, digits: number) => {
  const f = 10 ** digits;
  return Math.round(x * f) / f;
};
const roundArray = (a: Float64Array, digits: number) => Array.from(a, (v) => round(v, digits));

/** Hands the event loop back so requests are served between the CPU-heavy stages. */
export const yieldToEventLoop = () => new Promise<void>((resolve) => setImmediate(resolve));

type ScanWavelength = Pick<typeof scans.$inferSelect, "anode" | "wavelengthA" | "wavelength2A">;

/**
 * Parses and processes scan text with a run's parameters. The wavelength is the scan's (from the file or the
 * upload form) unless the run overrides it; it is never silently assumed.
 */
export function processScanText(text: string, requested: ProcessParamsInput, scanRow: ScanWavelength) {
  const parsed = parseScan(text);
  const req = requested.processing ?? {};
  const override = req.anode !== undefined || req.wavelength !== undefined;
  const params: ProcessParams = {
    ...req,
    ...(override
      ? { anode: req.anode, wavelength: req.wavelength, wavelength2: req.wavelength2 }
      : { anode: scanRow.anode ?? undefined, wavelength: scanRow.wavelengthA, wavelength2: scanRow.wavelength2A ?? req.wavelength2 }),
    fallbackAnode: null,
  };
  return { parsed, processed: processScan(parsed, params) };
}

/** Search–match of processed peaks against the library over the measured range. */
export function identifyProcessed(processed: ProcessedScan, requested: ProcessParamsInput, library: readonly ReferencePattern[]): IdentificationResult {
  const n = processed.twoTheta.length;
  return identifyPhases(processed.peaks, library, {
    ...requested.identify,
    wavelength: processed.wavelength,
    twoThetaRange: [processed.twoTheta[0], processed.twoTheta[n - 1]],
  });
}

function storedMatches(c: IdentificationResult["candidates"][number], ref: ReferencePattern | undefined): StoredMatch[] {
  return c.matchedLines.map((m) => {
    const line = ref?.lines[m.refIndex];
    return {
      twoTheta: round(m.twoTheta, 4),
      d: round(m.d, 5),
      dRef: round(m.dRef, 5),
      intensity: round(m.intensity, 2),
      intensityRef: round(m.intensityRef, 2),
      hkl: line ? [line.h, line.k, line.l] : null,
    };
  });
}

function peakRow(runId: string, p: Peak) {
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

function failureMessage(err: unknown): string {
  if (err instanceof RangeError || err instanceof TypeError || (err instanceof Error && err.name === "ScanParseError")) return err.message;
  if (err instanceof Error && err.name === "StorageError") return `The stored scan file could not be read (${err.message}).`;
  return "Processing failed on the server; see the server log.";
}

/**
 * Executes a claimed (status "running") run: reads the stored file, processes and identifies it against the
 * reference library, and stores peaks, candidates and curves. The run ends "done" or "failed" (never throws for
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
    const { processed } = processScanText(text, requested, scan);
    onStage("identifying");
    await yieldToEventLoop();
    const identification = identifyProcessed(processed, requested, library);
    await yieldToEventLoop();
    onStage("saving");
    const byId = new Map(library.map((p) => [p.id, p]));
    const wt = new Map(identification.phases.map((p) => [p.referenceId, p]));
    const profile: RunProfile = {
      wavelength: processed.wavelength,
      twoTheta: roundArray(processed.twoTheta, 5),
      raw: roundArray(processed.raw, 2),
      background: roundArray(processed.background, 2),
      processed: roundArray(processed.stripped, 2),
      fitted: roundArray(processed.fitted, 2),
      warnings: processed.warnings,
      noConfidentMatch: identification.noConfidentMatch,
      quantification: identification.quantification,
      mixture: identification.phases.map((p) => ({
        referencePhaseId: p.referenceId,
        mineral: p.mineral,
        wtPercent: p.wtPercent === null ? null : round(p.wtPercent, 2),
        rir: p.rir,
        scale: p.scale,
        zeroShift: round(p.zeroShift, 4),
      })),
      broadFeatures: identification.broadFeatures.map((p) => ({ twoTheta: round(p.twoTheta, 4), d: round(p.d, 5), fwhm: round(p.fwhm, 4) })),
    };
    const resolvedParams: RunParams = { requested, resolved: { processing: processed.params, identify: identification.params } };
    const durationMs = Math.round(performance.now() - started);
    await db.transaction(async (tx) => {
      if (processed.peaks.length > 0) {
        // Chunked: SQLite limits bound variables per statement.
        for (let i = 0; i < processed.peaks.length; i += 80) await tx.insert(peaksTable).values(processed.peaks.slice(i, i + 80).map((p) => peakRow(runId, p)));
      }
      if (identification.candidates.length > 0) {
        await tx.insert(phaseResults).values(
          identification.candidates.map((c, i) => {
            const w = wt.get(c.referenceId)?.wtPercent;
            return {
              runId,
              scanId: scan.id,
              referencePhaseId: c.referenceId,
              rank: i + 1,
              score: round(c.score, 4),
              confident: c.confident,
              wtPercent: w == null ? null : Math.min(100, Math.max(0, round(w, 2))),
              matchedJson: storedMatches(c, byId.get(c.referenceId)),
              source: "auto" as const,
              status: "candidate" as const,
            };
          }),
        );
      }
      await tx
        .update(processingRuns)
        .set({
          status: "done",
          error: null,
          paramsJson: resolvedParams as unknown as Record<string, unknown>,
          profileJson: profile as unknown as Record<string, unknown>,
          unexplainedJson: identification.unexplainedPeaks.map((p) => ({ twoTheta: round(p.twoTheta, 4), d: round(p.d, 5), intensity: round(p.intensity, 2) })),
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
