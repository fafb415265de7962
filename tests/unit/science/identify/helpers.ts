/**
 * Shared helpers of the identification tests: a synthetic scan of library phases run through the real processing
 * pipeline (parse-free: synthesizeScan → processScan → identifyPhases). The synthetic scans are built from the
 * same calculated patterns as the library, so these tests check the search, not the patterns (the patterns are
 * checked against gemmi and handbook d-spacings in the crystal and minerals tests).
 */
import { identifyPhases } from "@/lib/science/identify";
import type { IdentificationResult, IdentifyOptions } from "@/lib/science/identify";
import { REFERENCE_LIBRARY, findReferencePattern } from "@/lib/science/minerals";
import { processScan, type ProcessParams } from "@/lib/science/signal";
import { synthesizeScan, type SynthesizeScanOptions } from "@/lib/science/synthetic";
import type { ReferencePattern } from "@/lib/science/types";

export function pattern(mineral: string): ReferencePattern {
  const p = findReferencePattern(mineral);
  if (!p) throw new Error(`${mineral} is not in the shipped library`);
  return p;
}

export interface RunOptions {
  mix: [string, number][];
  scan?: Omit<SynthesizeScanOptions, "phases">;
  process?: ProcessParams;
  identify?: IdentifyOptions;
  library?: readonly ReferencePattern[];
}

/** Synthesize, process and identify. */
export function runScan({ mix, scan = {}, process = {}, identify = {}, library = REFERENCE_LIBRARY }: RunOptions): IdentificationResult {
  const s = synthesizeScan({ phases: mix.map(([m, w]) => ({ pattern: pattern(m), weight: w })), ...scan });
  const processed = processScan(s, process);
  const n = s.twoTheta.length;
  return identifyPhases(processed.peaks, library, {
    wavelength: processed.wavelength,
    twoThetaRange: [s.twoTheta[0], s.twoTheta[n - 1]],
    ...identify,
  });
}

export function phaseNames(result: IdentificationResult): string[] {
  return result.phases.map((p) => p.mineral).sort();
}

export function wtOf(result: IdentificationResult, mineral: string): number {
  const p = result.phases.find((x) => x.mineral === mineral);
  if (!p || p.wtPercent === null) throw new Error(`${mineral} not quantified`);
  return p.wtPercent;
}
