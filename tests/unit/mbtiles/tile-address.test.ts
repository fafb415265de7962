import { describe, expect, test } from "vitest";
import { MbtilesError, mbtilesRow, parseTileAddress } from "@/lib/mbtiles";
import { lonLatToTile } from "@/lib/map/tiles";

describe("MBTiles row flip (XYZ ↔ TMS)", () => {
  // Source: slippy-map tile formula (OpenStreetMap wiki "Slippy map tilenames"), recomputed; the flip
  // row_tms = 2^z − 1 − y is from the MBTiles 1.3 spec ("tile_row … TMS scheme").
  test("48.85837 N 2.29448 E at z15 → x 16592, y 11272, MBTiles row 21495", () => {
    expect(lonLatToTile(2.29448, 48.85837, 15)).toEqual({ x: 16592, y: 11272 });
    expect(mbtilesRow(11272, 15)).toBe(21495);
  });

  test("33.85678 S 151.21530 E at z12 → x 3768, y 2457, MBTiles row 1638", () => {
    expect(lonLatToTile(151.2153, -33.85678, 12)).toEqual({ x: 3768, y: 2457 });
    expect(mbtilesRow(2457, 12)).toBe(1638);
  });

  test("the flip is its own inverse; z0 has a single row 0", () => {
    expect(mbtilesRow(mbtilesRow(11272, 15), 15)).toBe(11272);
    expect(mbtilesRow(0, 0)).toBe(0);
  });
});

describe("parseTileAddress", () => {
  test("accepts z/x/y with an image extension on y", () => {
    expect(parseTileAddress("15", "16592", "11272.png")).toEqual({ z: 15, x: 16592, y: 11272 });
  });

  test.each([
    ["15", "16592", "-1", /y must be a non-negative integer/],
    ["3", "8", "0", /x must be below 8 at zoom 3/],
    ["3", "0", "8", /y must be below 8 at zoom 3/],
    ["25", "0", "0", /Zoom must be at most 24/],
    ["a", "0", "0", /z must be a non-negative integer/],
  ])("rejects %s/%s/%s with a specific message", (z, x, y, msg) => {
    expect(() => parseTileAddress(z, x, y)).toThrow(MbtilesError);
    expect(() => parseTileAddress(z, x, y)).toThrow(msg);
  });
});
