/**
 * Retry schedule of the offline outbox: capped exponential backoff with "full jitter" (Brooker, "Exponential
 * Backoff And Jitter", AWS Architecture Blog, 2015): delay = random(0, min(cap, base · 2^attempt)).
 * Pure: no browser or framework imports.
 */
export const BACKOFF_BASE_MS = 2_000;
export const BACKOFF_CAP_MS = 5 * 60_000;

/** Upper bound of the delay before retry number `attempt` (0 = first retry). */
export function backoffCeiling(attempt: number, base = BACKOFF_BASE_MS, cap = BACKOFF_CAP_MS): number {
  if (!Number.isFinite(attempt) || attempt < 0) return base;
  return Math.min(cap, base * 2 ** Math.min(attempt, 30));
}

/** The delay before retry number `attempt`, drawn uniformly in [0, ceiling] (full jitter); `random` in [0, 1). */
export function backoffDelay(attempt: number, random: () => number = Math.random, base = BACKOFF_BASE_MS, cap = BACKOFF_CAP_MS): number {
  return Math.floor(random() * backoffCeiling(attempt, base, cap));
}

/** HTTP statuses worth retrying: no answer, timeout, throttling, server trouble (RFC 9110 §15.5.9, §15.6; RFC 6585 §4). */
export function isRetryableStatus(status: number): boolean {
  return status === 0 || status === 408 || status === 425 || status === 429 || status >= 500;
}

export type SendOutcome =
  | { kind: "done"; record: Record<string, unknown> }
  | { kind: "conflict"; current: Record<string, unknown>; message: string }
  | { kind: "retry"; message: string }
  | { kind: "failed"; message: string };

/** What one send attempt means for the queued item, from the HTTP status and the API's JSON body. */
export function classifyResponse(status: number, body: unknown): SendOutcome {
  const err = (body as { error?: { message?: string; details?: { current?: Record<string, unknown> }; fields?: Record<string, string[]> } } | null)?.error;
  if (status >= 200 && status < 300) return { kind: "done", record: (body ?? {}) as Record<string, unknown> };
  if (status === 409 && err?.details?.current) return { kind: "conflict", current: err.details.current, message: err.message ?? "Changed by someone else." };
  const fieldText = err?.fields ? Object.entries(err.fields).map(([k, v]) => `${k}: ${v.join(" ")}`).join("; ") : "";
  const message = [err?.message ?? `The server answered ${status}.`, fieldText].filter(Boolean).join(" ");
  if (isRetryableStatus(status)) return { kind: "retry", message };
  return { kind: "failed", message };
}
