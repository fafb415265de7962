import type { Scan } from "@/lib/science/types";
import { PointCollector, type ScanLimits } from "./collector";
import { ScanParseError } from "./errors";
import { applyHeaderLine, emptyMeta } from "./header";
import { forEachLine, isCommentStart } from "./lines";
import { CellKind, readCell } from "./numbers";

const FIELDS = ["twoTheta", "counts", "esd"] as const;
const WS = /[ \t]+/;

/**
 * Read a whitespace-separated XY/XYE scan: `2θ counts [esd]` per line; lines starting with `#`, `!` or `;` are
 * comments (`key: value` comments fill the metadata); non-numeric lines before the first data line are a header.
 * @throws ScanParseError with line and column for any bad cell
 */
export function parseXy(text: string, limits: ScanLimits): Scan {
  const meta = emptyMeta("xy");
  const points = new PointCollector(limits);
  let columns = 0;
  let columnsLine = 0;
  forEachLine(text, (raw, lineNo) => {
    const line = raw.trim();
    if (line.length === 0) return;
    if (isCommentStart(line[0], false)) {
      applyHeaderLine(meta, line.replace(/^[#!;]+/, ""));
      return;
    }
    const cells = line.split(WS);
    if (columns === 0) {
      const [kind] = readCell(cells[0]);
      if (kind === CellKind.NotNumeric) {
        // Header text before the data (e.g. "2Theta Intensity" or "Wavelength=1.5406").
        applyHeaderLine(meta, line);
        return;
      }
    }
    if (line.includes(",") || line.includes(";")) {
      throw new ScanParseError(
        "MIXED_SEPARATORS",
        "comma or semicolon in a whitespace-separated file; use one separator throughout",
        { line: lineNo },
      );
    }
    if (cells.length > 3) {
      throw new ScanParseError("TOO_MANY_COLUMNS", `${cells.length} columns; expected 2θ, counts and optional esd`, {
        line: lineNo,
        column: 4,
      });
    }
    if (cells.length < 2) {
      throw new ScanParseError("TOO_FEW_COLUMNS", "only one column; expected 2θ and counts", { line: lineNo, column: 2 });
    }
    if (columns === 0) {
      columns = cells.length;
      columnsLine = lineNo;
    } else if (cells.length !== columns) {
      throw new ScanParseError(
        cells.length > columns ? "TOO_MANY_COLUMNS" : "TOO_FEW_COLUMNS",
        `${cells.length} columns, but line ${columnsLine} has ${columns}`,
        { line: lineNo },
      );
    }
    let x = NaN;
    let y = NaN;
    let e = NaN;
    for (let c = 0; c < cells.length; c++) {
      const [kind, v] = readCell(cells[c]);
      if (kind === CellKind.NotNumeric) {
        throw new ScanParseError("NOT_NUMERIC", `"${cells[c].slice(0, 40)}" is not a number`, {
          line: lineNo,
          column: c + 1,
          field: FIELDS[c],
        });
      }
      if (kind === CellKind.NonFinite) {
        throw new ScanParseError("NOT_FINITE", `"${cells[c].slice(0, 40)}" is not a finite number`, {
          line: lineNo,
          column: c + 1,
          field: FIELDS[c],
        });
      }
      if (c === 0) x = v;
      else if (c === 1) y = v;
      else e = v;
    }
    points.push(x, y, e, lineNo);
  });
  return points.finish(meta);
}
