import { runJob, TaskError } from "@/lib/workers/pool";
import type { ScanAnalyseInput } from "@/lib/workers/tasks/scan-analyse";
import type scanAnalyse from "@/lib/workers/tasks/scan-analyse";

/** Limits of one scan analysis: generous for 64k-point scans on a busy 2-core machine. */
const LIMITS = { timeoutMs: 120_000, maxMemoryMb: 512 };
/** Error names whose messages are meant for the analyst (bad file, impossible parameters). */
const USER_ERRORS = new Set(["RangeError", "TypeError", "ScanParseError"]);

/**
 * Parse, process, search and fit a scan in the worker pool (time and memory limits per job; the server keeps
 * answering meanwhile). Errors thrown by the science code come back with their original name, so callers can tell
 * bad input (shown to the user) from failures.
 */
export async function analyseInWorker(input: ScanAnalyseInput, label: string): Promise<ReturnType<typeof scanAnalyse>> {
  try {
    return await runJob<ReturnType<typeof scanAnalyse>>("scan-analyse", input, LIMITS, `Processing ${label}`);
  } catch (err) {
    if (!(err instanceof TaskError && USER_ERRORS.has(err.remoteName))) throw err;
    const e = err.remoteName === "RangeError" ? new RangeError(err.message) : err.remoteName === "TypeError" ? new TypeError(err.message) : new Error(err.message);
    if (err.remoteName === "ScanParseError") e.name = "ScanParseError";
    throw e;
  }
}
