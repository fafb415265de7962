/**
 * Worker task: the CPU-heavy part of a processing run or a refit — parse and process the stored scan, rank
 * candidates by the peak-list search (runs only) and fit the whole pattern. The caller reads and writes the
 * database; everything here is pure computation on cloned inputs.
 */
import { fitProcessed, identifyProcessed, processScanText, type RunFitOptions } from "@/lib/jobs/analyse-scan";
import type { ReferencePattern } from "@/lib/science/types";
import type { ProcessParamsInput } from "@/lib/validation/scan";

export interface ScanAnalyseInput {
  text: string;
  requested: ProcessParamsInput;
  scanRow: Parameters<typeof processScanText>[2];
  library: ReferencePattern[];
  fitOptions: RunFitOptions;
  /** Rank candidates by the peak-list search too (a new run; a refit keeps its parent's list). */
  search: boolean;
}

export default function scanAnalyse(input: ScanAnalyseInput) {
  const { processed } = processScanText(input.text, input.requested, input.scanRow);
  const identification = input.search ? identifyProcessed(processed, input.requested, input.library) : null;
  const fit = fitProcessed(processed, input.library, input.fitOptions);
  return { processed, identification, fit };
}
