import proj4 from "proj4";
import { describe, expect, test } from "vitest";
import { MAX_AREA_TILES, areaRequestProblem, fitsStorage, formatBytes, planArea, planTileUrls, type OfflineTileSource } from "@/lib/map/offline-area";
import { MERCATOR_MAX_LAT, tileBounds } from "@/lib/map/tiles";

const WORLD = { west: -180, south: -MERCATOR_MAX_LAT, east: 180, north: MERCATOR_MAX_LAT };
const src = (over: Partial<OfflineTileSource> = {}): OfflineTileSource => ({ id: "t", name: "test", template: "/t/{z}/{x}/{y}.png", minNativeZoom: 0, maxNativeZoom: 19, bytesPerTile: 1000, ...over });

// Half the Web Mercator world width, metres: π · 6 378 137 (spherical Web Mercator, EPSG:3857).
const HALF = Math.PI * 6378137;
/** Tile column/row from proj4's own EPSG:3857 projection (an independent implementation). */
function tileViaProj4(lon: number, lat: number, z: number) {
  const [mx, my] = proj4("EPSG:4326", "EPSG:3857", [lon, lat]);
  const n = 2 ** z;
  return { x: Math.floor(((mx + HALF) / (2 * HALF)) * n), y: Math.floor(((HALF - my) / (2 * HALF)) * n) };
}

describe("planArea: tile enumeration", () => {
  test("the whole world needs 2^z × 2^z tiles at zoom z (OpenStreetMap Wiki, 'Slippy map tilenames', zoom-level table: 1, 4, 16 … 2^2n tiles)", () => {
    for (const z of [0, 1, 2, 3, 4]) {
      const plan = planArea({ bbox: WORLD, minZoom: z, maxZoom: z }, [src()]);
      expect(plan.tiles).toBe(4 ** z);
      expect(planTileUrls(plan)).toHaveLength(4 ** z);
    }
    // Zooms 0–3 together: 1 + 4 + 16 + 64.
    expect(planArea({ bbox: WORLD, minZoom: 0, maxZoom: 3 }, [src()]).tiles).toBe(85);
  });

  test("a tile at zoom 12 is 360/2^12 = 0.0879° wide (same wiki table, 'tile size in degrees')", () => {
    const b = tileBounds(2047, 1362, 12);
    expect(b.east - b.west).toBeCloseTo(0.0879, 4);
  });

  test("a box's tiles agree with proj4's EPSG:3857 at its corners, and their count is the product of the ranges", () => {
    const bbox = { west: -6.7, south: 37.66, east: -6.55, north: 37.76 };
    const plan = planArea({ bbox, minZoom: 12, maxZoom: 15 }, [src()]);
    let expected = 0;
    for (const r of plan.sources[0].ranges) {
      const nw = tileViaProj4(bbox.west, bbox.north, r.z);
      const se = tileViaProj4(bbox.east, bbox.south, r.z);
      expect([r.xMin, r.yMin, r.xMax, r.yMax]).toEqual([nw.x, nw.y, se.x, se.y]);
      expected += (se.x - nw.x + 1) * (se.y - nw.y + 1);
    }
    expect(plan.tiles).toBe(expected);
    const urls = planTileUrls(plan);
    expect(new Set(urls).size).toBe(expected);
    const nw15 = tileViaProj4(bbox.west, bbox.north, 15);
    expect(urls).toContain(`/t/15/${nw15.x}/${nw15.y}.png`);
  });

  test("above a layer's native zoom its highest-zoom tiles are kept once (Leaflet scales them up)", () => {
    const bbox = { west: -6.7, south: 37.66, east: -6.65, north: 37.7 };
    const capped = planArea({ bbox, minZoom: 14, maxZoom: 18 }, [src({ maxNativeZoom: 15 })]);
    expect(capped.sources[0].ranges.map((r) => r.z)).toEqual([14, 15]);
    const below = planArea({ bbox, minZoom: 3, maxZoom: 5 }, [src({ minNativeZoom: 5 })]);
    expect(below.sources[0].ranges.map((r) => r.z)).toEqual([5]);
  });

  test("a package's bounds clip the box; a package outside it contributes nothing", () => {
    const bbox = { west: -6.7, south: 37.66, east: -6.55, north: 37.76 };
    const inside = planArea({ bbox, minZoom: 14, maxZoom: 14 }, [src({ bounds: { west: -6.7, south: 37.66, east: -6.65, north: 37.7 } })]);
    const whole = planArea({ bbox, minZoom: 14, maxZoom: 14 }, [src()]);
    expect(inside.tiles).toBeLessThan(whole.tiles);
    const away = planArea({ bbox, minZoom: 14, maxZoom: 14 }, [src({ bounds: { west: 10, south: 40, east: 11, north: 41 } })]);
    expect(away.sources).toHaveLength(0);
    expect(away.problem).toMatch(/No map layer has tiles/);
  });

  test("coverage filtering drops tiles a source does not have", () => {
    const plan = planArea({ bbox: WORLD, minZoom: 1, maxZoom: 1 }, [src({ covered: (_z, x) => x === 0 })]);
    expect(planTileUrls(plan).sort()).toEqual(["/t/1/0/0.png", "/t/1/0/1.png"]);
  });

  test("too many tiles: refused with the count and the limit, without listing them", () => {
    // Iberia from zoom 10 to 19 is some 500 million tiles: listing them would not finish within the test timeout.
    const plan = planArea({ bbox: { west: -10, south: 35, east: 5, north: 44 }, minZoom: 10, maxZoom: 19 }, [src()]);
    expect(plan.tiles).toBeGreaterThan(1e8);
    expect(plan.problem).toContain(`at most ${MAX_AREA_TILES.toLocaleString("en")}`);
    expect(plan.problem).toContain(plan.tiles.toLocaleString("en"));
  });

  test("estimate = tiles × each source's typical tile size", () => {
    const bbox = { west: -6.7, south: 37.66, east: -6.55, north: 37.76 };
    const plan = planArea({ bbox, minZoom: 13, maxZoom: 13 }, [src({ bytesPerTile: 5000 }), src({ id: "b", bytesPerTile: 20000 })]);
    expect(plan.estimatedBytes).toBe(plan.sources[0].tiles * 5000 + plan.sources[1].tiles * 20000);
  });

  test("bad requests get specific problems", () => {
    expect(areaRequestProblem({ bbox: { west: 1, south: 0, east: 1, north: 1 }, minZoom: 1, maxZoom: 2 })).toMatch(/empty/);
    expect(areaRequestProblem({ bbox: { west: 0, south: 0, east: 1, north: 1 }, minZoom: 5, maxZoom: 2 })).toMatch(/lowest zoom \(5\) is above the highest \(2\)/);
    expect(areaRequestProblem({ bbox: { west: 0, south: 0, east: 1, north: 1 }, minZoom: 0, maxZoom: 25 })).toMatch(/0 to 19/);
    expect(areaRequestProblem({ bbox: { west: -200, south: 0, east: 1, north: 1 }, minZoom: 0, maxZoom: 2 })).toMatch(/runs off the map/);
  });
});

describe("storage figures", () => {
  test("formatBytes uses SI units", () => {
    expect(formatBytes(999)).toBe("999 B");
    expect(formatBytes(840_000)).toBe("840 KB");
    expect(formatBytes(4_520_000)).toBe("4.52 MB");
    expect(formatBytes(12_400_000)).toBe("12.4 MB");
    expect(formatBytes(1_200_000_000)).toBe("1.20 GB");
  });
  test("fitsStorage keeps a tenth of the quota free; unknown quota → null", () => {
    expect(fitsStorage(10, { usage: 80, quota: 100 })).toBe(true);
    expect(fitsStorage(11, { usage: 80, quota: 100 })).toBe(false);
    expect(fitsStorage(1, null)).toBeNull();
  });
});
