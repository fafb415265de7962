/** Metadata Lithodex reads from a reference CIF: crystal system, citation, and `# lithodex-…` comment lines. Pure. */
import { cellVolume, unitCellMass, type CifStructure } from "@/lib/science/crystal";
import type { PhaseFitData } from "@/lib/science/types";

/** Crystal system from the space-group number (ITA ranges), else from the cell metrics. */
export function crystalSystemOf(structure: CifStructure): string {
  const n = structure.spaceGroup.number;
  if (n) {
    if (n <= 2) return "triclinic";
    if (n <= 15) return "monoclinic";
    if (n <= 74) return "orthorhombic";
    if (n <= 142) return "tetragonal";
    if (n <= 167) return "trigonal";
    if (n <= 194) return "hexagonal";
    return "cubic";
  }
  const { a, b, c, alpha, beta, gamma } = structure.cell;
  const eq = (x: number, y: number, t = 1e-3) => Math.abs(x - y) <= t * Math.max(x, y);
  const r90 = (x: number) => Math.abs(x - 90) < 1e-3;
  if (r90(alpha) && r90(beta) && Math.abs(gamma - 120) < 1e-3) return "hexagonal";
  if (r90(alpha) && r90(beta) && r90(gamma)) {
    if (eq(a, b) && eq(b, c)) return "cubic";
    if (eq(a, b)) return "tetragonal";
    return "orthorhombic";
  }
  if ([alpha, beta, gamma].filter(r90).length === 2) return "monoclinic";
  return "triclinic";
}

/** What the `# lithodex-…` comment lines of a CIF say. */
export interface LithodexComments {
  group?: string;
  hazards: string[];
  aliases: string[];
  /** `# lithodex-texture: h k l` — usual preferred-orientation plane (March–Dollase direction). */
  texture?: [number, number, number];
  /** `# lithodex-broadening: 3` — typical width multiple (> 0). */
  broadening?: number;
  /** `# lithodex-variable001: 12.4-15.5` — d(001) varies with hydration; the range in Å (or `yes` without one). */
  variable001?: boolean;
  d001Range?: [number, number];
  /** Lines that carry a lithodex key but an unusable value: "line 7: lithodex-texture needs three integers …". */
  problems: string[];
}

const NUM = String.raw`[0-9]+(?:\.[0-9]+)?`;

/** `# lithodex-key: value` comment lines of a CIF (unknown keys are ignored; bad values are listed in `problems`). */
export function lithodexComments(text: string): LithodexComments {
  const out: LithodexComments = { hazards: [], aliases: [], problems: [] };
  const lines = text.split(/\r?\n/);
  for (let i = 0; i < lines.length; i++) {
    const m = /^#\s*lithodex-(group|hazard|alias|texture|broadening|variable001)\s*:\s*(.+?)\s*$/.exec(lines[i]);
    if (!m) continue;
    const [, key, value] = m;
    const bad = (why: string) => out.problems.push(`line ${i + 1}: lithodex-${key} ${why} (found "${value}")`);
    if (key === "group") out.group = value.toLowerCase();
    else if (key === "hazard") out.hazards.push(...value.split(/[,\s]+/).filter(Boolean));
    else if (key === "alias") out.aliases.push(...value.split(/,\s*/).map((s) => s.trim().toLowerCase()).filter(Boolean));
    else if (key === "texture") {
      const t = /^(-?\d+)[\s,]+(-?\d+)[\s,]+(-?\d+)$/.exec(value);
      if (!t || (t[1] === "0" && t[2] === "0" && t[3] === "0")) bad("needs three integers h k l, not all zero");
      else out.texture = [Number(t[1]), Number(t[2]), Number(t[3])];
    } else if (key === "broadening") {
      const b = Number(value);
      if (!Number.isFinite(b) || b <= 0 || b > 50) bad("needs a width multiple between 0 and 50");
      else out.broadening = b;
    } else {
      const r = new RegExp(`^(${NUM})\\s*(?:-|–|to)\\s*(${NUM})`).exec(value);
      if (r && Number(r[1]) > 0 && Number(r[1]) < Number(r[2])) {
        out.variable001 = true;
        out.d001Range = [Number(r[1]), Number(r[2])];
      } else if (/^(yes|true)\b/i.test(value)) out.variable001 = true;
      else bad('needs a d(001) range in Å such as "12.4-15.5", or "yes"');
    }
  }
  out.hazards.sort();
  out.aliases.sort();
  return out;
}

/** The lithodex comments that belong to {@link PhaseFitData} (only those present). */
export function fitTags(meta: LithodexComments): Pick<PhaseFitData, "texture" | "broadening" | "variable001" | "d001Range"> {
  return {
    ...(meta.texture ? { texture: meta.texture } : {}),
    ...(meta.broadening !== undefined ? { broadening: meta.broadening } : {}),
    ...(meta.variable001 ? { variable001: true } : {}),
    ...(meta.d001Range ? { d001Range: meta.d001Range } : {}),
  };
}

/** IUPAC 2021 abridged standard atomic weight of H (Prohaska et al. 2022, Pure Appl. Chem. 94, 573). */
const HYDROGEN_WEIGHT = 1.008;

/**
 * Mass (g/mol per cell) of the hydrogen that `_chemical_formula_sum` lists but the atom sites omit: X-ray
 * refinements often leave H out, yet the ZM of Hill & Howard (1987) is the whole cell content (gypsum would be
 * 2.3 % light without it). Zero when any H or D site is present, or when the formula sum or Z is missing.
 */
export function omittedHydrogenMass(structure: CifStructure): number {
  if (structure.sites.some((s) => s.element === "H" || s.element === "D" || s.deuterium)) return 0;
  const z = structure.formulaUnitsZ;
  const f = structure.formulaSum;
  if (!z || z <= 0 || !f) return 0;
  const m = /(?:^|[\s(])H(\d*\.?\d*)(?=[\s)]|$)/.exec(f);
  if (!m) return 0;
  const n = m[1] === "" ? 1 : Number(m[1]);
  return Number.isFinite(n) && n > 0 ? z * n * HYDROGEN_WEIGHT : 0;
}

/**
 * Fit data of a structure (see {@link PhaseFitData}) from its computed lines: V, Z·M (sites × occupancies ×
 * atomic weights, plus the hydrogen of the formula sum when the sites omit it) and the absolute
 * m·|F|²·Lp of the strongest line. Pass the lines computed with the library's settings (Cu Kα1, no
 * monochromator) so that `absoluteScale` matches the stored intensities.
 * @throws RangeError when there are no lines
 */
export function fitDataOf(structure: CifStructure, lines: readonly { absoluteIntensity: number }[], meta: LithodexComments): PhaseFitData {
  if (lines.length === 0) throw new RangeError("no computed lines: the absolute scale is undefined");
  const strongest = lines.reduce((m, l) => Math.max(m, l.absoluteIntensity), 0);
  return {
    cellVolume: roundTo(cellVolume(structure.cell), 4),
    cellMass: roundTo(unitCellMass(structure) + omittedHydrogenMass(structure), 4),
    absoluteScale: roundSignificant(strongest, 7),
    ...fitTags(meta),
  };
}

function roundTo(x: number, digits: number): number {
  const f = 10 ** digits;
  return Math.round(x * f) / f;
}

function roundSignificant(x: number, digits: number): number {
  if (x === 0 || !Number.isFinite(x)) return x;
  return Number(x.toPrecision(digits));
}

/** "Authors (year) journal volume, page" from a parsed CIF's citation. */
export function citationOf(structure: CifStructure): string {
  const c = structure.citation;
  const authors = c.authors.join(", ");
  const pages = c.firstPage ? (c.lastPage ? `${c.firstPage}-${c.lastPage}` : c.firstPage) : "";
  return [authors, c.year ? `(${c.year})` : "", c.journal ?? "", [c.volume, pages].filter(Boolean).join(", ")]
    .filter((s) => s !== "")
    .join(" ")
    .trim();
}

