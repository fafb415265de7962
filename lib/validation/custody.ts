import { z } from "zod";
import { CUSTODY_EVENTS, SAMPLE_STATUSES, type SampleStatus } from "@/lib/vocabulary";
import { isoInstant, optionalText } from "./common";

export type CustodyEvent = (typeof CUSTODY_EVENTS)[number];

/**
 * Position of each status on the sample lifecycle (DOMAIN §1): planned → collected → dispatched → received →
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
  prepared: "prepared",
  scanned: "scanned",
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

export { SAMPLE_STATUSES };
