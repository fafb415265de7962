/**
 * Shared shapes of the diffraction core. Pure data: no framework, database or I/O.
 * Angles in degrees 2θ, d-spacings and wavelengths in ångström.
 */

export type Anode = "Cu" | "Co" | "Fe" | "Cr" | "Mo" | "Ag";

/** A measured powder scan, as read from a file. Arrays are the same length, 2θ strictly increasing. */
export interface Scan {
  twoTheta: Float64Array;
  counts: Float64Array;
  /** Standard uncertainty of each count, when the file carries it. */
  esd?: Float64Array;
  meta: ScanMeta;
}

export interface ScanMeta {
  format: "xy" | "csv" | "pdcif";
  /** Wavelength found in the file (Å), if any. */
  wavelength?: number;
  wavelength2?: number;
  anode?: Anode;
  instrument?: string;
  sampleId?: string;
  /** Other key/value settings found in the file (kV, mA, slits, step time…). */
  settings: Record<string, string | number>;
  /**
   * Unit of `counts` after reading: "counts" (detector counts, also after converting counts per second with a
   * known counting time) or "cps" (counts per second left as given because no counting time was known).
   * Undefined when the file does not say (counts assumed).
   */
  intensityUnit?: "counts" | "cps";
  /** What the reader assumed or converted (unrecognised column names read by position, cps → counts, d → 2θ…). */
  warnings?: string[];
}

/** A fitted peak of a processed scan. */
export interface Peak {
  twoTheta: number;
  d: number;
  /** Height above background (counts). */
  height: number;
  /** Integrated area above background (counts·°). */
  area: number;
  /** Full width at half maximum, ° 2θ. */
  fwhm: number;
  /** Standard uncertainty of the FWHM from the fit, ° 2θ. */
  fwhmEsd?: number;
  /** Standard uncertainty of the position from the fit, ° 2θ. */
  twoThetaEsd?: number;
  /** Standard uncertainty of d propagated from twoThetaEsd, Å. */
  dEsd?: number;
  /** Standard uncertainty of the area from the fit, counts·°. */
  areaEsd?: number;
  /** Pseudo-Voigt mixing η (0 Gaussian … 1 Lorentzian). */
  eta?: number;
  /** Relative intensity, strongest = 100 (by height). */
  intensity: number;
  /** Scherrer size estimate (nm); see `scherrer` for its assumptions. */
  crystalliteNm?: number;
}

/** A line of a reference pattern computed from a crystal structure. */
export interface ReferenceLine {
  h: number;
  k: number;
  l: number;
  d: number;
  /** I/I₁₀₀ on a 0–100 scale, for the geometry the pattern was computed for. */
  intensity: number;
  multiplicity: number;
  /** 2θ for the wavelength the pattern was computed for (optional; d is authoritative). */
  twoTheta?: number;
}

/** A reference phase as the identifier sees it: d-based, so independent of the anode. */
export interface ReferencePattern {
  id: string;
  /** Lowercase IMA name, e.g. "quartz". */
  mineral: string;
  formula: string;
  /** Element symbols present, e.g. ["O", "Si"]. */
  elements: string[];
  /** Lines with intensity ≥ ~0.5, d descending. Intensities for Cu Kα1, Bragg–Brentano, no monochromator. */
  lines: ReferenceLine[];
  /** Reference intensity ratio I/I_corundum (strongest lines, 50:50 by weight). */
  rir?: number;
  hazard?: "asbestos" | "crystalline_silica";
  group?: string;
  /** Cell volume V (Å³) of the structure the lines were computed from. Optional: see {@link PhaseFitData}. */
  cellVolume?: number;
  /** Mass of the unit-cell contents Z·M (g/mol): sites × occupancies × atomic weights, plus formula-sum H the sites omit. */
  cellMass?: number;
  /** m·|F|²·Lp of the line with intensity 100 (electrons² per cell × Lp); absolute = intensity/100 × absoluteScale. */
  absoluteScale?: number;
  /** Usual preferred-orientation plane [h, k, l] for March–Dollase (platy or prismatic habit). */
  texture?: [number, number, number];
  /** Typical peak-width multiple relative to a well-crystallised phase (e.g. 3 for illite). */
  broadening?: number;
  /** d(001) changes with hydration and interlayer cation (smectites). */
  variable001?: boolean;
  /** Range of d(001) (Å) met in practice when `variable001` is set. */
  d001Range?: [number, number];
  /** Unit cell of the structure the lines were computed from (Å, °): preferred-orientation angles need it. */
  cell?: { a: number; b: number; c: number; alpha: number; beta: number; gamma: number };
}

/**
 * Per-phase data the whole-pattern fit needs beyond the lines (all optional on {@link ReferencePattern}, so
 * imported phases without them still work).
 *
 * - `cellVolume` V (Å³), `cellMass` Z·M (g/mol) and `absoluteScale` (m·|F|²·Lp of the 100-line for Cu Kα1,
 *   Bragg–Brentano, no monochromator: the library's convention) give Hill & Howard (1987, J. Appl. Cryst. 20,
 *   467) quantification: a fitted multiplier s of the relative profile (intensity/100) is a Rietveld scale
 *   S = s / absoluteScale on the |F|²-per-cell scale, and W_p = S_p·(ZMV)_p / Σ_i S_i·(ZMV)_i.
 * - `texture`: the plane a platy or prismatic phase usually lies on in a back-loaded mount, the direction of
 *   March–Dollase preferred orientation (Dollase 1986, J. Appl. Cryst. 19, 267): 001 for micas, clays and
 *   chlorites, 104 for the calcite-group carbonates (hexagonal setting), 110 for monoclinic amphiboles, 010 for
 *   gypsum (common practice in Rietveld quantification of rocks and soils).
 * - `broadening`: a typical width multiple for phases that never give sharp lines (illite, smectite).
 * - `variable001` and `d001Range`: the basal spacing depends on hydration and cation (smectites).
 */
export interface PhaseFitData {
  cellVolume: number;
  cellMass: number;
  absoluteScale: number;
  texture?: [number, number, number];
  broadening?: number;
  variable001?: boolean;
  d001Range?: [number, number];
}
