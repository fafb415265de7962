/**
 * Writing register rows as CSV (RFC 4180, comma-separated, CRLF line ends, UTF-8). Pure.
 */
import Papa from "papaparse";
import { isoInstantSeconds, SPREADSHEET_FORMULA } from "./formula-guard";
import { SAMPLE_CSV_COLUMNS, type SampleCsvField } from "./sample-columns";

/** A register row as the export reads it: every CSV field, plus anything else (ignored). */
export type SampleCsvRecord = { [K in SampleCsvField]?: string | number | boolean | null };

/**
 * Text that a spreadsheet would evaluate gets a leading "'" (rule and sources in ./formula-guard); the import
 * strips it again. Numbers are written as numbers; instants in one format (ISO 8601 UTC to the second).
 */

/** The header line, CRLF-terminated. */
export function sampleCsvHeaderLine(): string {
  return Papa.unparse([SAMPLE_CSV_COLUMNS.map((c) => c.header)], { newline: "\r\n" }) + "\r\n";
}

/** Data lines for some records (no header), each CRLF-terminated; "" for none. */
export function sampleCsvLines(records: readonly SampleCsvRecord[]): string {
  if (records.length === 0) return "";
  const data = records.map((r) =>
    SAMPLE_CSV_COLUMNS.map((c) => {
      const v = r[c.field];
      if (v === null || v === undefined) return "";
      if (typeof v === "boolean") return v ? "yes" : "no";
      if (c.kind === "instant" && typeof v === "string") return isoInstantSeconds(v);
      return v;
    }),
  );
  return Papa.unparse(data, { newline: "\r\n", escapeFormulae: SPREADSHEET_FORMULA }) + "\r\n";
}
