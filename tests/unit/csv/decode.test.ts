/**
 * CSV bytes → text. The Windows-1252 fixture was encoded by Python's cp1252 codec (an encoder that is not ours):
 * "Muñoz" is the byte 0xF1 there, and the typographic quotes and dash (0x93, 0x94, 0x96) exist only in
 * Windows-1252 (C1 controls in ISO-8859-1; WHATWG Encoding Standard, index-windows-1252).
 */
import { readFileSync } from "node:fs";
import { join } from "node:path";
import { describe, expect, test } from "vitest";
import { parseSampleCsv } from "@/lib/csv";
import { decodeCsvBytes } from "@/lib/csv/decode";

const fixture = readFileSync(join(__dirname, "../../fixtures/csv/windows-1252-munoz.csv"));

describe("decodeCsvBytes", () => {
  test("the fixture really is Windows-1252 and not UTF-8 (0xF1 for ñ)", () => {
    expect(fixture.includes(Buffer.from([0x4d, 0x75, 0xf1, 0x6f, 0x7a]))).toBe(true);
    expect(() => new TextDecoder("utf-8", { fatal: true }).decode(fixture)).toThrow();
  });

  test("a Windows-1252 file is converted, with a warning naming the encoding and the first accented line", () => {
    const r = decodeCsvBytes(fixture);
    expect(r.ok).toBe(true);
    if (!r.ok) return;
    expect(r.encoding).toBe("windows-1252");
    expect(r.how).toBe("detected");
    expect(r.text).toContain("Inés Muñoz");
    expect(r.text).toContain("\u201cmuestra\u201d 2 \u2013 ladera norte");
    expect(r.warning).toMatch(/not UTF-8: it was read as Windows-1252/);
    expect(r.warning).toContain('line 2: "ENC-0001,hand_sample,granodiorite,Inés Muñoz');
    const parsed = parseSampleCsv(r.text);
    expect(parsed.errors).toEqual([]);
    expect(parsed.rows[0].sample).toMatchObject({ collectorName: "Inés Muñoz" });
  });

  test("UTF-8 with and without a byte-order mark, and UTF-16LE with its mark, pass without a warning", () => {
    const utf8 = Buffer.from("code,collector\nA-1,Muñoz\n", "utf8");
    expect(decodeCsvBytes(utf8)).toMatchObject({ ok: true, encoding: "utf-8", how: "valid-utf-8", warning: null, text: "code,collector\nA-1,Muñoz\n" });
    expect(decodeCsvBytes(Buffer.concat([Buffer.from([0xef, 0xbb, 0xbf]), utf8]))).toMatchObject({ ok: true, how: "bom", text: "code,collector\nA-1,Muñoz\n" });
    const utf16 = Buffer.concat([Buffer.from([0xff, 0xfe]), Buffer.from("code\nMuñoz\n", "utf16le")]);
    expect(decodeCsvBytes(utf16)).toMatchObject({ ok: true, encoding: "utf-16le", text: "code\nMuñoz\n" });
  });

  test("a chosen encoding skips detection; UTF-8 chosen for Windows-1252 bytes is refused, not garbled", () => {
    expect(decodeCsvBytes(fixture, "windows-1252")).toMatchObject({ ok: true, how: "chosen" });
    expect(decodeCsvBytes(fixture, "utf-8")).toMatchObject({ ok: false });
  });
});

describe("parseSampleCsv and mis-decoded text", () => {
  test("text read as UTF-8 from Windows-1252 bytes (U+FFFD) is refused with its line", () => {
    const garbled = new TextDecoder("utf-8").decode(fixture);
    expect(garbled).toContain("Mu\uFFFDoz");
    const r = parseSampleCsv(garbled);
    expect(r.rows).toEqual([]);
    expect(r.errors).toEqual([expect.objectContaining({ line: 2, message: expect.stringMatching(/wrong encoding.*Windows-1252/) })]);
  });
});
