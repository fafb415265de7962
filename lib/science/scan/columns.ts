/**
 * Column names of scan files as instruments and spreadsheets write them: `2theta`, `2-Theta`, `two_theta`, `2θ`,
 * `°2θ`, `2Theta (deg)`, `Angle`, `Pos. [°2Th.]`, `d (Å)`, `d-spacing`, `Intensity`, `Counts`, `cps`, `I`, `y_obs`,
 * `Intensity [counts/s]`, `esd`, `sigma`, `error`, `time (s)`… Matching ignores case, spaces, `_`, `-`, `.` and
 * quotes; a unit in brackets (or after `/`) is read separately.
 */

import { ScanParseError } from "./errors";

/** What a column holds. */
export type ColumnRole = "twoTheta" | "d" | "intensity" | "esd" | "time";

/** A recognised column name. */
export interface ColumnName {
  role: ColumnRole;
  /** The name as written (trimmed, quotes removed). */
  name: string;
  /** Unit read from the name: angles "deg"/"rad", d "A"/"nm", intensity "counts"/"cps", time "s"/"ms". */
  unit?: "deg" | "rad" | "A" | "nm" | "counts" | "cps" | "s" | "ms";
}

const TWO_THETA = new Set(["2theta", "2θ", "2th", "tth", "twotheta", "2thetadeg", "angle", "pos", "position", "x", "2thetaobs", "2thetameas", "theta2"]);
const D_SPACING = new Set(["d", "dspacing", "dvalue", "dhkl", "dobs", "dspace"]);
const INTENSITY = new Set(["intensity", "int", "i", "counts", "count", "cts", "cps", "y", "yobs", "iobs", "obs", "intensityobs", "rawcounts", "signal", "rate", "countrate", "countspersecond", "countspers", "cts/s", "counts/s", "c/s"]);
const ESD = new Set(["esd", "sigma", "σ", "su", "s.u.", "err", "error", "errors", "uncertainty", "unc", "dy", "e", "sd", "stdev", "std", "yerr", "sigmay", "sigmai", "σi", "esdi", "ierr", "yesd", "sigmayobs"]);
const TIME = new Set(["time", "t", "counttime", "countingtime", "steptime", "timeperstep", "livetime", "dwell", "dwelltime"]);

const CPS_UNIT = /^(cps|counts?\/s(ec)?|cts\/s(ec)?|c\/s|1\/s|s\^?-1|counts?persec(ond)?|cts?persec(ond)?)$/;
const COUNTS_UNIT = /^(counts?|cts|cnts?)$/;

function unitOf(u: string): ColumnName["unit"] | undefined {
  const t = u.toLowerCase().replace(/\s+/g, "");
  if (t === "°" || t === "deg" || t === "degree" || t === "degrees" || t === "°2θ" || t === "°2th" || t === "°2th.") return "deg";
  if (t === "rad" || t === "radian" || t === "radians") return "rad";
  if (t === "å" || t === "a" || t === "angstrom" || t === "ang" || t === "aa") return "A";
  if (t === "nm") return "nm";
  if (CPS_UNIT.test(t)) return "cps";
  if (COUNTS_UNIT.test(t)) return "counts";
  if (t === "s" || t === "sec" || t === "seconds") return "s";
  if (t === "ms") return "ms";
  return undefined;
}

/**
 * Recognise one column name.
 * @returns role and unit, or null when the name is not one of the known spellings
 */
export function classifyColumnName(raw: string): ColumnName | null {
  const name = raw.trim().replace(/^["']|["']$/g, "").trim();
  if (!name) return null;
  let text = name.toLowerCase();
  // Units in brackets, e.g. "2Theta (deg)", "Intensity [cps]", "d (Å)"; several brackets are allowed.
  let unit: ColumnName["unit"] | undefined;
  const bracketed: string[] = [];
  text = text.replace(/[([{]([^)\]}]*)[)\]}]/g, (_, inner: string) => {
    bracketed.push(inner);
    return " ";
  });
  // "Intensity/cps", "2theta/deg": a unit after a slash (not "counts/s" itself, handled below).
  const slash = /^([^/]+)\/\s*([^/]+)$/.exec(text.trim());
  if (slash && !INTENSITY.has(text.replace(/\s+/g, "")) && unitOf(slash[2])) {
    bracketed.push(slash[2]);
    text = slash[1];
  }
  for (const b of bracketed) unit ??= unitOf(b);
  // "°2θ", "2θ°", "2theta deg": angle units written into the name.
  if (/°/.test(text)) {
    unit ??= "deg";
    text = text.replace(/°/g, "");
  }
  let base = text.replace(/[\s_\-.'"]+/g, "").replace(/[:;,]+$/, "");
  const suffix = /^(.+?)(deg|degrees|degree|rad)$/.exec(base);
  if (suffix && (TWO_THETA.has(suffix[1]) || suffix[1] === "2thet")) {
    base = suffix[1];
    unit ??= suffix[2] === "rad" ? "rad" : "deg";
  }
  if (base === "2thetadeg") base = "2theta";
  // "Pos. [°2Th.]" → "pos"; "2-Theta" → "2theta"; "two theta" → "twotheta".
  if (TWO_THETA.has(base)) return { role: "twoTheta", name, ...(unit === "deg" || unit === "rad" ? { unit } : {}) };
  if (D_SPACING.has(base) || /^d(spacing|value)?(a|å|angstrom|nm)$/.test(base)) {
    const u = unit ?? (/nm$/.test(base) ? "nm" : "A");
    return { role: "d", name, unit: u === "nm" ? "nm" : "A" };
  }
  if (INTENSITY.has(base) || CPS_UNIT.test(base)) {
    const cps = unit === "cps" || CPS_UNIT.test(base) || base === "rate" || base === "countrate" || base.startsWith("countsper") || base.startsWith("ctsper");
    return { role: "intensity", name, ...(cps ? { unit: "cps" as const } : unit === "counts" ? { unit: "counts" as const } : {}) };
  }
  if (ESD.has(base) || /^(sigma|σ|esd|err|error|su)(i|y|int|intensity|counts)$/.test(base)) return { role: "esd", name };
  if (TIME.has(base) || /^(count|counting|step|live)?time(perstep|s)?$/.test(base)) {
    return { role: "time", name, unit: unit === "ms" ? "ms" : "s" };
  }
  return null;
}

/**
 * Split a whitespace-separated header line (XY files) into column names: runs of two or more spaces or tabs
 * separate names when present; otherwise single spaces do, with a bracketed unit ("(deg)", "[cps]") kept with the
 * name before it, and "2 theta" kept together.
 */
export function splitXyHeader(line: string): string[] {
  const text = line.trim().replace(/\b2\s+(theta|θ|th)\b/gi, "2$1");
  const wide = text.split(/\t+|\s{2,}/).filter(Boolean);
  if (wide.length >= 2) return wide;
  const out: string[] = [];
  for (const tok of text.split(/\s+/)) {
    if (out.length > 0 && /^[([{]/.test(tok)) out[out.length - 1] += ` ${tok}`;
    else out.push(tok);
  }
  return out;
}

/** Which data column holds what, decided from a header row. */
export interface ColumnMap {
  /** 0-based indices; -1 when absent. */
  x: number;
  y: number;
  e: number;
  t: number;
  /** The x column holds d-spacings. */
  xIsD: boolean;
  /** Multiplier for the x column (radians → degrees, nm → Å). */
  xScale?: number;
  yUnit?: "counts" | "cps";
  /** The header names as written. */
  names: string[];
  /** Set when a column was read by its position because its name was not recognised. */
  warning?: string;
}

const ROLE_LABEL: Record<ColumnRole, string> = { twoTheta: "2θ", d: "d", intensity: "intensity", esd: "esd", time: "counting time" };

/**
 * Decide the columns from header names. Known names (see {@link classifyColumnName}) are used wherever they are;
 * when 2θ (or d) or intensity is not named but the row has at most three columns, the unnamed columns are taken in
 * file order as 2θ, intensity and esd, and `warning` says so. Extra unnamed columns next to named 2θ and intensity
 * are ignored.
 * @param names - header cells
 * @param dataColumns - number of columns of the data rows, when known (XY headers); defaults to `names.length`
 * @throws ScanParseError when 2θ or intensity cannot be decided
 */
export function mapColumns(names: string[], line: number, dataColumns = names.length): ColumnMap {
  const cls = names.map(classifyColumnName);
  const first = (roles: ColumnRole[]) => cls.findIndex((c) => c !== null && roles.includes(c.role));
  let x = first(["twoTheta"]);
  if (x < 0) x = first(["d"]);
  let y = first(["intensity"]);
  let e = first(["esd"]);
  const t = first(["time"]);
  const width = Math.max(dataColumns, names.length);
  const guessed: { column: number; role: ColumnRole }[] = [];
  if (x < 0 || y < 0) {
    const taken = new Set([x, y, e, t].filter((i) => i >= 0));
    // Unnamed columns count only when nothing else is named as an unknown quantity: ≤ 3 data columns.
    const others = Array.from({ length: width }, (_, i) => i).filter((i) => !taken.has(i) && (cls[i] === null || cls[i] === undefined));
    if (width - (t >= 0 ? 1 : 0) > 3) {
      const list = names.map((nm) => `"${nm}"`).join(", ");
      if (x < 0) throw new ScanParseError("TOO_FEW_COLUMNS", `no 2θ (or d) column among ${list}; name it e.g. "2theta" or "d"`, { line, field: "twoTheta" });
      throw new ScanParseError("TOO_FEW_COLUMNS", `no intensity column among ${list}; name it e.g. "counts" or "intensity"`, { line, field: "counts" });
    }
    if (x < 0) {
      const c = others.shift();
      if (c === undefined) throw new ScanParseError("TOO_FEW_COLUMNS", "no 2θ column in the header", { line, field: "twoTheta" });
      x = c;
      guessed.push({ column: c, role: "twoTheta" });
    }
    if (y < 0) {
      const c = others.shift();
      if (c === undefined) throw new ScanParseError("TOO_FEW_COLUMNS", "no counts/intensity column in the header", { line, field: "counts" });
      y = c;
      guessed.push({ column: c, role: "intensity" });
    }
    if (e < 0 && others.length === 1 && width === 3) {
      e = others[0];
      guessed.push({ column: e, role: "esd" });
    }
  }
  const xc = cls[x];
  const yc = cls[y];
  const xIsD = xc?.role === "d";
  const xScale = xIsD ? (xc?.unit === "nm" ? 10 : undefined) : xc?.unit === "rad" ? 180 / Math.PI : undefined;
  const yUnit = yc?.unit === "cps" ? "cps" : yc?.unit === "counts" ? "counts" : undefined;
  let warning: string | undefined;
  if (guessed.length > 0) {
    const what = guessed
      .map((g) => (names[g.column] !== undefined && names[g.column] !== "" ? `"${names[g.column]}" as ${ROLE_LABEL[g.role]}` : `column ${g.column + 1} as ${ROLE_LABEL[g.role]}`))
      .join(", ");
    warning = `column names on line ${line} not recognised: read ${what} (by position)`;
  }
  return { x, y, e, t, xIsD, ...(xScale ? { xScale } : {}), ...(yUnit ? { yUnit } : {}), names, ...(warning ? { warning } : {}) };
}
