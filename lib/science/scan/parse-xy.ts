import type { Scan } from "@/lib/science/types";
import { PointCollector, type ScanLimits } from "./collector";
import { mapColumns, splitXyHeader, classifyColumnName, type ColumnMap } from "./columns";
import { ScanParseError } from "./errors";
import { applyHeaderLine, emptyMeta } from "./header";
import { forEachLine, isCommentStart } from "./lines";
import { CellKind, plainDecimal, plainDecimalIn, readCell } from "./numbers";

const FIELDS = ["twoTheta", "counts", "esd"] as const;
/** Most columns read from a file whose header names them (extra named columns such as a calculated curve). */
const MAX_NAMED_COLUMNS = 16;

/** Split a data line at spaces and tabs into `out` (reused); returns the number of cells. */
function splitCells(line: string, out: string[]): number {
  let n = 0;
  const len = line.length;
  let i = 0;
  while (i < len) {
    let c = line.charCodeAt(i);
    while (i < len && (c === 32 || c === 9)) c = line.charCodeAt(++i);
    if (i >= len) break;
    const start = i;
    while (i < len && c !== 32 && c !== 9) c = line.charCodeAt(++i);
    out[n++] = line.slice(start, i);
  }
  return n;
}

/**
 * Read a line of exactly `count` plain decimal cells separated by spaces or tabs into `out`; false for anything else
 * (comments, other cell counts, separators, non-numbers), which then goes the careful way with its error messages.
 */
function fastRow(line: string, count: number, out: Float64Array): boolean {
  const len = line.length;
  let i = 0;
  let k = 0;
  while (i < len) {
    let c = line.charCodeAt(i);
    while (c === 32 || c === 9) c = line.charCodeAt(++i);
    if (i >= len) break;
    if (k === count) return false;
    const start = i;
    while (i < len && c !== 32 && c !== 9) c = line.charCodeAt(++i);
    const v = plainDecimalIn(line, start, i);
    if (v !== v) return false; // NaN: not a plain decimal
    out[k++] = v;
  }
  return k === count;
}

/** A header line is column names when every name is recognised, or when its name count matches the data. */
function headerCandidate(text: string): string[] | null {
  const names = splitXyHeader(text);
  return names.length >= 2 ? names : null;
}

/**
 * Read a whitespace-separated XY/XYE scan: `2θ counts [esd]` per line; lines starting with `#`, `!` or `;` are
 * comments (`key: value` comments fill the metadata); non-numeric lines before the first data line are a header.
 * A header line of column names (`2Theta Intensity`, `d(Å) I(cps) esd`, or a `# Columns: …` comment) decides
 * which column is what (see `mapColumns`); without one the columns are 2θ, counts and optional esd.
 * @throws ScanParseError with line and column for any bad cell
 */
export function parseXy(text: string, limits: ScanLimits): Scan {
  const meta = emptyMeta("xy");
  const points = new PointCollector(limits);
  let columns = 0;
  let columnsLine = 0;
  let header: { names: string[]; line: number } | null = null;
  let map: (ColumnMap & { headerLine?: number }) | null = null;
  let plain = true; // columns are 2θ, counts[, esd] in that order
  const cells: string[] = [];
  const row = new Float64Array(3);
  forEachLine(text, (raw, lineNo) => {
    // Fast path for a data line of the plain layout: numbers read in place, no cells cut out.
    if (plain && columns > 0 && fastRow(raw, columns, row)) {
      points.push(row[0], row[1], columns === 3 ? row[2] : NaN, lineNo);
      return;
    }
    const n = splitCells(raw, cells);
    if (n === 0) return;
    const c0 = cells[0].charCodeAt(0);
    if (c0 === 35 || c0 === 33 || c0 === 59 /* # ! ; */) {
      const line = raw.trim();
      if (isCommentStart(line[0], false)) {
        applyHeaderLine(meta, line.replace(/^[#!;]+/, ""));
        return;
      }
    }
    if (columns === 0) {
      const [kind] = readCell(cells[0]);
      const line = raw.trim();
      if (kind === CellKind.NotNumeric || /^2\s+(theta|θ|th)(?=\s|$)/i.test(line)) {
        // Header text before the data: "2Theta Intensity", "Wavelength=1.5406", a title…
        if (!applyHeaderLine(meta, line)) {
          const names = headerCandidate(line);
          if (names) header = { names, line: lineNo };
        }
        return;
      }
    }
    if (columns === 0) {
      // First data line: decide the columns.
      if (raw.includes(",") || raw.includes(";")) {
        throw new ScanParseError("MIXED_SEPARATORS", "comma or semicolon in a whitespace-separated file; use one separator throughout", { line: lineNo });
      }
      map = decideColumns(header, meta.settings.columns, n, lineNo, meta);
      plain = map === null || (map.x === 0 && map.y === 1 && (map.e === 2 || (map.e < 0 && n < 3)) && map.t < 0);
      const limit = map ? MAX_NAMED_COLUMNS : 3;
      if (n > limit) {
        throw new ScanParseError("TOO_MANY_COLUMNS", `${n} columns; expected 2θ, counts and optional esd`, { line: lineNo, column: limit + 1 });
      }
      if (n < 2) throw new ScanParseError("TOO_FEW_COLUMNS", "only one column; expected 2θ and counts", { line: lineNo, column: 2 });
      columns = n;
      columnsLine = lineNo;
    } else if (n !== columns) {
      if (raw.includes(",") || raw.includes(";")) {
        throw new ScanParseError("MIXED_SEPARATORS", "comma or semicolon in a whitespace-separated file; use one separator throughout", { line: lineNo });
      }
      if (n < 2) throw new ScanParseError("TOO_FEW_COLUMNS", "only one column; expected 2θ and counts", { line: lineNo, column: 2 });
      throw new ScanParseError(n > columns ? "TOO_MANY_COLUMNS" : "TOO_FEW_COLUMNS", `${n} columns, but line ${columnsLine} has ${columns}`, { line: lineNo });
    }
    if (plain) {
      const x = cellValue(cells[0], lineNo, 0, FIELDS[0]);
      const y = cellValue(cells[1], lineNo, 1, FIELDS[1]);
      const e = n === 3 ? cellValue(cells[2], lineNo, 2, FIELDS[2]) : NaN;
      points.push(x, y, e, lineNo);
      return;
    }
    const m = map as ColumnMap;
    // Every cell must be a number, also in columns that are not used.
    let x = NaN;
    let y = NaN;
    let e = NaN;
    let t = NaN;
    for (let c = 0; c < n; c++) {
      const field = c === m.x ? (m.xIsD ? "d" : "twoTheta") : c === m.y ? "counts" : c === m.e ? "esd" : c === m.t ? "time" : (m.names[c] ?? `column ${c + 1}`);
      const v = cellValue(cells[c], lineNo, c, field);
      if (c === m.x) x = v;
      else if (c === m.y) y = v;
      else if (c === m.e) e = v;
      else if (c === m.t) t = v;
    }
    points.push(x, y, e, lineNo, t);
  });
  const m = map as (ColumnMap & { headerLine?: number }) | null;
  if (!m) return points.finish(meta);
  const name = (i: number, fallback: string) => (i >= 0 && m.names[i] ? m.names[i] : fallback);
  return points.finish(meta, {
    x: name(m.x, m.xIsD ? "d" : "twoTheta"),
    y: name(m.y, "counts"),
    e: name(m.e, "esd"),
    t: name(m.t, "time"),
    xIsD: m.xIsD,
    xColumn: m.x + 1,
    headerLine: m.headerLine,
    ...(m.xScale ? { xScale: m.xScale } : {}),
    ...(m.yUnit ? { yUnit: m.yUnit } : {}),
  });
}

function cellValue(cell: string, line: number, c: number, field: string): number {
  const fast = plainDecimal(cell);
  if (fast === fast) return fast; // the usual plain decimal (not NaN)
  const [kind, v] = readCell(cell);
  if (kind === CellKind.Number) return v;
  if (kind === CellKind.NotNumeric) {
    if (cell.includes(",") || cell.includes(";")) {
      throw new ScanParseError("MIXED_SEPARATORS", "comma or semicolon in a whitespace-separated file; use one separator throughout", { line });
    }
    throw new ScanParseError("NOT_NUMERIC", `"${cell.slice(0, 40)}" is not a number`, { line, column: c + 1, field });
  }
  throw new ScanParseError("NOT_FINITE", `"${cell.slice(0, 40)}" is not a finite number`, { line, column: c + 1, field });
}

/**
 * Column map of an XY file from its header line (or a `# Columns: …` comment), or null for the plain 2θ, counts,
 * esd order. A header whose names are all unknown counts as a title unless it has as many names as the data has
 * columns; then the columns are read by position with a warning.
 */
function decideColumns(
  header: { names: string[]; line: number } | null,
  columnsSetting: string | number | undefined,
  dataColumns: number,
  dataLine: number,
  meta: { warnings?: string[] },
): (ColumnMap & { headerLine?: number }) | null {
  let cand = header;
  if (!cand && typeof columnsSetting === "string") {
    const names = splitXyHeader(columnsSetting);
    if (names.length >= 2) cand = { names, line: dataLine };
  }
  if (!cand) return null;
  const known = cand.names.filter((nm) => classifyColumnName(nm) !== null).length;
  if (known === 0 && cand.names.length !== dataColumns) return null; // a title line, not column names
  const map = mapColumns(cand.names, cand.line, dataColumns);
  if (map.warning) (meta.warnings ??= []).push(map.warning);
  // XYE convention: an unnamed third column next to named 2θ and intensity is the esd.
  if (map.e < 0 && dataColumns === 3 && map.x !== 2 && map.y !== 2 && map.t !== 2 && !classifyColumnName(cand.names[2] ?? "")) map.e = 2;
  return { ...map, headerLine: cand.line };
}
