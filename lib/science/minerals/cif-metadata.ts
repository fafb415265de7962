/** Metadata Lithodex reads from a reference CIF: crystal system, citation, and `# lithodex-…` comment lines. Pure. */
import type { CifStructure } from "@/lib/science/crystal";

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

/** `# lithodex-key: value` comment lines of a CIF. */
export function lithodexComments(text: string): { group?: string; hazards: string[]; aliases: string[] } {
  const out: { group?: string; hazards: string[]; aliases: string[] } = { hazards: [], aliases: [] };
  for (const line of text.split(/\r?\n/)) {
    const m = /^#\s*lithodex-(group|hazard|alias)\s*:\s*(.+?)\s*$/.exec(line);
    if (!m) continue;
    if (m[1] === "group") out.group = m[2].toLowerCase();
    else if (m[1] === "hazard") out.hazards.push(...m[2].split(/[,\s]+/).filter(Boolean));
    else out.aliases.push(...m[2].split(/,\s*/).map((s) => s.trim().toLowerCase()).filter(Boolean));
  }
  out.hazards.sort();
  out.aliases.sort();
  return out;
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

