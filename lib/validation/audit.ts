import { z } from "zod";

const day = z.string().date("Use a date YYYY-MM-DD.");

/** Filters of the audit log (query string of the page, the API and the CSV export). */
export const auditQuerySchema = z
  .object({
    /** Record type, e.g. sample, submission, scan. */
    entity: z.string().trim().max(40).regex(/^[a-z_]+$/, "Record type is lower-case letters and underscores, e.g. sample.").optional(),
    /** One record's id. */
    entityId: z.string().trim().max(80).optional(),
    /** A person's user id, or "system" for entries the app wrote by itself. */
    actorId: z.string().trim().max(80).optional(),
    /** An action, or its family: "custody" matches custody.received, custody.scanned… */
    action: z.string().trim().max(60).regex(/^[a-z_.]+$/, "Action is lower-case letters, dots and underscores, e.g. custody.received.").optional(),
    from: day.optional(),
    to: day.optional(),
    page: z.coerce.number().int().min(1).max(100_000).default(1),
    pageSize: z.coerce.number().int().min(1).max(200).default(50),
  })
  .refine((v) => !v.from || !v.to || v.from <= v.to, { message: "The end date is before the start date.", path: ["to"] });

export type AuditQuery = z.infer<typeof auditQuerySchema>;
