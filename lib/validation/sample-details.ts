import { z } from "zod";
import { CORE_PORTIONS, CORE_SIZES, FLOW_STATES, OTHER_SUBTYPES, SOIL_HORIZONS } from "@/lib/sample-details";
import { SAMPLE_TYPES } from "@/lib/vocabulary";
import { optionalText } from "./common";

const metres = (label: string, max = 5000) =>
  z.number({ error: `${label} must be a number (metres).` }).min(0, `${label} cannot be negative.`).max(max, `${label} above ${max} m is implausible.`);

const optionalNumber = (schema: z.ZodNumber) => schema.nullable().optional();

const interval = <T extends { fromM?: number | null; toM?: number | null }>(v: T) => v.fromM == null || v.toM == null || v.toM > v.fromM;
const intervalMessage = { message: "“To” must be deeper/further than “from”.", path: ["toM"] };

/** Fields that only some sample types have (common practice). `kind` repeats the sample type. */
export const sampleDetailsSchema = z.discriminatedUnion(
  "kind",
  [
    z.object({ kind: z.literal("hand_sample"), representativeness: optionalText(500) }).strict(),
    z
      .object({
        kind: z.literal("chip"),
        lengthM: optionalNumber(metres("Chip line length", 1000)),
        orientationDeg: optionalNumber(z.number().min(0, "Orientation is an azimuth 0–360°.").max(360, "Orientation is an azimuth 0–360°.")),
      })
      .strict(),
    z
      .object({
        kind: z.literal("channel"),
        fromM: optionalNumber(metres("From")),
        toM: optionalNumber(metres("To")),
        widthCm: optionalNumber(z.number().positive("Width must be positive.").max(500, "Width above 500 cm is implausible.")),
      })
      .strict()
      .refine(interval, intervalMessage),
    z.object({ kind: z.literal("float"), inSitu: z.literal(false).default(false), transportNote: optionalText(500) }).strict(),
    z
      .object({
        kind: z.literal("core"),
        holeId: z.string({ error: "Hole ID is required for drill core." }).trim().min(1, "Hole ID is required for drill core.").max(40, "At most 40 characters."),
        fromM: metres("From depth", 10000),
        toM: metres("To depth", 10000),
        coreSize: z.enum(CORE_SIZES).nullable().optional(),
        portion: z.enum(CORE_PORTIONS).nullable().optional(),
      })
      .strict()
      .refine(interval, intervalMessage),
    z
      .object({
        kind: z.literal("soil"),
        depthCm: optionalNumber(z.number().min(0, "Depth cannot be negative.").max(1000, "Soil depth above 1000 cm is implausible.")),
        horizon: z.enum(SOIL_HORIZONS).nullable().optional(),
        sieveFraction: optionalText(60),
      })
      .strict(),
    z
      .object({
        kind: z.literal("stream_sediment"),
        catchment: optionalText(120),
        fraction: optionalText(60),
        flowState: z.enum(FLOW_STATES).nullable().optional(),
      })
      .strict(),
    z.object({ kind: z.literal("other"), subtype: z.enum(OTHER_SUBTYPES).nullable().optional(), note: optionalText(500) }).strict(),
  ],
  { error: `Type details need a kind: one of ${SAMPLE_TYPES.join(", ")}.` },
);

export type SampleDetails = z.infer<typeof sampleDetailsSchema>;
