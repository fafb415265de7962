/**
 * Build the shipped reference library (lib/science/minerals/library.json) from the mineral CIFs in
 * lib/science/minerals/cif: pattern for Cu Kα1 up to 100° 2θ (lines with I ≥ 0.5), RIR against corundum.cif, and
 * the `# lithodex-group:`, `# lithodex-hazard:`, `# lithodex-alias:` comment lines of each file.
 *
 *   npx tsx scripts/build-reference-library.ts           write the JSON
 *   npx tsx scripts/build-reference-library.ts --check   exit 1 when the JSON is out of date
 *
 * The output is sorted and rounded (d to 5 decimals, I to 2) so rebuilds are byte-stable.
 */
import { readdirSync, readFileSync, writeFileSync } from "node:fs";
import { basename, dirname, join } from "node:path";
import { fileURLToPath, pathToFileURL } from "node:url";
import { CifError, computePattern, parseCif, referenceIntensityRatio, type CifStructure } from "@/lib/science/crystal";
import type { LibraryFile, LibraryPhase } from "@/lib/science/minerals";

/** Cu Kα1 (Å), ITC Vol. C (2006) Table 4.2.2.6 rounded as in DOMAIN §3.1. */
export const LIBRARY_WAVELENGTH = 1.540593;
export const LIBRARY_TWO_THETA_MAX = 100;
export const LIBRARY_MIN_INTENSITY = 0.5;

/** One CIF file's name and text. */
export interface CifFile {
  file: string;
  text: string;
}

const round = (x: number, digits: number): number => {
  const f = 10 ** digits;
  const v = Math.round(x * f) / f;
  return Object.is(v, -0) ? 0 : v;
};

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

/**
 * Build the library from CIF texts (pure apart from the inputs given).
 * @param cifs - all mineral CIFs; one of them must be `corundum.cif` (the RIR reference)
 * @throws Error naming the file when a CIF cannot be read or yields no lines
 */
export function buildReferenceLibrary(cifs: readonly CifFile[]): LibraryFile {
  const corundumFile = cifs.find((c) => basename(c.file) === "corundum.cif");
  if (!corundumFile) throw new Error("corundum.cif is missing: it is the reference of every RIR");
  const corundum = parseCif(corundumFile.text);
  const patternOptions = { wavelength: LIBRARY_WAVELENGTH, twoThetaMax: LIBRARY_TWO_THETA_MAX };
  const phases: LibraryPhase[] = [];
  for (const { file, text } of [...cifs].sort((a, b) => basename(a.file).localeCompare(basename(b.file)))) {
    const id = basename(file, ".cif");
    let structure: CifStructure;
    try {
      structure = parseCif(text);
    } catch (e) {
      throw new Error(`${basename(file)}: ${e instanceof CifError ? "CIF error: " : ""}${(e as Error).message}`);
    }
    const lines = computePattern(structure, { ...patternOptions, minIntensity: LIBRARY_MIN_INTENSITY });
    if (lines.length === 0) throw new Error(`${basename(file)}: no lines computed up to ${LIBRARY_TWO_THETA_MAX}° 2θ`);
    const rir = referenceIntensityRatio(structure, corundum, patternOptions);
    const meta = lithodexComments(text);
    const { a, b, c, alpha, beta, gamma } = structure.cell;
    phases.push({
      id,
      mineral: (structure.mineral ?? id).trim().toLowerCase(),
      aliases: meta.aliases,
      formula: (structure.formulaSum ?? "").replace(/\s+/g, " ").trim(),
      elements: [...new Set(structure.sites.map((s) => s.element))].sort(),
      group: meta.group ?? null,
      hazards: meta.hazards,
      rir: round(rir, 3),
      spaceGroup: structure.spaceGroup.name ?? null,
      spaceGroupNumber: structure.spaceGroup.number ?? null,
      crystalSystem: crystalSystemOf(structure),
      cell: { a: round(a, 5), b: round(b, 5), c: round(c, 5), alpha: round(alpha, 4), beta: round(beta, 4), gamma: round(gamma, 4) },
      citation: citationOf(structure),
      databaseCode: structure.citation.databaseCode ?? null,
      source: `lib/science/minerals/cif/${basename(file)}`,
      lines: lines
        .map((l) => [l.h, l.k, l.l, round(l.d, 5), round(l.intensity, 2), l.multiplicity] as [number, number, number, number, number, number])
        .sort((p, q) => q[3] - p[3] || p[0] - q[0] || p[1] - q[1] || p[2] - q[2]),
    });
  }
  return {
    about:
      "Generated by scripts/build-reference-library.ts from lib/science/minerals/cif/*.cif; do not edit by hand. " +
      "Calculated patterns (not measured), Cu Kα1, Bragg–Brentano, no monochromator, random orientation.",
    wavelength: LIBRARY_WAVELENGTH,
    twoThetaMax: LIBRARY_TWO_THETA_MAX,
    minIntensity: LIBRARY_MIN_INTENSITY,
    lineColumns: ["h", "k", "l", "d", "intensity", "multiplicity"],
    phases,
  };
}

/** Stable JSON text of a library: one phase per block, one line per reflection. */
export function serializeLibrary(library: LibraryFile): string {
  const { phases, ...head } = library;
  const phaseText = phases.map((p) => {
    const { lines, ...rest } = p;
    const body = JSON.stringify(rest).slice(1, -1);
    return `    {${body},"lines":[\n${lines.map((l) => `      ${JSON.stringify(l)}`).join(",\n")}\n    ]}`;
  });
  const headText = JSON.stringify(head).slice(1, -1);
  return `{${headText},"phases":[\n${phaseText.join(",\n")}\n]}\n`;
}

/** Read every CIF of a folder. */
export function readCifFolder(folder: string): CifFile[] {
  return readdirSync(folder)
    .filter((f) => f.endsWith(".cif"))
    .sort()
    .map((f) => ({ file: f, text: readFileSync(join(folder, f), "utf8") }));
}

const root = join(dirname(fileURLToPath(import.meta.url)), "..");
export const CIF_FOLDER = join(root, "lib/science/minerals/cif");
export const LIBRARY_PATH = join(root, "lib/science/minerals/library.json");

function main(argv: string[]): number {
  const check = argv.includes("--check");
  const t0 = performance.now();
  const library = buildReferenceLibrary(readCifFolder(CIF_FOLDER));
  const text = serializeLibrary(library);
  const ms = performance.now() - t0;
  if (check) {
    let current = "";
    try {
      current = readFileSync(LIBRARY_PATH, "utf8");
    } catch {
      /* missing file counts as out of date */
    }
    if (current !== text) {
      console.error("library.json is out of date: run npx tsx scripts/build-reference-library.ts");
      return 1;
    }
    console.log(`library.json is up to date (${library.phases.length} phases)`);
    return 0;
  }
  writeFileSync(LIBRARY_PATH, text);
  const lines = library.phases.reduce((s, p) => s + p.lines.length, 0);
  console.log(`wrote ${library.phases.length} phases, ${lines} lines, ${(text.length / 1024).toFixed(0)} KiB in ${ms.toFixed(0)} ms`);
  return 0;
}

if (process.argv[1] && import.meta.url === pathToFileURL(process.argv[1]).href) {
  try {
    process.exitCode = main(process.argv.slice(2));
  } catch (e) {
    console.error(`build-reference-library: ${(e as Error).message}`);
    process.exitCode = 2;
  }
}
