/**
 * In-process queue of scan processing runs. State lives in processing_runs.status (queued → running → done |
 * failed), so the queue survives a restart: runs left "running" by a dead process go back to "queued" and are picked
 * up again. One worker at a time (the machine has two cores and requests must stay responsive); the worker yields
 * to the event loop between stages and between scans, so a large batch never blocks requests.
 */
import { and, asc, count, eq, lt, sql } from "drizzle-orm";
import { getDb } from "@/db";
import { processingRuns, scans } from "@/db/schema";
import { executeRun, RUN_STAGES, yieldToEventLoop, type RunStage } from "./process-run";

interface QueueState {
  /** The running worker loop, if any. */
  active: Promise<void> | null;
  /** Set when work arrived while the loop was running, so it looks again before stopping. */
  again: boolean;
  /** Runs left "running" by an earlier process were re-queued (once per process). */
  recovered: boolean;
  /** Stage of the run being executed now. */
  current: { runId: string; stage: RunStage; startedAt: number } | null;
  /** Runs finished by this process. */
  finished: { done: number; failed: number };
}

const g = globalThis as unknown as { __lithodexProcessingQueue?: QueueState };
const state: QueueState = (g.__lithodexProcessingQueue ??= { active: null, again: false, recovered: false, current: null, finished: { done: 0, failed: 0 } });

/** Set LITHODEX_JOBS=manual to stop runs starting by themselves (tests drive the queue with drainProcessingQueue). */
const autoStart = () => process.env.LITHODEX_JOBS !== "manual";

/**
 * Puts runs left "running" by a process that died back in the queue.
 * @returns the number of runs re-queued
 */
export async function recoverInterruptedRuns(): Promise<number> {
  const db = getDb();
  const stuck = await db
    .update(processingRuns)
    .set({ status: "queued" })
    .where(and(eq(processingRuns.status, "running"), state.current ? sql`${processingRuns.id} <> ${state.current.runId}` : undefined))
    .returning({ id: processingRuns.id });
  return stuck.length;
}

/** Atomically claims the oldest queued run (queued → running). */
async function claimNext(): Promise<string | null> {
  const db = getDb();
  const rows = await db
    .update(processingRuns)
    .set({ status: "running" })
    .where(
      sql`${processingRuns.id} = (select ${processingRuns.id} from ${processingRuns} where ${processingRuns.status} = 'queued' order by ${processingRuns.createdAt}, ${processingRuns.id} limit 1) and ${processingRuns.status} = 'queued'`,
    )
    .returning({ id: processingRuns.id });
  return rows[0]?.id ?? null;
}

/**
 * Claims and executes the oldest queued run.
 * @returns the run id and outcome, or null when the queue is empty
 */
export async function runNextQueued(): Promise<{ runId: string; outcome: "done" | "failed" } | null> {
  const runId = await claimNext();
  if (!runId) return null;
  state.current = { runId, stage: "reading", startedAt: Date.now() };
  try {
    const outcome = await executeRun(runId, (stage) => {
      state.current = { runId, stage, startedAt: state.current?.startedAt ?? Date.now() };
    });
    state.finished[outcome]++;
    return { runId, outcome };
  } finally {
    state.current = null;
  }
}

async function loop(): Promise<void> {
  try {
    do {
      state.again = false;
      for (;;) {
        const r = await runNextQueued();
        if (!r) break;
        await yieldToEventLoop();
      }
    } while (state.again);
  } finally {
    state.active = null;
  }
}

function startLoop(): Promise<void> {
  if (state.active) {
    state.again = true;
    return state.active;
  }
  state.active = loop().catch((err) => {
    console.error("processing queue stopped:", err);
  });
  return state.active;
}

/**
 * Makes sure the worker runs: re-queues interrupted runs once per process, then starts the loop in the background
 * if anything is queued. Safe to call on every request. Does nothing when LITHODEX_JOBS=manual.
 */
export function ensureProcessingWorker(): void {
  if (!autoStart()) return;
  if (!state.recovered) {
    state.recovered = true;
    void recoverInterruptedRuns()
      .then(() => startLoop())
      .catch((err) => console.error("processing queue recovery failed:", err));
    return;
  }
  setImmediate(() => void startLoop());
}

/** Starts the worker for newly queued work (same as {@link ensureProcessingWorker}). */
export const kickProcessingWorker = ensureProcessingWorker;

/**
 * Runs the queue until it is empty, waiting for a loop already in progress (tests, seed scripts).
 * @returns counts of runs finished while draining
 */
export async function drainProcessingQueue(): Promise<{ done: number; failed: number }> {
  const start = { ...state.finished };
  if (!state.recovered) {
    state.recovered = true;
    await recoverInterruptedRuns();
  }
  while (state.active) await state.active;
  await startLoop();
  while (state.active) await state.active;
  return { done: state.finished.done - start.done, failed: state.finished.failed - start.failed };
}

/** Progress of one run for the client. */
export interface RunProgress {
  status: "queued" | "running" | "done" | "failed";
  /** Queued runs ahead of this one (queued only). */
  ahead?: number;
  /** Current stage and fraction 0–1 (running only, in this process). */
  stage?: RunStage;
  fraction?: number;
}

/** Progress of runs by id: status from the database, stage from the worker, queue position for queued runs. */
export async function runProgress(runs: { id: string; status: RunProgress["status"]; createdAt: Date }[]): Promise<Map<string, RunProgress>> {
  const out = new Map<string, RunProgress>();
  const queued = runs.filter((r) => r.status === "queued");
  const db = getDb();
  for (const r of runs) {
    const p: RunProgress = { status: r.status };
    if (r.status === "running" && state.current?.runId === r.id) {
      p.stage = state.current.stage;
      p.fraction = (RUN_STAGES.indexOf(state.current.stage) + 0.5) / RUN_STAGES.length;
    }
    out.set(r.id, p);
  }
  for (const r of queued) {
    const [{ n }] = await db
      .select({ n: count() })
      .from(processingRuns)
      .where(and(eq(processingRuns.status, "queued"), lt(processingRuns.createdAt, r.createdAt)));
    out.get(r.id)!.ahead = n;
  }
  return out;
}

/** Oldest-first queued run ids of a scan's project (for tests and the list). */
export async function queuedRunIds(projectId: string): Promise<string[]> {
  const rows = await getDb()
    .select({ id: processingRuns.id })
    .from(processingRuns)
    .innerJoin(scans, eq(scans.id, processingRuns.scanId))
    .where(and(eq(scans.projectId, projectId), eq(processingRuns.status, "queued")))
    .orderBy(asc(processingRuns.createdAt));
  return rows.map((r) => r.id);
}
