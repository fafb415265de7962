/** Phase identification: strong-line index, figure of merit, multiphase search–match, RIR weight fractions. */
export { identifyPhases } from "./identify-phases";
export { buildStrongLineIndex, lookupStrongLines, type StrongLineIndexOptions, type StrongLineLookup } from "./strong-line-index";
export { normalizeElementFilter, passesElementFilter } from "./element-filter";
export { rirWeightFractions, type RirPhase } from "./rir-quantification";
export type {
  ElementFilter,
  MatchTolerance,
  IdentifyOptions,
  StrongLineIndex,
  MatchedLine,
  ScoreParts,
  PhaseCandidate,
  IdentifiedPhase,
  IdentificationResult,
  ResolvedIdentifyParams,
} from "./types";
