import { describe, expect, test } from "vitest";
import { parseBoolean, parseDecimal, parseEnum, parseInstant, zonedLocalToUtcMs } from "@/lib/csv";

describe("parseDecimal", () => {
  test("point decimals and the Unicode minus", () => {
    expect(parseDecimal("37.712345")).toEqual({ ok: true, value: 37.712345 });
    expect(parseDecimal("\u22126.6")).toEqual({ ok: true, value: -6.6 });
  });

  test("decimal comma only when the file uses it (common practice in European locales)", () => {
    expect(parseDecimal("37,71", true)).toEqual({ ok: true, value: 37.71 });
    const r = parseDecimal("37,71", false);
    expect(r.ok).toBe(false);
    if (!r.ok) expect(r.message).toMatch(/decimal comma/);
  });

  test("thousands separators, units and words are refused rather than guessed", () => {
    for (const s of ["1.234,5", "12 m", "abc", "1e3", "37°"]) expect(parseDecimal(s, true).ok).toBe(false);
  });
});

describe("parseBoolean / parseEnum", () => {
  test("yes/no words", () => {
    expect(parseBoolean("Yes")).toEqual({ ok: true, value: true });
    expect(parseBoolean("0")).toEqual({ ok: true, value: false });
    expect(parseBoolean("maybe").ok).toBe(false);
  });

  test("enum by key or label, case-insensitive; message lists the choices", () => {
    const values = { soil: "soil", "stream sediment": "stream_sediment", stream_sediment: "stream_sediment" };
    expect(parseEnum("Stream  Sediment", values)).toEqual({ ok: true, value: "stream_sediment" });
    const bad = parseEnum("boulder", values);
    expect(bad.ok).toBe(false);
    if (!bad.ok) expect(bad.message).toBe('"boulder" is not one of: soil, stream_sediment.');
  });
});

describe("parseInstant", () => {
  test("offsets are normalised to UTC", () => {
    // ISO 8601: 10:05 at +01:00 is 09:05 UTC.
    expect(parseInstant("2026-03-14T10:05:00+01:00", null)).toEqual({ ok: true, value: "2026-03-14T09:05:00Z" });
    expect(parseInstant("2026-03-14 10:05Z", null)).toEqual({ ok: true, value: "2026-03-14T10:05:00Z" });
  });

  test("local time needs the row's IANA zone; Madrid is UTC+1 in winter, UTC+2 in summer (EU summer time, last Sunday of March)", () => {
    expect(parseInstant("2026-02-10 12:00", "Europe/Madrid")).toEqual({ ok: true, value: "2026-02-10T11:00:00Z" });
    expect(parseInstant("2026-07-10T12:00", "Europe/Madrid")).toEqual({ ok: true, value: "2026-07-10T10:00:00Z" });
    const noTz = parseInstant("2026-07-10T12:00", null);
    expect(noTz.ok).toBe(false);
    if (!noTz.ok) expect(noTz.message).toMatch(/no UTC offset/);
  });

  test("a local time skipped by the spring-forward jump does not exist (2026-03-29 02:30 in Madrid)", () => {
    // EU rule (Directive 2000/84/EC): clocks go from 02:00 to 03:00 local on the last Sunday of March — 2026-03-29.
    expect(zonedLocalToUtcMs(2026, 3, 29, 2, 30, 0, "Europe/Madrid")).toBeNull();
    expect(parseInstant("2026-03-29T02:30", "Europe/Madrid").ok).toBe(false);
  });

  test("bare dates and impossible dates are refused", () => {
    const d = parseInstant("2026-03-14", null);
    expect(d.ok).toBe(false);
    if (!d.ok) expect(d.message).toMatch(/date without a time/);
    expect(parseInstant("2026-02-30T10:00", "UTC").ok).toBe(false);
  });
});
