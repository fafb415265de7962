import { describe, expect, test } from "vitest";
import { formatDms, formatDmsPair, parseAngle, parseLatLon, toDms } from "@/lib/geo/dms";

// The arithmetic of DMS is the definition: value = d + m/60 + s/3600, negative for S and W.
describe("parseLatLon", () => {
  test("DMS with hemisphere letters: 37°44'28.3\"N 6°37'16.7\"W", () => {
    // 37 + 44/60 + 28.3/3600 = 37.7411944…; 6 + 37/60 + 16.7/3600 = 6.6213055…
    const r = parseLatLon(`37°44'28.3"N 6°37'16.7"W`);
    expect(r.ok).toBe(true);
    if (!r.ok) return;
    expect(r.lat).toBeCloseTo(37.7411944, 6);
    expect(r.lon).toBeCloseTo(-6.6213056, 6);
  });

  test("the same position typed in other common ways", () => {
    const variants = [
      "37.741194, -6.621306",
      "37.741194 -6.621306",
      "37.741194N 6.621306W",
      "N 37°44.4717' W 6°37.2783'", // degrees + decimal minutes: 44.4717′ = 44′28.3″
      "37 44 28.3 N, 6 37 16.7 W",
      "37°44′28.3″N 6°37′16.7″W", // typographic primes
      `6°37'16.7"W 37°44'28.3"N`, // longitude first, letters say so
      "37:44:28.3 -6:37:16.7",
    ];
    for (const v of variants) {
      const r = parseLatLon(v);
      expect(r.ok, v).toBe(true);
      if (!r.ok) continue;
      expect(r.lat, v).toBeCloseTo(37.741194, 5);
      expect(r.lon, v).toBeCloseTo(-6.621306, 5);
    }
  });

  test("southern/eastern hemisphere: 33°52'4\"S 151°12'26\"E", () => {
    // The photo fixture (tests/helpers/photo-fixtures.ts): 33/1 52/1 4/1 S, 151/1 12/1 26/1 E → −33.8678, 151.2072
    const r = parseLatLon(`33°52'4"S 151°12'26"E`);
    expect(r.ok && r.lat).toBeCloseTo(-33.8678, 4);
    expect(r.ok && r.lon).toBeCloseTo(151.2072, 4);
  });

  test("explains bad input", () => {
    const cases: [string, RegExp][] = [
      ["91, 0", /Latitude .* outside/],
      ["0, 181", /Longitude .* outside/],
      [`37°61'00"N 6°W`, /minutes must be below 60/],
      [`37°44'60"N 6°W`, /seconds must be below 60/],
      ["-37.5S 6W", /sign or a hemisphere/],
      ["37N 38N", /same axis/],
      ["37N 6", /both latitude and longitude/],
      ["north-ish", /not a coordinate|hemisphere|latitude/i],
      ["", /Type a position/],
      ["37.5°30' 6", /Could not tell|decimals/],
    ];
    for (const [text, msg] of cases) {
      const r = parseLatLon(text);
      expect(r.ok, text).toBe(false);
      if (!r.ok) expect(r.error, text).toMatch(msg);
    }
  });
});

describe("parseAngle with an expected axis", () => {
  test("refuses a longitude where a latitude is expected", () => {
    const r = parseAngle("6°37'W", "lat");
    expect(r.ok).toBe(false);
  });
  test("range is checked against the expected axis", () => {
    expect(parseAngle("120", "lat").ok).toBe(false);
    expect(parseAngle("120", "lon").ok).toBe(true);
  });
});

describe("formatDms", () => {
  test("formats the example position", () => {
    expect(formatDmsPair(37.7411944, -6.6213056)).toBe(`37°44'28.3"N 6°37'16.7"W`);
  });
  test("carries rounding into minutes and degrees (59.96″ → next minute)", () => {
    // 10° 59′ 59.96″ = 10.99998889°, rounded to 0.1″ is 11°00′00.0″
    expect(formatDms(10 + 59 / 60 + 59.96 / 3600, "lat")).toBe(`11°00'00.0"N`);
    expect(toDms(-0.5)).toEqual({ deg: 0, min: 30, sec: 0 });
  });
  test("round-trips 2000 random positions to within 0.05″ (half the last printed digit)", () => {
    let seed = 12345;
    const rnd = () => ((seed = (seed * 1103515245 + 12345) % 2 ** 31) / 2 ** 31);
    for (let i = 0; i < 2000; i++) {
      const lat = rnd() * 180 - 90;
      const lon = rnd() * 360 - 180;
      const r = parseLatLon(formatDmsPair(lat, lon));
      expect(r.ok).toBe(true);
      if (!r.ok) continue;
      expect(Math.abs(r.lat - lat) * 3600).toBeLessThanOrEqual(0.05 + 1e-9);
      expect(Math.abs(r.lon - lon) * 3600).toBeLessThanOrEqual(0.05 + 1e-9);
    }
  });
});
