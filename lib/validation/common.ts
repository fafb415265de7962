import { z } from "zod";

/** Optional free text: trims, turns "" into null, caps the length. */
export const optionalText = (max = 2000) =>
  z
    .string()
    .trim()
    .max(max, `At most ${max} characters.`)
    .transform((v) => (v === "" ? null : v))
    .nullable()
    .optional();

export const latitude = z.number({ error: "Latitude must be a number." }).min(-90, "Latitude must be between −90 and 90.").max(90, "Latitude must be between −90 and 90.");
export const longitude = z.number({ error: "Longitude must be a number." }).min(-180, "Longitude must be between −180 and 180.").max(180, "Longitude must be between −180 and 180.");

/** An ISO 8601 instant with an offset or Z, e.g. 2026-03-14T17:05:22Z. */
export const isoInstant = z
  .string()
  .trim()
  .refine((v) => /^\d{4}-\d{2}-\d{2}T\d{2}:\d{2}(:\d{2}(\.\d+)?)?(Z|[+-]\d{2}:\d{2})$/.test(v) && !Number.isNaN(Date.parse(v)), {
    message: "Use an ISO 8601 date-time with offset, e.g. 2026-03-14T17:05:22Z.",
  });

/** An IANA zone name the runtime knows, e.g. Europe/Madrid. */
export const ianaZone = z
  .string()
  .trim()
  .refine((v) => {
    try {
      new Intl.DateTimeFormat("en", { timeZone: v });
      return true;
    } catch {
      return false;
    }
  }, "Unknown time zone; use an IANA name such as Europe/Madrid.");

/** zod issues → { "field.path": ["message"] } */
export function fieldErrors(error: z.ZodError): Record<string, string[]> {
  const out: Record<string, string[]> = {};
  for (const issue of error.issues) {
    const key = issue.path.length ? issue.path.join(".") : "_";
    (out[key] ??= []).push(issue.message);
  }
  return out;
}

/** A record id made by the client (offline capture), a UUID per RFC 9562 (UUIDv7 recommended: time-ordered). */
export const clientId = z.uuid({ error: "id must be a UUID (RFC 9562), e.g. made with uuidv7() on the device." }).transform((v) => v.toLowerCase());
