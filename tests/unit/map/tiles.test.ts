import proj4 from "proj4";
import { describe, expect, test } from "vitest";

import {
  MERCATOR_MAX_LAT,
  lonLatToTile,
  lonLatToWorldPixel,
  tileBounds,
  tileRangeForBBox,
  tileToLonLat,
  tmsRow,
} from "@/lib/map/tiles";

// Half the Web Mercator world width, metres: π · 6 378 137 (EPSG:3857, spherical R = 6 378 137 m).
const HALF = Math.PI * 6378137;

/** Tile index from proj4's own EPSG:3857 projection: an independent implementation of the same mapping. */
function tileViaProj4(lon: number, lat: number, z: number) {
  const [mx, my] = proj4("EPSG:4326", "EPSG:3857", [lon, lat]);
  const n = 2 ** z;
  return { x: Math.floor(((mx + HALF) / (2 * HALF)) * n), y: Math.floor(((HALF - my) / (2 * HALF)) * n) };
}

describe("lonLatToTile and tmsRow", () => {
  test("Paris check value: 48.85837 N, 2.29448 E at z15", () => {
    // Slippy-map tile formula (OpenStreetMap wiki), recomputed: x 16592, y 11272, TMS row 21495.
    const t = lonLatToTile(2.29448, 48.85837, 15);
    expect(t).toEqual({ x: 16592, y: 11272 });
    expect(tmsRow(t.y, 15)).toBe(21495);
  });

  test("Sydney check value: 33.85678 S, 151.21530 E at z12", () => {
    // Slippy-map tile formula (OpenStreetMap wiki), recomputed: x 3768, y 2457, TMS row 1638.
    const t = lonLatToTile(151.2153, -33.85678, 12);
    expect(t).toEqual({ x: 3768, y: 2457 });
    expect(tmsRow(t.y, 12)).toBe(1638);
  });

  test("agrees with proj4's EPSG:3857 at the demo district and elsewhere", () => {
    const points: Array<[number, number]> = [
      [-6.6, 37.68], // demo district, Huelva
      [-6.78, 37.58],
      [-6.42, 37.78],
      [-70.6693, -33.4489], // Santiago de Chile (southern + western hemisphere)
      [139.6917, 35.6895], // Tokyo
      [-149.9, 61.2], // Anchorage
    ];
    for (const [lon, lat] of points) {
      for (const z of [0, 3, 9, 13, 15, 18]) expect(lonLatToTile(lon, lat, z)).toEqual(tileViaProj4(lon, lat, z));
    }
  });

  test("world pixels match proj4 metres to a millimetre-scale fraction of a pixel", () => {
    const [mx, my] = proj4("EPSG:4326", "EPSG:3857", [-6.6, 37.68]);
    const { px, py } = lonLatToWorldPixel(-6.6, 37.68, 15);
    const size = 256 * 2 ** 15;
    expect(px).toBeCloseTo(((mx + HALF) / (2 * HALF)) * size, 6);
    expect(py).toBeCloseTo(((HALF - my) / (2 * HALF)) * size, 6);
  });

  test("edges: lon 180 and the poles fall in the last column / edge rows", () => {
    expect(lonLatToTile(180, 0, 3)).toEqual({ x: 7, y: 4 });
    expect(lonLatToTile(-180, 90, 3)).toEqual({ x: 0, y: 0 });
    expect(lonLatToTile(0, -90, 3)).toEqual({ x: 4, y: 7 });
  });

  test("tmsRow is its own inverse (TMS counts rows from the south, MBTiles 1.3 spec)", () => {
    for (const y of [0, 1, 1000, 32767]) expect(tmsRow(tmsRow(y, 15), 15)).toBe(y);
    expect(tmsRow(0, 0)).toBe(0);
  });

  test("bad input gets specific errors", () => {
    expect(() => lonLatToTile(200, 0, 3)).toThrow(/longitude .* got 200/);
    expect(() => lonLatToTile(0, Number.NaN, 3)).toThrow(/latitude/);
    expect(() => lonLatToTile(0, 0, 2.5)).toThrow(/zoom must be an integer/);
    expect(() => tmsRow(16, 4)).toThrow(/tile row y .* 0 to 15 at zoom 4, got 16/);
    expect(() => tileBounds(-1, 0, 2)).toThrow(/tile column x/);
  });
});

describe("tileToLonLat and tileBounds", () => {
  test("z0 covers the whole Mercator square", () => {
    // ±85.0511287798° = atan(sinh π), the Web Mercator latitude limit (EPSG:3857; recomputed independently).
    const b = tileBounds(0, 0, 0);
    expect(b.west).toBe(-180);
    expect(b.east).toBe(180);
    expect(b.north).toBeCloseTo(85.0511287798, 9);
    expect(b.south).toBeCloseTo(-85.0511287798, 9);
    expect(MERCATOR_MAX_LAT).toBeCloseTo(85.0511287798, 9);
  });

  test("the NW corner agrees with proj4's inverse EPSG:3857", () => {
    const z = 15, x = 16592, y = 11272;
    const n = 2 ** z;
    const [lon, lat] = proj4("EPSG:3857", "EPSG:4326", [(x / n) * 2 * HALF - HALF, HALF - (y / n) * 2 * HALF]);
    const c = tileToLonLat(x, y, z);
    expect(c.lon).toBeCloseTo(lon, 9);
    expect(c.lat).toBeCloseTo(lat, 9);
  });

  test("round trip: a tile's bounds contain the point that selected it", () => {
    for (const [lon, lat, z] of [
      [2.29448, 48.85837, 15],
      [151.2153, -33.85678, 12],
      [-6.6, 37.68, 14],
    ]) {
      const t = lonLatToTile(lon, lat, z);
      const b = tileBounds(t.x, t.y, z);
      expect(lon).toBeGreaterThanOrEqual(b.west);
      expect(lon).toBeLessThan(b.east);
      expect(lat).toBeGreaterThan(b.south);
      expect(lat).toBeLessThanOrEqual(b.north);
      // The corner maps back to the same tile.
      expect(lonLatToTile(b.west + 1e-9, b.north - 1e-9, z)).toEqual(t);
    }
  });
});

describe("tileRangeForBBox", () => {
  test("the whole world at z2 is 4 × 4 tiles", () => {
    const r = tileRangeForBBox({ west: -180, south: -MERCATOR_MAX_LAT, east: 180, north: MERCATOR_MAX_LAT }, 2);
    expect(r).toEqual({ z: 2, xMin: 0, xMax: 3, yMin: 0, yMax: 3 });
  });

  test("a box edge on a tile edge does not pull in the neighbour", () => {
    // Tile 1/1/0 is lon 0…180, lat 0…85.05.
    expect(tileRangeForBBox({ west: 0, south: 0, east: 180, north: 80 }, 1)).toEqual({
      z: 1,
      xMin: 1,
      xMax: 1,
      yMin: 0,
      yMax: 0,
    });
  });

  test("ranges of the demo district agree with proj4 at its corners", () => {
    const bbox = { west: -6.78, south: 37.58, east: -6.42, north: 37.78 };
    for (const z of [13, 14, 15]) {
      const r = tileRangeForBBox(bbox, z);
      const nw = tileViaProj4(bbox.west, bbox.north, z);
      const se = tileViaProj4(bbox.east, bbox.south, z);
      expect(r).toEqual({ z, xMin: nw.x, xMax: se.x, yMin: nw.y, yMax: se.y });
    }
  });

  test("rejects an inverted box", () => {
    expect(() => tileRangeForBBox({ west: 10, south: 0, east: 5, north: 1 }, 3)).toThrow(/west < east/);
  });
});
