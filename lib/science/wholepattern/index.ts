/** Whole-pattern phase analysis: calculated profiles, NNLS selection by BIC, refinement, Hill & Howard fractions. */
export { identifyWholePattern } from "./identify-whole-pattern";
export { fitCaglioti, type CagliotiFit } from "./caglioti";
export { hillHoward, internalStandard, massFactor, type QuantPhase, type QuantResult } from "./quantify";
export { nnlsFromGram, gramSystem } from "./nnls";
export { phaseLines, type PhaseLines } from "./phase-lines";
export { renderPhase, cagliotiFwhm, linePosition } from "./profile";
export type * from "./types";
