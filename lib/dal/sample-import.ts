import "server-only";
import { and, eq, inArray, sql } from "drizzle-orm";
import { z } from "zod";
import { getDb } from "@/db";
import { auditLog, custodyEvents, projects, samples, stations } from "@/db/schema";
import { SAMPLE_CSV_COLUMNS, type CsvImportError, type CsvImportParse, type CsvImportRow } from "@/lib/csv";
import { runJob } from "@/lib/workers/pool";
import { authorize, type Actor } from "./actor";
import { audit } from "./audit";
import { checkReservedCodesForImport } from "./code-blocks";
import { AppError } from "./errors";
import { formatCodeFromPattern } from "@/lib/validation/project";
import { IGSN_NOT_ACCEPTED, isUniqueViolation } from "./samples";
import { validateInput } from "./validate";

/** Largest CSV accepted, characters (≈ 20 000 rows of a full register). */
export const MAX_IMPORT_CHARS = 12_000_000;
/** Rows returned by a preview for the table (errors are all returned, up to {@link MAX_ERRORS_RETURNED}). */
export const PREVIEW_ROWS = 50;
export const MAX_ERRORS_RETURNED = 1000;
/** Rows per INSERT statement: 22 columns × 400 rows stays well under SQLite's 32 766 bound parameters. */
const INSERT_BATCH = 400;

const FIELDS = SAMPLE_CSV_COLUMNS.map((c) => c.field) as [string, ...string[]];

export const sampleImportSchema = z
  .object({
    csv: z.string({ error: "csv (the file's text) is required." }).min(1, "The file is empty.").max(MAX_IMPORT_CHARS, `The file is larger than ${MAX_IMPORT_CHARS / 1_000_000} million characters; split it.`),
    mapping: z.record(z.string(), z.enum(FIELDS).nullable()).optional(),
    decimalComma: z.union([z.boolean(), z.literal("auto")]).optional(),
    timeZone: z.string().trim().max(64).nullable().optional(),
  })
  .strict();

export interface SampleImportPreview {
  headers: string[];
  mapping: CsvImportParse["mapping"];
  delimiter: string;
  decimalComma: boolean;
  rowCount: number;
  validRowCount: number;
  /** The first rows as they would be imported. */
  rows: CsvImportRow[];
  errors: CsvImportError[];
  errorCount: number;
}

type Checked = { parse: CsvImportParse; errors: CsvImportError[]; stationIds: Map<string, string> };

function chunks<T>(items: readonly T[], size: number): T[][] {
  const out: T[][] = [];
  for (let i = 0; i < items.length; i += size) out.push(items.slice(i, i + size));
  return out;
}

/** Parses the file, then checks what needs the database: codes and IGSNs already used, station codes. */
async function parseAndCheck(projectId: string, raw: unknown): Promise<Checked> {
  const input = validateInput(sampleImportSchema, raw);
  // Parsing and per-row validation of up to 12 million characters run in the worker pool (time and memory limit).
  const parse = await runJob<CsvImportParse>(
    "csv-parse",
    { csv: input.csv, options: { mapping: input.mapping as CsvImportParse["mapping"] | undefined, decimalComma: input.decimalComma ?? "auto", defaultTimeZone: input.timeZone || null } },
    { timeoutMs: 60_000, maxMemoryMb: 768 },
    "Reading the CSV file",
  );
  const errors = [...parse.errors];
  const db = getDb();
  const colOf = (field: string) => parse.headers.find((h) => parse.mapping[h] === field) ?? null;

  const stationRows = await db.select({ id: stations.id, code: stations.code }).from(stations).where(eq(stations.projectId, projectId));
  const stationIds = new Map(stationRows.map((s) => [s.code.toUpperCase(), s.id]));

  const codes = parse.rows.map((r) => r.sample.code).filter((c): c is string => !!c);
  const taken = new Set<string>();
  for (const part of chunks(codes, 500)) {
    const rows = await db.select({ code: samples.code }).from(samples).where(and(eq(samples.projectId, projectId), inArray(samples.code, part)));
    for (const r of rows) taken.add(r.code);
  }
  const igsns = parse.rows.map((r) => r.sample.igsn).filter((c): c is string => !!c);
  const takenIgsn = new Set<string>();
  const hiddenIgsn = new Set<string>();
  for (const part of chunks(igsns, 500)) {
    // IGSNs are unique everywhere; one held by a project the caller cannot see is answered like an invalid value.
    for (const r of await db.select({ igsn: samples.igsn, projectId: samples.projectId }).from(samples).where(inArray(samples.igsn, part))) {
      if (r.igsn) (r.projectId === projectId ? takenIgsn : hiddenIgsn).add(r.igsn);
    }
  }
  const igsnLines = new Map<string, number>();

  const good: CsvImportRow[] = [];
  for (const row of parse.rows) {
    const rowErrors: CsvImportError[] = [];
    const { code, igsn } = row.sample;
    if (code && taken.has(code)) rowErrors.push({ line: row.line, column: colOf("code"), field: "code", message: `Sample code ${code} is already used in this project.` });
    if (igsn) {
      if (takenIgsn.has(igsn)) rowErrors.push({ line: row.line, column: colOf("igsn"), field: "igsn", message: `IGSN ${igsn} is already registered to another sample in this project.` });
      else if (hiddenIgsn.has(igsn)) rowErrors.push({ line: row.line, column: colOf("igsn"), field: "igsn", message: IGSN_NOT_ACCEPTED });
      else if (igsnLines.has(igsn)) rowErrors.push({ line: row.line, column: colOf("igsn"), field: "igsn", message: `IGSN ${igsn} is already used on line ${igsnLines.get(igsn)} of this file.` });
      else igsnLines.set(igsn, row.line);
    }
    if (row.stationCode && !stationIds.has(row.stationCode)) {
      rowErrors.push({ line: row.line, column: colOf("stationCode"), field: "stationCode", message: `No station ${row.stationCode} in this project; create the station first or leave the cell empty.` });
    }
    if (rowErrors.length) errors.push(...rowErrors);
    else good.push(row);
  }
  errors.sort((a, b) => a.line - b.line);
  return { parse: { ...parse, rows: good }, errors, stationIds };
}

function summary(c: Checked): SampleImportPreview {
  const { parse, errors } = c;
  return {
    headers: parse.headers,
    mapping: parse.mapping,
    delimiter: parse.delimiter,
    decimalComma: parse.decimalComma,
    rowCount: parse.rowCount,
    validRowCount: parse.rows.length,
    rows: parse.rows.slice(0, PREVIEW_ROWS),
    errors: errors.slice(0, MAX_ERRORS_RETURNED),
    errorCount: errors.length,
  };
}

/**
 * Dry run of an import: the proposed column mapping, the first rows as they would be stored, and
 * every problem by file line and column. Writes nothing.
 */
export async function previewSampleImport(actor: Actor, projectId: string, raw: unknown): Promise<SampleImportPreview> {
  await authorize(actor, projectId, "sample.write");
  return summary(await parseAndCheck(projectId, raw));
}

/**
 * Imports every row of the file in one transaction, or none: any problem (in the file or against the
 * project) is a 422 listing them, and nothing is written. Rows without a code get the next codes of
 * the project sequence, in file order.
 */
export async function commitSampleImport(actor: Actor, projectId: string, raw: unknown): Promise<{ imported: number; firstCode: string | null; lastCode: string | null }> {
  const access = await authorize(actor, projectId, "sample.write");
  const checked = await parseAndCheck(projectId, raw);
  if (checked.errors.length) {
    const s = summary(checked);
    throw new AppError("validation_failed", `${s.errorCount} problem${s.errorCount === 1 ? "" : "s"} in the file; nothing was imported.`, undefined, {
      errors: s.errors,
      errorCount: s.errorCount,
    });
  }
  const rows = checked.parse.rows;
  const db = getDb();
  try {
    return await db.transaction(async (tx) => {
      const needCodes = rows.filter((r) => !r.sample.code).length;
      let next = 0;
      let pattern: string | null = null;
      if (needCodes > 0) {
        const [p] = await tx
          .update(projects)
          .set({ sampleSeq: sql`${projects.sampleSeq} + ${needCodes}` })
          .where(eq(projects.id, projectId))
          .returning({ seq: projects.sampleSeq, pattern: projects.sampleCodePattern });
        next = p.seq - needCodes + 1;
        pattern = p.pattern;
      }
      const now = new Date().toISOString();
      const values = rows.map(({ sample: { planned, ...r }, stationCode }) => ({
        ...r,
        id: crypto.randomUUID(),
        code: r.code ?? formatCodeFromPattern(pattern, access.projectCode, next++),
        projectId,
        stationId: stationCode ? checked.stationIds.get(stationCode)! : null,
        // The status follows the events: a collection event per collected sample below.
        status: planned ? ("planned" as const) : ("collected" as const),
        createdBy: actor.userId,
      }));
      for (const part of chunks(values, INSERT_BATCH)) await tx.insert(samples).values(part);
      // Typed codes reserved for a device: only the account that reserved them may use them (lib/dal/code-blocks.ts).
      await checkReservedCodesForImport(tx, actor, projectId, values.filter((v, i) => rows[i].sample.code).map((v) => ({ code: v.code, sampleId: v.id })));
      const collected = values.filter((v) => v.status === "collected");
      for (const part of chunks(collected, INSERT_BATCH)) {
        await tx.insert(custodyEvents).values(
          part.map((v) => ({ sampleId: v.id, event: "collected" as const, actorId: actor.userId, actorName: v.collectorName || actor.name, occurredAt: v.collectedAt ?? now, note: "Registered by CSV import", statusAfter: "collected" as const })),
        );
      }
      for (const part of chunks(values, INSERT_BATCH)) {
        await tx.insert(auditLog).values(
          part.map((v) => ({ projectId, actorId: actor.userId, action: "import", entity: "sample", entityId: v.id, beforeJson: null, afterJson: v })),
        );
      }
      await audit(tx, actor, {
        projectId,
        action: "import",
        entity: "sample_import",
        entityId: crypto.randomUUID(),
        after: { rows: values.length, firstCode: values[0]?.code, lastCode: values.at(-1)?.code },
      });
      return { imported: values.length, firstCode: values[0]?.code ?? null, lastCode: values.at(-1)?.code ?? null };
    });
  } catch (err) {
    if (isUniqueViolation(err, "samples.code")) {
      throw new AppError("conflict", "A sample code in the file was taken by another import or a code issued from the sequence; nothing was imported. Preview again.");
    }
    if (isUniqueViolation(err, "samples.igsn")) throw new AppError("validation_failed", "An IGSN in the file is not accepted; nothing was imported. Preview again.");
    throw err;
  }
}
