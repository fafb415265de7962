/**
 * Crystal-structure part of the diffraction core: CIF reading and calculated powder patterns.
 * Pure computation (no I/O): callers pass CIF text in.
 */
export { CifError, type CifErrorCode } from "./cif-error";
export { parseCif, CIF_LIMITS, DEFAULT_B_ISO, type ParseCifOptions } from "./parse-cif";
export { readCifBlocks, parseCifNumber, type CifBlock, type CifLoop, type CifValue, type CifNumber } from "./cif-star";
export { parseSymop, type SymOp } from "./symop";
export {
  computePattern,
  computePatternDetailed,
  CU_KA1,
  type PatternLine,
  type PatternResult,
  type ReflectionClass,
} from "./pattern";
export { referenceIntensityRatio, referenceIntensityRatioDetailed, type RirOptions, type RirResult } from "./rir";
export { referencePatternFromCif, type ReferencePatternOptions } from "./reference-pattern";
export { cellVolume, dSpacing, metricTensor, reciprocalMetricTensor, uEquivalent } from "./cell";
export { unitCellContents, unitCellMass, calculatedDensity } from "./cell-contents";
export { lorentzPolarisation } from "./lorentz-polarisation";
export { marchDollase } from "./preferred-orientation";
export { scatteringFactor, it92Coefficients } from "./scattering-factors";
export { atomicWeight } from "./atomic-weights";
export { expandSites, type ExpandedCell } from "./expand-sites";
export type { AtomSite, CellParameters, CifCitation, CifStructure, PatternOptions, AdpSource } from "./types";
