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
  const len = () => 3 + random() * 6.5;
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
    return { cell: { a, b: a, c: len() * 1.4, alpha: 90, beta: 90, gamma: 120 }, system: "hexagonal" };
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
  let bufQ = new Float64Array(4096);
  let bufI = new Float64Array(4096);
  let bufH = new Int32Array(3 * 4096);
  let mQ = new Float64Array(4096);
  let mI = new Float64Array(4096);
  let mM = new Int32Array(4096);
  let mR = new Int32Array(4096);
  const grow = (): void => {
    const q = new Float64Array(bufQ.length * 2);
    q.set(bufQ);
    const i = new Float64Array(bufQ.length * 2);
    i.set(bufI);
    const hh = new Int32Array(bufH.length * 2);
    hh.set(bufH);
    bufQ = q;
    bufI = i;
    bufH = hh;
    mQ = new Float64Array(bufQ.length);
    mI = new Float64Array(bufQ.length);
    mM = new Int32Array(bufQ.length);
    mR = new Int32Array(bufQ.length);
  };
  for (let p = 0; p < count; p++) {
    const { cell } = randomCell(random);
    const g = reciprocalMetric(cell);
    const hMax = Math.floor(cell.a / dMin);
    const kMax = Math.floor(cell.b / dMin);
    const lMax = Math.floor(cell.c / dMin);
    const centring = random() < 0.35 ? (random() < 0.5 ? "I" : "C") : "P";
    const B = 0.5 + random();
    let count = 0;
    // Half of reciprocal space (Friedel pairs counted through the multiplicity 2).
    for (let h = 0; h <= hMax; h++) {
      for (let k = -kMax; k <= kMax; k++) {
        const qhk = g[0] * h * h + g[4] * k * k + 2 * g[1] * h * k;
        if (qhk > qMax * 1.5 + 1) continue;
        for (let l = -lMax; l <= lMax; l++) {
          if (h === 0 && (k < 0 || (k === 0 && l <= 0))) continue;
          const q = qhk + g[8] * l * l + 2 * (g[2] * h * l + g[5] * k * l);
          if (q > qMax || q <= 0) continue;
          if (centring === "I" && (h + k + l) % 2 !== 0) continue;
          if (centring === "C" && (h + k) % 2 !== 0) continue;
          if (count === bufQ.length) grow();
          const f2 = -Math.log(1 - random() * 0.999999);
          const sin2 = Math.min(0.999999, (CU_KA1 * CU_KA1 * q) / 4);
          const cos2t = 1 - 2 * sin2;
          const lp = (1 + cos2t * cos2t) / (sin2 * Math.sqrt(1 - sin2));
          bufQ[count] = q;
          bufI[count] = 2 * f2 * lp * Math.exp((-2 * B * q) / 4);
          bufH[3 * count] = h;
          bufH[3 * count + 1] = k;
          bufH[3 * count + 2] = l;
          count++;
        }
      }
    }
    const order = new Uint32Array(count);
    for (let i = 0; i < count; i++) order[i] = i;
    order.sort((x, y) => bufQ[x] - bufQ[y]);
    // Merge reflections at equal d (symmetry-equivalent or accidental), in place into the m* buffers.
    let nm = 0;
    let maxI = 0;
    for (let o = 0; o < count; o++) {
      const r = order[o];
      if (nm > 0 && bufQ[r] - mQ[nm - 1] < 1e-9 * bufQ[r] + 1e-12) {
        mI[nm - 1] += bufI[r];
        mM[nm - 1] += 2;
      } else {
        mQ[nm] = bufQ[r];
        mI[nm] = bufI[r];
        mM[nm] = 2;
        mR[nm] = r;
        nm++;
      }
      if (mI[nm - 1] > maxI) maxI = mI[nm - 1];
    }
    const keep: number[] = [];
    for (let i = 0; i < nm; i++) if ((100 * mI[i]) / maxI >= 0.5) keep.push(i);
    if (keep.length > maxLines) keep.sort((x, y) => mI[y] - mI[x]).splice(maxLines);
    keep.sort((x, y) => mQ[x] - mQ[y]);
    const lines: ReferenceLine[] = keep.map((i) => {
      const d = 1 / Math.sqrt(mQ[i]);
      const r = mR[i];
      return {
        h: bufH[3 * r],
        k: bufH[3 * r + 1],
        l: bufH[3 * r + 2],
        d,
        intensity: (100 * mI[i]) / maxI,
        multiplicity: mM[i],
        twoTheta: (2 * Math.asin(CU_KA1 / (2 * d))) / DEG,
      };
    });
    const elements = new Set(["O"]);
    const extra = 1 + Math.floor(random() * 3);
    while (elements.size < extra + 1) elements.add(ELEMENTS[Math.floor(random() * ELEMENTS.length)]);
    const id = `${prefix}-${String(p + 1).padStart(6, "0")}`;
    out.push({ id, mineral: id, formula: [...elements].sort().join(""), elements: [...elements].sort(), lines, rir: 0.5 + random() * 4.5 });
  }
  return out;
}
