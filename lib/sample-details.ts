/**
 * Sample-type details without zod: the choices, their labels and the empty details a form starts from.
 * Forms import this module; the schema that checks the details is lib/validation/sample-details.ts.
 */
import type { SampleDetails } from "@/lib/validation/sample-details";
import type { SampleType } from "@/lib/vocabulary";

/** Core sizes by wireline name (common practice). */
export const CORE_SIZES = ["AQ", "BQ", "NQ", "HQ", "PQ", "other"] as const;
export const CORE_PORTIONS = ["whole", "half", "quarter"] as const;
/** Soil horizons (master horizons O, A, E, B, C, R — common practice). */
export const SOIL_HORIZONS = ["O", "A", "E", "B", "C", "R"] as const;
export const FLOW_STATES = ["dry", "low", "moderate", "high", "flood"] as const;
export const OTHER_SUBTYPES = ["pan_concentrate", "till", "rc_chips", "mine_dump", "other"] as const;

export const CORE_PORTION_LABELS: Record<(typeof CORE_PORTIONS)[number], string> = { whole: "Whole core", half: "Half core (sawn)", quarter: "Quarter core" };
export const FLOW_STATE_LABELS: Record<(typeof FLOW_STATES)[number], string> = { dry: "Dry", low: "Low flow", moderate: "Moderate flow", high: "High flow", flood: "Flood" };
export const OTHER_SUBTYPE_LABELS: Record<(typeof OTHER_SUBTYPES)[number], string> = {
  pan_concentrate: "Pan concentrate",
  till: "Till",
  rc_chips: "Rock chips from drilling (RC)",
  mine_dump: "Mine dump",
  other: "Other",
};

/** Empty details for a type (what the form starts from when the type changes). */
export function emptySampleDetails(kind: SampleType): SampleDetails {
  // Core starts with blank depths (not 0) so the form asks for them.
  return kind === "float" ? { kind, inSitu: false } : kind === "core" ? ({ kind, holeId: "", fromM: null, toM: null } as unknown as SampleDetails) : ({ kind } as SampleDetails);
}
