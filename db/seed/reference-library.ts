/**
 * Loads the shipped reference library (lib/science/minerals/library.json, built from the CIFs in
 * lib/science/minerals/cif) into reference_phases. Idempotent: built-in rows are matched by mineral name and
 * updated in place (so phase results keep pointing at them); imported rows are never touched.
 */
import { readFileSync } from "node:fs";
import { join } from "node:path";
import { and, eq } from "drizzle-orm";
import { getDb } from "@/db";
import { referencePhases } from "@/db/schema";
import { fitFieldsOf, LIBRARY_PHASES, type LibraryPhase } from "@/lib/science/minerals";
import { hermannMauguin, mineralFormula } from "@/lib/science/minerals/notation";
import type { PhaseFitData } from "@/lib/science/types";

type ReferenceInsert = typeof referencePhases.$inferInsert;

/** The reference_phases row of a shipped phase (CIF text read from the repository). */
export function libraryPhaseRow(phase: LibraryPhase, root = process.cwd()): ReferenceInsert {
  const typed = phase.hazards.find((h): h is "asbestos" | "crystalline_silica" => h === "asbestos" || h === "crystalline_silica");
  return {
    mineral: phase.mineral,
    formula: mineralFormula(phase.mineral, phase.formula),
    mineralGroup: phase.group,
    crystalSystem: phase.crystalSystem,
    spaceGroup: phase.spaceGroup ? hermannMauguin(phase.spaceGroup) : phase.spaceGroupNumber ? `No. ${phase.spaceGroupNumber}` : "unknown",
    cellA: phase.cell.a,
    cellB: phase.cell.b,
    cellC: phase.cell.c,
    cellAlpha: phase.cell.alpha,
    cellBeta: phase.cell.beta,
    cellGamma: phase.cell.gamma,
    elements: phase.elements.join(","),
    hazard: typed ?? null,
    citation: phase.citation || phase.source,
    cifText: readFileSync(join(root, phase.source), "utf8"),
    patternJson: phase.lines.map(([h, k, l, d, intensity, multiplicity]) => ({ h, k, l, d, intensity, multiplicity })),
    rir: phase.rir,
    fitJson: fitFieldsOf(phase) as PhaseFitData,
    builtin: true,
  };
}

/**
 * Inserts or refreshes every shipped phase.
 * @returns how many rows were inserted and updated
 */
export async function seedReferenceLibrary(): Promise<{ inserted: number; updated: number }> {
  const db = getDb();
  const existing = await db
    .select({ id: referencePhases.id, mineral: referencePhases.mineral })
    .from(referencePhases)
    .where(eq(referencePhases.builtin, true));
  const byMineral = new Map(existing.map((r) => [r.mineral, r.id]));
  let inserted = 0;
  let updated = 0;
  await db.transaction(async (tx) => {
    for (const phase of LIBRARY_PHASES) {
      const row = libraryPhaseRow(phase);
      const id = byMineral.get(phase.mineral);
      if (id) {
        await tx.update(referencePhases).set(row).where(and(eq(referencePhases.id, id), eq(referencePhases.builtin, true)));
        updated++;
      } else {
        await tx.insert(referencePhases).values(row);
        inserted++;
      }
    }
  });
  return { inserted, updated };
}
