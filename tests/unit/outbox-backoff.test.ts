import { describe, expect, test } from "vitest";
import { backoffCeiling, backoffDelay, classifyResponse, isRetryableStatus } from "@/lib/outbox/backoff";

describe("outbox retry schedule (Brooker 2015, 'Exponential Backoff And Jitter', full jitter)", () => {
  test("the ceiling doubles per attempt from the base and stops at the cap", () => {
    // Brooker 2015: sleep = random_between(0, min(cap, base * 2 ** attempt)).
    expect([0, 1, 2, 3].map((a) => backoffCeiling(a, 100, 10_000))).toEqual([100, 200, 400, 800]);
    expect(backoffCeiling(20, 100, 10_000)).toBe(10_000);
  });
  test("full jitter draws uniformly between 0 and the ceiling", () => {
    expect(backoffDelay(3, () => 0, 100, 10_000)).toBe(0);
    expect(backoffDelay(3, () => 0.5, 100, 10_000)).toBe(400);
    expect(backoffDelay(3, () => 0.999999, 100, 10_000)).toBe(799);
  });
});

describe("what an answer means for a queued record", () => {
  test("RFC 9110 / RFC 6585: timeouts (408), too early (425), throttling (429) and 5xx are retried; other 4xx are not", () => {
    expect([0, 408, 425, 429, 500, 502, 503].every(isRetryableStatus)).toBe(true);
    expect([400, 401, 403, 404, 413, 415, 422].some(isRetryableStatus)).toBe(false);
  });
  test("a 409 carrying the current record is a conflict for a person to resolve, never a retry", () => {
    const out = classifyResponse(409, { error: { code: "conflict", message: "Changed by someone else", details: { current: { id: "a", version: 3 } } } });
    expect(out).toEqual({ kind: "conflict", current: { id: "a", version: 3 }, message: "Changed by someone else" });
  });
  test("a 422 keeps the field messages so the panel can say why", () => {
    const out = classifyResponse(422, { error: { code: "validation_failed", message: "Check the fields.", fields: { lat: ["Latitude must be between −90 and 90."] } } });
    expect(out.kind).toBe("failed");
    expect(out.kind === "failed" && out.message).toContain("lat: Latitude must be between −90 and 90.");
  });
  test("2xx is done with the server's record", () => {
    expect(classifyResponse(201, { id: "x", code: "APR-000001" })).toEqual({ kind: "done", record: { id: "x", code: "APR-000001" } });
  });
});
