/**
 * Reference intensity ratio from structure models (Chung 1974, J. Appl. Cryst. 7, 519; Hubbard & Snyder 1988,
 * Powder Diffr. 3, 74).
 *
 * Derivation. For line i of phase α in a flat, thick, randomly oriented mixture (Klug & Alexander; Chung 1974):
 *   I_iα = K_e · (m|F|²Lp)_iα / V_α² · X_α / (ρ_α · μ*_mix),
 * K_e = instrument/experiment constant, V = cell volume, X = weight fraction, ρ = density, μ*_mix = mass
 * attenuation coefficient of the whole mixture. In a 50:50 mixture of α and corundum, K_e, X and μ*_mix are the
 * same for both and cancel. With ρ = W/(N_A·V), W = mass of the cell contents (Z·M):
 *   RIR = I_α,strongest / I_corundum,113 = [(m|F|²Lp)_α / (V_α·W_α)] / [(m|F|²Lp)_c,113 / (V_c·W_c)].
 * Intensities are integrated intensities of the computed lines (coincident reflections merged), so a phase
 * whose strongest line is a merged line gets the merged intensity, as a measured pattern would.
 */
import { dSpacing } from "./cell";
import { unitCellMass } from "./cell-contents";
import { computePatternDetailed, type PatternLine } from "./pattern";
import type { CifStructure, PatternOptions } from "./types";

export interface RirOptions extends PatternOptions {
  /** Corundum reflection used as reference (hexagonal setting). @default {h: 1, k: 1, l: 3} */
  corundumHkl?: { h: number; k: number; l: number };
}

export interface RirResult {
  rir: number;
  phaseLine: PatternLine;
  corundumLine: PatternLine;
  /** W = Z·M of the cell contents (g/mol) and V (Å³) of the phase and of corundum. */
  phase: { cellMass: number; volume: number };
  corundum: { cellMass: number; volume: number };
}

/** RIR with the lines and cell figures it was computed from. @throws RangeError if corundum 113 is absent. */
export function referenceIntensityRatioDetailed(
  structure: CifStructure,
  corundumStructure: CifStructure,
  options: RirOptions = {},
): RirResult {
  // minIntensity is irrelevant here: the strongest line and 113 are always kept
  const { corundumHkl = { h: 1, k: 1, l: 3 }, ...rest } = options;
  const patternOptions = { ...rest, minIntensity: 0 };
  const a = computePatternDetailed(structure, patternOptions);
  const c = computePatternDetailed(corundumStructure, patternOptions);
  if (a.lines.length === 0) throw new RangeError("the phase has no lines in the computed range");
  const phaseLine = a.lines.reduce((best, l) => (l.absoluteIntensity > best.absoluteIntensity ? l : best));
  const d113 = dSpacing(corundumStructure.cell, corundumHkl.h, corundumHkl.k, corundumHkl.l);
  const corundumLine = c.lines.find((l) => Math.abs(l.d - d113) <= 1e-4 * d113);
  if (!corundumLine) {
    throw new RangeError(
      `corundum line ${corundumHkl.h}${corundumHkl.k}${corundumHkl.l} (d = ${d113.toFixed(4)} Å) not in the computed pattern; is the corundum structure in the hexagonal setting?`,
    );
  }
  const wa = unitCellMass(structure, options.siteTolerance);
  const wc = unitCellMass(corundumStructure, options.siteTolerance);
  const rir =
    phaseLine.absoluteIntensity / (a.volume * wa) / (corundumLine.absoluteIntensity / (c.volume * wc));
  return {
    rir,
    phaseLine,
    corundumLine,
    phase: { cellMass: wa, volume: a.volume },
    corundum: { cellMass: wc, volume: c.volume },
  };
}

/**
 * RIR = I(strongest line of the phase) / I(corundum 113) for a 50:50 weight mixture, from the two structure
 * models and the same pattern options (wavelength, monochromator). See the module comment for the formula.
 */
export function referenceIntensityRatio(
  structure: CifStructure,
  corundumStructure: CifStructure,
  options: RirOptions = {},
): number {
  return referenceIntensityRatioDetailed(structure, corundumStructure, options).rir;
}
