import Papa from "papaparse";
import type { Scan } from "@/lib/science/types";
import { PointCollector, type ScanLimits } from "./collector";
import { ScanParseError } from "./errors";
import { mapColumns, type ColumnMap } from "./columns";
import { applyHeaderLine, emptyMeta } from "./header";
import { isCommentStart } from "./lines";
import { CellKind, readCell } from "./numbers";

/** Field separator of a CSV scan. */
export type CsvSeparator = "," | ";";

interface Columns extends ColumnMap {
  headerLine?: number;
}

function fieldName(c: Columns, index: number, fallback: string): string {
  const name = c.names[index];
  return name ? name.trim().replace(/^["']|["']$/g, "") : fallback;
}

/**
 * Read a delimited scan (CSV with `,` or `;`), with or without a header row. With `;` a decimal comma is accepted.
 * Lines starting with `#` or `!` (and `;` when the separator is `,`) are comments; `key: value` comments fill the
 * metadata. Tokenising is done by papaparse (quoted header cells are fine).
 * @throws ScanParseError with line and column for any bad cell
 */
export function parseCsv(text: string, separator: CsvSeparator, limits: ScanLimits): Scan {
  const meta = emptyMeta("csv");
  meta.settings.separator = separator;
  const decimalComma = separator === ";";
  const other = separator === "," ? ";" : ",";
  const points = new PointCollector(limits);
  let cols: Columns | null = null;
  let dataStarted = false;
  let lineNo = 1; // line where the current row starts
  let prevCursor = 0;
  let failure: ScanParseError | null = null;

  const handleRow = (cells: string[], rowText: string): void => {
    const first = cells[0]?.trim() ?? "";
    if (cells.length === 1 && first === "") return; // empty line
    const trimmedRow = rowText.trim();
    if (trimmedRow.length === 0) return;
    if (isCommentStart(trimmedRow[0], separator === ";")) {
      applyHeaderLine(meta, trimmedRow.replace(/^[#!;]+/, ""));
      return;
    }
    if (trimmedRow.includes("\t") || (cells.length === 1 ? trimmedRow.includes(other) && !decimalComma : false)) {
      throw new ScanParseError("MIXED_SEPARATORS", `tab or "${other}" in a "${separator}"-separated file`, { line: lineNo });
    }
    if (!dataStarted) {
      const [kind] = readCell(first, decimalComma);
      if (kind === CellKind.NotNumeric && cells.length === 1 && /^[+-]?\.?\d/.test(first)) {
        throw new ScanParseError("MIXED_SEPARATORS", `numbers without "${separator}" between them`, { line: lineNo });
      }
      if (kind === CellKind.NotNumeric) {
        if (cols === null && cells.length >= 2) {
          cols = { ...mapColumns(cells.map((c) => c.trim()), lineNo), headerLine: lineNo };
          meta.settings.columns = cols.names.join(separator);
          if (cols.warning) (meta.warnings ??= []).push(cols.warning);
        } else {
          applyHeaderLine(meta, trimmedRow);
        }
        return;
      }
      if (cells.length === 1) {
        throw new ScanParseError(
          "MIXED_SEPARATORS",
          `no "${separator}" on this line; the file's data lines are "${separator}"-separated`,
          { line: lineNo },
        );
      }
      if (cols === null) {
        if (cells.length > 3) {
          throw new ScanParseError("TOO_MANY_COLUMNS", `${cells.length} columns; expected 2θ, counts and optional esd`, {
            line: lineNo,
            column: 4,
          });
        }
        cols = { x: 0, y: 1, e: cells.length === 3 ? 2 : -1, t: -1, xIsD: false, names: [] };
      }
      dataStarted = true;
    }
    const c = cols as Columns;
    const width = c.names.length || (c.e >= 0 ? 3 : 2);
    if (cells.length !== width) {
      if (cells.length === 1) {
        throw new ScanParseError("MIXED_SEPARATORS", `no "${separator}" on this line`, { line: lineNo });
      }
      throw new ScanParseError(
        cells.length > width ? "TOO_MANY_COLUMNS" : "TOO_FEW_COLUMNS",
        `${cells.length} columns; expected ${width}`,
        { line: lineNo },
      );
    }
    const read = (index: number, field: string): number => {
      const cell = cells[index].trim();
      if (!decimalComma && cell.includes(",")) {
        throw new ScanParseError("MIXED_SEPARATORS", `comma inside a cell`, { line: lineNo, column: index + 1, field });
      }
      const [kind, v] = readCell(cell, decimalComma);
      if (kind === CellKind.NotNumeric) {
        throw new ScanParseError("NOT_NUMERIC", `"${cell.slice(0, 40)}" is not a number`, { line: lineNo, column: index + 1, field });
      }
      if (kind === CellKind.NonFinite) {
        throw new ScanParseError("NOT_FINITE", `"${cell.slice(0, 40)}" is not a finite number`, {
          line: lineNo,
          column: index + 1,
          field,
        });
      }
      return v;
    };
    const x = read(c.x, c.xIsD ? "d" : "twoTheta");
    const y = read(c.y, "counts");
    const e = c.e >= 0 ? read(c.e, "esd") : NaN;
    const t = c.t >= 0 ? read(c.t, "time") : NaN;
    points.push(x, y, e, lineNo, t);
  };

  Papa.parse<string[]>(text, {
    delimiter: separator,
    newline: "\n",
    skipEmptyLines: false,
    step: (result, parser) => {
      if (failure) return;
      const cursor = result.meta.cursor;
      try {
        if (result.errors.length > 0) {
          const err = result.errors[0];
          throw new ScanParseError("NOT_NUMERIC", `malformed CSV (${err.message.toLowerCase()})`, { line: lineNo });
        }
        handleRow(result.data, text.slice(prevCursor, cursor));
      } catch (e) {
        failure = e instanceof ScanParseError ? e : new ScanParseError("NOT_NUMERIC", String(e), { line: lineNo });
        parser.abort();
        return;
      }
      for (let i = text.indexOf("\n", prevCursor); i >= 0 && i < cursor; i = text.indexOf("\n", i + 1)) lineNo++;
      prevCursor = cursor;
    },
  });
  if (failure) throw failure;
  const c = cols as Columns | null;
  if (!c) return points.finish(meta);
  return points.finish(meta, {
    x: fieldName(c, c.x, c.xIsD ? "d" : "twoTheta"),
    y: fieldName(c, c.y, "counts"),
    e: fieldName(c, c.e, "esd"),
    t: fieldName(c, c.t, "time"),
    xIsD: c.xIsD,
    xColumn: c.x + 1,
    headerLine: c.headerLine,
    ...(c.xScale ? { xScale: c.xScale } : {}),
    ...(c.yUnit ? { yUnit: c.yUnit } : {}),
  });
}
