/**
 * Worker-thread pool for heavy work (CIF patterns, MBTiles validation, CSV imports; scan processing can join): the
 * request thread only waits, so `/api/health` and every other request keep answering while a job runs. Each job has
 * a time limit (the worker is terminated when it passes) and a memory limit (V8 heap of the worker, via
 * `resourceLimits`); a job over either fails with {@link JobLimitError}, which the API maps to 422.
 *
 * Native code (SQLite inside libsql, sharp) is not interrupted by worker termination: such tasks must bound their
 * own work (the MBTiles reader checks the schema before it queries), the time limit then frees the caller.
 *
 * Built on piscina (one pool per memory limit, since resource limits are per worker).
 */
import { availableParallelism } from "node:os";
import { join } from "node:path";
import { pathToFileURL } from "node:url";
import { Piscina } from "piscina";
import { AppError } from "@/lib/dal/errors";
import { TASKS, type TaskName } from "./tasks";

export interface JobLimits {
  /** Wall-clock limit from submission, ms. @default 30 000 */
  timeoutMs?: number;
  /** Old-generation heap of the worker, MiB. @default 256 */
  maxMemoryMb?: number;
}

export const DEFAULT_LIMITS: Required<JobLimits> = { timeoutMs: 30_000, maxMemoryMb: 256 };

/** A job that ran past its time or memory limit. */
export class JobLimitError extends AppError {
  constructor(
    readonly limit: "time" | "memory",
    message: string,
  ) {
    super("validation_failed", message, undefined, { limit });
    this.name = "JobLimitError";
  }
}

/** An error the task threw, carried across the thread as data (name, message, code, line, field, issues). */
export class TaskError extends Error {
  readonly code?: string;
  readonly line?: number;
  readonly field?: string;
  readonly issues?: string[];
  constructor(readonly remoteName: string, message: string, extra: { code?: string; line?: number; field?: string; issues?: string[] } = {}) {
    super(message);
    this.name = "TaskError";
    Object.assign(this, extra);
  }
}

const root = () => process.env.LITHODEX_ROOT || process.cwd();

interface PoolState {
  pools: Map<number, Piscina>;
}
const g = globalThis as unknown as { __lithodexWorkerPools?: PoolState };
const state: PoolState = (g.__lithodexWorkerPools ??= { pools: new Map() });

/** Threads per pool: env LITHODEX_WORKER_THREADS, default cores − 1 (at least 1) so the request thread keeps a core. */
function maxThreads(): number {
  const v = Number(process.env.LITHODEX_WORKER_THREADS);
  if (Number.isInteger(v) && v > 0) return v;
  return Math.max(1, availableParallelism() - 1);
}

function poolFor(memoryMb: number): Piscina {
  let p = state.pools.get(memoryMb);
  if (!p) {
    p = new Piscina({
      filename: pathToFileURL(join(/*turbopackIgnore: true*/ root(), "lib/workers/worker-entry.mjs")).href,
      workerData: { tsconfig: join(/*turbopackIgnore: true*/ root(), "tsconfig.json") },
      minThreads: 0,
      maxThreads: maxThreads(),
      idleTimeout: 60_000,
      maxQueue: 64,
      resourceLimits: { maxOldGenerationSizeMb: memoryMb, maxYoungGenerationSizeMb: Math.min(64, Math.max(8, memoryMb / 8)), stackSizeMb: 4 },
      // Node's default env sharing would leak later changes; the worker sees the env at pool creation.
      env: { ...process.env },
    });
    state.pools.set(memoryMb, p);
  }
  return p;
}

const seconds = (ms: number) => (ms >= 10_000 ? `${Math.round(ms / 1000)} s` : `${(ms / 1000).toFixed(1)} s`);

/**
 * Runs a registered task in a worker thread.
 * @param task - name in {@link TASKS}
 * @param input - structured-cloneable input (typed arrays and Buffers are copied)
 * @param limits - time and memory limit of this job
 * @param label - what the job is, for the error message ("pattern of quartz.cif")
 * @throws JobLimitError (422) over a limit, TaskError for an error thrown by the task
 */
export async function runJob<T = unknown>(task: TaskName, input: unknown, limits: JobLimits = {}, label: string = task): Promise<T> {
  const { timeoutMs, maxMemoryMb } = { ...DEFAULT_LIMITS, ...limits };
  const pool = poolFor(maxMemoryMb);
  const moduleUrl = pathToFileURL(join(/*turbopackIgnore: true*/ root(), TASKS[task])).href;
  let out: { ok: true; value: T } | { ok: false; error: { name: string; message: string; code?: string; line?: number; field?: string; issues?: string[] } };
  try {
    out = await pool.run({ task, module: moduleUrl, input }, { signal: AbortSignal.timeout(timeoutMs) });
  } catch (err) {
    const e = err as { name?: string; code?: string; message?: string };
    if (e?.name === "AbortError" || e?.name === "TimeoutError") {
      throw new JobLimitError("time", `${label} did not finish within ${seconds(timeoutMs)} (the time limit of one job); it was stopped.`);
    }
    if (e?.code === "ERR_WORKER_OUT_OF_MEMORY" || /out of memory|heap/i.test(String(e?.message))) {
      throw new JobLimitError("memory", `${label} needed more than ${maxMemoryMb} MiB of memory (the memory limit of one job); it was stopped.`);
    }
    if (/queue is full/i.test(String(e?.message))) throw new AppError("conflict", "The server is busy with other heavy jobs; try again in a minute.");
    throw err;
  }
  if (out.ok) return out.value;
  const { name, message, ...extra } = out.error;
  throw new TaskError(name, message, extra);
}

/** Stops every pool (tests, shutdown). */
export async function closeWorkerPools(): Promise<void> {
  const pools = [...state.pools.values()];
  state.pools.clear();
  await Promise.all(pools.map((p) => p.close({ force: true }).catch(() => {})));
}

/** Threads alive and jobs queued, for health and benchmarks. */
export function workerPoolStats() {
  return [...state.pools.entries()].map(([memoryMb, p]) => ({ memoryMb, threads: p.threads.length, queued: p.queueSize, completed: p.completed }));
}
