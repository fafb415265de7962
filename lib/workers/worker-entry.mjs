// Entry of every pool worker (see pool.ts). Workers run the TypeScript task modules from source through tsx's
// loader, so the same code runs under tests, `next dev` and `next start` without a separate worker build.
import { register } from "tsx/esm/api";
import { workerData } from "node:worker_threads";

register({ tsconfig: workerData?.tsconfig });

const loaded = new Map();

/**
 * @param {{ task: string, module: string, input: unknown }} job
 * @returns {Promise<{ ok: true, value: unknown } | { ok: false, error: Record<string, unknown> }>}
 */
export default async function run(job) {
  let mod = loaded.get(job.module);
  if (!mod) {
    mod = await import(job.module);
    loaded.set(job.module, mod);
  }
  try {
    return { ok: true, value: await mod.default(job.input) };
  } catch (err) {
    // Errors cross the thread as plain data: name, message and the fields callers switch on.
    const e = /** @type {Record<string, unknown>} */ (err ?? {});
    return {
      ok: false,
      error: { name: e.name ?? "Error", message: e.message ?? String(err), code: e.code, line: e.line, field: e.field, issues: e.issues },
    };
  }
}
