/**
 * The sample lifecycle: which status each custody event implies and how a status may change. Pure and zod-free,
 * so pages and forms can use it; the request schemas are in lib/validation/custody.ts.
 */
import { CUSTODY_EVENTS, type SampleStatus } from "@/lib/vocabulary";

export type CustodyEvent = (typeof CUSTODY_EVENTS)[number];

/**
 * Position of each status on the sample lifecycle (common practice): planned → collected → dispatched → received →
 * prepared → scanned → processed → confirmed → reported → stored / returned / discarded. Stored and returned
 * share a rank (a sample can move between them); discarded is last.
 */
export const STATUS_RANK: Record<SampleStatus, number> = {
  planned: 0,
  collected: 1,
  dispatched: 2,
  received: 3,
  prepared: 4,
  scanned: 5,
  processed: 6,
  confirmed: 7,
  reported: 8,
  stored: 9,
  returned: 9,
  discarded: 10,
};

/** The sample status a custody event implies; a plain hand-over ("transferred") implies none. */
export const CUSTODY_EVENT_STATUS: Record<CustodyEvent, SampleStatus | null> = {
  collected: "collected",
  dispatched: "dispatched",
  received: "received",
  received_directly: "received",
  prepared: "prepared",
  scanned: "scanned",
  processed: "processed",
  confirmed: "confirmed",
  // Reopening a sign-off takes the sample back to "candidates ready" on purpose (written with the "reset" policy).
  reopened: "processed",
  reported: "reported",
  stored: "stored",
  returned: "returned",
  discarded: "discarded",
  transferred: null,
};

/**
 * What to do with the sample status when an event is recorded:
 * "forward" moves it on, and refuses an event that would move it back;
 * "keep" records a late entry without touching the status;
 * "reset" moves it to the event's status even backwards (a deliberate correction or re-run; needs a note).
 */
export const STATUS_POLICIES = ["forward", "keep", "reset"] as const;
export type StatusPolicy = (typeof STATUS_POLICIES)[number];

export type StatusPlan =
  | { ok: true; next: SampleStatus; change: "advance" | "same" | "keep" | "regress" }
  | { ok: false; reason: string };

/** Decides the sample's next status for an event; pure, so the lifecycle rules are unit-tested in one place. */
export function planStatusChange(current: SampleStatus, event: CustodyEvent, policy: StatusPolicy = "forward"): StatusPlan {
  const target = CUSTODY_EVENT_STATUS[event];
  if (policy === "keep" || target === null) return { ok: true, next: current, change: target === null ? "same" : "keep" };
  if (target === current) return { ok: true, next: current, change: "same" };
  if (policy === "reset") return { ok: true, next: target, change: STATUS_RANK[target] < STATUS_RANK[current] ? "regress" : "advance" };
  if (STATUS_RANK[target] >= STATUS_RANK[current]) return { ok: true, next: target, change: "advance" };
  return {
    ok: false,
    reason: `The sample is already "${current}"; recording "${event}" would move its status back. Use status policy "keep" to record a late entry without changing the status, or "reset" with a note to move it back on purpose.`,
  };
}

/** Custody events the lab records step by step (intake itself goes through the submission's receive). */
export const LAB_STEP_EVENTS = ["received", "prepared", "scanned", "stored", "returned", "discarded"] as const satisfies readonly CustodyEvent[];
/** Events any custodian may record (a hand-over between people or places). */
export const FIELD_STEP_EVENTS = ["transferred"] as const satisfies readonly CustodyEvent[];
export const STEP_EVENTS = [...LAB_STEP_EVENTS, ...FIELD_STEP_EVENTS] as const;

/**
 * Statuses of a sample the lab holds: intake recorded (through a submission, or "received directly" by an in-house
 * lab) and not yet returned or discarded. Only such a sample can get a scan.
 */
export const AT_LAB_STATUSES = ["received", "prepared", "scanned", "processed", "confirmed", "reported", "stored"] as const satisfies readonly SampleStatus[];
export const isAtLab = (s: SampleStatus) => (AT_LAB_STATUSES as readonly string[]).includes(s);

/** Events recorded on one sample outside a submission: its collection (a planned sample), or an in-house lab's direct receipt. */
export const SAMPLE_EVENTS = ["collected", "received_directly"] as const satisfies readonly CustodyEvent[];

/**
 * The status that a list of events leaves, in the order they were recorded: each event stores the status it left
 * (status_after); a sample without events is "planned". This is the definition of a sample's status.
 */
export function statusFromEvents(events: readonly { statusAfter: SampleStatus | null }[]): SampleStatus {
  for (let i = events.length - 1; i >= 0; i--) if (events[i].statusAfter) return events[i].statusAfter!;
  return "planned";
}
