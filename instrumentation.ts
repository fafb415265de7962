// Runs once when the server starts: resume scan processing that was queued or interrupted by a restart.
export async function register() {
  if (process.env.NEXT_RUNTIME !== "nodejs") return;
  const { ensureProcessingWorker } = await import("@/lib/jobs/processing-queue");
  ensureProcessingWorker();
}
