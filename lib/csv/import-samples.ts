/**
 * Parsing a register CSV for import: delimiter detection (papaparse), header mapping, cell reading and
 * per-row validation with the same zod schema as the sample form. Every problem is reported with the
 * file line and the column it came from; nothing is guessed. Pure (no database: codes already used
 * in the project and station codes are checked by the import DAL).
 */
import Papa from "papaparse";
import { sampleCreateSchema, type SampleCreateInput } from "@/lib/validation/sample";
import { unguardFormula } from "./formula-guard";
import { guessColumnMapping, mappingProblems, type ColumnMapping } from "./column-mapping";
import { parseBoolean, parseDecimal, parseEnum, parseInstant, isKnownZone, type CellResult } from "./parse-values";
import { SAMPLE_CSV_COLUMN_BY_FIELD, type SampleCsvField } from "./sample-columns";

/** One problem in the file. `line` is the physical line in the file (the header is line 1). */
export interface CsvImportError {
  line: number;
  /** Header of the column at fault, as written in the file; null for problems of the whole row/file. */
  column: string | null;
  field: SampleCsvField | null;
  message: string;
}

/** A row that passed every check here, ready for the database checks. */
export interface CsvImportRow {
  line: number;
  /** Validated sample fields (no stationId: the station is named by code). */
  sample: Omit<SampleCreateInput, "stationId">;
  stationCode: string | null;
}

export interface CsvImportOptions {
  /** Header → field; omitted headers are guessed. @default guessed from the headers */
  mapping?: ColumnMapping;
  /** Comma as decimal separator; "auto" = yes when the file is semicolon-separated (common practice in European locales). @default "auto" */
  decimalComma?: boolean | "auto";
  /** Refuse files with more data rows than this. @default 20000 */
  maxRows?: number;
  /**
   * IANA zone for local date-times in rows that name none (chosen by the importer, never guessed);
   * such rows also get it as their collected_tz. @default none: local times without a zone are errors
   */
  defaultTimeZone?: string | null;
}

export interface CsvImportParse {
  headers: string[];
  mapping: ColumnMapping;
  delimiter: string;
  decimalComma: boolean;
  /** Data rows in the file (empty lines skipped). */
  rowCount: number;
  rows: CsvImportRow[];
  errors: CsvImportError[];
}


function fileError(message: string): CsvImportError {
  return { line: 1, column: null, field: null, message };
}

function readCell(field: SampleCsvField, raw: string, tz: string | null, decimalComma: boolean): CellResult<unknown> {
  const col = SAMPLE_CSV_COLUMN_BY_FIELD[field];
  switch (col.kind) {
    case "number":
      return parseDecimal(raw, decimalComma);
    case "boolean":
      return parseBoolean(raw);
    case "enum":
      return parseEnum(raw, col.values ?? {});
    case "instant":
      return parseInstant(raw, tz);
    case "zone":
      return isKnownZone(raw) ? { ok: true, value: raw } : { ok: false, message: `"${raw}" is not an IANA time zone such as Europe/Madrid.` };
    default:
      return { ok: true, value: unguardFormula(raw) };
  }
}

/**
 * Parses and validates a register CSV.
 *
 * @param text - the file's text (UTF-8; a byte-order mark is ignored)
 * @param options - see {@link CsvImportOptions}
 */
export function parseSampleCsv(text: string, options: CsvImportOptions = {}): CsvImportParse {
  const { decimalComma: dc = "auto", maxRows = 20_000, defaultTimeZone = null } = options;
  const src = text.replace(/^\uFEFF/, "").replace(/\r\n?/g, "\n");
  const errors: CsvImportError[] = [];
  const records: { line: number; cells: string[] }[] = [];
  let scanned = 0;
  let newlines = 0;
  const parsed = Papa.parse<string[]>(src, {
    skipEmptyLines: "greedy",
    step: (r) => {
      // The cursor points past the row's line break (when it has one); count breaks before the row's end.
      const end = src.charCodeAt(r.meta.cursor - 1) === 10 ? r.meta.cursor - 1 : r.meta.cursor;
      for (let i = scanned; i < end; i++) if (src.charCodeAt(i) === 10) newlines++;
      scanned = Math.max(scanned, end);
      const inner = r.data.reduce((n, cell) => n + (cell.match(/\n/g)?.length ?? 0), 0);
      const line = newlines + 1 - inner;
      // A one-column file has no delimiter to detect; that is not an error.
      for (const e of r.errors) if (e.code !== "UndetectableDelimiter") errors.push({ line, column: null, field: null, message: `CSV syntax: ${e.message}.` });
      records.push({ line, cells: r.data });
    },
  });
  const delimiter = parsed?.meta?.delimiter ?? ",";
  const decimalComma = dc === "auto" ? delimiter === ";" : dc;

  if (records.length === 0) {
    return { headers: [], mapping: {}, delimiter, decimalComma, rowCount: 0, rows: [], errors: [fileError("The file is empty: it needs a header row and at least one data row.")] };
  }
  // Text decoded with the wrong encoding carries U+FFFD replacement characters; refuse it rather than store them
  // (lib/csv/decode reads the file's bytes and names the encoding).
  const bad = records.find((r) => r.cells.some((c) => c.includes("\uFFFD")));
  if (bad) {
    return {
      headers: [], mapping: {}, delimiter, decimalComma, rowCount: records.length - 1, rows: [],
      errors: [{ line: bad.line, column: null, field: null, message: `Line ${bad.line} contains "\uFFFD" (a character that could not be read): the file was decoded with the wrong encoding. Choose its encoding (e.g. Windows-1252), or save it as "CSV UTF-8".` }],
    };
  }
  const [head, ...data] = records;
  const headers = head.cells.map((h) => h.trim());
  const base = { headers, delimiter, decimalComma, rowCount: data.length };

  const dupHeaders = headers.filter((h, i) => h !== "" && headers.indexOf(h) !== i);
  if (dupHeaders.length) errors.push(fileError(`The header row repeats column names: ${[...new Set(dupHeaders)].join(", ")}. Give each column a unique name.`));
  const guessed = guessColumnMapping(headers);
  const mapping: ColumnMapping = { ...guessed, ...(options.mapping ?? {}) };
  for (const p of mappingProblems(headers, mapping)) errors.push(fileError(p));
  if (!Object.values(mapping).includes("sampleType")) errors.push(fileError('No column is mapped to the sample type; add a "sample_type" column (e.g. hand_sample, soil, stream_sediment).'));
  if (data.length === 0) errors.push(fileError("The file has a header row but no data rows."));
  if (data.length > maxRows) errors.push(fileError(`The file has ${data.length} data rows; import at most ${maxRows} at a time.`));
  if (defaultTimeZone && !isKnownZone(defaultTimeZone)) errors.push(fileError(`"${defaultTimeZone}" is not an IANA time zone such as Europe/Madrid.`));
  if (errors.length) return { ...base, mapping, rows: [], errors };

  const fieldColumn = new Map<SampleCsvField, number>();
  headers.forEach((h, i) => {
    const f = mapping[h];
    if (f) fieldColumn.set(f, i);
  });
  const headerOf = (f: SampleCsvField | null) => (f && fieldColumn.has(f) ? headers[fieldColumn.get(f)!] : null);
  const tzCol = fieldColumn.get("collectedTz");

  const rows: CsvImportRow[] = [];
  const codeLines = new Map<string, number>();
  for (const { line, cells } of data) {
    if (cells.length !== headers.length) {
      errors.push({ line, column: null, field: null, message: `This row has ${cells.length} cells but the header has ${headers.length} columns.` });
      continue;
    }
    const rowErrors: CsvImportError[] = [];
    const values: Record<string, unknown> = {};
    const tzRaw = tzCol !== undefined ? cells[tzCol].trim() : "";
    const tz = tzRaw ? (isKnownZone(tzRaw) ? tzRaw : null) : defaultTimeZone;
    for (const [field, i] of fieldColumn) {
      const raw = cells[i].trim();
      if (raw === "") continue;
      const res = readCell(field, raw, tz, decimalComma);
      if (res.ok) values[field] = res.value;
      else rowErrors.push({ line, column: headers[i], field, message: res.message });
    }
    // The zone was checked above (cached); the schema's own zone check builds an Intl formatter per row,
    // which alone would cost ~0.8 s for 5,000 rows.
    const { stationCode, collectedTz, status, ...sampleValues } = values;
    // A status is never imported as such: it follows custody events. An import registers samples as collected (a
    // collection event each) or, with status "planned", as not yet taken.
    if (status === "planned") sampleValues.planned = true;
    else if (status !== undefined && status !== "collected") {
      rowErrors.push({ line, column: headerOf("status"), field: "status", message: `Status "${status}" cannot be imported: a sample's status follows its custody events (dispatch, lab intake, scans, sign-off), which an import does not carry. Use collected or planned, or clear the cell.` });
    }
    const check = sampleCreateSchema.safeParse(sampleValues);
    if (!check.success) {
      for (const issue of check.error.issues) {
        const field = (issue.path[0] as SampleCsvField | undefined) ?? null;
        if (rowErrors.some((e) => e.field === field)) continue;
        rowErrors.push({ line, column: headerOf(field), field, message: issue.message });
      }
    }
    if (rowErrors.length || !check.success) {
      errors.push(...rowErrors);
      continue;
    }
    const zone = (collectedTz as string | undefined) ?? (sampleValues.collectedAt ? defaultTimeZone : null);
    const sample = zone ? { ...check.data, collectedTz: zone } : check.data;
    if (sample.code) {
      const first = codeLines.get(sample.code);
      if (first !== undefined) {
        errors.push({ line, column: headerOf("code"), field: "code", message: `Code ${sample.code} is already used on line ${first} of this file.` });
        continue;
      }
      codeLines.set(sample.code, line);
    }
    rows.push({ line, sample, stationCode: typeof stationCode === "string" ? stationCode.toUpperCase() : null });
  }
  return { ...base, mapping, rows, errors };
}
