import { z } from "zod";
import { ANODES, PHASE_STATUSES, REFERENCE_HAZARDS } from "@/lib/vocabulary";
import { optionalText } from "./common";

/** Upload-form choices for Kα2: decided from the peak shapes, or said by the analyst. */
export const KALPHA2_CHOICES = ["auto", "present", "absent"] as const;

/** The processing mode of an upload-form Kα2 choice. */
export function kAlpha2Mode(choice: (typeof KALPHA2_CHOICES)[number] | undefined): "auto" | "yes" | "no" {
  return choice === "present" ? "yes" : choice === "absent" ? "no" : "auto";
}

/** Multipart form values arrive as strings: "" means "not given". */
const blankToUndefined = (v: unknown) => (typeof v === "string" && v.trim() === "" ? undefined : v);
const formNumber = (label: string, min: number, max: number) =>
  z.preprocess(
    blankToUndefined,
    z.coerce
      .number({ error: `${label} must be a number.` })
      .refine(Number.isFinite, `${label} must be a number.`)
      .min(min, `${label} must be at least ${min}.`)
      .max(max, `${label} must be at most ${max}.`)
      .optional(),
  );

export const anodeSchema = z.enum(ANODES, { error: `Anode must be one of: ${ANODES.join(", ")}.` });

/**
 * Instrument settings typed on the upload form. Each is used only where the file does not say; range and step
 * are always read from the data (the form values, when given, are checked against it).
 */
export const scanSettingsSchema = z.object({
  anode: z.preprocess(blankToUndefined, anodeSchema.optional()),
  /** Kα1 (or single) wavelength, Å. */
  wavelength: formNumber("Wavelength (Å)", 0.1, 5),
  /** Kα2 wavelength, Å. */
  wavelength2: formNumber("Kα2 wavelength (Å)", 0.1, 5),
  twoThetaStart: formNumber("Start 2θ", 0.1, 179),
  twoThetaEnd: formNumber("End 2θ", 0.1, 179.9),
  stepDeg: formNumber("Step", 0.0001, 5),
  timePerStepS: formNumber("Time per step (s)", 0.001, 3600),
  instrument: z.preprocess(blankToUndefined, z.string().trim().max(200, "At most 200 characters.").optional()),
  /** Kα2 in the scan: decided from the peak shapes ("auto"), or said by the analyst. */
  kAlpha2: z.preprocess(blankToUndefined, z.enum(KALPHA2_CHOICES, { error: "Kα2 must be auto, present or absent." }).optional()),
});
export type ScanSettingsInput = z.infer<typeof scanSettingsSchema>;

/** Single upload: the settings plus the sample the file belongs to. */
export const scanUploadSchema = scanSettingsSchema.extend({
  sampleId: z.string({ error: "Choose the sample this scan belongs to." }).trim().min(1, "Choose the sample this scan belongs to."),
});

const elementSymbol = z
  .string()
  .trim()
  .regex(/^[A-Za-z][a-z]?$/, "Use element symbols such as Si, Fe, O.")
  .transform((s) => s.charAt(0).toUpperCase() + s.slice(1).toLowerCase());

/** Processing and identification parameters of a run (all optional; the science core fills in defaults). */
export const processParamsSchema = z
  .object({
    processing: z
      .object({
        anode: anodeSchema.optional(),
        wavelength: z.number().min(0.1).max(5).optional(),
        wavelength2: z.number().min(0.1).max(5).optional(),
        expectedFwhmDeg: z.number().min(0.01, "Expected FWHM must be at least 0.01°.").max(2, "Expected FWHM must be at most 2°.").optional(),
        smoothing: z
          .object({
            enabled: z.boolean().optional(),
            windowSize: z
              .union([z.literal("auto"), z.number().int().min(5).max(101).refine((n) => n % 2 === 1, "The smoothing window must be an odd number of points.")])
              .optional(),
            polynomial: z.number().int().min(2).max(6).optional(),
          })
          .strict()
          .optional(),
        background: z
          .object({
            enabled: z.boolean().optional(),
            halfWidthDeg: z.number().min(0.05, "Background half-width must be at least 0.05°.").max(10, "Background half-width must be at most 10°.").optional(),
          })
          .strict()
          .optional(),
        kAlpha2: z
          .object({
            mode: z.enum(["auto", "yes", "no"], { error: "Kα2 mode must be auto, yes or no." }).optional(),
            enabled: z.boolean().optional(),
            ratio: z.number().min(0).max(1).optional(),
          })
          .strict()
          .optional(),
        peaks: z
          .object({
            k: z.number().min(1, "Peak threshold k must be at least 1.").max(50).optional(),
            maxPeaks: z.number().int().min(1).max(1000).optional(),
          })
          .strict()
          .optional(),
        correction: z
          .object({
            zeroShiftDeg: z.number().min(-2).max(2).optional(),
            displacementMm: z.number().min(-3).max(3).optional(),
            radiusMm: z.number().min(50).max(1000).optional(),
          })
          .strict()
          .optional(),
        scherrer: z
          .object({ enabled: z.boolean().optional(), K: z.number().min(0.5).max(2).optional(), instrumentalFwhmDeg: z.number().min(0).max(2).optional() })
          .strict()
          .optional(),
      })
      .strict()
      .optional(),
    identify: z
      .object({
        tolerance: z.object({ twoTheta: z.number().min(0.01).max(1).optional(), dRelative: z.number().min(0).max(0.05).optional() }).strict().optional(),
        maxZeroShift: z.number().min(0).max(2).optional(),
        elements: z
          .object({
            required: z.array(elementSymbol).max(20).optional(),
            allowed: z.array(elementSymbol).max(100).optional(),
            excluded: z.array(elementSymbol).max(100).optional(),
          })
          .strict()
          .optional(),
        minScore: z.number().min(0).max(1).optional(),
        maxPhases: z.number().int().min(1).max(12).optional(),
      })
      .strict()
      .optional(),
  })
  .strict();
export type ProcessParamsInput = z.infer<typeof processParamsSchema>;

/** Analyst's decision on a candidate phase. */
export const phaseDecisionSchema = z
  .object({
    status: z.enum(PHASE_STATUSES, { error: "Status must be candidate, accepted or rejected." }),
    note: optionalText(2000),
  })
  .strict();

/** Analyst adds a phase the search did not propose. */
export const manualPhaseSchema = z
  .object({
    referencePhaseId: z.string({ error: "Choose a phase from the reference library." }).trim().min(1, "Choose a phase from the reference library."),
    note: optionalText(2000),
  })
  .strict();

/** Most phases the analyst may fit at once. */
export const MAX_REFIT_PHASES = 10;

/** Refit the whole pattern with exactly these reference phases (the analyst's choice). */
export const refitSchema = z
  .object({
    phaseIds: z
      .array(z.string({ error: "Each phase is a reference phase id." }).trim().min(1, "A phase id cannot be empty."), { error: "List the phases to fit (phaseIds)." })
      .min(1, "Fit at least one phase.")
      .max(MAX_REFIT_PHASES, `Fit at most ${MAX_REFIT_PHASES} phases at once.`)
      .refine((ids) => new Set(ids).size === ids.length, "List each phase once."),
  })
  .strict();

export const scanNoteSchema = z.object({ note: optionalText(8000) }).strict();

/** Make an earlier run the current one. */
export const scanPatchSchema = z.object({ currentRunId: z.string().trim().min(1) }).strict();

/** Reopening a sign-off says why (kept with the sign-off's version). */
export const reopenSchema = z
  .object({ reason: z.string({ error: "Say why the sign-off is reopened." }).trim().min(5, "Say why the sign-off is reopened (at least a few words).").max(2000, "At most 2000 characters.") })
  .strict();

export const signOffSchema = z
  .object({
    /** The analyst confirms they reviewed the accepted phases. */
    confirm: z.literal(true, { error: "Tick the confirmation to sign off." }),
    note: optionalText(8000),
  })
  .strict();

export const scanListQuerySchema = z.object({
  sampleId: z.string().trim().min(1).optional(),
  status: z.enum(["uploaded", "processing", "processed", "failed", "signed_off"]).optional(),
  page: z.coerce.number().int().min(1).default(1),
  pageSize: z.coerce.number().int().min(1).max(200).default(50),
});
export type ScanListQuery = z.infer<typeof scanListQuerySchema>;

export const referenceListQuerySchema = z.object({
  q: z.string().trim().max(100).optional(),
  hazard: z.enum(REFERENCE_HAZARDS).optional(),
  element: elementSymbol.optional(),
  source: z.enum(["builtin", "imported"]).optional(),
  page: z.coerce.number().int().min(1).default(1),
  pageSize: z.coerce.number().int().min(1).max(500).default(200),
});
export type ReferenceListQuery = z.infer<typeof referenceListQuerySchema>;

export const patternQuerySchema = z.object({
  anode: anodeSchema.optional(),
  wavelength: z.coerce.number().min(0.1).max(5).optional(),
  twoThetaMax: z.coerce.number().min(10).max(160).default(100),
});

// ---------------------------------------------------------------------------------------------------------------
// File name → sample code matching (bulk upload). Pure, shared by the server and the upload form.

/**
 * Splits a code or file name into comparison tokens: runs of letters (upper-cased) and runs of digits (leading
 * zeros dropped), so "apr-000012_bulk.xy" → ["APR", "12", "BULK", "XY"] and "APR-000012" → ["APR", "12"].
 */
export function codeTokens(text: string): string[] {
  const out: string[] = [];
  for (const m of text.toUpperCase().matchAll(/[A-Z]+|[0-9]+/g)) out.push(/^[0-9]/.test(m[0]) ? String(BigInt(m[0])) : m[0]);
  return out;
}

/** A file name with its extension removed ("a.b.xy" → "a.b"); only the last extension is dropped. */
export function stripExtension(fileName: string): string {
  const base = fileName.split(/[\\/]/).pop() ?? fileName;
  const dot = base.lastIndexOf(".");
  return dot > 0 ? base.slice(0, dot) : base;
}

export interface SampleCodeRef {
  id: string;
  code: string;
}

export type FileMatch =
  | { fileName: string; sampleId: string; sampleCode: string }
  | { fileName: string; sampleId: null; sampleCode: null; reason: string; alternatives?: string[] };

/**
 * Matches upload file names to sample codes: a code matches when its tokens appear, in order and adjacent, in the
 * file name's tokens (case, separators and leading zeros ignored: `apr-000012_bulk.csv`, `APR000012.xy` and
 * `APR-12 run2.xy` all name APR-000012). The longest matching code wins (APR-000012-D over APR-000012); two
 * different codes of the same length make the file ambiguous. Time is linear in the total number of tokens.
 * @param fileNames - names as uploaded
 * @param samples - the project's sample codes
 */
export function matchFilesToSamples(fileNames: readonly string[], samples: readonly SampleCodeRef[]): FileMatch[] {
  // Index codes by their first two tokens (or the single token of a one-token code).
  const index = new Map<string, { ref: SampleCodeRef; tokens: string[] }[]>();
  for (const ref of samples) {
    const tokens = codeTokens(ref.code);
    if (tokens.length === 0) continue;
    const key = tokens.slice(0, 2).join("|");
    const list = index.get(key);
    if (list) list.push({ ref, tokens });
    else index.set(key, [{ ref, tokens }]);
  }
  return fileNames.map((fileName) => {
    const tokens = codeTokens(stripExtension(fileName));
    let best: { ref: SampleCodeRef; len: number }[] = [];
    for (let i = 0; i < tokens.length; i++) {
      for (const key of [tokens.slice(i, i + 2).join("|"), tokens[i]]) {
        for (const cand of index.get(key) ?? []) {
          const len = cand.tokens.length;
          if (i + len > tokens.length) continue;
          let ok = true;
          for (let k = 0; k < len && ok; k++) ok = tokens[i + k] === cand.tokens[k];
          if (!ok) continue;
          if (best.length === 0 || len > best[0].len) best = [{ ref: cand.ref, len }];
          else if (len === best[0].len && !best.some((b) => b.ref.id === cand.ref.id)) best.push({ ref: cand.ref, len });
        }
      }
    }
    if (best.length === 1) return { fileName, sampleId: best[0].ref.id, sampleCode: best[0].ref.code };
    if (best.length > 1) {
      return { fileName, sampleId: null, sampleCode: null, reason: "The name matches more than one sample code.", alternatives: best.map((b) => b.ref.code).sort() };
    }
    return { fileName, sampleId: null, sampleCode: null, reason: "No sample code of this project found in the file name." };
  });
}

// ---------------------------------------------------------------------------------------------------------------
// Hazard classes for the cautions (common practice; silica: US OSHA 29 CFR 1910.1053, IARC 100C).

/** Species that occur in asbestiform habit (common practice), including the trade names of their asbestos forms. */
export const ASBESTIFORM_MINERALS = ["chrysotile", "riebeckite", "crocidolite", "grunerite", "amosite", "anthophyllite", "tremolite", "actinolite", "erionite"] as const;
/** Crystalline silica polymorphs (quartz and cristobalite, as in IARC 100C; tridymite and coesite are polymorphs too). */
export const CRYSTALLINE_SILICA_MINERALS = ["quartz", "cristobalite", "tridymite", "coesite"] as const;

/**
 * Hazard class of a mineral name: asbestos-group species or crystalline silica, else null. A suffix after a space,
 * hyphen or bracket is ignored ("erionite-Na", "quartz (low)").
 */
export function hazardFromName(mineral: string): "asbestos" | "crystalline_silica" | null {
  const base = mineral.trim().toLowerCase().split(/[\s\-_(,]/)[0];
  if ((ASBESTIFORM_MINERALS as readonly string[]).includes(base)) return "asbestos";
  if ((CRYSTALLINE_SILICA_MINERALS as readonly string[]).includes(base)) return "crystalline_silica";
  return null;
}
