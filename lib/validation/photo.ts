import { z } from "zod";
import { optionalText } from "./common";

/** Copy a photo's EXIF position onto its sample (the caller chooses to; the sample's version guards concurrent edits). */
export const photoApplyLocationSchema = z
  .object({
    version: z.number({ error: "version is required." }).int().min(1, "version is required."),
    /** Also copy the EXIF altitude (metres above sea level per EXIF). @default false */
    includeElevation: z.boolean().default(false),
  })
  .strict();

export const photoPatchSchema = z.object({ caption: optionalText(500) }).strict();

export const PHOTO_VARIANTS = ["original", "thumb", "display"] as const;
export type PhotoVariantName = (typeof PHOTO_VARIANTS)[number];

/** Beyond this distance from its station a photo's position earns a warning (metres, common practice). */
export const PHOTO_STATION_WARN_M = 200;
