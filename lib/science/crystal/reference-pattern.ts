/** CIF text → reference pattern record for the phase identifier. */
import type { ReferencePattern } from "../types";
import { unitCellContents } from "./cell-contents";
import { parseCif } from "./parse-cif";
import { computePattern, CU_KA1 } from "./pattern";
import { referenceIntensityRatio } from "./rir";
import type { CifStructure, PatternOptions } from "./types";

export interface ReferencePatternOptions extends PatternOptions {
  id: string;
  /** Mineral name; default `_chemical_name_mineral`, else the data block name. Stored lower-case. */
  mineral?: string;
  /** Data block to read. */
  block?: string;
  /** Corundum structure: when given, `rir` is computed (see {@link referenceIntensityRatio}). */
  corundum?: CifStructure;
  /** @default 0.5 */
  minIntensity?: number;
}

function formulaFromContents(structure: CifStructure): string {
  const contents = unitCellContents(structure);
  const z = structure.formulaUnitsZ && structure.formulaUnitsZ > 0 ? structure.formulaUnitsZ : 1;
  const fmt = (n: number) => {
    const v = Math.round((n / z) * 100) / 100;
    return v === 1 ? "" : String(v);
  };
  return Object.keys(contents)
    .sort()
    .map((e) => `${e}${fmt(contents[e])}`)
    .join(" ");
}

/**
 * Parse a CIF and compute its reference pattern (lines with I ≥ minIntensity, d descending).
 * Elements come from the atom sites (sorted symbols, D counted as H).
 * @throws CifError for unusable CIFs, RangeError for invalid options.
 */
export function referencePatternFromCif(
  cifText: string,
  options: ReferencePatternOptions,
): ReferencePattern & { structure: CifStructure } {
  const { id, mineral, block, corundum, minIntensity = 0.5, wavelength = CU_KA1, ...patternOptions } = options;
  const structure = parseCif(cifText, { block });
  const lines = computePattern(structure, { ...patternOptions, wavelength, minIntensity }).map((l) => ({
    h: l.h,
    k: l.k,
    l: l.l,
    d: l.d,
    intensity: l.intensity,
    multiplicity: l.multiplicity,
    twoTheta: l.twoTheta,
  }));
  const elements = [...new Set(structure.sites.map((s) => s.element))].sort();
  const out: ReferencePattern & { structure: CifStructure } = {
    id,
    mineral: (mineral ?? structure.mineral ?? structure.blockName).trim().toLowerCase(),
    formula: structure.formulaSum?.replace(/\s+/g, " ") ?? formulaFromContents(structure),
    elements,
    lines,
    structure,
  };
  if (corundum) out.rir = referenceIntensityRatio(structure, corundum, { ...patternOptions, wavelength });
  return out;
}
