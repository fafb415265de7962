import type { Anode, Scan } from "@/lib/science/types";
import { wavelengthsFor } from "@/lib/science/anodes";
import { ScanParseError } from "./errors";
import { detectFormat, type ScanFormat } from "./detect";
import { parseCsv, type CsvSeparator } from "./parse-csv";
import { parsePdCif } from "./parse-pdcif";
import { parseXy } from "./parse-xy";

/** Options of {@link parseScan}. */
export interface ParseScanOptions {
  /**
   * Force a format instead of detecting it from the content.
   * @default "auto"
   */
  format?: ScanFormat | "auto";
  /** CSV separator when `format` is "csv" (detected when omitted). */
  separator?: CsvSeparator;
  /**
   * Largest accepted text, in UTF-16 code units (= bytes for ASCII files).
   * @default 52_428_800 (50 MiB)
   */
  maxBytes?: number;
  /**
   * Largest accepted number of data points.
   * @default 2_000_000
   */
  maxPoints?: number;
  /**
   * Smallest accepted number of data points.
   * @default 50
   */
  minPoints?: number;
  /**
   * Wavelength (Å) for reading a d column as 2θ, used only when the file gives neither a wavelength nor an anode.
   */
  wavelength?: number;
  /** Anode whose Kα1 converts a d column to 2θ when the file does not say (after `wavelength`). */
  anode?: Anode;
  /**
   * Counting time per step (s) for turning counts per second into counts, used only when the file gives none.
   */
  countingTimeS?: number;
}

/** Default size limit of {@link parseScan}: 50 MiB. */
export const DEFAULT_MAX_BYTES = 50 * 1024 * 1024;
/** Default point limit of {@link parseScan}. */
export const DEFAULT_MAX_POINTS = 2_000_000;
/** Default minimum number of points of {@link parseScan}. */
export const DEFAULT_MIN_POINTS = 50;

/**
 * Read a powder diffraction scan from text: plain XY/XYE, CSV (`,` or `;`, header optional) or IUCr pdCIF, with the
 * format detected from the content. Column names are matched loosely (`2theta`, `two_theta`, `°2θ`, `d (Å)`,
 * `Intensity [cps]`…); unknown names over two or three numeric columns are read by position with a warning. A d
 * column becomes 2θ (Bragg's law, with the file's wavelength or `options.wavelength`), counts per second become
 * counts when the counting time is known. What was assumed or converted is listed in `meta.warnings`. Every successful result satisfies: equal array lengths ≥ `minPoints`, 2θ finite,
 * strictly increasing, inside (0, 180)°; counts and esd finite and ≥ 0. Time and memory are linear in the text size.
 * @param text - whole file content (decode bytes outside lib/science)
 * @returns the scan with the metadata found in the file
 * @throws ScanParseError — and only ScanParseError — with `code`, `line`, `column`/`field` and a message
 */
export function parseScan(text: string, options: ParseScanOptions = {}): Scan {
  const {
    format = "auto",
    separator,
    maxBytes = DEFAULT_MAX_BYTES,
    maxPoints = DEFAULT_MAX_POINTS,
    minPoints = DEFAULT_MIN_POINTS,
  } = options;
  if (typeof text !== "string") throw new ScanParseError("EMPTY", "scan content must be text");
  if (text.length > maxBytes) {
    throw new ScanParseError("TOO_LARGE", `file is ${text.length} characters; the limit is ${maxBytes}`);
  }
  // Normalise line breaks once (linear) and drop a byte-order mark.
  let body = text.charCodeAt(0) === 0xfeff ? text.slice(1) : text;
  if (body.includes("\r")) body = body.replace(/\r\n?/g, "\n");
  if (body.trim().length === 0) throw new ScanParseError("EMPTY", "the file is empty");
  if (body.includes("\u0000")) {
    throw new ScanParseError("UNKNOWN_FORMAT", "binary content (NUL bytes); export the scan as XY, CSV or pdCIF text");
  }
  const wavelength = options.wavelength ?? (options.anode ? wavelengthsFor(options.anode).kAlpha1 : undefined);
  const limits = { maxPoints, minPoints, wavelength, countingTimeS: options.countingTimeS };
  const detected = format === "auto" ? detectFormat(body) : { format, separator };
  try {
    switch (detected.format) {
      case "pdcif":
        return parsePdCif(body, limits);
      case "csv":
        return parseCsv(body, detected.separator ?? detectFormat(body).separator ?? ",", limits);
      case "xy":
        return parseXy(body, limits);
      default:
        throw new ScanParseError("UNKNOWN_FORMAT", `unknown format "${String(detected.format)}"`);
    }
  } catch (e) {
    if (e instanceof ScanParseError) throw e;
    // Defensive: nothing else should escape; report it as a parse failure rather than crash the caller.
    throw new ScanParseError("UNKNOWN_FORMAT", `could not read the scan (${e instanceof Error ? e.message : String(e)})`);
  }
}
