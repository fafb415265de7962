/**
 * Characteristic X-ray wavelengths of common diffractometer tube anodes (targets), in ångström.
 *
 * Source of the Kα1, Kα2 and Kβ1 numbers below: the set tabulated in International Tables for Crystallography
 * Vol. C (2nd edn 1999 / 3rd edn 2004, Table 4.2.2.1) and reproduced widely in diffraction software and textbooks.
 * **All six rows are written from memory** and must be checked against the printed table before they are used as
 * an oracle. They agree with Hölzer et al. (1997, Phys. Rev. A 56, 4554; Cr–Cu) and ITC Vol. C (2006, §4.2.2,
 * after Deslattes et al. 2003; Table 4.2.2.6 gives Cu Kα1 = 1.54059292(45) Å, Mo Kα1 = 0.70931713(41) Å) to within
 * a few 10⁻⁵ Å; older tables on Bearden's (1967) Å* scale are ~20 ppm lower. The effect on d is ≤ 30 ppm.
 * The weighted Kα is the conventional intensity-weighted mean (2·Kα1 + Kα2)/3, computed here, not tabulated.
 */
import type { Anode } from "@/lib/science/types";

/** Wavelengths of one anode, Å. */
export interface AnodeWavelengths {
  anode: Anode;
  /** Kα1 (KL3), Å. */
  kAlpha1: number;
  /** Kα2 (KL2), Å. */
  kAlpha2: number;
  /** Conventional weighted Kα = (2·Kα1 + Kα2)/3, Å. */
  kAlpha: number;
  /** Kβ1 (KM3), Å. */
  kBeta1: number;
  /** Filter usually used to suppress Kβ (common practice). */
  kBetaFilter: string;
  /** Where the numbers come from. */
  source: string;
}

const SOURCE =
  "ITC Vol. C (1999/2004) Table 4.2.2.1, from memory — verify against the printed table; weighted Kα computed";

function row(anode: Anode, kAlpha1: number, kAlpha2: number, kBeta1: number, kBetaFilter: string): AnodeWavelengths {
  return Object.freeze({
    anode,
    kAlpha1,
    kAlpha2,
    kAlpha: (2 * kAlpha1 + kAlpha2) / 3,
    kBeta1,
    kBetaFilter,
    source: SOURCE,
  });
}

/** Anode table. Values from memory (see module comment); Kβ filters are common practice. */
export const ANODE_WAVELENGTHS: Readonly<Record<Anode, AnodeWavelengths>> = Object.freeze({
  // anode      Kα1        Kα2        Kβ1       filter   (ITC Vol. C Table 4.2.2.1, from memory)
  Cr: row("Cr", 2.28976, 2.293663, 2.08492, "V"),
  Fe: row("Fe", 1.936042, 1.93998, 1.75661, "Mn"),
  Co: row("Co", 1.788965, 1.79285, 1.62079, "Fe"),
  Cu: row("Cu", 1.540598, 1.544426, 1.39225, "Ni"),
  Mo: row("Mo", 0.709319, 0.713609, 0.632305, "Zr"),
  // Ag row from memory, flagged: Kα1 0.559421, Kα2 0.563813, Kβ1 0.497082.
  Ag: row("Ag", 0.559421, 0.563813, 0.497082, "Rh or Pd"),
});

/** Anode symbols in the table. */
export const ANODES: readonly Anode[] = Object.freeze(["Cu", "Co", "Fe", "Cr", "Mo", "Ag"] as Anode[]);

/** True if `value` is one of the tabulated anode symbols (case-sensitive: "Cu", not "CU"). */
export function isAnode(value: unknown): value is Anode {
  return typeof value === "string" && Object.prototype.hasOwnProperty.call(ANODE_WAVELENGTHS, value);
}

/**
 * Normalise an anode name as written in files ("cu", "CU", "Copper", "Cu K-alpha") to an {@link Anode}.
 * @returns the anode, or undefined when the text names none of the tabulated anodes
 */
export function parseAnode(text: string): Anode | undefined {
  const t = text.trim().toLowerCase();
  const names: Record<string, Anode> = {
    copper: "Cu",
    cobalt: "Co",
    iron: "Fe",
    chromium: "Cr",
    molybdenum: "Mo",
    silver: "Ag",
  };
  for (const [name, anode] of Object.entries(names)) if (t.startsWith(name)) return anode;
  const m = /^(cu|co|fe|cr|mo|ag)(?![a-z])/.exec(t);
  if (!m) return undefined;
  return (m[1][0].toUpperCase() + m[1][1]) as Anode;
}

/**
 * Wavelengths of an anode.
 * @param anode - tube target symbol
 * @returns Kα1, Kα2, weighted Kα and Kβ1 in Å with their source
 * @throws RangeError for an unknown anode
 */
export function wavelengthsFor(anode: Anode): AnodeWavelengths {
  if (!isAnode(anode)) throw new RangeError(`unknown anode "${String(anode)}"; expected one of ${ANODES.join(", ")}`);
  return ANODE_WAVELENGTHS[anode];
}

/** Which line a resolved wavelength represents. */
export type WavelengthKind = "kAlpha1" | "kAlphaWeighted" | "kBeta1" | "custom";

/** A wavelength decision, with where it came from. */
export interface ResolvedWavelength {
  /** Wavelength used for Bragg conversions, Å (Kα1 when the anode is known). */
  wavelength: number;
  /** Kα2 wavelength, Å, when known (needed for Kα2 stripping). */
  wavelength2?: number;
  anode?: Anode;
  kind: WavelengthKind;
  /** "explicit" (given wavelength), "anode" (from the anode table) or "default" (fallback anode). */
  source: "explicit" | "anode" | "default";
  /** Human-readable notes about the decision (e.g. a weighted Kα recognised and replaced by Kα1). */
  notes: string[];
}

/** Input to {@link resolveWavelength}. */
export interface WavelengthInput {
  anode?: Anode;
  /** Explicit wavelength, Å. Wins over the anode when both are given. */
  wavelength?: number;
  /** Explicit Kα2 wavelength, Å. */
  wavelength2?: number;
  /**
   * Anode assumed when neither anode nor wavelength is given; `null` makes that case an error.
   * @default null
   */
  fallbackAnode?: Anode | null;
  /**
   * Tolerance (Å) for recognising an explicit wavelength as a tabulated line of the anode.
   * @default 0.0005
   */
  matchToleranceA?: number;
}

/**
 * Decide the wavelength(s) to use from an anode and/or an explicit wavelength.
 *
 * - explicit wavelength: used as given; if it matches the weighted Kα of an anode (within `matchToleranceA`) it is
 *   replaced by that anode's Kα1 with Kα2 filled in (a weighted-mean λ is the wrong value for Kα1 peak positions after
 *   Kα2 stripping) and a note says so; if it matches Kα1, Kα2 is filled in from the table.
 * - anode only: Kα1 and Kα2 from the table.
 * - neither: `fallbackAnode` if set, else an error.
 * @throws RangeError for a non-positive or non-finite wavelength, or when nothing is given and no fallback is set
 */
export function resolveWavelength(input: WavelengthInput): ResolvedWavelength {
  const { anode, wavelength, wavelength2, fallbackAnode = null, matchToleranceA = 0.0005 } = input;
  if (wavelength !== undefined && !(Number.isFinite(wavelength) && wavelength > 0)) {
    throw new RangeError(`wavelength must be a positive number of ångström, got ${wavelength}`);
  }
  if (wavelength2 !== undefined && !(Number.isFinite(wavelength2) && wavelength2 > 0)) {
    throw new RangeError(`wavelength2 must be a positive number of ångström, got ${wavelength2}`);
  }
  if (anode !== undefined && !isAnode(anode)) {
    throw new RangeError(`unknown anode "${String(anode)}"; expected one of ${ANODES.join(", ")}`);
  }
  const notes: string[] = [];
  if (wavelength !== undefined) {
    const candidates = anode ? [ANODE_WAVELENGTHS[anode]] : ANODES.map((a) => ANODE_WAVELENGTHS[a]);
    for (const w of candidates) {
      if (Math.abs(wavelength - w.kAlpha1) <= matchToleranceA) {
        return { wavelength, wavelength2: wavelength2 ?? w.kAlpha2, anode: w.anode, kind: "kAlpha1", source: "explicit", notes };
      }
      if (Math.abs(wavelength - w.kAlpha) <= matchToleranceA && wavelength2 === undefined) {
        notes.push(
          `wavelength ${wavelength} Å is the weighted ${w.anode} Kα; using Kα1 ${w.kAlpha1} Å and Kα2 ${w.kAlpha2} Å`,
        );
        return { wavelength: w.kAlpha1, wavelength2: w.kAlpha2, anode: w.anode, kind: "kAlphaWeighted", source: "explicit", notes };
      }
      if (Math.abs(wavelength - w.kBeta1) <= matchToleranceA) {
        return { wavelength, wavelength2, anode: w.anode, kind: "kBeta1", source: "explicit", notes };
      }
    }
    if (anode) notes.push(`wavelength ${wavelength} Å does not match any tabulated ${anode} line; used as given`);
    return { wavelength, wavelength2, anode, kind: "custom", source: "explicit", notes };
  }
  if (anode) {
    const w = ANODE_WAVELENGTHS[anode];
    return { wavelength: w.kAlpha1, wavelength2: wavelength2 ?? w.kAlpha2, anode, kind: "kAlpha1", source: "anode", notes };
  }
  if (fallbackAnode) {
    const w = wavelengthsFor(fallbackAnode);
    notes.push(`no anode or wavelength given; assumed ${fallbackAnode} Kα1 ${w.kAlpha1} Å — check the instrument record`);
    return { wavelength: w.kAlpha1, wavelength2: w.kAlpha2, anode: fallbackAnode, kind: "kAlpha1", source: "default", notes };
  }
  throw new RangeError("no wavelength: give an anode or an explicit wavelength (Å)");
}
