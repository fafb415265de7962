import { z } from "zod";
import { INTAKE_CONDITIONS, PRIORITIES, SUBMISSION_STATUSES } from "@/lib/vocabulary";
import { optionalText } from "./common";
import { pastInstant } from "./custody";

const email = z.string().trim().toLowerCase().pipe(z.email("Not an e-mail address."));

const uniqueIds = (ids: string[]) => new Set(ids).size === ids.length;

export const submissionCreateSchema = z
  .object({
    sampleIds: z
      .array(z.string().trim().min(1), { error: "sampleIds must be a list of sample ids." })
      .min(1, "Select at least one sample.")
      .max(500, "At most 500 samples per submission.")
      .refine(uniqueIds, "A sample is listed twice."),
    requestedAnalysis: z
      .array(z.string().trim().min(1, "An analysis cannot be empty.").max(80, "At most 80 characters per analysis."), { error: "requestedAnalysis must be a list." })
      .min(1, "Choose at least one analysis, e.g. XRD bulk.")
      .max(10),
    priority: z.enum(PRIORITIES, { error: `Priority must be one of: ${PRIORITIES.join(", ")}.` }).default("routine"),
    hazards: optionalText(1000),
    qaqcNote: optionalText(1000),
    notes: optionalText(4000),
    labEmail: email.nullable().optional(),
  })
  .strict();
export type SubmissionCreateInput = z.infer<typeof submissionCreateSchema>;

export const submissionSendSchema = z
  .object({
    waybill: z.string({ error: "Give the courier's waybill number (or \"hand-carried\")." }).trim().min(1, "Give the courier's waybill number (or \"hand-carried\").").max(80),
    courier: optionalText(120),
    occurredAt: pastInstant.optional(),
    sealNumber: optionalText(80),
    location: optionalText(200),
    note: optionalText(2000),
    /** Only re-send the e-mail of a submission that is already sent. */
    resendEmail: z.boolean().optional(),
  })
  .strict();

export const submissionResendSchema = z.object({ resendEmail: z.literal(true) }).strict();

export const intakeItemSchema = z
  .object({
    sampleId: z.string().trim().min(1, "sampleId is required."),
    condition: z.enum(INTAKE_CONDITIONS, { error: `Condition must be one of: ${INTAKE_CONDITIONS.join(", ")}.` }),
    location: optionalText(200),
    weightKg: z.number().positive("Weight must be positive.").max(1000).nullable().optional(),
    note: optionalText(1000),
  })
  .strict()
  .refine((v) => v.condition !== "damaged" || !!v.note, { message: "Describe the damage.", path: ["note"] });

export const submissionReceiveSchema = z
  .object({
    receivedAt: pastInstant.optional(),
    labReference: optionalText(80),
    /** Default location for every bag without its own, e.g. "Lab reception, shelf R2". */
    location: optionalText(200),
    sealNumber: optionalText(80),
    note: optionalText(2000),
    items: z.array(intakeItemSchema).min(1, "Give the condition of each bag on the manifest."),
  })
  .strict()
  .refine((v) => uniqueIds(v.items.map((i) => i.sampleId)), { message: "A sample appears twice in the intake.", path: ["items"] });
export type SubmissionReceiveInput = z.infer<typeof submissionReceiveSchema>;

export const submissionListQuerySchema = z.object({
  status: z.enum(SUBMISSION_STATUSES).optional(),
});

/** Next code in a project, e.g. APR-SUB-0007. */
export function formatSubmissionCode(projectCode: string, seq: number): string {
  return `${projectCode}-SUB-${String(seq).padStart(4, "0")}`;
}
