import { count, max } from "drizzle-orm";
import { getDb } from "@/db";
import { referencePhases } from "@/db/schema";
import { fitFieldsOf } from "@/lib/science/minerals";
import type { PhaseFitData, ReferenceLine, ReferencePattern } from "@/lib/science/types";

/** One stored pattern line, as written by the seed and the CIF import. */
export interface StoredLine {
  h: number;
  k: number;
  l: number;
  d: number;
  intensity: number;
  multiplicity: number;
}

type ReferenceRow = Pick<
  typeof referencePhases.$inferSelect,
  "id" | "mineral" | "formula" | "elements" | "patternJson" | "rir" | "hazard" | "mineralGroup"
> & {
  /** Whole-pattern fit data (null or absent for rows stored before the column existed). */
  fitJson?: Partial<PhaseFitData> | null;
} & Partial<Pick<typeof referencePhases.$inferSelect, "cellA" | "cellB" | "cellC" | "cellAlpha" | "cellBeta" | "cellGamma">>;

/** A reference_phases row as the identifier's pattern; the pattern id is the row id, so candidates map back to rows. */
export function patternFromRow(row: ReferenceRow): ReferencePattern {
  const lines: ReferenceLine[] = (row.patternJson as StoredLine[]).map((l) => ({ h: l.h, k: l.k, l: l.l, d: l.d, intensity: l.intensity, multiplicity: l.multiplicity }));
  return {
    id: row.id,
    mineral: row.mineral,
    formula: row.formula,
    elements: row.elements ? row.elements.split(",").filter(Boolean) : [],
    lines,
    ...(row.rir != null ? { rir: row.rir } : {}),
    ...(row.hazard ? { hazard: row.hazard } : {}),
    ...(row.mineralGroup ? { group: row.mineralGroup } : {}),
    ...(row.fitJson ? fitFieldsOf(row.fitJson) : {}),
    ...(row.cellA != null && row.cellB != null && row.cellC != null && row.cellAlpha != null && row.cellBeta != null && row.cellGamma != null
      ? { cell: { a: row.cellA, b: row.cellB, c: row.cellC, alpha: row.cellAlpha, beta: row.cellBeta, gamma: row.cellGamma } }
      : {}),
  };
}

interface CachedLibrary {
  signature: string;
  patterns: readonly ReferencePattern[];
}

const cache = globalThis as unknown as { __lithodexReferenceLibrary?: CachedLibrary };

/** Drops the cached library (call after importing or changing reference phases). */
export function invalidateReferenceLibrary(): void {
  cache.__lithodexReferenceLibrary = undefined;
}

/**
 * Every reference phase (shipped and imported) as identifier patterns. The array is cached while the table is
 * unchanged, so the identifier's strong-line index (cached per array) is built once.
 */
export async function loadReferenceLibrary(): Promise<readonly ReferencePattern[]> {
  const db = getDb();
  const [sig] = await db.select({ n: count(), last: max(referencePhases.createdAt) }).from(referencePhases);
  const signature = `${sig.n}:${sig.last instanceof Date ? sig.last.getTime() : String(sig.last)}`;
  const hit = cache.__lithodexReferenceLibrary;
  if (hit && hit.signature === signature) return hit.patterns;
  const rows = await db
    .select({
      id: referencePhases.id,
      mineral: referencePhases.mineral,
      formula: referencePhases.formula,
      elements: referencePhases.elements,
      patternJson: referencePhases.patternJson,
      rir: referencePhases.rir,
      hazard: referencePhases.hazard,
      mineralGroup: referencePhases.mineralGroup,
      fitJson: referencePhases.fitJson,
      cellA: referencePhases.cellA,
      cellB: referencePhases.cellB,
      cellC: referencePhases.cellC,
      cellAlpha: referencePhases.cellAlpha,
      cellBeta: referencePhases.cellBeta,
      cellGamma: referencePhases.cellGamma,
    })
    .from(referencePhases)
    .orderBy(referencePhases.mineral, referencePhases.id);
  const patterns = Object.freeze(rows.map(patternFromRow));
  cache.__lithodexReferenceLibrary = { signature, patterns };
  return patterns;
}
