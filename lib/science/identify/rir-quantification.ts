/**
 * Semi-quantitative phase analysis by the reference intensity ratio (Chung 1974, J. Appl. Cryst. 7, 519 and 526):
 * with every phase crystalline and identified, `X_a = (I_a/RIR_a) / Σ_j (I_j/RIR_j)`, where I is the intensity of
 * each phase's strongest line and RIR = I/I_corundum in a 50:50 mixture by weight. Accuracy is tens of % relative.
 */

/** One phase for {@link rirWeightFractions}. */
export interface RirPhase {
  /** Intensity of the phase's strongest line (any common unit). */
  intensity: number;
  /** Reference intensity ratio I/I_corundum; must be > 0. */
  rir: number | null | undefined;
}

/**
 * Weight percentages by RIR, normalised to 100 over the given phases.
 * @returns wt% per phase (same order), or null for every phase when one lacks a usable RIR
 */
export function rirWeightFractions(phases: readonly RirPhase[]): (number | null)[] {
  if (phases.some((p) => !(typeof p.rir === "number" && p.rir > 0) || !(p.intensity >= 0)))
    return phases.map(() => null);
  const q = phases.map((p) => p.intensity / (p.rir as number));
  const sum = q.reduce((a, b) => a + b, 0);
  return q.map((v) => (sum > 0 ? (100 * v) / sum : null));
}
