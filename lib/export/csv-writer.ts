/**
 * Register CSV (RFC 4180, comma-separated, CRLF, UTF-8 with a byte-order mark): the register's import
 * columns (lib/csv, so a file imports back unchanged; the import ignores the extra columns) followed by
 * the phase columns. Written page by page. Pure.
 */
import Papa from "papaparse";
import { SAMPLE_CSV_COLUMNS } from "@/lib/csv";
import { isoInstantSeconds, SPREADSHEET_FORMULA } from "@/lib/csv/formula-guard";
import { phaseNames, phaseSymbols } from "./phase-text";
import type { ExportRow, RegisterExport } from "./types";

/** Phase columns after the register columns. */
export const PHASE_CSV_HEADERS = ["confirmed_phases", "confirmed_symbols", "candidate_phases_unconfirmed"] as const;

/** Same rule as the register CSV export: cells a spreadsheet would evaluate get a leading "'" (lib/csv/formula-guard). */

export function registerCsvHeader(): string {
  return Papa.unparse([[...SAMPLE_CSV_COLUMNS.map((c) => c.header), ...PHASE_CSV_HEADERS]], { newline: "\r\n" }) + "\r\n";
}

/** Data lines for some rows, CRLF-terminated; "" for none. Numbers stay numbers, booleans are yes/no, instants ISO 8601 UTC to the second. */
export function registerCsvLines(rows: readonly ExportRow[]): string {
  if (rows.length === 0) return "";
  const data = rows.map((r) => {
    const rec = r as unknown as Record<string, unknown>;
    const cells: (string | number)[] = SAMPLE_CSV_COLUMNS.map((c) => {
      const v = rec[c.field];
      if (v === null || v === undefined) return "";
      if (typeof v === "boolean") return v ? "yes" : "no";
      if (c.kind === "instant" && typeof v === "string") return isoInstantSeconds(v);
      return v as string | number;
    });
    cells.push(phaseNames(r.confirmed), phaseSymbols(r.confirmed), phaseNames(r.candidates));
    return cells;
  });
  return Papa.unparse(data, { newline: "\r\n", escapeFormulae: SPREADSHEET_FORMULA }) + "\r\n";
}

/** The whole CSV as chunks, one per page. */
export async function* writeRegisterCsv(exp: RegisterExport): AsyncGenerator<string> {
  yield `\uFEFF${registerCsvHeader()}`;
  for await (const page of exp.pages()) yield registerCsvLines(page);
}
