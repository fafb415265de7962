import { z } from "zod";
import { CUSTODY_EVENTS, SAMPLE_STATUSES, type SampleStatus } from "@/lib/vocabulary";
import { isoInstant, optionalText } from "./common";

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

const FUTURE_SLACK_MS = 5 * 60_000;

/** An ISO instant that is not in the future (5 min of clock slack). */
export const pastInstant = isoInstant.refine((v) => Date.parse(v) <= Date.now() + FUTURE_SLACK_MS, "The time cannot be in the future.");

const stepFields = {
  event: z.enum(STEP_EVENTS, { error: `Event must be one of: ${STEP_EVENTS.join(", ")}.` }),
  occurredAt: pastInstant.optional(),
  location: optionalText(200),
  sealNumber: optionalText(80),
  note: optionalText(2000),
  /** Who physically handled the samples, when not the person recording (e.g. a technician without an account). */
  handledBy: optionalText(120),
  handedTo: optionalText(120),
  weightKg: z.number().positive("Weight must be positive.").max(1000, "Weight above 1000 kg is implausible.").nullable().optional(),
  statusPolicy: z.enum(STATUS_POLICIES).default("forward"),
};

const stepRules = <T extends { event: string; statusPolicy: StatusPolicy; note?: string | null }>(v: T, ctx: z.RefinementCtx) => {
  if (v.statusPolicy === "reset" && !v.note) ctx.addIssue({ code: "custom", path: ["note"], message: "Say why the status is reset (a note is required)." });
  if (v.event === "discarded" && !v.note) ctx.addIssue({ code: "custom", path: ["note"], message: "Say why and how the material was disposed of." });
};

/** One custody step for one sample. */
export const custodyStepSchema = z.object(stepFields).strict().superRefine(stepRules);

/** The same step for several samples of a submission at once (all or nothing). */
export const custodyBatchSchema = z
  .object({ ...stepFields, sampleIds: z.array(z.string().trim().min(1)).min(1, "Select at least one sample.").max(1000) })
  .strict()
  .superRefine(stepRules);

export type CustodyStepInput = z.infer<typeof custodyStepSchema>;

/**
 * Statuses of a sample the lab holds: intake recorded (through a submission, or "received directly" by an in-house
 * lab) and not yet returned or discarded. Only such a sample can get a scan.
 */
export const AT_LAB_STATUSES = ["received", "prepared", "scanned", "processed", "confirmed", "reported", "stored"] as const satisfies readonly SampleStatus[];
export const isAtLab = (s: SampleStatus) => (AT_LAB_STATUSES as readonly string[]).includes(s);

/** Events recorded on one sample outside a submission: its collection (a planned sample), or an in-house lab's direct receipt. */
export const SAMPLE_EVENTS = ["collected", "received_directly"] as const satisfies readonly CustodyEvent[];

export const sampleEventSchema = z
  .object({
    event: z.enum(SAMPLE_EVENTS, { error: `Event must be one of: ${SAMPLE_EVENTS.join(", ")}.` }),
    occurredAt: pastInstant.optional(),
    location: optionalText(200),
    note: optionalText(2000),
    /** Who physically handled the sample, when not the person recording. */
    handledBy: optionalText(120),
  })
  .strict()
  .superRefine((v, ctx) => {
    if (v.event === "received_directly" && !v.note) {
      ctx.addIssue({ code: "custom", path: ["note"], message: "Say why the sample is taken without a submission (e.g. brought to the in-house lab by hand)." });
    }
  });

/**
 * The status that a list of events leaves, in the order they were recorded: each event stores the status it left
 * (status_after); a sample without events is "planned". This is the definition of a sample's status.
 */
export function statusFromEvents(events: readonly { statusAfter: SampleStatus | null }[]): SampleStatus {
  for (let i = events.length - 1; i >= 0; i--) if (events[i].statusAfter) return events[i].statusAfter!;
  return "planned";
}

export { SAMPLE_STATUSES };
