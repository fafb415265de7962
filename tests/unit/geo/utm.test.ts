import { describe, expect, test } from "vitest";
import { formatUtm, fromUtm, toUtm, utmBand, utmCentralMeridian, utmZone, UtmRangeError } from "@/lib/geo/utm";

describe("toUtm — check values from PROJ via gdaltransform (WGS84)", () => {
  test("Paris 48.85837 N, 2.29448 E → zone 31 north, E 448 250.5, N 5 411 951.6", () => {
    // PROJ via gdaltransform, EPSG:4326 → EPSG:32631
    const u = toUtm(48.85837, 2.29448);
    expect(u.zone).toBe(31);
    expect(u.hemisphere).toBe("N");
    expect(u.epsg).toBe(32631);
    expect(u.easting).toBeCloseTo(448250.5, 0);
    expect(u.northing).toBeCloseTo(5411951.6, 0);
  });

  test("Sydney 33.85678 S, 151.21530 E → zone 56 south, E 334 900.5, N 6 252 291.0", () => {
    // PROJ via gdaltransform, EPSG:4326 → EPSG:32756
    const u = toUtm(-33.85678, 151.2153);
    expect(u.zone).toBe(56);
    expect(u.hemisphere).toBe("S");
    expect(u.band).toBe("H"); // band H = 40–32° S (8° bands from C at 80° S, no I/O; NGA/DMA TM 8358.2, 1989)
    expect(u.epsg).toBe(32756);
    expect(u.easting).toBeCloseTo(334900.5, 0);
    expect(u.northing).toBeCloseTo(6252291.0, 0);
  });

  test("Norway exception: 60.0 N, 5.0 E is zone 32 (not 31), E 276 979.9, N 6 658 157.2", () => {
    // PROJ via gdaltransform (EPSG:32632); 56–64° N, 3–12° E → zone 32 (NGA/DMA TM 8358.2, 1989)
    expect(Math.floor((5 + 180) / 6) + 1).toBe(31); // the plain rule would say 31
    const u = toUtm(60.0, 5.0);
    expect(u.zone).toBe(32);
    expect(u.band).toBe("V");
    expect(u.easting).toBeCloseTo(276979.9, 0);
    expect(u.northing).toBeCloseTo(6658157.2, 0);
  });

  test("equator on a central meridian: 0°, 3° E → E 500 000, N 0", () => {
    // PROJ via gdaltransform (EPSG:32631); central meridian 6·31 − 183 = 3 (Snyder 1987, USGS PP 1395)
    expect(utmCentralMeridian(31)).toBe(3);
    const u = toUtm(0, 3);
    expect(u.zone).toBe(31);
    expect(u.hemisphere).toBe("N");
    expect(u.easting).toBeCloseTo(500000, 3);
    expect(u.northing).toBeCloseTo(0, 3);
  });

  test("the southern grid puts the equator at 10 000 000 m (false northing; Snyder 1987, USGS PP 1395)", () => {
    const u = toUtm(0, 3, { hemisphere: "S" });
    expect(u.northing).toBeCloseTo(10_000_000, 3);
    expect(u.epsg).toBe(32731);
  });
});

describe("zone rules (Snyder 1987, USGS PP 1395; NGA/DMA TM 8358.2, 1989)", () => {
  test("Svalbard uses 31X, 33X, 35X, 37X", () => {
    expect(utmZone(78, 5)).toBe(31);
    expect(utmZone(78, 15)).toBe(33);
    expect(utmZone(78, 25)).toBe(35);
    expect(utmZone(78, 40)).toBe(37);
    expect(utmBand(78)).toBe("X");
  });

  test("Norway exception stops at 64° N and at 12° E", () => {
    expect(utmZone(64.5, 5)).toBe(31);
    expect(utmZone(60, 12.5)).toBe(33);
    expect(utmZone(55.9, 5)).toBe(31);
  });

  test("lon 180 is zone 60, lon −180 is zone 1", () => {
    expect(utmZone(0, 180)).toBe(60);
    expect(utmZone(0, -180)).toBe(1);
  });

  test("the Iberian Pyrite Belt demo area is zone 29 north, band S (S is a northern band)", () => {
    // zone = floor((−6.62 + 180)/6) + 1 = 29; band S = 32–40° N (NGA/DMA TM 8358.2, 1989)
    const u = toUtm(37.741194, -6.621306);
    expect(u.zone).toBe(29);
    expect(u.band).toBe("S");
    expect(u.hemisphere).toBe("N");
    expect(formatUtm(u)).toMatch(/^29 north \(band S\)/);
  });

  test("outside 80° S–84° N is refused with the reason (UPS)", () => {
    expect(() => toUtm(85, 0)).toThrow(UtmRangeError);
    expect(() => toUtm(-81, 0)).toThrow(/polar/);
  });
});

describe("fromUtm inverts toUtm", () => {
  test("round-trips the check values to better than 1e-7°", () => {
    for (const [lat, lon] of [
      [48.85837, 2.29448],
      [-33.85678, 151.2153],
      [60, 5],
    ]) {
      const u = toUtm(lat, lon);
      const back = fromUtm(u.zone, u.hemisphere, u.easting, u.northing);
      expect(back.lat).toBeCloseTo(lat, 7);
      expect(back.lon).toBeCloseTo(lon, 7);
    }
  });

  test("rejects an easting outside a zone and a bad zone", () => {
    expect(() => fromUtm(31, "N", 50_000, 5_000_000)).toThrow(/Easting/);
    expect(() => fromUtm(61, "N", 500_000, 5_000_000)).toThrow(/zone/);
  });
});
