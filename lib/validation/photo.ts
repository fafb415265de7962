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

/**
 * Gallery edits: the caption and the azimuth the camera faced (degrees clockwise from north, 0–360, the range of
 * EXIF GPSImgDirection — CIPA DC-008 "Exif 2.3", 2012, tag 0x0011), with its reference (T true, M magnetic).
 */
export const photoPatchSchema = z
  .object({
    caption: optionalText(500),
    imgDirection: z
      .number({ error: "Azimuth must be a number of degrees." })
      .min(0, "Azimuth must be between 0 and 360 degrees (clockwise from north).")
      .max(360, "Azimuth must be between 0 and 360 degrees (clockwise from north).")
      .nullable()
      .optional(),
    imgDirectionRef: z.enum(["T", "M"], { error: "Azimuth reference must be T (true north) or M (magnetic north)." }).nullable().optional(),
  })
  .strict();

/**
 * What a device sends when it opens a resumable upload (tus Upload-Metadata): its own photo id (UUID, so a replay
 * is recognised), the sample or the station the photo belongs to (exactly one), and the file name.
 */
export const photoUploadMetaSchema = z
  .object({
    clientPhotoId: z.uuid({ error: "clientPhotoId must be a UUID made on the device." }),
    sampleId: z.string().min(1).max(64).nullish(),
    stationId: z.string().min(1).max(64).nullish(),
    filename: z
      .string({ error: "filename is required." })
      .trim()
      .min(1, "filename is required.")
      .max(255, "filename is at most 255 characters.")
      .transform((n) => n.replace(/[\\/\u0000-\u001f]/g, "_")),
  })
  .refine((m) => !!m.sampleId !== !!m.stationId, { message: "Give exactly one of sampleId and stationId.", path: ["sampleId"] });
export type PhotoUploadMeta = z.infer<typeof photoUploadMetaSchema>;

export const PHOTO_VARIANTS = ["original", "thumb", "display"] as const;
export type PhotoVariantName = (typeof PHOTO_VARIANTS)[number];

/** Beyond this distance from its station a photo's position earns a warning (metres, common practice). */
export const PHOTO_STATION_WARN_M = 200;
