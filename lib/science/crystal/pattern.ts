/**
 * Powder diffraction pattern (d, hkl, relative integrated intensity) of a crystal structure (ITC Vol. C 2006 ch. 6.1/6.2):
 * positions from 1/d² = hᵀG*h; F(hkl) = Σ_j o_j·f_j(s)·exp(−B_j s²)·exp[2πi(hx_j + ky_j + lz_j)] over the
 * full cell; I = |F|²·m·Lp(θ)·P (Bragg–Brentano, thick specimen).
 */
import type { ReferenceLine } from "../types";
import { cellVolume, inverseDSquared, reciprocalMetricTensor } from "./cell";
import { CifError } from "./cif-error";
import { expandSites, type ExpandedCell } from "./expand-sites";
import { lorentzPolarisation } from "./lorentz-polarisation";
import { marchDollase } from "./preferred-orientation";
import { it92Coefficients } from "./scattering-factors";
import type { CifStructure, PatternOptions } from "./types";

/** Cu Kα1 (Å): ITC Vol. C (2006) Table 4.2.2.6, 1.54059292(45), rounded to 6 decimals. */
export const CU_KA1 = 1.540593;

const DEG = 180 / Math.PI;

/**
 * Work bounds of one pattern computation (a hostile structure must fail fast, not run for minutes). The number of
 * reciprocal-lattice points with d ≥ dMin is ≈ (4π/3)·V/dMin³ (the volume of the limiting sphere times the cell
 * volume; International Tables B, 2008, §1.1.3); each needs a sum over every atom of the cell.
 */
export const PATTERN_LIMITS = {
  /** Most hkl inside the limiting sphere (before symmetry grouping). */
  maxReflections: 150_000,
  /** Most reflection × atom-in-cell terms of the structure-factor sums (≈ 1 s on one core here). */
  maxStructureFactorTerms: 30_000_000,
} as const;

/** Estimated hkl count inside the limiting sphere 1/d ≤ 1/dMin for a cell of volume V (Å³). */
export function estimatedReflections(volume: number, dMin: number): number {
  return ((4 * Math.PI) / 3) * (volume / dMin ** 3);
}

/** One set of symmetry-equivalent reflections (Friedel mates included). */
export interface ReflectionClass {
  h: number;
  k: number;
  l: number;
  d: number;
  multiplicity: number;
  /** |F(hkl)|² in electrons² per unit cell. */
  fSquared: number;
  /** m·|F|²·Lp·P on the absolute scale of {@link PatternResult} (no normalisation). */
  intensity: number;
}

/**
 * A line of a computed pattern. When symmetry-independent reflections coincide in d (within
 * `coincidenceTolerance`), they form one line: d and hkl are those of the member with the conventional label (see `labelScore`), the intensity is
 * their sum and `multiplicity` is the total number of hkl contributing. All of them are in `reflections`.
 */
export interface PatternLine extends ReferenceLine {
  twoTheta: number;
  /** m·|F|²·Lp·P summed over the line, before normalisation (electrons² per cell × Lp). */
  absoluteIntensity: number;
  reflections: ReflectionClass[];
}

export interface PatternResult {
  lines: PatternLine[];
  wavelength: number;
  dMin: number;
  dMax: number;
  /** Cell volume (Å³). */
  volume: number;
  /** Number of atom images in the cell after symmetry expansion (before occupancy). */
  atomCount: number;
  /** Symmetry-independent reflections computed (one structure factor each). */
  reflectionClassCount: number;
  warnings: string[];
}

interface Classes {
  h: Int32Array;
  k: Int32Array;
  l: Int32Array;
  q: Float64Array;
  mult: Int32Array;
  /** members of class c: memberHkl[3·memberStart[c] …] */
  memberStart: Int32Array;
  memberHkl: Int32Array;
  count: number;
  metricMismatch: number;
}

function uniqueRotations(structure: CifStructure): Int32Array[] {
  const seen = new Set<string>();
  const out: Int32Array[] = [];
  for (const op of structure.symops) {
    const key = op.rotation.join(",");
    if (seen.has(key)) continue;
    seen.add(key);
    out.push(Int32Array.from(op.rotation));
  }
  return out;
}

/** Enumerate all hkl with dMin ≤ d ≤ dMax and group them into symmetry classes (rotations of the operators + Friedel). */
function enumerateClasses(structure: CifStructure, gs: Float64Array, dMin: number, dMax: number): Classes {
  const { cell } = structure;
  const H = Math.floor(cell.a / dMin);
  const K = Math.floor(cell.b / dMin);
  const L = Math.floor(cell.c / dMin);
  const nk = 2 * K + 1;
  const nl = 2 * L + 1;
  const visited = new Uint8Array((2 * H + 1) * nk * nl);
  const qMax = (1 / (dMin * dMin)) * (1 + 1e-12);
  const qMin = 1 / (dMax * dMax);
  const rots = uniqueRotations(structure);

  const ch: number[] = [];
  const ck: number[] = [];
  const cl: number[] = [];
  const cq: number[] = [];
  const cm: number[] = [];
  const ms: number[] = [];
  const mem: number[] = [];
  let mismatch = 0;

  for (let h = -H; h <= H; h++) {
    for (let k = -K; k <= K; k++) {
      for (let l = -L; l <= L; l++) {
        if (h === 0 && k === 0 && l === 0) continue;
        const i0 = ((h + H) * nk + (k + K)) * nl + (l + L);
        if (visited[i0]) continue;
        const q = inverseDSquared(gs, h, k, l);
        if (q > qMax || q < qMin) continue;
        const start = mem.length / 3;
        let best = -1;
        let bh = h;
        let bk = k;
        let bl = l;
        for (const R of rots) {
          const hp = h * R[0] + k * R[3] + l * R[6];
          const kp = h * R[1] + k * R[4] + l * R[7];
          const lp = h * R[2] + k * R[5] + l * R[8];
          for (let sgn = 1; sgn >= -1; sgn -= 2) {
            const a = sgn * hp;
            const b = sgn * kp;
            const c = sgn * lp;
            if (Math.abs(a) > H || Math.abs(b) > K || Math.abs(c) > L) {
              mismatch++;
              continue;
            }
            const j = ((a + H) * nk + (b + K)) * nl + (c + L);
            if (visited[j]) continue;
            visited[j] = 1;
            mem.push(a, b, c);
            const qq = inverseDSquared(gs, a, b, c);
            if (Math.abs(qq - q) > 1e-4 * q) mismatch++;
            const score = labelScore({ h: a, k: b, l: c });
            if (score > best) {
              best = score;
              bh = a;
              bk = b;
              bl = c;
            }
          }
        }
        ch.push(bh);
        ck.push(bk);
        cl.push(bl);
        cq.push(inverseDSquared(gs, bh, bk, bl));
        cm.push(mem.length / 3 - start);
        ms.push(start);
      }
    }
  }
  ms.push(mem.length / 3);
  return {
    h: Int32Array.from(ch),
    k: Int32Array.from(ck),
    l: Int32Array.from(cl),
    q: Float64Array.from(cq),
    mult: Int32Array.from(cm),
    memberStart: Int32Array.from(ms),
    memberHkl: Int32Array.from(mem),
    count: ch.length,
    metricMismatch: mismatch,
  };
}

/**
 * Preference among index triples for labels (common practice in mineral powder data, e.g. −2 0 1, −1 2 1):
 * most non-negative indices; then non-negative l, then k, then h; then lexicographically largest
 * (1 0 1 before 0 1 1, 2 1 0 before 1 2 0).
 */
function labelScore(r: { h: number; k: number; l: number }): number {
  const nn = (r.h >= 0 ? 1 : 0) + (r.k >= 0 ? 1 : 0) + (r.l >= 0 ? 1 : 0);
  const signs = (r.l >= 0 ? 4 : 0) + (r.k >= 0 ? 2 : 0) + (r.h >= 0 ? 1 : 0);
  return (((nn * 8 + signs) * 1024 + r.h + 512) * 1024 + r.k + 512) * 1024 + r.l + 512;
}

/** cos/sin tables of 2π·n·x_j for n = −N…N, one row per n. */
function phaseTable(coord: Float64Array, N: number): { cos: Float64Array; sin: Float64Array } {
  const n = coord.length;
  const cos = new Float64Array((2 * N + 1) * n);
  const sin = new Float64Array((2 * N + 1) * n);
  for (let m = -N; m <= N; m++) {
    const row = (m + N) * n;
    for (let j = 0; j < n; j++) {
      const a = 2 * Math.PI * m * coord[j];
      cos[row + j] = Math.cos(a);
      sin[row + j] = Math.sin(a);
    }
  }
  return { cos, sin };
}

/** |F|² of every class representative. Images of a site share o·f·exp(−Bs²), so those are applied per site. */
function structureFactorsSquared(structure: CifStructure, cells: ExpandedCell, cls: Classes): Float64Array {
  const sites = structure.sites;
  const elements = [...new Set(sites.map((s) => s.element))];
  const coefs = elements.map((e) => it92Coefficients(e));
  const siteEl = Int32Array.from(sites.map((s) => elements.indexOf(s.element)));
  const siteOcc = Float64Array.from(sites.map((s) => s.occupancy));
  const siteB = Float64Array.from(sites.map((s) => s.bIso));
  const n = cells.x.length;
  let H = 0;
  let K = 0;
  let L = 0;
  for (let c = 0; c < cls.count; c++) {
    H = Math.max(H, Math.abs(cls.h[c]));
    K = Math.max(K, Math.abs(cls.k[c]));
    L = Math.max(L, Math.abs(cls.l[c]));
  }
  const tx = phaseTable(cells.x, H);
  const ty = phaseTable(cells.y, K);
  const tz = phaseTable(cells.z, L);
  const fe = new Float64Array(elements.length);
  const out = new Float64Array(cls.count);
  const start = cells.imageStart;

  for (let c = 0; c < cls.count; c++) {
    const s2 = cls.q[c] / 4;
    for (let e = 0; e < coefs.length; e++) {
      const k9 = coefs[e];
      fe[e] =
        k9[0] * Math.exp(-k9[4] * s2) +
        k9[1] * Math.exp(-k9[5] * s2) +
        k9[2] * Math.exp(-k9[6] * s2) +
        k9[3] * Math.exp(-k9[7] * s2) +
        k9[8];
    }
    const ox = (cls.h[c] + H) * n;
    const oy = (cls.k[c] + K) * n;
    const oz = (cls.l[c] + L) * n;
    let re = 0;
    let im = 0;
    for (let s = 0; s < sites.length; s++) {
      let sr = 0;
      let si = 0;
      for (let j = start[s]; j < start[s + 1]; j++) {
        const ax = tx.cos[ox + j];
        const bx = tx.sin[ox + j];
        const ay = ty.cos[oy + j];
        const by = ty.sin[oy + j];
        const az = tz.cos[oz + j];
        const bz = tz.sin[oz + j];
        const pr = ax * ay - bx * by;
        const pi = ax * by + bx * ay;
        sr += pr * az - pi * bz;
        si += pr * bz + pi * az;
      }
      const w = siteOcc[s] * fe[siteEl[s]] * Math.exp(-siteB[s] * s2);
      re += w * sr;
      im += w * si;
    }
    out[c] = re * re + im * im;
  }
  return out;
}

function validate(structure: CifStructure, options: PatternOptions) {
  const {
    wavelength = CU_KA1,
    twoThetaMax = 90,
    dMax = 20,
    absenceThreshold = 1e-6,
    coincidenceTolerance = 1e-5,
    siteTolerance = 0.05,
    minIntensity = 0,
    monochromatorTwoTheta,
    preferredOrientation,
  } = options;
  if (!(wavelength > 0)) throw new RangeError(`wavelength must be > 0 Å, got ${wavelength}`);
  if (!(twoThetaMax > 0 && twoThetaMax < 180)) throw new RangeError(`twoThetaMax must be within (0, 180)°, got ${twoThetaMax}`);
  let dMin = options.dMin ?? wavelength / (2 * Math.sin((twoThetaMax / 2) * (Math.PI / 180)));
  if (!(dMin > 0)) throw new RangeError(`dMin must be > 0 Å, got ${dMin}`);
  const warnings: string[] = [];
  if (dMin < wavelength / 2) {
    warnings.push(`dMin ${dMin} Å is below λ/2; raised to ${wavelength / 2} Å (2θ = 180°)`);
    dMin = wavelength / 2;
  }
  if (!(dMax > dMin)) throw new RangeError(`dMax (${dMax} Å) must exceed dMin (${dMin} Å)`);
  if (monochromatorTwoTheta !== undefined && !(monochromatorTwoTheta >= 0 && monochromatorTwoTheta < 180)) {
    throw new RangeError(`monochromatorTwoTheta must be within [0, 180)°, got ${monochromatorTwoTheta}`);
  }
  if (preferredOrientation) {
    const { h, k, l, r } = preferredOrientation;
    if (![h, k, l].every(Number.isInteger) || (h === 0 && k === 0 && l === 0)) {
      throw new RangeError("preferredOrientation needs integer h, k, l, not all zero");
    }
    if (!(r > 0)) throw new RangeError(`March–Dollase r must be > 0, got ${r}`);
  }
  if (structure.sites.length === 0) throw new RangeError("structure has no atom sites");
  if (structure.symops.length === 0) throw new RangeError("structure has no symmetry operators (at least x,y,z)");
  return {
    wavelength,
    dMin,
    dMax,
    absenceThreshold,
    coincidenceTolerance,
    siteTolerance,
    minIntensity,
    monochromatorTwoTheta,
    preferredOrientation,
    warnings,
  };
}

/**
 * Compute the powder pattern with everything needed for absolute-scale work (RIR, whole-pattern scaling).
 * See {@link computePattern} for the method.
 */
export function computePatternDetailed(structure: CifStructure, options: PatternOptions = {}): PatternResult {
  const o = validate(structure, options);
  const gs = reciprocalMetricTensor(structure.cell);
  const reflections = estimatedReflections(cellVolume(structure.cell), o.dMin);
  if (reflections > PATTERN_LIMITS.maxReflections) {
    throw new CifError(
      "limit",
      `about ${Math.round(reflections)} reflections down to d = ${o.dMin.toFixed(3)} Å is over the limit of ${PATTERN_LIMITS.maxReflections} (maxReflections); lower 2θ max or use a smaller cell`,
      0,
    );
  }
  const cells = expandSites(structure, o.siteTolerance);
  if (reflections * cells.x.length > PATTERN_LIMITS.maxStructureFactorTerms) {
    throw new CifError(
      "limit",
      `${cells.x.length} atoms in the cell × about ${Math.round(reflections)} reflections is over the limit of ${PATTERN_LIMITS.maxStructureFactorTerms} structure-factor terms (maxStructureFactorTerms)`,
      0,
    );
  }
  const cls = enumerateClasses(structure, gs, o.dMin, o.dMax);
  const warnings = [...o.warnings];
  if (cls.metricMismatch > 0) {
    warnings.push("cell metric is not consistent with the symmetry operators (equivalent hkl differ in d); check cell and setting");
  }
  const f2 = structureFactorsSquared(structure, cells, cls);
  let f2max = 0;
  for (let c = 0; c < cls.count; c++) f2max = Math.max(f2max, f2[c]);

  // preferred orientation: reciprocal vector of the chosen hkl
  const po = o.preferredOrientation;
  let gH: [number, number, number] | null = null;
  let HH = 1;
  if (po && po.r !== 1) {
    gH = [
      gs[0] * po.h + gs[1] * po.k + gs[2] * po.l,
      gs[3] * po.h + gs[4] * po.k + gs[5] * po.l,
      gs[6] * po.h + gs[7] * po.k + gs[8] * po.l,
    ];
    HH = inverseDSquared(gs, po.h, po.k, po.l);
  }

  const present: ReflectionClass[] = [];
  for (let c = 0; c < cls.count; c++) {
    if (!(f2[c] >= o.absenceThreshold * f2max) || f2max === 0) continue;
    const d = 1 / Math.sqrt(cls.q[c]);
    const twoTheta = 2 * Math.asin(o.wavelength / (2 * d)) * DEG;
    let pSum = cls.mult[c];
    if (gH) {
      pSum = 0;
      for (let m = cls.memberStart[c]; m < cls.memberStart[c + 1]; m++) {
        const a = cls.memberHkl[3 * m];
        const b = cls.memberHkl[3 * m + 1];
        const e = cls.memberHkl[3 * m + 2];
        const cosA = (a * gH[0] + b * gH[1] + e * gH[2]) / Math.sqrt(cls.q[c] * HH);
        pSum += marchDollase(Math.max(-1, Math.min(1, cosA)), po!.r);
      }
    }
    present.push({
      h: cls.h[c],
      k: cls.k[c],
      l: cls.l[c],
      d,
      multiplicity: cls.mult[c],
      fSquared: f2[c],
      intensity: f2[c] * lorentzPolarisation(twoTheta, o.monochromatorTwoTheta) * pSum,
    });
  }
  present.sort((p, q) => q.d - p.d);

  // merge non-equivalent reflections that coincide in d
  const lines: PatternLine[] = [];
  for (let i = 0; i < present.length; ) {
    const d0 = present[i].d;
    let j = i + 1;
    while (j < present.length && (d0 - present[j].d) / d0 <= o.coincidenceTolerance) j++;
    const group = present.slice(i, j);
    let top = group[0];
    let sum = 0;
    let mult = 0;
    for (const g of group) {
      sum += g.intensity;
      mult += g.multiplicity;
      if (labelScore(g) > labelScore(top)) top = g;
    }
    lines.push({
      h: top.h,
      k: top.k,
      l: top.l,
      d: top.d,
      twoTheta: 2 * Math.asin(o.wavelength / (2 * top.d)) * DEG,
      intensity: 0,
      multiplicity: mult,
      absoluteIntensity: sum,
      reflections: group,
    });
    i = j;
  }
  let imax = 0;
  for (const l of lines) imax = Math.max(imax, l.absoluteIntensity);
  for (const l of lines) l.intensity = imax > 0 ? 100 * (l.absoluteIntensity / imax) : 0;

  return {
    lines: o.minIntensity > 0 ? lines.filter((l) => l.intensity >= o.minIntensity) : lines,
    wavelength: o.wavelength,
    dMin: o.dMin,
    dMax: o.dMax,
    volume: cellVolume(structure.cell),
    atomCount: cells.x.length,
    reflectionClassCount: cls.count,
    warnings,
  };
}

/**
 * Calculated powder pattern of a structure for Bragg–Brentano geometry (ITC Vol. C 2006 ch. 6.1/6.2).
 *
 * - All hkl with dMin ≤ d ≤ dMax from the reciprocal metric tensor (any cell).
 * - Atoms: every operator applied to every site; coincident images of one site are one atom.
 * - F(hkl) with IT92 scattering factors of neutral atoms and isotropic exp(−B s²); one F per class of
 *   symmetry-equivalent reflections (rotation parts + Friedel), multiplicity = class size.
 * - Absent reflections (|F|² < absenceThreshold·max) are dropped — systematic absences come out of F.
 * - Lp for Bragg–Brentano with or without monochromator; optional March–Dollase orientation.
 * - Non-equivalent reflections at the same d are merged into one line (see {@link PatternLine}).
 *
 * @returns lines sorted by d descending, intensity I/I₁₀₀ on 0–100 (integrated intensities).
 * @throws RangeError for invalid options.
 */
export function computePattern(structure: CifStructure, options: PatternOptions = {}): PatternLine[] {
  return computePatternDetailed(structure, options).lines;
}
