/** Input of a share link (shared by the lead's form and the DAL). Pure (zod). */
import { z } from "zod";
import { optionalText } from "@/lib/validation/common";

/** Longest validity a lead may give a link, days (our policy: links are for a review, not for ever). */
export const SHARE_LINK_MAX_DAYS = 90;

export const shareLinkCreateSchema = z
  .object({
    label: optionalText(120),
    /** Days from now until the link stops working. */
    expiresInDays: z
      .number({ error: "expiresInDays must be a whole number of days." })
      .int("expiresInDays must be a whole number of days.")
      .min(1, "A link must be valid for at least 1 day.")
      .max(SHARE_LINK_MAX_DAYS, `A link may be valid for at most ${SHARE_LINK_MAX_DAYS} days.`)
      .default(14),
    /** The register filter (query parameters of the register / phase map); paging is dropped. */
    filter: z.record(z.string(), z.union([z.string(), z.number(), z.boolean()])).default({}),
  })
  .strict();
export type ShareLinkCreateInput = z.infer<typeof shareLinkCreateSchema>;
