import "server-only";
import { readFileSync } from "node:fs";
import { join } from "node:path";
import { and, asc, count, eq, inArray, or, sql, type SQL } from "drizzle-orm";
import { getDb } from "@/db";
import { projectMembers, referencePhases, user } from "@/db/schema";
import { invalidateReferenceLibrary, type StoredLine } from "@/lib/jobs";
import { formulaSearchKey, hermannMauguin, mineralFormula } from "@/lib/science/minerals/notation";
import { ANODE_WAVELENGTHS } from "@/lib/science/anodes";
import type { CifStructure } from "@/lib/science/crystal";
import { findLibraryPhase } from "@/lib/science/minerals";
import { twoThetaFromD } from "@/lib/science/units";
import { hazardFromName, patternQuerySchema, referenceListQuerySchema } from "@/lib/validation/scan";
import { citationOf, crystalSystemOf, fitDataOf, lithodexComments } from "@/lib/science/minerals/cif-metadata";
import type { PhaseFitData } from "@/lib/science/types";
import type { Actor } from "./actor";
import { audit } from "./audit";
import { AppError, forbidden, notFound } from "./errors";
import { PERMISSIONS } from "./permissions";
import { validateInput } from "./validate";
import { runJob, TaskError } from "@/lib/workers/pool";
import type { CifImportOutput } from "@/lib/workers/tasks/cif-import";

/** Limits of one CIF job in the worker pool (the CIF and pattern limits keep real work far below them). */
const CIF_JOB_LIMITS = { timeoutMs: 15_000, maxMemoryMb: 256 };

/** True for errors a CIF job reports about the file itself (not a server fault). */
const isFileProblem = (err: unknown): err is TaskError => err instanceof TaskError && ["CifError", "RangeError", "TypeError"].includes(err.remoteName);

/** Settings of the shipped library, used for imported structures too (Cu Kα1, 2θ ≤ 100°, I ≥ 0.5). */
const LIBRARY_WAVELENGTH = 1.540593;
const LIBRARY_TWO_THETA_MAX = 100;
const LIBRARY_MIN_INTENSITY = 0.5;
/** Largest CIF accepted, bytes. */
export const MAX_CIF_BYTES = 2 * 1024 * 1024;
/** Most CIF files in one import request (the request body is capped at 2 MiB too). */
export const MAX_CIF_FILES = 20;

/** Handling hazards of a shipped phase beyond the two typed ones (radioactive, toxic-arsenic…). */
export function otherHazardsOf(mineral: string): string[] {
  return (findLibraryPhase(mineral)?.hazards ?? []).filter((h) => h !== "asbestos" && h !== "crystalline_silica");
}

/** True when the actor may import reference structures: site admin, or a role with reference.import in any project. */
export async function canImportReferences(actor: Actor): Promise<boolean> {
  if (actor.isAdmin) return true;
  const roles = PERMISSIONS["reference.import"].roles as readonly string[];
  const [row] = await getDb()
    .select({ n: count() })
    .from(projectMembers)
    .where(and(eq(projectMembers.userId, actor.userId), inArray(projectMembers.role, roles as ("lead" | "field_geologist" | "lab_analyst" | "consultant")[])));
  return row.n > 0;
}

const strongest = (lines: StoredLine[], n: number) =>
  [...lines]
    .sort((a, b) => b.intensity - a.intensity)
    .slice(0, n)
    .map((l) => ({ d: l.d, intensity: l.intensity }));

/** The reference library (shipped and imported), searchable by name, formula, group, element and hazard. Any signed-in user. */
export async function listReferencePhases(actor: Actor, raw: unknown) {
  void actor;
  const q = validateInput(referenceListQuerySchema, raw);
  const db = getDb();
  const parts: (SQL | undefined)[] = [];
  if (q.q) {
    const v = `%${q.q.toLowerCase().replace(/[\\%_]/g, (c) => `\\${c}`)}%`;
    // A formula matches however it is spaced or bracketed: "FeS2", "Fe S2" and "fes2" agree (formulaSearchKey).
    const key = formulaSearchKey(q.q).replace(/[\\%_]/g, (c) => `\\${c}`);
    const formulaKey = sql`replace(replace(replace(replace(replace(lower(${referencePhases.formula}), ' ', ''), '(', ''), ')', ''), '·', ''), ',', '')`;
    parts.push(
      or(
        sql`lower(${referencePhases.mineral}) LIKE ${v} ESCAPE '\\'`,
        sql`lower(${referencePhases.formula}) LIKE ${v} ESCAPE '\\'`,
        key ? sql`${formulaKey} LIKE ${`%${key}%`} ESCAPE '\\'` : undefined,
        sql`lower(coalesce(${referencePhases.mineralGroup}, '')) LIKE ${v} ESCAPE '\\'`,
      ),
    );
  }
  if (q.hazard) parts.push(eq(referencePhases.hazard, q.hazard));
  if (q.element) parts.push(sql`(',' || ${referencePhases.elements} || ',') LIKE ${`%,${q.element},%`}`);
  if (q.source) parts.push(eq(referencePhases.builtin, q.source === "builtin"));
  const where = parts.length ? and(...parts) : undefined;
  const [rows, [{ total }]] = await Promise.all([
    db
      .select({
        id: referencePhases.id,
        mineral: referencePhases.mineral,
        formula: referencePhases.formula,
        group: referencePhases.mineralGroup,
        crystalSystem: referencePhases.crystalSystem,
        spaceGroup: referencePhases.spaceGroup,
        elements: referencePhases.elements,
        hazard: referencePhases.hazard,
        rir: referencePhases.rir,
        builtin: referencePhases.builtin,
        citation: referencePhases.citation,
        pattern: referencePhases.patternJson,
        createdAt: referencePhases.createdAt,
      })
      .from(referencePhases)
      .where(where)
      .orderBy(asc(referencePhases.mineral), asc(referencePhases.createdAt))
      .limit(q.pageSize)
      .offset((q.page - 1) * q.pageSize),
    db.select({ total: count() }).from(referencePhases).where(where),
  ]);
  return {
    items: rows.map(({ pattern, elements, ...r }) => ({
      ...r,
      elements: elements.split(",").filter(Boolean),
      otherHazards: r.builtin ? otherHazardsOf(r.mineral) : [],
      strongLines: strongest(pattern as StoredLine[], 3),
    })),
    total,
    page: q.page,
    pageSize: q.pageSize,
    canImport: await canImportReferences(actor),
  };
}

/**
 * One reference phase with its calculated pattern for any anode or wavelength (recomputed from the stored
 * structure: positions and the Lorentz–polarisation factor depend on λ).
 */
export async function getReferencePhaseOrThrow(actor: Actor, id: string, raw: unknown) {
  void actor;
  const q = validateInput(patternQuerySchema, raw);
  const db = getDb();
  const [row] = await db
    .select({ phase: referencePhases, importedByName: user.name })
    .from(referencePhases)
    .leftJoin(user, eq(user.id, referencePhases.importedBy))
    .where(eq(referencePhases.id, id));
  if (!row) throw notFound("Reference phase not found.");
  const p = row.phase;
  const wavelength = q.wavelength ?? ANODE_WAVELENGTHS[q.anode ?? "Cu"].kAlpha1;
  let lines: { h: number; k: number; l: number; d: number; twoTheta: number; intensity: number; multiplicity: number }[];
  let warnings: string[] = [];
  try {
    const result = await runJob<{ warnings: string[]; lines: typeof lines }>(
      "cif-pattern",
      { cifText: p.cifText, wavelength, twoThetaMax: q.twoThetaMax, minIntensity: LIBRARY_MIN_INTENSITY },
      CIF_JOB_LIMITS,
      `The pattern of ${p.mineral}`,
    );
    warnings = result.warnings;
    lines = result.lines;
  } catch (err) {
    if (!isFileProblem(err)) throw err;
    // The stored lines (Cu Kα1) converted by Bragg's law: positions are right, intensities keep the Cu Lp factor.
    warnings = [`Pattern recomputation failed (${err.message}); stored Cu Kα1 intensities shown at the new positions.`];
    lines = (p.patternJson as StoredLine[])
      .filter((l) => wavelength / (2 * l.d) < 1)
      .map((l) => ({ ...l, twoTheta: twoThetaFromD(l.d, wavelength) }))
      .filter((l) => l.twoTheta <= q.twoThetaMax);
  }
  const { cifText, elements, ...withPattern } = p;
  const rest: Omit<typeof withPattern, "patternJson"> & { patternJson?: unknown } = { ...withPattern };
  delete rest.patternJson;
  return {
    phase: { ...rest, elements: elements.split(",").filter(Boolean), otherHazards: p.builtin ? otherHazardsOf(p.mineral) : [], importedByName: row.importedByName, cifLength: cifText.length },
    pattern: { wavelength, anode: q.wavelength ? null : (q.anode ?? "Cu"), twoThetaMax: q.twoThetaMax, lines, warnings, geometry: "Bragg–Brentano, no monochromator, random orientation (calculated, not measured)" },
  };
}

/** The stored CIF text of a phase (download). */
export async function getReferenceCif(actor: Actor, id: string) {
  void actor;
  const [row] = await getDb().select({ mineral: referencePhases.mineral, cif: referencePhases.cifText }).from(referencePhases).where(eq(referencePhases.id, id));
  if (!row) throw notFound("Reference phase not found.");
  return row;
}

let corundumCache: string | null = null;

/** Corundum, the RIR reference: the shipped row in the database, else the shipped CIF file (its text; workers parse it). */
async function corundumText(): Promise<string> {
  if (corundumCache) return corundumCache;
  const [row] = await getDb().select({ cif: referencePhases.cifText }).from(referencePhases).where(and(eq(referencePhases.mineral, "corundum"), eq(referencePhases.builtin, true)));
  corundumCache = row?.cif ?? readFileSync(join(process.cwd(), "lib/science/minerals/cif/corundum.cif"), "utf8");
  return corundumCache;
}

/** A CIF that could not be imported, with the line when known. */
export interface CifProblem {
  fileName: string;
  message: string;
  line?: number;
  code?: string;
}

/** True for structures determined far from room conditions (common practice: use ambient entries for identification). */
function nonAmbient(s: CifStructure): string | null {
  const t = s.ambient.temperatureK;
  const p = s.ambient.pressureKPa;
  if (t !== undefined && (t < 200 || t > 400)) return `the structure was determined at ${t} K; import an ambient-temperature entry for identification`;
  if (p !== undefined && p > 1000) return `the structure was determined at ${p} kPa; import an ambient-pressure entry for identification`;
  return null;
}

/**
 * Imports CIFs into the library: each usable file becomes a reference phase with its stored structure, calculated
 * Cu Kα1 pattern and RIR against corundum; each unusable one gets its own error (with the CIF line when known).
 * Site admins and lab analysts (in any project) only.
 * @returns imported phases and per-file errors; 422 when no file could be imported
 */
export async function importReferenceCifs(actor: Actor, files: { name: string; bytes: Uint8Array }[]) {
  if (!(await canImportReferences(actor))) throw forbidden("Only lab analysts and site admins can import reference structures.");
  if (files.length === 0) throw new AppError("validation_failed", "Choose one or more CIF files.", { files: ["Choose one or more CIF files."] });
  if (files.length > MAX_CIF_FILES) throw new AppError("validation_failed", `${files.length} files is over the limit of ${MAX_CIF_FILES} CIF files per import request (MAX_CIF_FILES).`, { files: [`At most ${MAX_CIF_FILES} CIF files per import request; this one has ${files.length}.`] });
  const db = getDb();
  const corundum = await corundumText();
  const errors: CifProblem[] = [];
  const imported: { id: string; fileName: string; mineral: string; formula: string; lines: number; rir: number | null; hazard: string | null; warnings: string[] }[] = [];
  for (const file of files) {
    if (file.bytes.byteLength === 0) {
      errors.push({ fileName: file.name, message: "The file is empty." });
      continue;
    }
    if (file.bytes.byteLength > MAX_CIF_BYTES) {
      errors.push({ fileName: file.name, message: `The file is larger than ${MAX_CIF_BYTES / 1048576} MiB.` });
      continue;
    }
    const text = new TextDecoder("utf-8").decode(file.bytes);
    let structure: CifStructure;
    let lines: StoredLine[];
    let warnings: string[];
    let rir: number | null = null;
    let fit: PhaseFitData | null = null;
    const meta = lithodexComments(text);
    try {
      // Parsing, the pattern and the RIR run in the worker pool, under the CIF limits and a time and memory limit.
      const job = await runJob<CifImportOutput>(
        "cif-import",
        { text, corundumText: corundum, wavelength: LIBRARY_WAVELENGTH, twoThetaMax: LIBRARY_TWO_THETA_MAX, minIntensity: LIBRARY_MIN_INTENSITY },
        CIF_JOB_LIMITS,
        file.name,
      );
      structure = job.structure;
      const result = { lines: job.lines, warnings: job.patternWarnings };
      const why = nonAmbient(structure);
      if (why) {
        errors.push({ fileName: file.name, message: `Not imported: ${why}.`, code: "non-ambient" });
        continue;
      }
      if (result.lines.length === 0) {
        errors.push({ fileName: file.name, message: `No diffraction lines up to ${LIBRARY_TWO_THETA_MAX}° 2θ (Cu Kα1); check the cell and atom sites.`, code: "no-lines" });
        continue;
      }
      lines = result.lines.map((l) => ({ h: l.h, k: l.k, l: l.l, d: Math.round(l.d * 1e5) / 1e5, intensity: Math.round(l.intensity * 100) / 100, multiplicity: l.multiplicity }));
      warnings = [...structure.warnings, ...result.warnings, ...meta.problems.map((p) => `Ignored: ${p}.`)];
      // cell volume, Z·M and the absolute scale of the 100-line for the whole-pattern fit (Hill & Howard 1987)
      fit = fitDataOf(structure, result.lines, meta);
      if (job.rir !== null) rir = Math.round(job.rir * 1000) / 1000;
      else if (job.rirProblem) warnings.push(`RIR could not be computed (${job.rirProblem}); semi-quantitative wt% will not be available for this phase.`);
    } catch (err) {
      if (isFileProblem(err)) {
        errors.push({ fileName: file.name, message: err.message, ...(err.code && { code: err.code }), ...(err.line && err.line > 0 && { line: err.line }) });
        continue;
      }
      if (err instanceof AppError && err.code === "validation_failed") {
        // over the job's time or memory limit: this file is refused, the others go on
        errors.push({ fileName: file.name, message: err.message, code: "limit" });
        continue;
      }
      throw err;
    }
    const mineral = (structure.mineral ?? structure.blockName).trim().toLowerCase().slice(0, 120);
    const hazardTag = meta.hazards.find((h): h is "asbestos" | "crystalline_silica" => h === "asbestos" || h === "crystalline_silica");
    const hazard = hazardTag ?? hazardFromName(mineral);
    const { a, b, c, alpha, beta, gamma } = structure.cell;
    const [dup] = await db
      .select({ id: referencePhases.id })
      .from(referencePhases)
      .where(and(eq(referencePhases.mineral, mineral), eq(referencePhases.builtin, false), sql`abs(${referencePhases.cellA} - ${a}) < 1e-4`));
    if (dup) {
      errors.push({ fileName: file.name, message: `${mineral} with a = ${a} Å is already in the library (imported earlier).`, code: "duplicate" });
      continue;
    }
    // Shown in mineral notation when the mineral is known, else the CIF sum compacted (hydrogen kept).
    const formula = mineralFormula(mineral, (structure.formulaSum ?? "").replace(/\s+/g, " ").trim() || [...new Set(structure.sites.map((s) => s.element))].sort().join(" "));
    const row = await db.transaction(async (tx) => {
      const [r] = await tx
        .insert(referencePhases)
        .values({
          mineral,
          formula,
          mineralGroup: meta.group ?? null,
          crystalSystem: crystalSystemOf(structure),
          spaceGroup: structure.spaceGroup.name ? hermannMauguin(structure.spaceGroup.name) : structure.spaceGroup.number ? `No. ${structure.spaceGroup.number}` : "P1 (from operators)",
          cellA: a,
          cellB: b,
          cellC: c,
          cellAlpha: alpha,
          cellBeta: beta,
          cellGamma: gamma,
          elements: [...new Set(structure.sites.map((s) => s.element))].sort().join(","),
          hazard,
          citation: citationOf(structure) || `Imported from ${file.name}`,
          cifText: text,
          patternJson: lines,
          rir,
          fitJson: fit,
          builtin: false,
          importedBy: actor.userId,
        })
        .returning({ id: referencePhases.id });
      await audit(tx, actor, { projectId: null, action: "import", entity: "reference_phase", entityId: r.id, after: { mineral, formula, fileName: file.name, rir, lines: lines.length } });
      return r;
    });
    imported.push({ id: row.id, fileName: file.name, mineral, formula, lines: lines.length, rir, hazard, warnings });
  }
  if (imported.length) invalidateReferenceLibrary();
  if (imported.length === 0) {
    throw new AppError(
      "validation_failed",
      errors.length === 1 ? `${errors[0].fileName}: ${errors[0].message}` : `None of the ${errors.length} files could be imported.`,
      { files: errors.map((e) => `${e.fileName}${e.line ? ` (line ${e.line})` : ""}: ${e.message}`) },
      { errors },
    );
  }
  return { imported, errors };
}

/** Finds shipped or imported phases by id (used by the review DAL). */
export async function referencePhaseExists(id: string): Promise<{ id: string; mineral: string } | null> {
  const [r] = await getDb().select({ id: referencePhases.id, mineral: referencePhases.mineral }).from(referencePhases).where(eq(referencePhases.id, id));
  return r ?? null;
}

