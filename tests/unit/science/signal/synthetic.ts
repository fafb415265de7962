/**
 * Synthetic scans for tests and the speed script. Invented data: pseudo-Voigt peaks (Thompson, Cox & Hastings 1987) on a smooth
 * background, Kα2 companions at the exact Bragg position (sinθ₂ = (λ2/λ1)·sinθ₁), Poisson noise from a seeded RNG.
 */
import type { Scan } from "@/lib/science/types";

/** mulberry32: small seeded PRNG (public-domain algorithm by Tommy Ettinger), uniform in [0, 1). */
export function mulberry32(seed: number): () => number {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

/**
 * Poisson deviate: Knuth's multiplication method for λ < 30, otherwise the normal approximation
 * N(λ, λ) rounded (adequate for λ ≥ 30 in these tests; skew ~ 1/√λ ignored).
 */
export function poisson(lambda: number, rand: () => number): number {
  if (lambda <= 0) return 0;
  if (lambda < 30) {
    const l = Math.exp(-lambda);
    let k = 0;
    let p = 1;
    do {
      k++;
      p *= rand();
    } while (p > l);
    return k - 1;
  }
  const u = Math.max(rand(), 1e-300);
  const v = rand();
  const z = Math.sqrt(-2 * Math.log(u)) * Math.cos(2 * Math.PI * v);
  return Math.max(0, Math.round(lambda + Math.sqrt(lambda) * z));
}

/** Independent pseudo-Voigt (unit area), written out again here so the tests do not reuse library code. */
export function pv(x: number, fwhm: number, eta: number): number {
  const g = (2 / fwhm) * Math.sqrt(Math.LN2 / Math.PI) * Math.exp((-4 * Math.LN2 * x * x) / (fwhm * fwhm));
  const l = 2 / (Math.PI * fwhm) / (1 + (4 * x * x) / (fwhm * fwhm));
  return eta * l + (1 - eta) * g;
}

export interface SynthPeak {
  twoTheta: number;
  /** Kα1 area, counts·°. */
  area: number;
  fwhm: number;
  eta: number;
}

export interface SynthOptions {
  start?: number;
  step?: number;
  points?: number;
  peaks: SynthPeak[];
  background?: (x: number) => number;
  /** Kα2 with this ratio at the Kα2 angle (0 = none). */
  ratio?: number;
  lambda1?: number;
  lambda2?: number;
  seed?: number;
  /** false = noise-free expected counts. */
  noise?: boolean;
}

/** Kα2 angle for a Kα1 angle (exact Bragg relation). */
export function kAlpha2Angle(twoTheta: number, lambda1: number, lambda2: number): number {
  const r = Math.PI / 180;
  return (2 * Math.asin((lambda2 / lambda1) * Math.sin((twoTheta * r) / 2))) / r;
}

/** Build a synthetic scan (Cu by default: λ1 1.540598, λ2 1.544426 Å, from the anode table's source). */
export function synthScan(o: SynthOptions): { scan: Scan; expected: Float64Array; background: Float64Array } {
  const {
    start = 10,
    step = 0.02,
    points = 4000,
    peaks,
    background = () => 100,
    ratio = 0,
    lambda1 = 1.540598,
    lambda2 = 1.544426,
    seed = 1,
    noise = true,
  } = o;
  const rand = mulberry32(seed);
  const x = new Float64Array(points);
  const y = new Float64Array(points);
  const expected = new Float64Array(points);
  const bg = new Float64Array(points);
  for (let i = 0; i < points; i++) {
    const t = Math.round((start + i * step) * 1e6) / 1e6;
    x[i] = t;
    bg[i] = background(t);
    let m = bg[i];
    for (const p of peaks) {
      m += p.area * pv(t - p.twoTheta, p.fwhm, p.eta);
      if (ratio > 0) m += ratio * p.area * pv(t - kAlpha2Angle(p.twoTheta, lambda1, lambda2), p.fwhm, p.eta);
    }
    expected[i] = m;
    y[i] = noise ? poisson(m, rand) : m;
  }
  return { scan: { twoTheta: x, counts: y, meta: { format: "xy", settings: {}, anode: "Cu" } }, expected, background: bg };
}
