/** Background processing of scans: the run executor and the in-process queue that drives it. */
export {
  ensureProcessingWorker,
  kickProcessingWorker,
  drainProcessingQueue,
  runNextQueued,
  recoverInterruptedRuns,
  runProgress,
  queuedRunIds,
  type RunProgress,
} from "./processing-queue";
export {
  executeRun,
  insertRunResults,
  processScanText,
  identifyProcessed,
  PIPELINE_VERSION,
  RUN_STAGES,
  type PhaseRowInsert,
  type RunStage,
  type RunParams,
  type RunProfile,
  type RunFit,
  type SparseCurve,
  type StoredFit,
  type StoredMatch,
  type StoredUnexplained,
} from "./process-run";
export { expandSparse, fitOptionsOf, fitProcessed, phaseRowsOf, runProfileOf, unexplainedOf, quantificationLabel, type ComputedPhaseRow, type SearchRow } from "./analyse-scan";
export { loadReferenceLibrary, invalidateReferenceLibrary, patternFromRow, type StoredLine } from "./reference-library";
export { advanceSampleStatus, writeSampleEvent, SYSTEM_ACTOR_NAME, type LabStatus, type SampleEventWrite } from "./sample-status";
