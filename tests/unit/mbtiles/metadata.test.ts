import { describe, expect, test } from "vitest";
import { MbtilesError, rasterFormatOf, sniffTileFormat, tileContentType, validateMbtilesMetadata } from "@/lib/mbtiles";

// Rules checked here are from the MBTiles 1.3 specification (mapbox/mbtiles-spec 1.3/spec.md, "Metadata"):
// name and format MUST be present; format is pbf, jpg, png, webp or an IETF media type; bounds is
// "left,bottom,right,top" in WGS84; center is "lon,lat,zoom"; minzoom/maxzoom are integers.
describe("validateMbtilesMetadata", () => {
  test("reads a complete raster package's metadata", () => {
    const m = validateMbtilesMetadata({
      name: "Arroyo orthophoto",
      format: "png",
      bounds: "-6.78,37.58,-6.42,37.78",
      center: "-6.6,37.68,13",
      minzoom: "10",
      maxzoom: "15",
      attribution: "Own drone survey",
      type: "overlay",
    });
    expect(m).toEqual({
      name: "Arroyo orthophoto",
      format: "png",
      bounds: [-6.78, 37.58, -6.42, 37.78],
      center: [-6.6, 37.68, 13],
      minZoom: 10,
      maxZoom: 15,
      attribution: "Own drone survey",
      description: null,
      type: "overlay",
    });
  });

  test("name and format are required; every problem is listed", () => {
    try {
      validateMbtilesMetadata({ bounds: "1,2,3" });
      expect.unreachable();
    } catch (err) {
      expect(err).toBeInstanceOf(MbtilesError);
      const issues = (err as MbtilesError).issues;
      expect(issues).toHaveLength(3);
      expect(issues[0]).toMatch(/"name" is required/);
      expect(issues[1]).toMatch(/"format" is required/);
      expect(issues[2]).toMatch(/"bounds" must be four numbers/);
    }
  });

  test("vector (pbf) packages are refused with a reason", () => {
    expect(() => validateMbtilesMetadata({ name: "v", format: "pbf" })).toThrow(/vector tiles/);
  });

  test("bad bounds, zooms and center are refused", () => {
    expect(() => validateMbtilesMetadata({ name: "a", format: "png", bounds: "10,0,5,1" })).toThrow(/left < right/);
    expect(() => validateMbtilesMetadata({ name: "a", format: "png", bounds: "-200,0,5,1" })).toThrow(/within/);
    expect(() => validateMbtilesMetadata({ name: "a", format: "png", minzoom: "12", maxzoom: "8" })).toThrow(/above maxzoom/);
    expect(() => validateMbtilesMetadata({ name: "a", format: "png", minzoom: "1.5" })).toThrow(/integer zoom/);
    expect(() => validateMbtilesMetadata({ name: "a", format: "png", center: "1,2" })).toThrow(/lon,lat,zoom/);
  });

  test("media types are accepted for format (spec allows an IETF media type)", () => {
    expect(validateMbtilesMetadata({ name: "a", format: "image/jpeg" }).format).toBe("jpg");
    expect(rasterFormatOf("WEBP")).toBe("webp");
    expect(rasterFormatOf("tiff")).toBeNull();
  });
});

describe("tile formats", () => {
  test("content types are the IANA image media types", () => {
    // IANA media types registry: image/png, image/jpeg, image/webp (RFC 9649).
    expect(tileContentType("png")).toBe("image/png");
    expect(tileContentType("jpg")).toBe("image/jpeg");
    expect(tileContentType("webp")).toBe("image/webp");
  });

  test("signatures: PNG, JPEG, WebP, gzip", () => {
    // PNG signature: PNG spec §5.2; JPEG SOI + marker FF D8 FF; RIFF....WEBP container; gzip magic 1F 8B (RFC 1952).
    expect(sniffTileFormat(Uint8Array.from([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a, 0]))).toBe("png");
    expect(sniffTileFormat(Uint8Array.from([0xff, 0xd8, 0xff, 0xe0]))).toBe("jpg");
    expect(sniffTileFormat(new TextEncoder().encode("RIFF\u0000\u0000\u0000\u0000WEBPVP8 "))).toBe("webp");
    expect(sniffTileFormat(Uint8Array.from([0x1f, 0x8b, 8]))).toBe("pbf");
    expect(sniffTileFormat(Uint8Array.from([1, 2, 3]))).toBeNull();
  });
});
