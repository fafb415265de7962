/**
 * Seeded random reference patterns for scaling tests of the search (not minerals): a random cell of a random
 * crystal system, all reflections down to `dMin` from the reciprocal metric (1/d² = hᵀ·G*·h), intensities
 * m·|F|²·Lp·exp(−2B·s²) with |F|² drawn from the acentric Wilson distribution (exponential; Wilson 1949,
 * Acta Cryst. 2, 318), random primitive/centred absences, lines merged at equal d, I ≥ 0.5 on a 0–100 scale.
 */
import type { ReferenceLine, ReferencePattern } from "@/lib/science/types";
import { reciprocalMetric, type UnitCell } from "./march-dollase";
import { createRandom, type Random } from "./random";

/** Options of {@link randomReferenceLibrary}. */
export interface RandomLibraryOptions {
  /** Number of patterns. */
  count: number;
  /** @default 1 */
  seed?: number;
  /** Shortest d, Å (Cu Kα1 reaches ≈100° 2θ at 1.0 Å). @default 1.0 */
  dMin?: number;
  /** Most lines kept per pattern (strongest). @default 80 */
  maxLines?: number;
  /** Prefix of ids and names. @default "random" */
  prefix?: string;
}

const ELEMENTS = ["Si", "Al", "Ca", "Mg", "Fe", "Na", "K", "Ti", "Mn", "S", "C", "P", "Ba", "Zn", "Cu", "Pb", "F", "Cl"];
const DEG = Math.PI / 180;
const CU_KA1 = 1.540593;

function randomCell(random: Random): { cell: UnitCell; system: string } {
  const len = () => 3 + random() * 9;
  const pick = random();
  if (pick < 0.12) {
    const a = len();
    return { cell: { a, b: a, c: a, alpha: 90, beta: 90, gamma: 90 }, system: "cubic" };
  }
  if (pick < 0.27) {
    const a = len();
    return { cell: { a, b: a, c: len(), alpha: 90, beta: 90, gamma: 90 }, system: "tetragonal" };
  }
  if (pick < 0.45) {
    const a = len();
    return { cell: { a, b: a, c: len() * 1.5, alpha: 90, beta: 90, gamma: 120 }, system: "hexagonal" };
  }
  if (pick < 0.65) return { cell: { a: len(), b: len(), c: len(), alpha: 90, beta: 90, gamma: 90 }, system: "orthorhombic" };
  if (pick < 0.9) return { cell: { a: len(), b: len(), c: len(), alpha: 90, beta: 92 + random() * 28, gamma: 90 }, system: "monoclinic" };
  return {
    cell: { a: len(), b: len(), c: len(), alpha: 80 + random() * 20, beta: 95 + random() * 20, gamma: 80 + random() * 20 },
    system: "triclinic",
  };
}

/**
 * Generate a seeded library of random patterns.
 * @returns patterns with ids `${prefix}-000001`…, elements always including O, RIR 0.5–5
 */
export function randomReferenceLibrary(options: RandomLibraryOptions): ReferencePattern[] {
  const { count, seed = 1, dMin = 1.0, maxLines = 80, prefix = "random" } = options;
  if (!(Number.isInteger(count) && count >= 0)) throw new RangeError("count must be a non-negative integer");
  const random = createRandom(seed);
  const out: ReferencePattern[] = [];
  const qMax = 1 / (dMin * dMin);
  for (let p = 0; p < count; p++) {
    const { cell } = randomCell(random);
    const g = reciprocalMetric(cell);
    const hMax = Math.floor(cell.a / dMin);
    const kMax = Math.floor(cell.b / dMin);
    const lMax = Math.floor(cell.c / dMin);
    const centring = random() < 0.35 ? (random() < 0.5 ? "I" : "C") : "P";
    const B = 0.5 + random();
    const raw: { h: number; k: number; l: number; q: number; i: number }[] = [];
    // Half of reciprocal space (Friedel pairs counted through the multiplicity 2).
    for (let h = 0; h <= hMax; h++) {
      for (let k = -kMax; k <= kMax; k++) {
        for (let l = -lMax; l <= lMax; l++) {
          if (h === 0 && (k < 0 || (k === 0 && l <= 0))) continue;
          const q = g[0] * h * h + g[4] * k * k + g[8] * l * l + 2 * (g[1] * h * k + g[2] * h * l + g[5] * k * l);
          if (q > qMax || q <= 0) continue;
          if (centring === "I" && (h + k + l) % 2 !== 0) continue;
          if (centring === "C" && (h + k) % 2 !== 0) continue;
          const f2 = -Math.log(1 - random() * 0.999999);
          const s = Math.sin(Math.asin(Math.min(1, (CU_KA1 * Math.sqrt(q)) / 2)));
          const th = Math.asin(s);
          const lp = (1 + Math.cos(2 * th) ** 2) / (Math.sin(th) ** 2 * Math.cos(th));
          raw.push({ h, k, l, q, i: 2 * f2 * lp * Math.exp((-2 * B * q) / 4) });
        }
      }
    }
    raw.sort((a, b) => a.q - b.q);
    const merged: ReferenceLine[] = [];
    for (const r of raw) {
      const d = 1 / Math.sqrt(r.q);
      const last = merged[merged.length - 1];
      if (last && Math.abs(last.d - d) < 1e-5) {
        last.intensity += r.i;
        last.multiplicity += 2;
      } else merged.push({ h: r.h, k: r.k, l: r.l, d, intensity: r.i, multiplicity: 2 });
    }
    let max = 0;
    for (const m of merged) max = Math.max(max, m.intensity);
    const lines = merged
      .map((m) => ({ ...m, intensity: (100 * m.intensity) / max, twoTheta: (2 * Math.asin(CU_KA1 / (2 * m.d))) / DEG }))
      .filter((m) => m.intensity >= 0.5)
      .sort((a, b) => b.intensity - a.intensity)
      .slice(0, maxLines)
      .sort((a, b) => b.d - a.d);
    const elements = new Set(["O"]);
    const extra = 1 + Math.floor(random() * 3);
    while (elements.size < extra + 1) elements.add(ELEMENTS[Math.floor(random() * ELEMENTS.length)]);
    const id = `${prefix}-${String(p + 1).padStart(6, "0")}`;
    out.push({ id, mineral: id, formula: [...elements].sort().join(""), elements: [...elements].sort(), lines, rir: 0.5 + random() * 4.5 });
  }
  return out;
}
