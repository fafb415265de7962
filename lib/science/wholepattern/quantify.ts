/**
 * Weight fractions from fitted scales.
 *
 * Hill & Howard (1987, J. Appl. Cryst. 20, 467): W_p = S_p·(ZMV)_p / Σ_i S_i·(ZMV)_i, with S the scale of the
 * calculated pattern on the absolute |F|²-per-cell scale, Z·M the mass of the cell contents and V the cell volume.
 * Our calculated patterns are relative (strongest line 100), so S = s·100 / absoluteScale for a fitted multiplier s.
 *
 * Internal standard (Chung 1974, J. Appl. Cryst. 7, 519 and 526): with a standard of known weight fraction W_s in
 * the spiked specimen, W_p = W_s·(S·ZMV)_p/(S·ZMV)_s; the rest of the specimen is amorphous or unidentified.
 *
 * Without a standard the fractions are normalised to 100 %: semi-quantitative, since amorphous material and
 * phases outside the library are invisible to them.
 */

/** What quantification needs of a phase. */
export interface QuantPhase {
  /** Fitted multiplier of the relative pattern. */
  scale: number;
  scaleSigma: number;
  /** Z·M, g/mol. */
  cellMass?: number;
  /** V, Å³. */
  cellVolume?: number;
  /** m|F|²Lp of the 100-line. */
  absoluteScale?: number;
  /** Reference intensity ratio (I/I_corundum), the fallback when structure data are missing. */
  rir?: number;
}

export interface QuantResult {
  /** wt% per phase (null where no factor is known). */
  wt: (number | null)[];
  sigma: (number | null)[];
  /** How each phase was weighted. */
  basis: ("ZMV" | "RIR" | null)[];
}

/** Relative mass factor of a phase: S·ZMV (Hill & Howard) or s/RIR (Chung), with which was used. */
export function massFactor(p: QuantPhase): { factor: number; basis: "ZMV" | "RIR" } | null {
  if (p.cellMass && p.cellVolume && p.absoluteScale) return { factor: ((p.scale * 100) / p.absoluteScale) * p.cellMass * p.cellVolume, basis: "ZMV" };
  if (p.rir && p.rir > 0) return { factor: p.scale / p.rir, basis: "RIR" };
  return null;
}

/**
 * Weight percent of each phase, normalised to 100 % over the phases that have a factor, with standard
 * uncertainties propagated from the scale uncertainties (first order, scales taken as uncorrelated).
 */
export function hillHoward(phases: readonly QuantPhase[]): QuantResult {
  const f = phases.map(massFactor);
  // One basis for all: ZMV only when every phase with a factor has structure data (the two scales differ).
  const allZmv = f.every((x) => x === null || x.basis === "ZMV");
  const factors = phases.map((p, i) => {
    if (f[i] === null) return null;
    if (allZmv) return f[i];
    return p.rir && p.rir > 0 ? { factor: p.scale / p.rir, basis: "RIR" as const } : null;
  });
  const total = factors.reduce((s, x) => s + (x ? x.factor : 0), 0);
  const wt = factors.map((x) => (x && total > 0 ? (100 * x.factor) / total : null));
  const sigma = factors.map((x, i) => {
    if (!x || !(total > 0)) return null;
    // ∂W_i/∂a_j = (δ_ij·T − a_i)/T²; σ(a_j) = perScale_j·σ(s_j)
    let v = 0;
    factors.forEach((y, j) => {
      if (!y) return;
      const pj = phases[j].scale > 0 ? y.factor / phases[j].scale : 0;
      const sa = pj * (Number.isFinite(phases[j].scaleSigma) ? phases[j].scaleSigma : 0);
      const dij = ((i === j ? total : 0) - x.factor) / (total * total);
      v += (100 * dij * sa) ** 2;
    });
    return Math.sqrt(v);
  });
  return { wt, sigma, basis: factors.map((x) => (x ? x.basis : null)) };
}

/**
 * Chung's internal-standard method: absolute wt% of each phase in the original (unspiked) specimen and the
 * amorphous + unidentified remainder.
 * @param phases - fitted phases including the standard
 * @param standardIndex - index of the standard in `phases`
 * @param standardWtPercent - wt% of the standard in the spiked specimen
 */
export function internalStandard(phases: readonly QuantPhase[], standardIndex: number, standardWtPercent: number): { wt: (number | null)[]; amorphous: number } | null {
  const f = phases.map(massFactor);
  const fs = f[standardIndex];
  if (!fs || !(standardWtPercent > 0 && standardWtPercent < 100)) return null;
  const ws = standardWtPercent / 100;
  const wt = phases.map((_, i) => {
    if (i === standardIndex) return null;
    const fi = f[i];
    if (!fi || fi.basis !== fs.basis) return null;
    // wt in the spiked specimen, then back to the original specimen: w/(1 − W_s)
    return (100 * ((ws * fi.factor) / fs.factor)) / (1 - ws);
  });
  const crystalline = wt.reduce<number>((s, v) => s + (v ?? 0), 0);
  return { wt, amorphous: Math.max(0, 100 - crystalline) };
}
