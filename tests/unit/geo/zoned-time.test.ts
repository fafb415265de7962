import { describe, expect, test } from "vitest";
import { utcToZonedLocal, zoneOffsetMinutes, zonedLocalToUtc } from "@/lib/geo/zoned-time";

// Offsets from the IANA tz rules as shipped with Node's ICU: Europe/Madrid is CET (+01:00) in winter and
// CEST (+02:00) from the last Sunday of March (EU summer-time directive 2000/84/EC); America/Santiago −03:00
// in its summer (from memory); Asia/Kathmandu +05:45 all year.
describe("zoned time", () => {
  test("Europe/Madrid winter and summer offsets", () => {
    expect(zoneOffsetMinutes(Date.parse("2026-03-14T12:00:00Z"), "Europe/Madrid")).toBe(60);
    expect(zoneOffsetMinutes(Date.parse("2026-07-14T12:00:00Z"), "Europe/Madrid")).toBe(120);
  });
  test("10:05 in Madrid on 14 March 2026 is 09:05 UTC; 14 July is 08:05 UTC", () => {
    expect(zonedLocalToUtc("2026-03-14T10:05", "Europe/Madrid")).toBe("2026-03-14T09:05:00Z");
    expect(zonedLocalToUtc("2026-07-14T10:05", "Europe/Madrid")).toBe("2026-07-14T08:05:00Z");
  });
  test("a +05:45 zone and a southern-hemisphere zone", () => {
    expect(zonedLocalToUtc("2026-01-10T12:00", "Asia/Kathmandu")).toBe("2026-01-10T06:15:00Z");
    expect(zonedLocalToUtc("2026-01-10T21:30", "America/Santiago")).toBe("2026-01-11T00:30:00Z");
  });
  test("the EU spring-forward day: 01:30 is before the change (+01:00), 03:30 after (+02:00); 29 March 2026 is the last Sunday", () => {
    expect(zonedLocalToUtc("2026-03-29T01:30", "Europe/Madrid")).toBe("2026-03-29T00:30:00Z");
    expect(zonedLocalToUtc("2026-03-29T03:30", "Europe/Madrid")).toBe("2026-03-29T01:30:00Z");
  });
  test("round-trips to the datetime-local form", () => {
    expect(utcToZonedLocal("2026-03-14T09:05:00Z", "Europe/Madrid")).toBe("2026-03-14T10:05");
    expect(zonedLocalToUtc("garbage", "Europe/Madrid")).toBeNull();
  });
});

describe("DST edge cases (EU rules: change at 01:00 UTC, directive 2000/84/EC)", () => {
  test("the repeated autumn hour picks the earlier instant: 02:30 on 25 Oct 2026 in Madrid is 00:30 UTC (CEST)", () => {
    expect(zonedLocalToUtc("2026-10-25T02:30", "Europe/Madrid")).toBe("2026-10-25T00:30:00Z");
  });
  test("a time in the spring gap (02:30 on 29 Mar 2026) is read with the winter offset", () => {
    expect(zonedLocalToUtc("2026-03-29T02:30", "Europe/Madrid")).toBe("2026-03-29T01:30:00Z");
  });
});
