import { describe, expect, test } from "vitest";
import { EARTH_MEAN_RADIUS_M, formatDistance, greatCircleDistanceM } from "@/lib/geo/distance";

describe("greatCircleDistanceM (haversine on the mean sphere)", () => {
  test("one degree along a meridian is πR/180 ≈ 111 195 m (sphere geometry)", () => {
    expect(greatCircleDistanceM({ lat: 0, lon: 0 }, { lat: 1, lon: 0 })).toBeCloseTo((Math.PI * EARTH_MEAN_RADIUS_M) / 180, 3);
  });
  test("1e-6° of latitude ≈ 0.11 m (πR/180 with R = 6 371 km, arithmetic)", () => {
    expect(greatCircleDistanceM({ lat: 37.7, lon: -6.6 }, { lat: 37.700001, lon: -6.6 })).toBeCloseTo(0.111, 3);
  });
  test("along a parallel the distance shrinks with cos(lat): 1° of longitude at 60° N ≈ 55 597 m (sphere geometry)", () => {
    // exact for small spans: R·cos(60°)·π/180 = 55 597.5 m; haversine along the parallel is slightly less (great circle)
    const d = greatCircleDistanceM({ lat: 60, lon: 0 }, { lat: 60, lon: 1 });
    expect(d).toBeGreaterThan(55_590);
    expect(d).toBeLessThan(55_598);
  });
  test("antipodes are half the circumference, πR (to 1 m: double precision near h = 1)", () => {
    expect(Math.abs(greatCircleDistanceM({ lat: 10, lon: 20 }, { lat: -10, lon: -160 }) - Math.PI * EARTH_MEAN_RADIUS_M)).toBeLessThan(1);
  });
  test("the 6371.0088 km mean radius is the IUGG R1 of WGS84 (from memory)", () => {
    expect(EARTH_MEAN_RADIUS_M).toBe(6_371_008.8);
  });
  test("formatDistance", () => {
    expect(formatDistance(85.4)).toBe("85 m");
    expect(formatDistance(1240)).toBe("1.24 km");
  });
});
