export { ASBESTOS_CAVEAT, ASBESTIFORM_MINERALS, CONFIRMED_VS_CANDIDATE, IDENTIFICATION_CAVEAT, SILICA_CAVEAT, isAsbestiform } from "./caveats";
export { describeFilter } from "./filter-text";
export { formatWt, hasAsbestiformPhase, phaseAttributes, phaseNames, phaseStatus, phaseSymbols } from "./phase-text";
export type { ExportPhase, ExportRow, RegisterExport, RegisterReportData } from "./types";
