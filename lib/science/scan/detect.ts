import { forEachLine, isCommentStart } from "./lines";

/** Formats `parseScan` can read. */
export type ScanFormat = "xy" | "csv" | "pdcif";

/** Result of content sniffing. */
export interface DetectedFormat {
  format: ScanFormat;
  /** Field separator for CSV. */
  separator?: "," | ";";
}

/** Lines looked at when sniffing (the decision never needs the whole file). */
const SNIFF_LINES = 200;

/**
 * Decide the format from the content (never the file name): a `data_` block with `_pd_`/`_diffrn` tags → pdCIF;
 * most data lines containing `;` → CSV with `;` (decimal comma allowed); containing `,` → CSV with
 * `,`; otherwise whitespace-separated XY. Reads at most the first ~200 lines.
 */
export function detectFormat(text: string): DetectedFormat {
  let cif = false;
  let pdTags = false;
  let semicolons = 0;
  let commas = 0;
  let plain = 0;
  let seen = 0;
  forEachLine(text, (raw) => {
    const line = raw.trim();
    if (line.length === 0) return;
    const lower = line.slice(0, 5).toLowerCase();
    if (lower === "data_") cif = true;
    if (line.startsWith("_pd_") || line.startsWith("_diffrn") || line.startsWith("_pd.") || line.startsWith("loop_")) pdTags = true;
    if (line[0] === "#" || line[0] === "!") return;
    // A line that starts with ';' is a comment in XY/CSV — unless the data themselves are ';'-separated
    // with an empty first cell, which we do not support.
    if (isCommentStart(line[0], false)) return;
    if (line.includes(";")) semicolons++;
    else if (line.includes(",")) commas++;
    else plain++;
    if (++seen >= SNIFF_LINES) return false;
  });
  if (cif && pdTags) return { format: "pdcif" };
  // Majority of the sniffed lines decides; the minority lines then fail as mixed separators.
  if (semicolons > 0 && semicolons >= commas && semicolons >= plain) return { format: "csv", separator: ";" };
  if (commas > 0 && commas >= plain) return { format: "csv", separator: "," };
  return { format: "xy" };
}
