/**
 * Tasks the worker pool can run: name → module (path from the repository root). A task module's default export
 * takes one structured-cloneable input and returns (or resolves to) a structured-cloneable value. Task modules must
 * be free of framework imports (no "server-only", no next/*, no database): they run in a plain worker thread.
 */
export const TASKS = {
  /** Parses a CIF and computes its library pattern and RIR (reference-phase import). */
  "cif-import": "lib/workers/tasks/cif-import.ts",
  /** Parses a stored CIF and computes its pattern for one wavelength (reference-phase page). */
  "cif-pattern": "lib/workers/tasks/cif-pattern.ts",
  /** Checks an uploaded MBTiles file (schema, metadata, tiles). */
  "mbtiles-inspect": "lib/workers/tasks/mbtiles-inspect.ts",
  /** Parses and validates a sample CSV import. */
  "csv-parse": "lib/workers/tasks/csv-parse.ts",
  /** Parses and processes a stored scan, ranks candidates and fits the whole pattern (processing runs, refits). */
  "scan-analyse": "lib/workers/tasks/scan-analyse.ts",
  /** Test-only: burns CPU or memory on purpose (limits and /api/health under load). */
  "hostile": "lib/workers/tasks/hostile.ts",
} as const;

export type TaskName = keyof typeof TASKS;
