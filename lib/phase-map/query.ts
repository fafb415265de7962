/**
 * The register filter: the sample register's query parameters (lib/validation/sample.ts) plus phase
 * filters. One schema for the phase map, every export format and share links, so "the current filter"
 * means the same thing everywhere. Pure (zod only).
 */
import { z } from "zod";
import { sampleListQuerySchema } from "@/lib/validation/sample";

/**
 * Which results count: "confirmed" (accepted on a signed-off scan), "candidate" (leading, not yet
 * confirmed) or "any" (both, drawn differently).
 */
export const PHASE_FILTERS = ["confirmed", "any", "candidate"] as const;
export type PhaseFilter = (typeof PHASE_FILTERS)[number];

const nameLike = (what: string) =>
  z
    .string()
    .trim()
    .toLowerCase()
    .max(60, `${what} has at most 60 characters.`)
    .regex(/^[a-z0-9][a-z0-9 ()\-,]*$/, `${what} is a mineral name such as quartz (letters, digits, spaces, hyphens, brackets).`);

/** Phase filter parameters added to the register's. */
export const phaseFilterShape = {
  /** Only samples/stations where this mineral (lowercase IMA name) is found with the chosen `phase` status. */
  mineral: nameLike("mineral").optional(),
  /** Only samples/stations with a phase of this mineral group (e.g. sulfide). */
  group: nameLike("group").optional(),
  phase: z.enum(PHASE_FILTERS, { error: `phase must be one of: ${PHASE_FILTERS.join(", ")}.` }).default("confirmed"),
  /** How many leading candidates per scan count (by rank). */
  leading: z.coerce.number({ error: "leading must be a whole number from 1 to 10." }).int("leading must be a whole number from 1 to 10.").min(1, "leading must be at least 1.").max(10, "leading is at most 10.").default(3),
};

/** Register filter + sort (paging is accepted and ignored where everything is returned). */
export const registerFilterSchema = sampleListQuerySchema.extend(phaseFilterShape);
export type RegisterFilter = z.infer<typeof registerFilterSchema>;

/** Query keys that belong to the filter (for building links and share links). */
export const REGISTER_FILTER_KEYS = [
  "q",
  "code",
  "status",
  "sampleType",
  "stationId",
  "lithology",
  "alteration",
  "collector",
  "from",
  "to",
  "bbox",
  "mineral",
  "group",
  "phase",
  "leading",
  "sort",
  "dir",
] as const;

/** The filter part of a query string/object, without paging, empty values dropped. */
export function filterParams(input: URLSearchParams | Record<string, unknown>): Record<string, string> {
  const out: Record<string, string> = {};
  const get = (k: string): unknown => (input instanceof URLSearchParams ? input.get(k) : input[k]);
  for (const k of REGISTER_FILTER_KEYS) {
    const v = get(k);
    if (v === null || v === undefined || v === "") continue;
    out[k] = String(v);
  }
  return out;
}

/** Whether the filter asks for a particular mineral or group. */
export const hasPhaseCriterion = (q: Pick<RegisterFilter, "mineral" | "group">) => Boolean(q.mineral || q.group);

/** A query string as a plain object for the DAL (empty values dropped; the DAL validates after the access check). */
export function queryObject(params: URLSearchParams): Record<string, string> {
  const out: Record<string, string> = {};
  params.forEach((v, k) => {
    if (v !== "") out[k] = v;
  });
  return out;
}
