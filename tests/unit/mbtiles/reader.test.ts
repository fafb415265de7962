import { writeFileSync } from "node:fs";
import { join } from "node:path";
import { tmpdir } from "node:os";
import sharp from "sharp";
import { describe, expect, test } from "vitest";
import { MbtilesError, inspectMbtilesFile, openMbtilesFile } from "@/lib/mbtiles";
import { solidPng, writeMbtiles } from "../../helpers/mbtiles-fixture";

describe("reading an MBTiles package written in the test with @libsql/client", () => {
  test("a tile written at XYZ 15/16592/11272 (TMS row 21495) reads back byte-identical", async () => {
    // Address from the slippy-map tile formula (48.85837 N 2.29448 E, z15); decoded colour checked with sharp.
    const red = await solidPng([200, 30, 30]);
    const blue = await solidPng([30, 30, 200]);
    const file = await writeMbtiles({ name: "fixture", format: "png", minzoom: "15", maxzoom: "15", bounds: "2.28,48.85,2.31,48.87" }, [
      { z: 15, x: 16592, y: 11272, data: red },
      { z: 15, x: 16592, y: 11273, data: blue },
    ]);
    const reader = await openMbtilesFile(file);
    try {
      expect(reader.metadata.format).toBe("png");
      const tile = await reader.getTile({ z: 15, x: 16592, y: 11272 });
      expect(tile).not.toBeNull();
      expect(Buffer.from(tile!).equals(Buffer.from(red))).toBe(true);
      const { channels } = await sharp(tile!).stats();
      expect(Math.round(channels[0].mean)).toBe(200);
      expect(Math.round(channels[2].mean)).toBe(30);
      // Reading row 21495 directly would be the XYZ row 11272 again — the flip is not applied twice.
      expect(await reader.getTile({ z: 15, x: 16592, y: 21495 })).toBeNull();
      expect(await reader.getTile({ z: 14, x: 0, y: 0 })).toBeNull();
    } finally {
      reader.close();
    }
  });

  test("inspection fills zooms from the tiles table and counts tiles", async () => {
    const png = await solidPng([10, 120, 10]);
    const file = await writeMbtiles({ name: "no zooms", format: "png" }, [
      { z: 3, x: 1, y: 2, data: png },
      { z: 5, x: 4, y: 4, data: png },
    ]);
    const info = await inspectMbtilesFile(file);
    expect(info.tileCount).toBe(2);
    expect(info.metadata.minZoom).toBe(3);
    expect(info.metadata.maxZoom).toBe(5);
  });

  test("a package whose tiles do not match its declared format is refused", async () => {
    const png = await solidPng([1, 2, 3]);
    const file = await writeMbtiles({ name: "liar", format: "jpg" }, [{ z: 0, x: 0, y: 0, data: png }]);
    await expect(inspectMbtilesFile(file)).rejects.toThrow(/says jpg, but the tiles are png/);
  });

  test("non-SQLite files and SQLite files without MBTiles tables are refused clearly", async () => {
    const junk = join(tmpdir(), `junk-${Date.now()}.mbtiles`);
    writeFileSync(junk, "name,format\nnot,sqlite\n");
    await expect(inspectMbtilesFile(junk)).rejects.toThrow(/not an SQLite database/);
    await expect(inspectMbtilesFile(join(tmpdir(), "missing-file.mbtiles"))).rejects.toThrow(MbtilesError);
    const empty = await writeMbtiles({ name: "empty", format: "png" }, []);
    await expect(inspectMbtilesFile(empty)).rejects.toThrow(/contains no tiles/);
  });
});

describe("hostile packages are refused before any query can run long (issue: a recursive view froze the server)", () => {
  async function withSchema(statements: string[]): Promise<string> {
    const png = await solidPng([1, 2, 3]);
    const file = await writeMbtiles({ name: "hostile", format: "png" }, [{ z: 0, x: 0, y: 0, data: png }]);
    const { createClient } = await import("@libsql/client");
    const c = createClient({ url: `file:${file}` });
    for (const s of statements) await c.execute(s);
    c.close();
    return file;
  }

  test("tiles as a recursive view is refused in well under a second", async () => {
    const file = await withSchema([
      "DROP TABLE tiles",
      "CREATE VIEW tiles AS WITH RECURSIVE n(i) AS (SELECT 1 UNION ALL SELECT i + 1 FROM n) SELECT 0 AS zoom_level, 0 AS tile_column, 0 AS tile_row, zeroblob(1) AS tile_data FROM n",
    ]);
    const started = Date.now();
    const err = await inspectMbtilesFile(file).catch((e: unknown) => e);
    expect(err).toBeInstanceOf(MbtilesError);
    expect((err as MbtilesError).issues.join(" ")).toMatch(/view \("tiles"\).*refused/);
    expect(Date.now() - started).toBeLessThan(5000); // generous bound for a shared machine; the count would take hours
  });

  test("the deduplicated tiles view over map and images (a layout MBTiles 1.3 allows) is accepted", async () => {
    const png = await solidPng([9, 9, 9]);
    const file = await withSchema([
      "DROP TABLE tiles",
      "CREATE TABLE map (zoom_level INTEGER, tile_column INTEGER, tile_row INTEGER, tile_id TEXT)",
      "CREATE TABLE images (tile_data blob, tile_id text)",
      "CREATE VIEW tiles AS SELECT map.zoom_level AS zoom_level, map.tile_column AS tile_column, map.tile_row AS tile_row, images.tile_data AS tile_data FROM map JOIN images ON images.tile_id = map.tile_id",
    ]);
    const { createClient } = await import("@libsql/client");
    const c = createClient({ url: `file:${file}` });
    await c.execute({ sql: "INSERT INTO images VALUES (?, 'a')", args: [png] });
    await c.execute("INSERT INTO map VALUES (0, 0, 0, 'a')");
    c.close();
    const info = await inspectMbtilesFile(file);
    expect(info.tileCount).toBe(1);
  });

  test("a trigger, a virtual table and a generated column are each refused with the object named", async () => {
    const trig = await withSchema(["CREATE TRIGGER t AFTER INSERT ON metadata BEGIN SELECT 1; END"]);
    await expect(inspectMbtilesFile(trig)).rejects.toThrow(/trigger \("t"\)/);
    const gen = await withSchema(["DROP TABLE tiles", "CREATE TABLE tiles (zoom_level integer, tile_column integer, tile_row integer, tile_data blob GENERATED ALWAYS AS (zeroblob(100000000)) VIRTUAL)"]);
    await expect(inspectMbtilesFile(gen)).rejects.toThrow(/"tiles" has a generated column/);
    const virt = await withSchema(["CREATE VIRTUAL TABLE extra USING rtree(id, minx, maxx)"]);
    await expect(inspectMbtilesFile(virt)).rejects.toThrow(/virtual table/);
  });

  test("the package file is not modified by inspection (opened query_only)", async () => {
    const png = await solidPng([5, 5, 5]);
    const file = await writeMbtiles({ name: "ro", format: "png" }, [{ z: 0, x: 0, y: 0, data: png }]);
    const { readFileSync } = await import("node:fs");
    const before = readFileSync(file);
    await inspectMbtilesFile(file);
    expect(readFileSync(file).equals(before)).toBe(true);
  });
});
