import { z } from "zod";
import { LINEAR_FEATURES, PLANAR_FEATURES, STRUCTURE_QUALITIES } from "@/lib/vocabulary";
import { clientId, optionalText } from "./common";

const azimuth = (name: string) =>
  z.number({ error: `${name} must be a number (degrees).` }).min(0, `${name} must be between 0 and 360°.`).max(360, `${name} must be between 0 and 360°.`);
const inclination = (name: string) =>
  z.number({ error: `${name} must be a number (degrees).` }).min(0, `${name} must be between 0 and 90°.`).max(90, `${name} must be between 0 and 90°.`);

const common = {
  id: clientId.optional(),
  generation: z
    .string()
    .trim()
    .toUpperCase()
    .regex(/^([SLF]\d{1,2}|)$/, "Generation is like S0, S1, L2 or F1.")
    .transform((v) => (v === "" ? null : v))
    .nullable()
    .optional(),
  overturned: z.boolean().optional(),
  quality: z.enum(STRUCTURE_QUALITIES).nullable().optional(),
  note: optionalText(1000),
  /** Reference of the azimuth as entered. Magnetic readings need the declination. */
  azimuthRef: z.enum(["true", "magnetic"]).default("true"),
  /** Magnetic declination, degrees, east positive (true = magnetic + declination). */
  declinationDeg: z.number({ error: "Declination must be a number (degrees, east positive)." }).min(-90, "Declination must be within ±90°.").max(90, "Declination must be within ±90°.").nullable().optional(),
};

const planarFeature = z.enum(PLANAR_FEATURES, { error: `A plane is one of: ${PLANAR_FEATURES.join(", ")}.` });
const linearFeature = z.enum(LINEAR_FEATURES, { error: `A line is one of: ${LINEAR_FEATURES.join(", ")}.` });

/**
 * A structural measurement as entered (common practice, e.g. Lisle & Leyshon 2004): a plane by strike/dip (right-hand rule) or dip
 * direction/dip, a line by trend/plunge or by rake on a plane measured at the same station.
 */
export const structureCreateSchema = z
  .discriminatedUnion(
    "convention",
    [
      z.object({ convention: z.literal("rhr"), kind: z.literal("planar").default("planar"), feature: planarFeature, strike: azimuth("Strike"), dip: inclination("Dip"), ...common }).strict(),
      z.object({ convention: z.literal("dip_dipdir"), kind: z.literal("planar").default("planar"), feature: planarFeature, dipDirection: azimuth("Dip direction"), dip: inclination("Dip"), ...common }).strict(),
      z
        .object({
          convention: z.literal("trend_plunge"),
          kind: z.literal("linear").default("linear"),
          feature: linearFeature,
          trend: azimuth("Trend"),
          plunge: inclination("Plunge"),
          planeId: z.string().trim().min(1).nullable().optional(),
          ...common,
        })
        .strict(),
      z
        .object({
          convention: z.literal("rake"),
          kind: z.literal("linear").default("linear"),
          feature: linearFeature,
          rake: z.number({ error: "Rake must be a number (degrees)." }).min(0, "Rake must be between 0 and 180° from the strike direction.").max(180, "Rake must be between 0 and 180° from the strike direction."),
          planeId: z.string({ error: "Choose the plane the rake was measured on." }).trim().min(1, "Choose the plane the rake was measured on."),
          ...common,
        })
        .strict(),
    ],
    { error: "convention must be rhr (strike/dip), dip_dipdir (dip direction/dip), trend_plunge or rake." },
  )
  .superRefine((v, ctx) => {
    // A rake is measured inside its plane: no compass azimuth, so no declination needed.
    if (v.convention !== "rake" && v.azimuthRef === "magnetic" && v.declinationDeg == null) {
      ctx.addIssue({
        code: "custom",
        path: ["declinationDeg"],
        message: "Give the magnetic declination (east positive) so the azimuth can be turned to true north, or choose true north if the compass was already corrected.",
      });
    }
  });

export type StructureCreateInput = z.infer<typeof structureCreateSchema>;
export type StructureCreateFormInput = z.input<typeof structureCreateSchema>;
