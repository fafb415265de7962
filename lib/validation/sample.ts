import { z } from "zod";
import { ELEVATION_REFS, LOCATION_SOURCES, SAMPLE_STATUSES, SAMPLE_TYPES } from "@/lib/vocabulary";
import { clientId, ianaZone, isoInstant, latitude, longitude, optionalText } from "./common";
import { sampleDetailsSchema } from "./sample-details";

export const SAMPLE_CODE_RE = /^[A-Z0-9][A-Z0-9-]{1,30}$/;
/** IGSN: a DOI-style "10.xxxx/SUFFIX" (optionally with igsn: or the doi.org prefix) or a legacy 9-character code. */
export const IGSN_RE = /^(?:(?:igsn:|https:\/\/doi\.org\/)?10\.\d{4,9}\/[A-Z0-9._\-/]+|[A-Z0-9]{5,12})$/i;

/** What a client that sends `status` is told. */
export const STATUS_NOT_WRITABLE =
  "A sample's status cannot be set directly: it follows the custody and review events (collection, dispatch, lab intake, preparation, scan, review, sign-off). Record the event instead.";

const sampleFields = {
  code: z.string().trim().toUpperCase().regex(SAMPLE_CODE_RE, "Use capital letters, digits and hyphens, e.g. APR-000123."),
  igsn: z.string().trim().regex(IGSN_RE, "Not an IGSN: use 10.prefix/SUFFIX (or igsn:10.prefix/SUFFIX).").nullable().optional(),
  stationId: z.string().trim().min(1).nullable().optional(),
  sampleType: z.enum(SAMPLE_TYPES, { error: `Sample type must be one of: ${SAMPLE_TYPES.join(", ")}.` }),
  lithology: optionalText(120),
  alteration: optionalText(200),
  alterationIntensity: z.enum(["none", "weak", "moderate", "strong", "intense"]).nullable().optional(),
  description: optionalText(4000),
  collectedAt: isoInstant.nullable().optional(),
  collectedTz: ianaZone.nullable().optional(),
  collectorName: optionalText(120),
  lat: latitude.nullable().optional(),
  lon: longitude.nullable().optional(),
  elevationM: z.number().min(-500, "Elevation below −500 m is implausible.").max(9000, "Elevation above 9000 m is implausible.").nullable().optional(),
  elevationRef: z.enum(ELEVATION_REFS, { error: "Elevation reference is msl (mean sea level) or ellipsoid (WGS84)." }).nullable().optional(),
  horizontalAccuracyM: z.number().min(0, "Accuracy cannot be negative.").max(100000).nullable().optional(),
  locationSource: z.enum(LOCATION_SOURCES).nullable().optional(),
  locationFixedAt: isoInstant.nullable().optional(),
  /** Fields of the sample type (common practice); `kind` must equal sampleType. */
  typeDetails: sampleDetailsSchema.nullable().optional(),
  storageLocation: optionalText(200),
  /** Never writable: the status follows custody and review events. Present only to answer with a clear message. */
  status: z.undefined({ error: STATUS_NOT_WRITABLE }).optional(),
  suspectedAsbestos: z.boolean().optional(),
  weightKg: z.number().positive("Weight must be positive.").max(1000).nullable().optional(),
};

const bothOrNeither = (v: { lat?: number | null; lon?: number | null }) => (v.lat == null) === (v.lon == null);
const coordMessage = { message: "Give both latitude and longitude, or neither.", path: ["lon"] };
const detailsMatchType = (v: { sampleType?: string; typeDetails?: { kind: string } | null }) => !v.typeDetails || !v.sampleType || v.typeDetails.kind === v.sampleType;
const detailsMessage = { message: "These details belong to another sample type; change the type or clear them.", path: ["typeDetails"] };

/**
 * Create: the code is optional (the project sequence issues one). A sample is registered as collected (a
 * "collected" custody event is written) unless `planned` says it is not taken yet.
 */
export const sampleCreateSchema = z
  .object({ ...sampleFields, id: clientId.optional(), code: sampleFields.code.optional(), planned: z.boolean({ error: "planned is true or false." }).optional() })
  .strict()
  .refine(bothOrNeither, coordMessage)
  .refine(detailsMatchType, detailsMessage);

/** Patch: any subset of fields, plus the version the client read (optimistic concurrency). */
export const samplePatchSchema = z
  .object({ ...sampleFields, version: z.number().int().min(1, "version is required.") })
  .partial()
  .required({ version: true })
  .strict()
  .refine(detailsMatchType, detailsMessage);

export type SampleCreateInput = z.infer<typeof sampleCreateSchema>;
export type SamplePatchInput = z.infer<typeof samplePatchSchema>;

export const SAMPLE_SORTS = ["code", "collectedAt", "sampleType", "lithology", "status", "station", "updatedAt"] as const;

/** Query string of the register: paging, sort, filters. */
export const sampleListQuerySchema = z.object({
  page: z.coerce.number().int().min(1).default(1),
  pageSize: z.coerce.number().int().min(1).max(500).default(25),
  sort: z.enum(SAMPLE_SORTS).default("code"),
  dir: z.enum(["asc", "desc"]).default("asc"),
  q: z.string().trim().max(100).optional(),
  code: z.string().trim().max(40).optional(),
  status: z.enum(SAMPLE_STATUSES).optional(),
  sampleType: z.enum(SAMPLE_TYPES).optional(),
  stationId: z.string().optional(),
  lithology: z.string().trim().max(120).optional(),
  alteration: z.string().trim().max(120).optional(),
  collector: z.string().trim().max(120).optional(),
  from: z.string().date("from must be a date YYYY-MM-DD.").optional(),
  to: z.string().date("to must be a date YYYY-MM-DD.").optional(),
  /** west,south,east,north in degrees */
  bbox: z
    .string()
    .regex(/^-?\d+(\.\d+)?(,-?\d+(\.\d+)?){3}$/, "bbox is west,south,east,north in decimal degrees.")
    .optional(),
});
export type SampleListQuery = z.infer<typeof sampleListQuerySchema>;
