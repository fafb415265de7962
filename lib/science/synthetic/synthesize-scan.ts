/**
 * Synthetic powder scans for tests and benchmarks: reference lines placed by Bragg's law for Kα1 and Kα2, pseudo-Voigt
 * profiles with Caglioti widths, phase intensities weighted by RIR so that a mixture of known wt% gives the intensity
 * ratios the RIR method assumes (Chung 1974: I_a ∝ X_a·RIR_a), a curved background (polynomial plus a 1/2θ low-angle
 * rise), an optional amorphous hump, a zero shift, March–Dollase preferred orientation and seeded Poisson noise.
 */
import type { ReferencePattern, Scan } from "@/lib/science/types";
import { marchDollase, reciprocalMetric, type UnitCell } from "./march-dollase";
import { cagliotiFwhm, pseudoVoigt, type Caglioti } from "./profile";
import { createRandom, poissonDeviate } from "./random";

/** One phase of a synthetic mixture. */
export interface SyntheticPhase {
  pattern: ReferencePattern;
  /** Weight fraction (any positive unit; normalised over the phases). */
  weight: number;
  /** March–Dollase preferred orientation of this phase. */
  preferredOrientation?: { hkl: [number, number, number]; r: number; cell: UnitCell };
}

/** Curved background: `a0 + a1·x + a2·x² + lowAngle / x` counts, x = 2θ in °. */
export interface SyntheticBackground {
  /** @default 120 */
  a0?: number;
  /** @default -0.6 */
  a1?: number;
  /** @default 0.004 */
  a2?: number;
  /** @default 1500 */
  lowAngle?: number;
}

/** Options of {@link synthesizeScan}. */
export interface SynthesizeScanOptions {
  phases: SyntheticPhase[];
  /** Kα1 wavelength, Å. @default 1.540593 (Cu) */
  wavelength?: number;
  /** Kα2 wavelength, Å. @default 1.544426 for the Cu default; otherwise no Kα2 unless given */
  wavelength2?: number;
  /** Kα2/Kα1 intensity ratio. @default 0.5 */
  kalpha2Ratio?: number;
  /** 2θ range [start, end], °. @default [5, 80] */
  range?: [number, number];
  /** Step, ° 2θ. @default 0.02 */
  step?: number;
  /** Caglioti width law, °². @default { U: 0.01, V: -0.003, W: 0.005 } (≈0.07° at 30°, ≈0.1° at 80°) */
  fwhm?: Caglioti;
  /** Pseudo-Voigt Lorentzian fraction. @default 0.5 */
  eta?: number;
  /** Net counts at the tallest point of the crystalline pattern. @default 10000 */
  maxCounts?: number;
  /** Background. @default the SyntheticBackground defaults; `false` for none */
  background?: SyntheticBackground | false;
  /** Broad amorphous hump (Gaussian): centre and FWHM in ° 2θ, height in counts. */
  amorphousHump?: { center: number; fwhm: number; height: number };
  /** Constant zero shift added to every position, ° 2θ. @default 0 */
  zeroShift?: number;
  /** Poisson counting noise. @default true */
  noise?: boolean;
  /** Seed of the noise. @default 1 */
  seed?: number;
  /** Wavelength the reference intensities were computed for, Å (Lp is corrected to `wavelength`). @default 1.540593 */
  referenceWavelength?: number;
}

const DEG = Math.PI / 180;
const CU_KA1 = 1.540593;
// Cu Kα2 (Å), ITC Vol. C (2006) Table 4.2.2.1, from memory.
const CU_KA2 = 1.544426;

function lorentzPolarization(twoThetaDeg: number): number {
  const th = (twoThetaDeg * DEG) / 2;
  const c2 = Math.cos(2 * th);
  return (1 + c2 * c2) / (Math.sin(th) ** 2 * Math.cos(th));
}

/**
 * Build a synthetic scan.
 * @throws RangeError for an empty mixture, a non-positive weight, a phase without RIR or an impossible range/step
 */
export function synthesizeScan(options: SynthesizeScanOptions): Scan {
  const {
    phases,
    wavelength = CU_KA1,
    kalpha2Ratio = 0.5,
    range = [5, 80],
    step = 0.02,
    fwhm = { U: 0.01, V: -0.003, W: 0.005 },
    eta = 0.5,
    maxCounts = 10000,
    background = {},
    amorphousHump,
    zeroShift = 0,
    noise = true,
    seed = 1,
    referenceWavelength = CU_KA1,
  } = options;
  const wavelength2 = options.wavelength2 ?? (wavelength === CU_KA1 ? CU_KA2 : undefined);
  if (!(range[1] > range[0] && range[0] > 0 && range[1] < 180)) throw new RangeError("range must be [start, end] with 0 < start < end < 180°");
  if (!(step > 0 && step < range[1] - range[0])) throw new RangeError("step must be > 0 and smaller than the range");
  const n = Math.floor((range[1] - range[0]) / step + 1e-9) + 1;
  const twoTheta = new Float64Array(n);
  for (let i = 0; i < n; i++) twoTheta[i] = range[0] + i * step;
  const net = new Float64Array(n);

  const totalWeight = phases.reduce((s, p) => s + p.weight, 0);
  phases.forEach((p, k) => {
    if (!(p.weight > 0)) throw new RangeError(`phases[${k}].weight must be > 0`);
    if (!(typeof p.pattern.rir === "number" && p.pattern.rir > 0)) throw new RangeError(`phases[${k}] (${p.pattern.mineral}) has no RIR`);
  });
  if (phases.length > 0 && !(totalWeight > 0)) throw new RangeError("phases need positive weights");

  const addLine = (center: number, area: number): void => {
    const h = cagliotiFwhm(center, fwhm);
    const reach = 40 * h;
    const i0 = Math.max(0, Math.ceil((center - reach - range[0]) / step));
    const i1 = Math.min(n - 1, Math.floor((center + reach - range[0]) / step));
    for (let i = i0; i <= i1; i++) net[i] += area * pseudoVoigt(twoTheta[i] - center, h, eta);
  };
  for (const phase of phases) {
    const { pattern, preferredOrientation: po } = phase;
    const factor = (phase.weight / totalWeight) * (pattern.rir as number);
    const gStar = po ? reciprocalMetric(po.cell) : null;
    for (const line of pattern.lines) {
      const s1 = wavelength / (2 * line.d);
      const sRef = referenceWavelength / (2 * line.d);
      if (!(s1 < 1 && sRef < 1)) continue;
      const tt1 = (2 * Math.asin(s1)) / DEG;
      const ttRef = (2 * Math.asin(sRef)) / DEG;
      let area = factor * line.intensity * (lorentzPolarization(tt1) / lorentzPolarization(ttRef));
      if (po && gStar) area *= marchDollase([line.h, line.k, line.l], po.hkl, po.r, gStar);
      addLine(tt1 + zeroShift, area);
      if (wavelength2 && kalpha2Ratio > 0) {
        const s2 = wavelength2 / (2 * line.d);
        if (s2 < 1) addLine((2 * Math.asin(s2)) / DEG + zeroShift, area * kalpha2Ratio);
      }
    }
  }
  let peakMax = 0;
  for (let i = 0; i < n; i++) peakMax = Math.max(peakMax, net[i]);
  const scale = peakMax > 0 ? maxCounts / peakMax : 0;
  const { a0 = 120, a1 = -0.6, a2 = 0.004, lowAngle = 1500 } = background || {};
  const counts = new Float64Array(n);
  const random = createRandom(seed);
  for (let i = 0; i < n; i++) {
    const x = twoTheta[i];
    let y = net[i] * scale;
    if (background !== false) y += Math.max(0, a0 + a1 * x + a2 * x * x + lowAngle / x);
    if (amorphousHump) y += amorphousHump.height * Math.exp((-4 * Math.LN2 * (x - amorphousHump.center) ** 2) / amorphousHump.fwhm ** 2);
    counts[i] = noise ? poissonDeviate(random, y) : y;
  }
  const esd = Float64Array.from(counts, (c) => Math.sqrt(Math.max(c, 1)));
  return {
    twoTheta,
    counts,
    esd,
    meta: {
      format: "xy",
      wavelength,
      ...(wavelength2 ? { wavelength2 } : {}),
      ...(wavelength === CU_KA1 ? { anode: "Cu" as const } : {}),
      sampleId: "synthetic",
      settings: { synthetic: "true", seed, step, kalpha2Ratio: wavelength2 ? kalpha2Ratio : 0, zeroShift },
    },
  };
}
