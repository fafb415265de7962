import { execFileSync } from "node:child_process";
import { existsSync, mkdtempSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { beforeAll, describe, expect, test } from "vitest";
import { GET as exportRoute } from "@/app/api/projects/[projectId]/exports/[format]/route";
import { POST as createRoute } from "@/app/api/projects/[projectId]/samples/route";
import { call, makeWorld, type World } from "../helpers/app";

/*
 * Each register export opened by an independent reader: GDAL (Debian gdal-bin; ogr2ogr converts the file to
 * GeoJSON on stdout with its GeoJSON, KML/LIBKML and XLSX drivers) and poppler's pdfinfo for the PDF. The values
 * we wrote must come back — booleans and dates included (the suspected-asbestos flag once came out of GDAL as 0).
 * Invented samples on real Iberian Pyrite Belt coordinates.
 */
const hasGdal = existsSync("/usr/bin/ogr2ogr");
let w: World;
let dir: string;

beforeAll(async () => {
  w = await makeWorld();
  dir = mkdtempSync(join(tmpdir(), "lithodex-gdal-"));
  const mk = async (body: Record<string, unknown>) => {
    const r = await call(createRoute, { method: "POST", params: { projectId: w.projectId }, cookie: w.cookies.lead, body });
    expect(r.status).toBe(201);
  };
  await mk({ code: "GDL-001", sampleType: "hand_sample", lithology: "gossan", lat: 37.712345, lon: -6.612345, collectedAt: "2026-03-14T10:05:00Z", suspectedAsbestos: false, weightKg: 1.25 });
  await mk({ code: "GDL-002", sampleType: "soil", lithology: "shale", lat: 37.65, lon: -6.5, collectedAt: "2026-03-15T08:30:00Z", suspectedAsbestos: true, description: "-5 shelf" });
});

async function save(format: string): Promise<string> {
  const res = await exportRoute(new Request(`http://localhost:3000/api/projects/x/exports/${format}?sort=code`, { headers: new Headers({ cookie: w.cookies.consultant }) }), {
    params: Promise.resolve({ projectId: w.projectId, format }),
  });
  expect(res.status).toBe(200);
  const file = join(dir, `register.${format}`);
  writeFileSync(file, Buffer.from(await res.arrayBuffer()));
  return file;
}

type Fc = { features: { properties: Record<string, unknown>; geometry: { coordinates: number[] } | null }[] };
/** ogr2ogr FILE → GeoJSON text on stdout, parsed. */
const viaGdal = (file: string, layer?: string, config: string[] = []): Fc =>
  JSON.parse(execFileSync("/usr/bin/ogr2ogr", [...config, "-f", "GeoJSON", "/vsistdout/", file, ...(layer ? [layer] : [])]).toString()) as Fc;
const byCode = (fc: Fc, key: string) => Object.fromEntries(fc.features.map((f) => [String(f.properties[key]), f]));

describe.skipIf(!hasGdal)("register exports read back by GDAL (ogr2ogr)", () => {
  test("GeoJSON: positions, the asbestos flag as a boolean and the collection instant", async () => {
    const f = byCode(viaGdal(await save("geojson")), "code");
    expect(f["GDL-001"].geometry!.coordinates).toEqual([-6.612345, 37.712345]);
    expect(f["GDL-002"].properties.suspected_asbestos).toBe(true);
    expect(f["GDL-001"].properties.suspected_asbestos).toBe(false);
    expect(new Date(String(f["GDL-002"].properties.collected_at)).toISOString()).toBe("2026-03-15T08:30:00.000Z");
  });

  test("KML: GDAL reads the flag as 1/0 (not 0 for both) and the collection instant", async () => {
    const fc = viaGdal(await save("kml"));
    const f = byCode(fc, "Name");
    expect(Object.keys(f).sort()).toEqual(["GDL-001", "GDL-002"]);
    expect(f["GDL-001"].geometry!.coordinates.slice(0, 2)).toEqual([-6.612345, 37.712345]);
    expect(Number(f["GDL-002"].properties.suspected_asbestos)).toBe(1);
    expect(Number(f["GDL-001"].properties.suspected_asbestos)).toBe(0);
    expect(new Date(String(f["GDL-002"].properties.collected_at)).toISOString()).toBe("2026-03-15T08:30:00.000Z");
  });

  test("XLSX: the Register sheet read by GDAL's XLSX driver — numbers, booleans, dates and text as entered", async () => {
    // first row as field names, cell types from the workbook (GDAL XLSX driver options; config form works on GDAL 3.6)
    const fc = viaGdal(await save("xlsx"), "Register", ["--config", "OGR_XLSX_HEADERS", "FORCE", "--config", "OGR_XLSX_FIELD_TYPES", "AUTO"]);
    const f = byCode(fc, "Code");
    expect(Object.keys(f).sort()).toEqual(["GDL-001", "GDL-002"]);
    const a = f["GDL-001"].properties;
    const b = f["GDL-002"].properties;
    expect(a["Latitude (WGS84 °)"]).toBe(37.712345);
    expect(a["Weight (kg)"]).toBe(1.25);
    // Office Open XML booleans (cell type "b", ECMA-376 Part 1 §18.18.11) come back as booleans.
    expect(b["Suspected asbestos"]).toBe(true);
    expect(a["Suspected asbestos"]).toBe(false);
    // a date cell (serial number with a date format), read back as the UTC instant written; the header stays text
    expect(a["Collected (UTC)"]).toBe("2026-03-14T10:05:00");
    // text that looks like a number or formula stays as entered, no apostrophe
    expect(b["Description"]).toBe("-5 shelf");
  });
});
