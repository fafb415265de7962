/**
 * Bytes of an uploaded CSV → text, with the encoding said out loud. Pure (TextDecoder and the chardet package;
 * runs in the browser and in Node).
 *
 * Order (WHATWG Encoding Standard §6 "decode": a byte-order mark wins):
 * 1. a BOM → UTF-8, UTF-16LE or UTF-16BE;
 * 2. bytes that are valid UTF-8 → UTF-8 (plain ASCII is valid UTF-8);
 * 3. otherwise the chardet package's best single-byte guess among the encodings below, with a warning naming it
 *    and the first line with non-ASCII text so the importer can check it; ISO-8859-1 is read as Windows-1252 (the
 *    Encoding Standard maps the label "iso-8859-1" to windows-1252, which is what spreadsheets on Windows write);
 * 4. no usable guess → an error asking for the file as UTF-8 or an encoding chosen by hand.
 * A chosen encoding (`encoding`) skips detection.
 */
import { analyse } from "chardet";

/** Encodings the importer offers and accepts (WHATWG labels). */
export const CSV_ENCODINGS = ["utf-8", "windows-1252", "iso-8859-15", "iso-8859-2", "windows-1250", "utf-16le", "utf-16be"] as const;
export type CsvEncoding = (typeof CSV_ENCODINGS)[number];

export const CSV_ENCODING_LABELS: Record<CsvEncoding, string> = {
  "utf-8": "UTF-8",
  "windows-1252": "Windows-1252 (Western European)",
  "iso-8859-15": "ISO-8859-15 (Latin-9)",
  "iso-8859-2": "ISO-8859-2 (Central European)",
  "windows-1250": "Windows-1250 (Central European)",
  "utf-16le": "UTF-16 LE",
  "utf-16be": "UTF-16 BE",
};

/** chardet's names → the encoding we read the bytes as. */
const FROM_CHARDET: Record<string, CsvEncoding> = {
  "ISO-8859-1": "windows-1252",
  "windows-1252": "windows-1252",
  "ISO-8859-15": "iso-8859-15",
  "ISO-8859-2": "iso-8859-2",
  "windows-1250": "windows-1250",
  "UTF-16LE": "utf-16le",
  "UTF-16BE": "utf-16be",
};

export type CsvDecodeResult =
  | { ok: true; text: string; encoding: CsvEncoding; how: "bom" | "valid-utf-8" | "detected" | "chosen"; warning: string | null }
  | { ok: false; message: string };

/**
 * Bytes 0x80–0x9F of Windows-1252 (WHATWG Encoding Standard, index-windows-1252). Node 20's TextDecoder reads
 * "windows-1252" as ISO-8859-1 (C1 controls for these bytes; browsers get it right), so they are mapped here.
 */
const WINDOWS_1252_C1 = "\u20AC\u0081\u201A\u0192\u201E\u2026\u2020\u2021\u02C6\u2030\u0160\u2039\u0152\u008D\u017D\u008F\u0090\u2018\u2019\u201C\u201D\u2022\u2013\u2014\u02DC\u2122\u0161\u203A\u0153\u009D\u017E\u0178";

function decodeWith(encoding: CsvEncoding, bytes: Uint8Array, fatal = false): string {
  const text = new TextDecoder(encoding, { fatal }).decode(bytes);
  return encoding === "windows-1252" ? text.replace(/[\u0080-\u009F]/g, (c) => WINDOWS_1252_C1[c.charCodeAt(0) - 0x80]) : text;
}

function firstNonAscii(text: string): { line: number; text: string } | null {
  const lines = text.split(/\r\n?|\n/);
  for (let i = 0; i < lines.length; i++) if (/[^\x00-\x7F]/.test(lines[i])) return { line: i + 1, text: lines[i].length > 80 ? `${lines[i].slice(0, 77)}…` : lines[i] };
  return null;
}

/** Decodes a CSV file's bytes (see the module comment for the order of checks). */
export function decodeCsvBytes(bytes: Uint8Array, encoding?: CsvEncoding | null): CsvDecodeResult {
  if (encoding) {
    try {
      const text = decodeWith(encoding, bytes, encoding === "utf-8");
      return { ok: true, text: text.replace(/^\uFEFF/, ""), encoding, how: "chosen", warning: null };
    } catch {
      return { ok: false, message: `The file is not valid ${CSV_ENCODING_LABELS[encoding]}; choose another encoding or save the file as CSV UTF-8.` };
    }
  }
  const bom: [number[], CsvEncoding][] = [
    [[0xef, 0xbb, 0xbf], "utf-8"],
    [[0xff, 0xfe], "utf-16le"],
    [[0xfe, 0xff], "utf-16be"],
  ];
  for (const [mark, enc] of bom) {
    if (mark.every((b, i) => bytes[i] === b)) return { ok: true, text: new TextDecoder(enc).decode(bytes), encoding: enc, how: "bom", warning: null };
  }
  try {
    return { ok: true, text: new TextDecoder("utf-8", { fatal: true }).decode(bytes), encoding: "utf-8", how: "valid-utf-8", warning: null };
  } catch {
    // not UTF-8: detect below
  }
  const guess = analyse(bytes).find((m) => FROM_CHARDET[m.name]);
  if (!guess) {
    return { ok: false, message: "The file is not UTF-8 and its encoding could not be recognised. Save it as \"CSV UTF-8\" in your spreadsheet, or choose the encoding it was written in." };
  }
  const enc = FROM_CHARDET[guess.name];
  const text = decodeWith(enc, bytes);
  const sample = firstNonAscii(text);
  const where = sample ? ` Check the accented text, e.g. line ${sample.line}: "${sample.text}".` : "";
  return {
    ok: true,
    text,
    encoding: enc,
    how: "detected",
    warning: `The file is not UTF-8: it was read as ${CSV_ENCODING_LABELS[enc]} (detected).${where} If the letters look wrong, choose the encoding, or save the file as "CSV UTF-8".`,
  };
}
