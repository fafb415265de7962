import { z } from "zod";
import { ANODES } from "@/lib/vocabulary";
import { ianaZone, optionalText } from "./common";
import { SAMPLE_CODE_RE } from "./sample";

/** Default pattern of new sample codes: the project code, a hyphen and six digits (APR-000042). */
export const DEFAULT_SAMPLE_CODE_PATTERN = "{code}-{seq:6}";

/**
 * A sample code from a pattern: {code} the project code, {yyyy} the year (UTC), {seq:N} the sequence number with N
 * digits (at least 3, at most 9). Pure.
 */
export function formatCodeFromPattern(pattern: string | null | undefined, projectCode: string, seq: number, at: Date = new Date()): string {
  return (pattern || DEFAULT_SAMPLE_CODE_PATTERN)
    .replace(/\{code\}/g, projectCode)
    .replace(/\{yyyy\}/g, String(at.getUTCFullYear()))
    .replace(/\{seq:(\d)\}/g, (_, n: string) => String(seq).padStart(Number(n), "0"));
}

/** Why a pattern cannot issue valid, unique codes, or null. */
export function sampleCodePatternProblem(pattern: string): string | null {
  const seq = pattern.match(/\{seq:(\d)\}/g) ?? [];
  if (seq.length !== 1) return "The pattern needs exactly one {seq:N} (N digits of the sequence, e.g. {seq:6}).";
  const n = Number(/\{seq:(\d)\}/.exec(pattern)![1]);
  if (n < 3 || n > 9) return "Use 3 to 9 digits for the sequence, e.g. {seq:6}.";
  const rest = pattern.replace(/\{code\}|\{yyyy\}|\{seq:\d\}/g, "");
  if (/[{}]/.test(rest)) return "Unknown token: use {code}, {yyyy} and {seq:N} only.";
  const example = formatCodeFromPattern(pattern, "ABC", 42, new Date(Date.UTC(2026, 0, 1)));
  if (!SAMPLE_CODE_RE.test(example)) return `Codes from this pattern (e.g. ${example}) would not be valid sample codes: capital letters, digits and hyphens only, 2–31 characters.`;
  return null;
}

const projectCode = z
  .string({ error: "A project code is required." })
  .trim()
  .toUpperCase()
  .regex(/^[A-Z][A-Z0-9]{1,7}$/, "Use 2–8 capital letters or digits, starting with a letter (e.g. APR): it prefixes sample codes.");

const settings = {
  name: z.string({ error: "A name is required." }).trim().min(2, "Give the project a name.").max(120, "At most 120 characters."),
  region: optionalText(120),
  description: optionalText(4000),
  timeZone: ianaZone.nullable().optional(),
  labEmail: z.string().trim().toLowerCase().pipe(z.email("Not an e-mail address.")).nullable().optional(),
  labAddress: optionalText(500),
  labInHouse: z.boolean().optional(),
  defaultAnode: z.enum(ANODES, { error: `Anode must be one of: ${ANODES.join(", ")}.` }).nullable().optional(),
  defaultInstrument: optionalText(120),
  sampleCodePattern: z
    .string()
    .trim()
    .max(40, "At most 40 characters.")
    .transform((v) => (v === "" ? null : v))
    .nullable()
    .optional()
    .superRefine((v, ctx) => {
      const p = v ? sampleCodePatternProblem(v) : null;
      if (p) ctx.addIssue({ code: "custom", message: p });
    }),
};

/** A new project (site admin, or anyone when the site allows it). */
export const projectCreateSchema = z.object({ code: projectCode, ...settings }).strict();

/** Settings edits (lead): any subset, with the version the form read. */
export const projectPatchSchema = z
  .object({ code: projectCode, ...settings, version: z.number().int().min(1) })
  .partial()
  .required({ version: true })
  .strict();

export const projectArchiveSchema = z.object({ archived: z.boolean({ error: "archived is true or false." }) }).strict();
