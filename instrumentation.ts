// Runs once when the server starts: refuse to run in production without a session secret, stamp the real peer
// address on requests (sign-in throttling), resume scan processing that was queued or interrupted by a restart.
export async function register() {
  if (process.env.NEXT_RUNTIME !== "nodejs") return;
  if (process.env.NODE_ENV === "production" && !process.env.BETTER_AUTH_SECRET) {
    throw new Error("BETTER_AUTH_SECRET is not set. Set it to a long random value (e.g. `openssl rand -base64 32`) before starting Lithodex in production; `npm run demo` sets one itself.");
  }
  const { installPeerAddressStamp } = await import("@/lib/security/peer-stamp");
  installPeerAddressStamp();
  const { ensureProcessingWorker } = await import("@/lib/jobs/processing-queue");
  ensureProcessingWorker();
}
