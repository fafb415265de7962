/**
 * Seeded pseudo-random numbers for reproducible synthetic data: mulberry32 (a 32-bit generator in common use;
 * common practice), Box–Muller normal deviates, and Poisson deviates (Knuth's multiplication method for small
 * means, a rounded normal approximation above 30 — counting statistics σ = √N).
 */

/** A seeded generator of uniform deviates in [0, 1). */
export type Random = () => number;

/**
 * Create a seeded uniform generator (mulberry32).
 * @param seed - any integer; the same seed gives the same sequence
 */
export function createRandom(seed: number): Random {
  let a = seed >>> 0 || 0x9e3779b9;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

/** Standard normal deviate (Box–Muller). */
export function normalDeviate(random: Random): number {
  let u = random();
  while (u <= 0) u = random();
  return Math.sqrt(-2 * Math.log(u)) * Math.cos(2 * Math.PI * random());
}

/**
 * Poisson deviate with mean `mean` (counts ≥ 0).
 * @param mean - expected counts; values ≤ 0 give 0
 */
export function poissonDeviate(random: Random, mean: number): number {
  if (!(mean > 0)) return 0;
  if (mean > 30) return Math.max(0, Math.round(mean + Math.sqrt(mean) * normalDeviate(random)));
  const limit = Math.exp(-mean);
  let k = 0;
  let p = random();
  while (p > limit) {
    k++;
    p *= random();
  }
  return k;
}
