/**
 * Reader for the STAR syntax of CIF 1.1 (Hall, Allen & Brown 1991, Acta Cryst. A47, 655; CIF 1.1 syntax
 * specification, IUCr 2003): data blocks, data names, `loop_`, quoted strings ('…' and "…", closed by a quote
 * followed by white space), semicolon text fields, comments, and the null values `?` and `.`.
 * Save frames are skipped (they belong to dictionaries, not to structure files).
 * Data names are case-insensitive and stored lower-case.
 */
import { CifError } from "./cif-error";

/** One value as written in the file. */
export interface CifValue {
  text: string;
  /** True for quoted strings and text fields: `'?'` is the literal text "?", not "unknown". */
  quoted: boolean;
  /** 1-based line where the value starts. */
  line: number;
}

export interface CifLoop {
  /** Lower-case data names, in file order. */
  tags: string[];
  rows: CifValue[][];
  line: number;
}

export interface CifBlock {
  name: string;
  line: number;
  /** Data names given once, outside loops. */
  items: Map<string, CifValue>;
  loops: CifLoop[];
  /** Every data name of the block (items and loop columns) → line of its declaration. */
  names: Map<string, number>;
}

type Token =
  | { kind: "tag"; text: string; line: number }
  | { kind: "value"; value: CifValue }
  | { kind: "data"; text: string; line: number }
  | { kind: "loop"; line: number }
  | { kind: "save"; text: string; line: number }
  | { kind: "global" | "stop"; line: number };

const isSpace = (c: string) => c === " " || c === "\t" || c === "\n" || c === "\r";

function* tokenize(text: string): Generator<Token> {
  const n = text.length;
  let i = 0;
  let line = 1;
  while (i < n) {
    const c = text[i];
    if (c === "\n") {
      line++;
      i++;
      continue;
    }
    if (isSpace(c)) {
      i++;
      continue;
    }
    if (c === "#") {
      while (i < n && text[i] !== "\n") i++;
      continue;
    }
    const atLineStart = i === 0 || text[i - 1] === "\n" || text[i - 1] === "\r";
    if (c === ";" && atLineStart) {
      const startLine = line;
      // text field: up to the next line that begins with ';'
      let j = i + 1;
      let end = -1;
      let lines = 0;
      while (j < n) {
        if (text[j] === "\n") {
          lines++;
          if (text[j + 1] === ";") {
            end = j;
            break;
          }
        }
        j++;
      }
      if (end < 0) throw new CifError("syntax", "text field opened with ';' is never closed", startLine);
      let body = text.slice(i + 1, end);
      if (body.endsWith("\r")) body = body.slice(0, -1);
      if (body.startsWith("\r\n")) body = body.slice(2);
      else if (body.startsWith("\n")) body = body.slice(1);
      yield { kind: "value", value: { text: body, quoted: true, line: startLine } };
      line += lines;
      i = end + 2;
      continue;
    }
    if (c === "'" || c === '"') {
      let j = i + 1;
      while (j < n) {
        const d = text[j];
        if (d === "\n" || d === "\r") {
          throw new CifError("syntax", `quoted string starting with ${c} is not closed on the same line`, line);
        }
        if (d === c && (j + 1 >= n || isSpace(text[j + 1]))) break;
        j++;
      }
      if (j >= n) throw new CifError("syntax", `quoted string starting with ${c} is not closed`, line);
      yield { kind: "value", value: { text: text.slice(i + 1, j), quoted: true, line } };
      i = j + 1;
      continue;
    }
    let j = i;
    while (j < n && !isSpace(text[j])) j++;
    const word = text.slice(i, j);
    i = j;
    const lower = word.toLowerCase();
    if (word[0] === "_") yield { kind: "tag", text: lower, line };
    else if (lower.startsWith("data_")) yield { kind: "data", text: word.slice(5), line };
    else if (lower === "loop_") yield { kind: "loop", line };
    else if (lower.startsWith("save_")) yield { kind: "save", text: word.slice(5), line };
    else if (lower === "global_") yield { kind: "global", line };
    else if (lower === "stop_") yield { kind: "stop", line };
    else yield { kind: "value", value: { text: word, quoted: false, line } };
  }
}

function tokenLine(t: Token): number {
  return t.kind === "value" ? t.value.line : t.line;
}

/** Read every data block of a CIF text. Throws {@link CifError} on syntax errors and duplicate data names. */
export function readCifBlocks(text: string): CifBlock[] {
  const tokens = Array.from(tokenize(text));
  const blocks: CifBlock[] = [];
  let block: CifBlock | null = null;
  let inSave = false;
  let p = 0;

  const declare = (name: string, line: number) => {
    if (!block) throw new CifError("syntax", "data name appears before any data_ block header", line, name);
    const first = block.names.get(name);
    if (first !== undefined) {
      throw new CifError("duplicate-name", `data name given twice in block '${block.name}' (first on line ${first})`, line, name);
    }
    block.names.set(name, line);
  };

  while (p < tokens.length) {
    const t = tokens[p];
    if (t.kind === "data") {
      block = { name: t.text, line: t.line, items: new Map(), loops: [], names: new Map() };
      blocks.push(block);
      inSave = false;
      p++;
      continue;
    }
    if (t.kind === "save") {
      inSave = t.text !== "";
      p++;
      continue;
    }
    if (inSave || t.kind === "stop" || t.kind === "global") {
      p++;
      continue;
    }
    if (t.kind === "tag") {
      const next = tokens[p + 1];
      if (!next || next.kind !== "value") {
        throw new CifError("syntax", "data name has no value", t.line, t.text);
      }
      declare(t.text, t.line);
      block!.items.set(t.text, next.value);
      p += 2;
      continue;
    }
    if (t.kind === "loop") {
      const loop: CifLoop = { tags: [], rows: [], line: t.line };
      p++;
      while (p < tokens.length && tokens[p].kind === "tag") {
        const tag = tokens[p] as { kind: "tag"; text: string; line: number };
        declare(tag.text, tag.line);
        loop.tags.push(tag.text);
        p++;
      }
      if (loop.tags.length === 0) throw new CifError("syntax", "loop_ without data names", t.line);
      const values: CifValue[] = [];
      while (p < tokens.length && tokens[p].kind === "value") {
        values.push((tokens[p] as { kind: "value"; value: CifValue }).value);
        p++;
      }
      const w = loop.tags.length;
      if (values.length % w !== 0) {
        const lastLine = values.length ? values[values.length - 1].line : t.line;
        throw new CifError(
          "loop-shape",
          `loop has ${w} data names but ${values.length} values (not a multiple of ${w}); a value is missing or an unquoted value contains a space (loop starts on line ${t.line})`,
          lastLine,
          loop.tags[0],
        );
      }
      for (let r = 0; r < values.length; r += w) loop.rows.push(values.slice(r, r + w));
      block!.loops.push(loop);
      continue;
    }
    // a stray value
    const stray = t.kind === "value" ? t.value.text : "?";
    throw new CifError("syntax", `value '${stray}' is not attached to a data name`, tokenLine(t));
  }
  return blocks;
}

/** True for the CIF null values: unquoted `?` (unknown) or `.` (not applicable). */
export function isCifNull(v: CifValue | undefined): boolean {
  return !v || (!v.quoted && (v.text === "?" || v.text === "."));
}

/** All values of a data name: one for a single item, a column for a looped name, undefined if absent. */
export function cifValues(block: CifBlock, tag: string): CifValue[] | undefined {
  const key = tag.toLowerCase();
  const item = block.items.get(key);
  if (item) return [item];
  for (const loop of block.loops) {
    const col = loop.tags.indexOf(key);
    if (col >= 0) return loop.rows.map((r) => r[col]);
  }
  return undefined;
}

/** The first value of a data name, or undefined when absent or null (`?`, `.`). */
export function cifValue(block: CifBlock, tag: string): CifValue | undefined {
  const v = cifValues(block, tag)?.[0];
  return isCifNull(v) ? undefined : v;
}

/** The loop that contains a data name. */
export function cifLoopOf(block: CifBlock, tag: string): CifLoop | undefined {
  const key = tag.toLowerCase();
  return block.loops.find((l) => l.tags.includes(key));
}

const NUMBER_RE = /^([+-]?)(\d*)(?:\.(\d*))?(?:[eE]([+-]?\d+))?(?:\((\d+)\))?$/;

/** A CIF number with its standard uncertainty, e.g. `4.9134(2)` → value 4.9134, esd 0.0002. */
export interface CifNumber {
  value: number;
  esd?: number;
}

/**
 * Parse a CIF numeric value (`4.9134(2)`, `-0.25`, `1.2E-3`, `90`). Returns undefined for the null values
 * `?` and `.`. Throws {@link CifError} `not-numeric` otherwise.
 */
export function parseCifNumber(v: CifValue | undefined, field: string): CifNumber | undefined {
  if (isCifNull(v)) return undefined;
  const m = NUMBER_RE.exec(v!.text.trim());
  if (!m || (m[2] === "" && (m[3] === undefined || m[3] === ""))) {
    throw new CifError("not-numeric", `'${v!.text}' is not a number`, v!.line, field);
  }
  const [, sign, int, frac, exp, esdDigits] = m;
  const value = Number(`${sign}${int || "0"}.${frac ?? ""}${exp ? `e${exp}` : ""}`);
  if (!Number.isFinite(value)) throw new CifError("not-numeric", `'${v!.text}' is not a finite number`, v!.line, field);
  if (esdDigits === undefined) return { value };
  const decimals = frac?.length ?? 0;
  const esd = Number(esdDigits) * 10 ** (-decimals + (exp ? Number(exp) : 0));
  return { value, esd };
}
