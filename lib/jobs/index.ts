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
export { executeRun, processScanText, identifyProcessed, PIPELINE_VERSION, RUN_STAGES, type RunStage, type RunParams, type RunProfile, type StoredMatch } from "./process-run";
export { loadReferenceLibrary, invalidateReferenceLibrary, patternFromRow, type StoredLine } from "./reference-library";
export { advanceSampleStatus, type LabStatus } from "./sample-status";
