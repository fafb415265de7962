/**
 * The shipped reference library: calculated powder patterns of common minerals (Cu Kα1, Bragg–Brentano, no
 * monochromator, random orientation) with their RIR against corundum, precomputed from the CIFs in ./cif by
 * scripts/build-reference-library.ts. Calculated patterns are references for search–match, not measured data;
 * a ranked candidate is a suggestion, not a confirmed identification.
 */
import type { PhaseFitData, ReferencePattern } from "@/lib/science/types";
import data from "./library.json";

/** One line as stored: [h, k, l, d (Å), intensity (0–100), multiplicity]. */
export type LibraryLine = [number, number, number, number, number, number];

/** One phase of library.json. */
export interface LibraryPhase {
  /** File name without .cif, e.g. "quartz". */
  id: string;
  /** Lowercase IMA name. */
  mineral: string;
  /** Other names the phase is known by (lowercase), e.g. "barite" for baryte. */
  aliases: string[];
  /** `_chemical_formula_sum` of the CIF. */
  formula: string;
  elements: string[];
  /** Mineral group from the CIF's `# lithodex-group:` line. */
  group: string | null;
  /** Hazard tags from `# lithodex-hazard:` lines (e.g. asbestos, crystalline_silica, radioactive). */
  hazards: string[];
  /** Reference intensity ratio I/I_corundum(113), computed from the structures. */
  rir: number;
  spaceGroup: string | null;
  spaceGroupNumber: number | null;
  crystalSystem: string;
  /** Cell, Å and °. */
  cell: { a: number; b: number; c: number; alpha: number; beta: number; gamma: number };
  /** Structure reference: authors (year) journal volume, pages. */
  citation: string;
  databaseCode: string | null;
  /** CIF path relative to the repository root. */
  source: string;
  /** Cell volume V (Å³). */
  cellVolume: number;
  /** Mass of the unit-cell contents Z·M (g/mol): sites × occupancies × IUPAC atomic weights, plus the H of the formula sum when the sites omit it. */
  cellMass: number;
  /**
   * m·|F|²·Lp (electrons² per cell × Lp, Cu Kα1, no monochromator) of the line with intensity 100, so that a
   * line's absolute intensity is intensity/100 × absoluteScale (Hill & Howard 1987 ZMV quantification).
   */
  absoluteScale: number;
  /** `# lithodex-texture:` usual preferred-orientation plane [h, k, l] (Dollase 1986 direction), when platy/prismatic. */
  texture?: [number, number, number];
  /** `# lithodex-broadening:` typical peak-width multiple (illite, smectite). */
  broadening?: number;
  /** `# lithodex-variable001:` d(001) varies with hydration and cation (smectite). */
  variable001?: boolean;
  /** d(001) range (Å) met in practice when `variable001` is set. */
  d001Range?: [number, number];
  lines: LibraryLine[];
}

/** Shape of library.json. */
export interface LibraryFile {
  about: string;
  /** Wavelength the patterns were computed for, Å. */
  wavelength: number;
  /** Upper 2θ limit of the patterns, °. */
  twoThetaMax: number;
  /** Lines weaker than this (0–100) were dropped. */
  minIntensity: number;
  lineColumns: string[];
  phases: LibraryPhase[];
}

/** The library file as shipped. */
export const LIBRARY_FILE: LibraryFile = data as unknown as LibraryFile;

/** Phases with their metadata (citation, cell, hazards…), sorted by id. */
export const LIBRARY_PHASES: readonly LibraryPhase[] = LIBRARY_FILE.phases;

const TYPED_HAZARDS = new Set(["asbestos", "crystalline_silica"]);

/** The optional {@link PhaseFitData} fields of a stored phase (only those present). */
export function fitFieldsOf(phase: Partial<PhaseFitData>): Partial<PhaseFitData> {
  const out: Partial<PhaseFitData> = {};
  if (phase.cellVolume !== undefined) out.cellVolume = phase.cellVolume;
  if (phase.cellMass !== undefined) out.cellMass = phase.cellMass;
  if (phase.absoluteScale !== undefined) out.absoluteScale = phase.absoluteScale;
  if (phase.texture) out.texture = [...phase.texture];
  if (phase.broadening !== undefined) out.broadening = phase.broadening;
  if (phase.variable001) out.variable001 = true;
  if (phase.d001Range) out.d001Range = [...phase.d001Range];
  return out;
}

/**
 * Convert a stored phase to the identifier's {@link ReferencePattern} (lines as objects with Cu Kα1 2θ).
 */
export function toReferencePattern(phase: LibraryPhase, wavelength = LIBRARY_FILE.wavelength): ReferencePattern {
  const hazard = phase.hazards.find((h) => TYPED_HAZARDS.has(h)) as ReferencePattern["hazard"];
  return {
    id: phase.id,
    mineral: phase.mineral,
    formula: phase.formula,
    elements: phase.elements,
    lines: phase.lines.map(([h, k, l, d, intensity, multiplicity]) => ({
      h,
      k,
      l,
      d,
      intensity,
      multiplicity,
      twoTheta: (2 * Math.asin(wavelength / (2 * d)) * 180) / Math.PI,
    })),
    rir: phase.rir,
    ...(hazard ? { hazard } : {}),
    ...(phase.group ? { group: phase.group } : {}),
    ...fitFieldsOf(phase),
    cell: { ...phase.cell },
  };
}

/** The shipped library as reference patterns, in LIBRARY_PHASES order (one shared array: its search index is cached). */
export const REFERENCE_LIBRARY: readonly ReferencePattern[] = Object.freeze(LIBRARY_PHASES.map((p) => toReferencePattern(p)));

/**
 * Find a shipped phase by id, mineral name or alias (case-insensitive).
 * @returns the phase's metadata, or undefined
 */
export function findLibraryPhase(name: string): LibraryPhase | undefined {
  const n = name.trim().toLowerCase();
  return LIBRARY_PHASES.find((p) => p.id === n || p.mineral === n || p.aliases.includes(n));
}

/**
 * Reference pattern of a shipped phase by id, mineral name or alias (case-insensitive).
 * @returns the pattern (the same object as in REFERENCE_LIBRARY), or undefined
 */
export function findReferencePattern(name: string): ReferencePattern | undefined {
  const phase = findLibraryPhase(name);
  return phase ? REFERENCE_LIBRARY[LIBRARY_PHASES.indexOf(phase)] : undefined;
}
