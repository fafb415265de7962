/** Shapes of the crystal-structure module. Lengths in Å, angles in degrees, displacement parameters in Å². */
import type { SymOp } from "./symop";

export interface CellParameters {
  a: number;
  b: number;
  c: number;
  alpha: number;
  beta: number;
  gamma: number;
}

/** How the isotropic displacement of a site was obtained. */
export type AdpSource = "Uiso" | "Biso" | "Uani" | "Bani" | "default";

export interface AtomSite {
  label: string;
  /** Type symbol as written (or the label when the file has none). */
  typeSymbol: string;
  /** Element used for scattering and mass ("D" → "H"). */
  element: string;
  /** Formal charge from the type symbol; scattering uses the neutral atom. */
  charge: number;
  deuterium: boolean;
  /** Fractional coordinates. */
  x: number;
  y: number;
  z: number;
  /** Chemical site occupancy (0–1). @default 1 */
  occupancy: number;
  /**
   * Isotropic displacement B = 8π²·U (Å²) used for the Debye–Waller factor exp(−B·s²).
   * With an `_atom_site_aniso_` row this is 8π²·U_eq (U_eq = ⅓ Σ U^ij a*_i a*_j a_i·a_j, Fischer & Tillmanns
   * 1988, Acta Cryst. C44, 775): the anisotropy itself is ignored — a simplification that changes relative
   * powder intensities by a few % at most for ordinary mineral ADPs.
   */
  bIso: number;
  adpSource: AdpSource;
  /** 1-based line of the site's row in the CIF. */
  line: number;
}

export interface CifCitation {
  journal?: string;
  year?: number;
  volume?: string;
  firstPage?: string;
  lastPage?: string;
  title?: string;
  authors: string[];
  /** `_database_code_amcsd`, `_cod_database_code` or similar, when present. */
  databaseCode?: string;
}

/** A crystal structure read from a CIF data block, ready for {@link computePattern}. */
export interface CifStructure {
  blockName: string;
  cell: CellParameters;
  spaceGroup: { name?: string; number?: number; hall?: string };
  /** Symmetry operators as listed (including centring translations). */
  symops: SymOp[];
  sites: AtomSite[];
  /** `_cell_formula_units_Z`, when given. */
  formulaUnitsZ?: number;
  mineral?: string;
  formulaSum?: string;
  citation: CifCitation;
  /** `_diffrn_ambient_temperature` (K) and `_diffrn_ambient_pressure` (kPa), when given. */
  ambient: { temperatureK?: number; pressureKPa?: number };
  /** Non-fatal problems (defaults applied, rows skipped). */
  warnings: string[];
}

/** Options of {@link computePattern}. */
export interface PatternOptions {
  /** X-ray wavelength (Å); any anode. @default 1.540593 (Cu Kα1, ITC Vol. C Table 4.2.2.6, rounded) */
  wavelength?: number;
  /** Upper 2θ limit (°) used to derive dMin when `dMin` is not given. @default 90 */
  twoThetaMax?: number;
  /** Smallest d-spacing (Å). @default λ / (2·sin(twoThetaMax/2)) */
  dMin?: number;
  /** Largest d-spacing (Å). @default 20 */
  dMax?: number;
  /**
   * 2θ (°) of a diffracted-beam monochromator crystal; omit for none (filter or energy-resolving detector).
   * Graphite 002 with Cu Kα: ≈ 26.6°. @default undefined
   */
  monochromatorTwoTheta?: number;
  /** March–Dollase preferred orientation (Dollase 1986): direction hkl and r (r < 1 platy along hkl, 1 = random). */
  preferredOrientation?: { h: number; k: number; l: number; r: number };
  /** Reflections with |F|² below this fraction of the largest |F|² are absent. @default 1e-6 */
  absenceThreshold?: number;
  /** Relative d tolerance within which non-equivalent reflections are merged into one line. @default 1e-5 */
  coincidenceTolerance?: number;
  /** Images of one site closer than this (Å) are the same atom (special positions). @default 0.05 */
  siteTolerance?: number;
  /** Drop lines weaker than this (0–100 scale) from the output. @default 0 */
  minIntensity?: number;
}
