import { describe, expect, test } from "vitest";
import { sampleCreateSchema, samplePatchSchema } from "@/lib/validation/sample";
import { structureCreateSchema } from "@/lib/validation/structure";
import { stationCreateSchema } from "@/lib/validation/station";
import { fieldErrors } from "@/lib/validation/common";

const errs = (r: { success: boolean; error?: unknown }) => (r.success ? {} : fieldErrors(r.error as never));

describe("per-type sample details (sample types: common practice)", () => {
  test("drill core is keyed by hole ID and from/to depth: all three required, to > from", () => {
    const missing = sampleCreateSchema.safeParse({ sampleType: "core", typeDetails: { kind: "core" } });
    expect(Object.keys(errs(missing)).sort()).toEqual(["typeDetails.fromM", "typeDetails.holeId", "typeDetails.toM"]);
    const inverted = sampleCreateSchema.safeParse({ sampleType: "core", typeDetails: { kind: "core", holeId: "APR-DD-003", fromM: 14, toM: 12.5 } });
    expect(errs(inverted)["typeDetails.toM"][0]).toMatch(/deeper/);
    const ok = sampleCreateSchema.safeParse({ sampleType: "core", typeDetails: { kind: "core", holeId: "APR-DD-003", fromM: 12.5, toM: 13.5, coreSize: "NQ", portion: "half" } });
    expect(ok.success).toBe(true);
  });

  test("float is recorded as not in situ", () => {
    const r = sampleCreateSchema.parse({ sampleType: "float", typeDetails: { kind: "float" } });
    expect(r.typeDetails).toEqual({ kind: "float", inSitu: false });
    expect(sampleCreateSchema.safeParse({ sampleType: "float", typeDetails: { kind: "float", inSitu: true } }).success).toBe(false);
  });

  test("details of another type are refused, also on edit", () => {
    const r = sampleCreateSchema.safeParse({ sampleType: "soil", typeDetails: { kind: "core", holeId: "H1", fromM: 0, toM: 1 } });
    expect(errs(r).typeDetails[0]).toMatch(/another sample type/);
    expect(samplePatchSchema.safeParse({ version: 3, sampleType: "soil", typeDetails: { kind: "channel" } }).success).toBe(false);
  });

  test("soil depth, horizon and sieve fraction; unknown keys are refused", () => {
    expect(sampleCreateSchema.safeParse({ sampleType: "soil", typeDetails: { kind: "soil", depthCm: 35, horizon: "B", sieveFraction: "−80 mesh (< 180 µm)" } }).success).toBe(true);
    expect(sampleCreateSchema.safeParse({ sampleType: "soil", typeDetails: { kind: "soil", colour: "red" } }).success).toBe(false);
  });
});

describe("station and structure schemas", () => {
  test("latitude 91 and an elevation reference outside msl/ellipsoid are refused (WGS84 latitude ±90°; common practice)", () => {
    const r = stationCreateSchema.safeParse({ lat: 91, lon: 0, elevationRef: "geoid" });
    expect(Object.keys(errs(r)).sort()).toEqual(["elevationRef", "lat"]);
  });
  test("dip 95 and strike 400 are refused by the right-hand-rule entry (ranges: common practice)", () => {
    const r = structureCreateSchema.safeParse({ convention: "rhr", feature: "bedding", strike: 400, dip: 95 });
    expect(Object.keys(errs(r)).sort()).toEqual(["dip", "strike"]);
  });
  test("a magnetic azimuth needs a declination; a rake does not (it is measured within the plane)", () => {
    expect(errs(structureCreateSchema.safeParse({ convention: "trend_plunge", feature: "lineation", trend: 10, plunge: 10, azimuthRef: "magnetic" })).declinationDeg).toBeDefined();
    expect(structureCreateSchema.safeParse({ convention: "rake", feature: "lineation", rake: 30, planeId: "p", azimuthRef: "magnetic" }).success).toBe(true);
  });
});
