import { describe, expect, test } from "vitest";
import { CUSTODY_EVENT_STATUS, STATUS_RANK, planStatusChange, statusFromEvents } from "@/lib/custody";
import { custodyStepSchema } from "@/lib/validation/custody";
import { SAMPLE_STATUSES, type SampleStatus } from "@/lib/vocabulary";

// The order is the usual sample lifecycle (common practice): planned → collected → dispatched → received →
// prepared → scanned → processed → candidates ready → confirmed → reported → stored / returned / discarded
// ("candidates ready" is our "processed").
const LIFECYCLE_ORDER: SampleStatus[] = ["planned", "collected", "dispatched", "received", "prepared", "scanned", "processed", "confirmed", "reported"];

describe("lifecycle ranks", () => {
  test("follow the lifecycle order strictly, with the three end states after reported", () => {
    for (let i = 1; i < LIFECYCLE_ORDER.length; i++) expect(STATUS_RANK[LIFECYCLE_ORDER[i]]).toBeGreaterThan(STATUS_RANK[LIFECYCLE_ORDER[i - 1]]);
    for (const end of ["stored", "returned", "discarded"] as const) expect(STATUS_RANK[end]).toBeGreaterThan(STATUS_RANK.reported);
    expect(Object.keys(STATUS_RANK).sort()).toEqual([...SAMPLE_STATUSES].sort());
  });
});

describe("planStatusChange", () => {
  test("custody along the chain moves the status forward step by step", () => {
    const chain = ["dispatched", "received", "prepared", "scanned", "stored"] as const;
    let s: SampleStatus = "collected";
    for (const e of chain) {
      const plan = planStatusChange(s, e);
      expect(plan).toEqual({ ok: true, next: CUSTODY_EVENT_STATUS[e], change: "advance" });
      if (plan.ok) s = plan.next;
    }
    expect(s).toBe("stored");
  });

  test("a step behind the current status is refused with forward, kept with keep, reset with reset", () => {
    const refused = planStatusChange("scanned", "prepared");
    expect(refused.ok).toBe(false);
    if (!refused.ok) expect(refused.reason).toContain('already "scanned"');
    expect(planStatusChange("scanned", "prepared", "keep")).toEqual({ ok: true, next: "scanned", change: "keep" });
    expect(planStatusChange("scanned", "prepared", "reset")).toEqual({ ok: true, next: "prepared", change: "regress" });
  });

  test("repeating the current step and a plain hand-over leave the status as it is", () => {
    expect(planStatusChange("scanned", "scanned")).toEqual({ ok: true, next: "scanned", change: "same" });
    expect(planStatusChange("received", "transferred")).toEqual({ ok: true, next: "received", change: "same" });
  });

  test("stored and returned can follow each other; nothing but a reset comes after discarded", () => {
    expect(planStatusChange("stored", "returned").ok).toBe(true);
    expect(planStatusChange("returned", "stored").ok).toBe(true);
    for (const e of ["received", "prepared", "scanned", "stored", "returned"] as const) expect(planStatusChange("discarded", e).ok).toBe(false);
    expect(planStatusChange("discarded", "stored", "reset")).toMatchObject({ ok: true, next: "stored", change: "regress" });
  });

  test("every event × status pair gives a decision and never moves back under 'forward'", () => {
    for (const st of SAMPLE_STATUSES) {
      for (const ev of Object.keys(CUSTODY_EVENT_STATUS) as (keyof typeof CUSTODY_EVENT_STATUS)[]) {
        const plan = planStatusChange(st, ev);
        if (plan.ok) expect(STATUS_RANK[plan.next]).toBeGreaterThanOrEqual(STATUS_RANK[st]);
      }
    }
  });
});

describe("custodyStepSchema", () => {
  test("a reset and a discard need a note; a future time is refused", () => {
    const r = custodyStepSchema.safeParse({ event: "discarded", statusPolicy: "reset", occurredAt: "2999-01-01T00:00:00Z" });
    expect(r.success).toBe(false);
    const paths = r.error!.issues.map((i) => i.path.join("."));
    expect(paths.sort()).toEqual(["note", "note", "occurredAt"]);
  });
  test("defaults to the forward policy", () => {
    expect(custodyStepSchema.parse({ event: "prepared" }).statusPolicy).toBe("forward");
  });
});

describe("review events and the derived status (issue 11 §2)", () => {
  test("an in-house lab's direct receipt puts the sample at the lab like an intake; review events follow the lifecycle", () => {
    expect(planStatusChange("collected", "received_directly")).toEqual({ ok: true, next: "received", change: "advance" });
    expect(planStatusChange("scanned", "processed")).toEqual({ ok: true, next: "processed", change: "advance" });
    expect(planStatusChange("processed", "confirmed")).toEqual({ ok: true, next: "confirmed", change: "advance" });
    expect(planStatusChange("confirmed", "reported")).toEqual({ ok: true, next: "reported", change: "advance" });
  });
  test("reopening a sign-off moves the status back only as a deliberate reset", () => {
    expect(planStatusChange("confirmed", "reopened").ok).toBe(false);
    expect(planStatusChange("confirmed", "reopened", "reset")).toEqual({ ok: true, next: "processed", change: "regress" });
  });
  test("the status is the one the latest event left; no events means planned", () => {
    expect(statusFromEvents([])).toBe("planned");
    expect(statusFromEvents([{ statusAfter: "collected" }, { statusAfter: "dispatched" }, { statusAfter: null }])).toBe("dispatched");
  });
});
