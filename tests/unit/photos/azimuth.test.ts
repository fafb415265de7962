import { describe, expect, test } from "vitest";
import { parseAzimuth } from "@/lib/photos/azimuth";

// Range 0–360 degrees clockwise from north: EXIF GPSImgDirection (CIPA DC-008-2012, "Exif 2.3", tag 0x0011).
describe("parseAzimuth", () => {
  test("degrees 0–360 accepted, with a decimal comma or a degree sign; empty is none", () => {
    expect(parseAzimuth("47.5")).toEqual({ ok: true, value: 47.5 });
    expect(parseAzimuth("47,5°")).toEqual({ ok: true, value: 47.5 });
    expect(parseAzimuth("0")).toEqual({ ok: true, value: 0 });
    expect(parseAzimuth("360")).toEqual({ ok: true, value: 360 });
    expect(parseAzimuth("  ")).toEqual({ ok: true, value: null });
  });
  test("outside the range or not a number: the reason, with the value", () => {
    expect(parseAzimuth("-1")).toEqual({ ok: false, error: "Azimuth -1° is outside 0–360° (degrees clockwise from north)." });
    expect(parseAzimuth("361")).toMatchObject({ ok: false, error: expect.stringMatching(/361° is outside 0–360°/) });
    expect(parseAzimuth("NE")).toEqual({ ok: false, error: '"NE" is not a number of degrees.' });
  });
});
