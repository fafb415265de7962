import { z } from "zod";
import { ELEVATION_REFS, LOCATION_SOURCES } from "@/lib/vocabulary";
import { clientId, isoInstant, latitude, longitude, optionalText } from "./common";

/** Station codes: capital letters, digits and hyphens, e.g. APR-ST-045. */
export const STATION_CODE_RE = /^[A-Z0-9][A-Z0-9-]{1,30}$/;

export const elevation = z
  .number({ error: "Elevation must be a number (metres)." })
  .min(-500, "Elevation below −500 m is implausible.")
  .max(9000, "Elevation above 9000 m is implausible.");
export const horizontalAccuracy = z.number({ error: "Accuracy must be a number (metres)." }).min(0, "Accuracy cannot be negative.").max(100000, "Accuracy above 100 km is not a position.");

const stationFields = {
  code: z.string().trim().toUpperCase().regex(STATION_CODE_RE, "Use capital letters, digits and hyphens, e.g. APR-ST-045."),
  name: optionalText(120),
  lat: latitude,
  lon: longitude,
  elevationM: elevation.nullable().optional(),
  elevationRef: z.enum(ELEVATION_REFS, { error: "Elevation reference is msl (mean sea level) or ellipsoid (WGS84)." }).nullable().optional(),
  horizontalAccuracyM: horizontalAccuracy.nullable().optional(),
  locationSource: z.enum(LOCATION_SOURCES).nullable().optional(),
  locationFixedAt: isoInstant.nullable().optional(),
  description: optionalText(4000),
  lithology: optionalText(120),
  observedAt: isoInstant.nullable().optional(),
};

/** Create: the code is optional (the project's station sequence issues one, e.g. APR-ST-016). */
export const stationCreateSchema = z.object({ ...stationFields, id: clientId.optional(), code: stationFields.code.optional() }).strict();

/** Patch: any subset plus the version the client read (optimistic concurrency). */
export const stationPatchSchema = z
  .object({ ...stationFields, version: z.number({ error: "version is required." }).int().min(1, "version is required.") })
  .partial()
  .required({ version: true })
  .strict();

export type StationCreateInput = z.infer<typeof stationCreateSchema>;
export type StationPatchInput = z.infer<typeof stationPatchSchema>;

export const stationListQuerySchema = z.object({
  q: z.string().trim().max(100).optional(),
  limit: z.coerce.number().int().min(1).max(2000).default(500),
});
