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
}
