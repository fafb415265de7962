/**
 * Worker task: a CIF as the reference-library import needs it — parsed structure, calculated pattern (library
 * settings) and RIR against corundum (Hubbard & Snyder 1988 definition, computed in lib/science/crystal/rir.ts).
 * CifError and RangeError propagate to the caller as TaskError with their name, code and line.
 */
import { CifError, computePatternDetailed, parseCif, referenceIntensityRatio, type CifStructure, type PatternResult } from "@/lib/science/crystal";

export interface CifImportInput {
  text: string;
  corundumText: string;
  wavelength: number;
  twoThetaMax: number;
  minIntensity: number;
}

export interface CifImportOutput {
  structure: CifStructure;
  /** The calculated lines as computePatternDetailed returns them. */
  lines: PatternResult["lines"];
  patternWarnings: string[];
  rir: number | null;
  rirProblem: string | null;
}

let corundum: { text: string; structure: CifStructure } | null = null;

export default function cifImport(input: CifImportInput): CifImportOutput {
  const structure = parseCif(input.text);
  const result = computePatternDetailed(structure, { wavelength: input.wavelength, twoThetaMax: input.twoThetaMax, minIntensity: input.minIntensity });
  const lines = result.lines;
  let rir: number | null = null;
  let rirProblem: string | null = null;
  if (lines.length) {
    if (corundum?.text !== input.corundumText) corundum = { text: input.corundumText, structure: parseCif(input.corundumText) };
    try {
      rir = referenceIntensityRatio(structure, corundum.structure, { wavelength: input.wavelength, twoThetaMax: input.twoThetaMax });
    } catch (err) {
      if (!(err instanceof RangeError || err instanceof CifError)) throw err;
      rirProblem = err.message;
    }
  }
  return { structure, lines, patternWarnings: result.warnings, rir, rirProblem };
}
