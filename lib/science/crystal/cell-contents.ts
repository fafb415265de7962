/** Unit-cell contents, mass and calculated density of a structure model. */
import { atomicWeight, DEUTERIUM_WEIGHT } from "./atomic-weights";
import { cellVolume } from "./cell";
import { expandSites } from "./expand-sites";
import { atomicNumber } from "./scattering-factors";
import type { CifStructure } from "./types";

/** Avogadro constant (mol⁻¹), exact since the 2019 SI redefinition. */
export const AVOGADRO = 6.02214076e23;

/**
 * Atoms per unit cell by element (occupancy-weighted, after symmetry expansion).
 * @param siteTolerance - Å, as in {@link expandSites} @default 0.05
 */
export function unitCellContents(structure: CifStructure, siteTolerance = 0.05): Record<string, number> {
  const cells = expandSites(structure, siteTolerance);
  const out: Record<string, number> = {};
  for (let j = 0; j < cells.site.length; j++) {
    const s = structure.sites[cells.site[j]];
    out[s.element] = (out[s.element] ?? 0) + s.occupancy;
  }
  return out;
}

/** Mass of the unit-cell contents (g/mol, i.e. Z·M), from IUPAC 2021 abridged standard atomic weights. */
export function unitCellMass(structure: CifStructure, siteTolerance = 0.05): number {
  const cells = expandSites(structure, siteTolerance);
  let m = 0;
  for (let j = 0; j < cells.site.length; j++) {
    const s = structure.sites[cells.site[j]];
    const w = s.deuterium ? DEUTERIUM_WEIGHT : atomicWeight(atomicNumber(s.element)!);
    m += s.occupancy * w;
  }
  return m;
}

/** Calculated (X-ray) density ρ = Z·M / (N_A·V) in g/cm³. */
export function calculatedDensity(structure: CifStructure, siteTolerance = 0.05): number {
  return unitCellMass(structure, siteTolerance) / (AVOGADRO * cellVolume(structure.cell) * 1e-24);
}
