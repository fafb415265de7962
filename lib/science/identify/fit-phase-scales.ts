/**
 * Joint scale factors of accepted phases: non-negative weighted least squares of the observed peak intensities
 * against the sum of each phase's matched reference intensities, so peaks shared by several phases are split
 * between them (search–match step 3, "scale its pattern to the data"). Iteratively reweighted to damp peaks that
 * disagree by more than a factor ~2 (preferred orientation, overlap with a phase not yet found).
 */

/** One accepted phase's contribution: reference intensity matched to each observed peak. */
export interface PhaseContribution {
  /** Observed peak index → summed reference intensity (0–100 scale). */
  refByPeak: Map<number, number>;
  /** Starting scale. */
  scale: number;
}

/** Options of {@link fitPhaseScales}. */
export interface FitPhaseScalesOptions {
  /** Floor of the weight denominator, % of the strongest peak. @default 1 */
  floor?: number;
  /** Reweighting passes. @default 4 */
  passes?: number;
}

/**
 * Fit non-negative scales.
 * @param observed - observed intensity of each peak (0–100)
 * @param phases - contributions of the accepted phases
 * @returns one scale per phase (observed % per reference unit)
 */
export function fitPhaseScales(observed: Float64Array, phases: readonly PhaseContribution[], options: FitPhaseScalesOptions = {}): number[] {
  const { floor = 1, passes = 4 } = options;
  const m = phases.length;
  const peaks = new Set<number>();
  for (const p of phases) for (const j of p.refByPeak.keys()) peaks.add(j);
  const J = [...peaks];
  const A = phases.map((p) => Float64Array.from(J, (j) => p.refByPeak.get(j) ?? 0));
  const y = Float64Array.from(J, (j) => observed[j]);
  const s = phases.map((p) => Math.max(p.scale, 0));
  const robust = new Float64Array(J.length).fill(1);
  for (let pass = 0; pass < passes; pass++) {
    const w = Float64Array.from(J, (_, k) => robust[k] / Math.max(y[k], floor));
    for (let sweep = 0; sweep < 60; sweep++) {
      let change = 0;
      for (let a = 0; a < m; a++) {
        let num = 0;
        let den = 0;
        for (let k = 0; k < J.length; k++) {
          const Aak = A[a][k];
          if (Aak === 0) continue;
          let other = 0;
          for (let b = 0; b < m; b++) if (b !== a) other += s[b] * A[b][k];
          num += w[k] * (y[k] - other) * Aak;
          den += w[k] * Aak * Aak;
        }
        const next = den > 0 ? Math.max(0, num / den) : 0;
        change = Math.max(change, Math.abs(next - s[a]) / Math.max(s[a], 1e-12));
        s[a] = next;
      }
      if (change < 1e-6) break;
    }
    // Bisquare-like reweighting on the log ratio of observed to predicted.
    for (let k = 0; k < J.length; k++) {
      let pred = 0;
      for (let a = 0; a < m; a++) pred += s[a] * A[a][k];
      const lr = Math.abs(Math.log(Math.max(y[k], 1e-9) / Math.max(pred, 1e-9)));
      const u = lr / Math.log(3);
      robust[k] = u < 1 ? (1 - u * u) ** 2 : 0.01;
    }
  }
  return s;
}
