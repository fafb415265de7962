export { IMA_SYMBOLS, imaSymbol } from "./ima-symbols";
export { INK, TOL_MUTED, TOL_PALE_GREY, contrastRatio, labelColourOn, relativeLuminance, type TolMutedName } from "./palette";
export { GROUP_SYMBOLS, MINERAL_CLASSES, SHAPES, groupStyle, phaseSymbol, type MineralClass, type PhaseSymbol, type Shape } from "./symbol-scheme";
export {
  annularSectorPath,
  clusterSymbolSvg,
  dominantIndex,
  phaseGlyphSvg,
  radiusForWtPercent,
  segmentShares,
  shapePath,
  stationSymbolSvg,
  type DrawnSymbol,
  type GlyphOptions,
  type StationSymbolOptions,
  type SymbolSegment,
} from "./svg";
export { comparePhases, describePhases, stationSegments, type SegmentOptions } from "./stations";
export {
  PHASE_CLUSTER_OPTIONS,
  clusterSegments,
  mapClusterProps,
  reduceClusterProps,
  stationPointProps,
  type ClusterPhaseCounts,
  type ClusterSummary,
  type StationPointProps,
} from "./cluster";
export { PHASE_FILTERS, REGISTER_FILTER_KEYS, filterParams, hasPhaseCriterion, queryObject, phaseFilterShape, registerFilterSchema, type PhaseFilter, type RegisterFilter } from "./query";
export type { MineralOption, PhaseKind, PhaseMapData, PhaseMapStation, StationPhase } from "./types";
