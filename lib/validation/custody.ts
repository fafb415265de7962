import { z } from "zod";
import { SAMPLE_EVENTS, STATUS_POLICIES, STEP_EVENTS, type StatusPolicy } from "@/lib/custody";
import { isoInstant, optionalText } from "./common";

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
