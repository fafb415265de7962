import { existsSync, readdirSync, readFileSync } from "node:fs";
import path from "node:path";
import sharp from "sharp";
import { describe, expect, test } from "vitest";

import {
  OFFLINE_DISTRICT_BBOX,
  OFFLINE_MAX_ZOOM,
  OFFLINE_MIN_ZOOM,
  OFFLINE_TILE_ATTRIBUTION,
  OFFLINE_TILE_COVERAGE,
  hasOfflineTile,
  offlineTileCount,
  offlineTileRanges,
} from "@/lib/map/offline-tiles";
import { lonLatToTile, lonLatToWorldPixel } from "@/lib/map/tiles";

const DIR = path.resolve("public/tiles-offline");
const tileFile = (z: number, x: number, y: number) => path.join(DIR, String(z), String(x), `${y}.png`);

/** Reads width/height from the IHDR chunk (PNG spec, ISO/IEC 15948: 8-byte signature, then IHDR). */
function pngHeader(buf: Buffer): { width: number; height: number } | null {
  const signature = Buffer.from([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a]);
  if (buf.length < 33 || !buf.subarray(0, 8).equals(signature)) return null;
  if (buf.toString("latin1", 12, 16) !== "IHDR") return null;
  return { width: buf.readUInt32BE(16), height: buf.readUInt32BE(20) };
}

/** RGB of the pixel at a position inside tile z/x/y. */
async function pixelAt(lon: number, lat: number, z: number): Promise<string> {
  const t = lonLatToTile(lon, lat, z);
  const { px, py } = lonLatToWorldPixel(lon, lat, z);
  const col = Math.floor(px) - t.x * 256;
  const row = Math.floor(py) - t.y * 256;
  const { data, info } = await sharp(tileFile(z, t.x, t.y)).raw().toBuffer({ resolveWithObject: true });
  const i = (row * info.width + col) * info.channels;
  return [data[i], data[i + 1], data[i + 2]].join(",");
}

/** Most frequent RGB value of a tile. */
async function dominantColour(file: string): Promise<string> {
  const { data, info } = await sharp(file).raw().toBuffer({ resolveWithObject: true });
  const counts = new Map<string, number>();
  for (let i = 0; i < data.length; i += info.channels) {
    const key = `${data[i]},${data[i + 1]},${data[i + 2]}`;
    counts.set(key, (counts.get(key) ?? 0) + 1);
  }
  return [...counts.entries()].sort((a, b) => b[1] - a[1])[0][0];
}

describe("offline coverage declaration", () => {
  test("zooms 0…15 each appear once, world at z0–5 and the district at z13–15", () => {
    const zooms = offlineTileRanges().map((r) => r.z);
    expect(zooms).toEqual(Array.from({ length: OFFLINE_MAX_ZOOM - OFFLINE_MIN_ZOOM + 1 }, (_, i) => i));
    expect(offlineTileRanges().slice(0, 6).every((r) => r.xMin === 0 && r.xMax === 2 ** r.z - 1)).toBe(true);
    const district = OFFLINE_TILE_COVERAGE.find((b) => b.name === "district");
    expect(district).toMatchObject({ minZoom: 13, maxZoom: 15, bbox: OFFLINE_DISTRICT_BBOX });
    expect(OFFLINE_DISTRICT_BBOX).toEqual({ west: -6.78, south: 37.58, east: -6.42, north: 37.78 });
    expect(OFFLINE_TILE_ATTRIBUTION).toMatch(/Natural Earth \(public domain\)/);
  });

  test("each finer block lies inside the coarser one, so zooming in over the district is continuous", () => {
    for (let i = 1; i < OFFLINE_TILE_COVERAGE.length; i++) {
      const outer = OFFLINE_TILE_COVERAGE[i - 1].bbox, inner = OFFLINE_TILE_COVERAGE[i].bbox;
      expect(inner.west).toBeGreaterThanOrEqual(outer.west);
      expect(inner.east).toBeLessThanOrEqual(outer.east);
      expect(inner.south).toBeGreaterThanOrEqual(outer.south);
      expect(inner.north).toBeLessThanOrEqual(outer.north);
      expect(OFFLINE_TILE_COVERAGE[i].minZoom).toBe(OFFLINE_TILE_COVERAGE[i - 1].maxZoom + 1);
    }
    // The district's centre has a tile at every zoom.
    for (let z = 0; z <= 15; z++) {
      const t = lonLatToTile(-6.6, 37.68, z);
      expect(hasOfflineTile(z, t.x, t.y)).toBe(true);
    }
  });

  test("stays within the budget of ~6,000 files", () => {
    expect(offlineTileCount().total).toBeLessThanOrEqual(6000);
  });
});

describe("generated tiles on disk", () => {
  test("every promised tile exists and is a 256 × 256 PNG; nothing else is there", () => {
    let checked = 0;
    for (const r of offlineTileRanges()) {
      for (let x = r.xMin; x <= r.xMax; x++) {
        for (let y = r.yMin; y <= r.yMax; y++) {
          const file = tileFile(r.z, x, y);
          expect(existsSync(file), file).toBe(true);
          expect(pngHeader(readFileSync(file)), file).toEqual({ width: 256, height: 256 });
          checked++;
        }
      }
    }
    expect(checked).toBe(offlineTileCount().total);
    // No stray tiles outside the coverage.
    let onDisk = 0;
    for (const z of readdirSync(DIR).filter((d) => /^\d+$/.test(d))) {
      for (const x of readdirSync(path.join(DIR, z))) onDisk += readdirSync(path.join(DIR, z, x)).length;
    }
    expect(onDisk).toBe(checked);
  });

  test("sharp decodes a sample of tiles as 256 × 256 PNG", async () => {
    for (const [z, x, y] of [
      [0, 0, 0],
      [5, 15, 12],
      [9, 250, 195],
      [12, 1972, 1585],
      [15, 15783, 12676],
    ]) {
      const meta = await sharp(tileFile(z, x, y)).metadata();
      expect(meta).toMatchObject({ format: "png", width: 256, height: 256 });
    }
  });

  test("the district at z15 is drawn (not blank) and inland (land colour, not sea)", async () => {
    const t = lonLatToTile(-6.6, 37.68, 15); // centre of the demo district
    const file = tileFile(15, t.x, t.y);
    const stats = await sharp(file).stats();
    expect(Math.max(...stats.channels.slice(0, 3).map((c) => c.stdev))).toBeGreaterThan(0);
    // The Sahara at 26° N, 5° E is land and the Gulf of Guinea at 2° N, 2° E is sea (common knowledge).
    const land = await pixelAt(5, 26, 2);
    const sea = await pixelAt(2, 2, 2);
    expect(await dominantColour(file)).toBe(land);
    expect(await dominantColour(file)).not.toBe(sea);
  });

  test("world tiles at z2 show land and sea in the right hemispheres", async () => {
    // Tile 2/2/1 (lon 0…90 E, lat 0…66.5 N): Sahara land, Gulf of Guinea sea.
    const sahara = await pixelAt(5, 26, 2);
    const guinea = await pixelAt(2, 2, 2);
    expect(sahara).not.toBe(guinea);
    // Tile 2/3/2 (lon 90…180 E, lat 0…66.5 S): central Australia land, the Indian Ocean south-west of it sea.
    expect(await pixelAt(134, -25, 2)).toBe(sahara);
    expect(await pixelAt(100, -40, 2)).toBe(guinea);
    // Western hemisphere: Brazil's interior land (10° S, 50° W, tile 2/1/2), mid-Atlantic sea (25° N, 40° W, tile 2/1/1).
    expect(await pixelAt(-50, -10, 2)).toBe(sahara);
    expect(await pixelAt(-40, 25, 2)).toBe(guinea);
    // Tile 2/2/1 is not flat: coastlines, borders and graticule on top of land and sea.
    const stats = await sharp(tileFile(2, 2, 1)).stats();
    expect(Math.max(...stats.channels.slice(0, 3).map((c) => c.stdev))).toBeGreaterThan(5);
  });
});
