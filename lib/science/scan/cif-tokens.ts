import { ScanParseError } from "./errors";

/** Kinds of CIF 1.1 tokens. */
export type CifTokenType = "data" | "loop" | "save" | "global" | "stop" | "tag" | "value";

/** One token with the 1-based line it starts on. `quoted` values are never numbers or `?`/`.` placeholders. */
export interface CifToken {
  type: CifTokenType;
  text: string;
  line: number;
  quoted: boolean;
}

const isWs = (c: number) => c === 32 || c === 9 || c === 10 || c === 13;

/**
 * Streaming tokenizer for CIF 1.1 syntax (Hall, Allen & Brown 1991; IUCr CIF 1.1 spec): comments, `data_`,
 * `loop_`, tags, bare/quoted values and `;` text fields. Linear in the text length; keeps no token list.
 */
export class CifTokenizer {
  private pos = 0;
  private line = 1;
  private readonly n: number;

  constructor(private readonly text: string) {
    this.n = text.length;
  }

  /** Next token, or null at end of text. @throws ScanParseError on an unterminated quote or text field */
  next(): CifToken | null {
    const s = this.text;
    const n = this.n;
    // Skip whitespace and comments.
    for (;;) {
      while (this.pos < n && isWs(s.charCodeAt(this.pos))) {
        if (s.charCodeAt(this.pos) === 10) this.line++;
        this.pos++;
      }
      if (this.pos >= n) return null;
      if (s.charCodeAt(this.pos) === 35 /* # */) {
        const nl = s.indexOf("\n", this.pos);
        this.pos = nl < 0 ? n : nl;
        continue;
      }
      break;
    }
    const start = this.pos;
    const line = this.line;
    const c = s.charCodeAt(start);
    const atLineStart = start === 0 || s.charCodeAt(start - 1) === 10;
    if (c === 59 /* ; */ && atLineStart) {
      // Text field: up to the next line that begins with ';'.
      let i = start + 1;
      for (;;) {
        const nl = s.indexOf("\n", i);
        if (nl < 0) throw new ScanParseError("CIF_SYNTAX", "text field opened with ';' is never closed", { line });
        this.line++;
        if (s.charCodeAt(nl + 1) === 59) {
          const body = s.slice(start + 1, nl);
          this.pos = nl + 2;
          return { type: "value", text: body, line, quoted: true };
        }
        i = nl + 1;
      }
    }
    if (c === 39 || c === 34 /* ' " */) {
      // Quoted value: ends at the same quote followed by whitespace or end of text.
      let i = start + 1;
      for (;;) {
        const q = s.indexOf(String.fromCharCode(c), i);
        const nl = s.indexOf("\n", i);
        if (q < 0 || (nl >= 0 && nl < q)) {
          throw new ScanParseError("CIF_SYNTAX", "quoted value not closed on its line", { line });
        }
        if (q + 1 >= n || isWs(s.charCodeAt(q + 1))) {
          this.pos = q + 1;
          return { type: "value", text: s.slice(start + 1, q), line, quoted: true };
        }
        i = q + 1;
      }
    }
    let i = start;
    while (i < n && !isWs(s.charCodeAt(i))) i++;
    this.pos = i;
    const text = s.slice(start, i);
    if (c === 95 /* _ */) return { type: "tag", text, line, quoted: false };
    const lower = text.length <= 8 ? text.toLowerCase() : text.slice(0, 8).toLowerCase();
    if (lower.startsWith("data_")) return { type: "data", text: text.slice(5), line, quoted: false };
    if (lower === "loop_") return { type: "loop", text, line, quoted: false };
    if (lower.startsWith("save_")) return { type: "save", text: text.slice(5), line, quoted: false };
    if (lower === "global_") return { type: "global", text, line, quoted: false };
    if (lower === "stop_") return { type: "stop", text, line, quoted: false };
    return { type: "value", text, line, quoted: false };
  }
}
