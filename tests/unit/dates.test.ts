import { describe, expect, test } from "vitest";
import { formatDateTime, formatLocalDate, isoUtc } from "@/lib/dates";

// Offsets from the IANA time zone database: Europe/Madrid is UTC+1 (CET) in winter and UTC+2 (CEST) from the last
// Sunday of March (EU Directive 2000/84/EC); America/Argentina/Catamarca is UTC−3 all year.
describe("the app's one date formatter (issue 11 §6)", () => {
  test("an instant is shown in the project's zone with its abbreviation; UTC without a zone", () => {
    expect(formatDateTime("2026-03-20T09:00:00Z", "Europe/Madrid")).toBe("2026-03-20 10:00 CET");
    expect(formatDateTime("2026-07-01T09:00:00Z", "Europe/Madrid")).toBe("2026-07-01 11:00 CEST");
    expect(formatDateTime(new Date("2026-03-20T09:00:00Z"))).toBe("2026-03-20 09:00 UTC");
    expect(formatDateTime(null)).toBe("—");
  });
  test("the local date of a sample collected late in the evening keeps its local day", () => {
    // 01:30 UTC on the 15th is 22:30 on the 14th in Catamarca: the PDF's "Collected" column says 2026-03-14.
    expect(formatLocalDate("2026-03-15T01:30:00Z", "America/Argentina/Catamarca")).toBe("2026-03-14");
    expect(formatLocalDate("2026-03-15T01:30:00Z")).toBe("2026-03-15");
  });
  test("files carry ISO 8601 UTC to the second, whatever offset was typed", () => {
    expect(isoUtc("2026-03-14T17:05:22+01:00")).toBe("2026-03-14T16:05:22Z");
    expect(isoUtc("2026-03-14T17:05:22.123Z")).toBe("2026-03-14T17:05:22Z");
    expect(isoUtc(undefined)).toBe("");
  });
  test("an unknown zone falls back to UTC instead of failing the page", () => {
    expect(formatDateTime("2026-03-20T09:00:00Z", "Mars/Olympus")).toBe("2026-03-20 09:00 UTC");
  });
});
