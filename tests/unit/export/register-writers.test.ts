/**
 * Register exports read back by readers that are not ours: @xmldom/xmldom and @tmcw/togeojson for KML, GDAL's
 * ogr2ogr (Debian gdal-bin, when installed) for KML, exceljs for XLSX, papaparse for CSV.
 */
import { execFileSync } from "node:child_process";
import { mkdtempSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { kml as kmlToGeoJson } from "@tmcw/togeojson";
import { DOMParser } from "@xmldom/xmldom";
import ExcelJS from "exceljs";
import Papa from "papaparse";
import { describe, expect, test } from "vitest";
import { parseSampleCsv, sampleCsvHeaderLine, sampleCsvLines } from "@/lib/csv";
import { guardFormula, unguardFormula, wouldEvaluate } from "@/lib/csv/formula-guard";
import { registerCsvHeader, registerCsvLines } from "@/lib/export/csv-writer";
import { writeRegisterKml } from "@/lib/export/kml-writer";
import type { ExportRow, RegisterExport } from "@/lib/export/types";
import { writeRegisterXlsx } from "@/lib/export/xlsx-writer";

// Invented rows (demo-style data); one with milliseconds in its instant, one without.
const base: ExportRow = {
  id: "00000000-0000-4000-8000-000000000001",
  code: "TST-0001",
  igsn: null,
  stationCode: "ST-01",
  stationLat: 37.7,
  stationLon: -6.6,
  sampleType: "hand_sample",
  lithology: "=1+2",
  alteration: "-5 shelf",
  alterationIntensity: null,
  description: "+A1",
  collectedAt: "2026-03-14T08:06:00.000Z",
  collectedTz: "Europe/Madrid",
  collectorName: "Ada Field",
  lat: 37.712345,
  lon: -6.612345,
  elevationM: 412.5,
  horizontalAccuracyM: 4,
  locationSource: "device_gnss",
  storageLocation: "-2+3+cmd|' /C calc'!A0",
  status: "collected",
  suspectedAsbestos: true,
  weightKg: 1.25,
  confirmed: [],
  candidates: [],
};
const rows: ExportRow[] = [
  base,
  { ...base, id: "00000000-0000-4000-8000-000000000002", code: "TST-0002", suspectedAsbestos: false, collectedAt: "2026-03-14T09:15:00Z", lithology: "granite", alteration: null, description: null, storageLocation: "shelf B" },
];

const exp: RegisterExport = {
  project: { id: "p", code: "TST", name: "Test project", region: null, description: null },
  filter: {} as RegisterExport["filter"],
  generatedAt: new Date("2026-04-01T12:00:00Z"),
  source: { kind: "member", name: "Ada Field" },
  pages: async function* () {
    yield rows;
  },
  report: async () => {
    throw new Error("not used");
  },
};

async function collect<T extends string | Uint8Array>(gen: AsyncGenerator<T>): Promise<T[]> {
  const out: T[] = [];
  for await (const c of gen) out.push(c);
  return out;
}

const hasOgr = (() => {
  try {
    execFileSync("ogr2ogr", ["--version"], { stdio: "ignore" });
    return true;
  } catch {
    return false;
  }
})();

describe("KML export", async () => {
  const text = (await collect(writeRegisterKml(exp, null))).join("");
  const doc = new DOMParser().parseFromString(text, "text/xml");

  test("booleans are xs:boolean 1/0 under a SimpleField of type bool (KML 2.2 §9.10, XML Schema Part 2 §3.2.2)", () => {
    const field = Array.from(doc.getElementsByTagName("SimpleField")).find((f) => f.getAttribute("name") === "suspected_asbestos");
    expect(field?.getAttribute("type")).toBe("bool");
    const values = Array.from(doc.getElementsByTagName("SimpleData"))
      .filter((d) => d.getAttribute("name") === "suspected_asbestos")
      .map((d) => d.textContent);
    expect(values).toEqual(["1", "0"]);
  });

  test("collected_at is the Placemark's TimeStamp/when in one format (read by @tmcw/togeojson)", () => {
    const gj = kmlToGeoJson(doc as unknown as Document);
    expect(gj.features.map((f) => f.properties?.timestamp)).toEqual(["2026-03-14T08:06:00Z", "2026-03-14T09:15:00Z"]);
    expect(gj.features.map((f) => f.properties?.collected_at)).toEqual(["2026-03-14T08:06:00Z", "2026-03-14T09:15:00Z"]);
  });

  // GDAL 3.6 (Debian 12 gdal-bin, LIBKML driver) reads a type="bool" field as Integer: "1"/"0" come out as 1/0,
  // while "true" gives 0 with "Value 'true' … parsed incompletely to integer 0" (checked by hand with ogr2ogr).
  test.skipIf(!hasOgr)("GDAL's ogr2ogr reads the asbestos flag as 1 and 0, the time stamp and the position (Debian gdal-bin)", () => {
    const dir = mkdtempSync(join(tmpdir(), "kml-"));
    writeFileSync(join(dir, "r.kml"), text);
    const out = JSON.parse(execFileSync("ogr2ogr", ["-f", "GeoJSON", "/vsistdout/", join(dir, "r.kml")], { encoding: "utf8" }));
    const props = out.features.map((f: { properties: Record<string, unknown> }) => f.properties);
    expect(props.map((p: Record<string, unknown>) => p.suspected_asbestos)).toEqual([1, 0]);
    expect(props.map((p: Record<string, unknown>) => p.timestamp)).toEqual(["2026-03-14T08:06:00Z", "2026-03-14T09:15:00Z"]);
    expect(out.features[0].geometry.coordinates.slice(0, 2)).toEqual([-6.612345, 37.712345]);
  });
});

describe("XLSX export (read back with exceljs)", async () => {
  const chunks = await collect(writeRegisterXlsx(exp));
  const wb = new ExcelJS.Workbook();
  await wb.xlsx.load(Buffer.concat(chunks.map((c) => Buffer.from(c))) as unknown as ArrayBuffer);
  const sheet = wb.getWorksheet("Register")!;
  const header = (sheet.getRow(1).values as unknown[]).slice(1);
  const col = (h: string) => header.indexOf(h) + 1;

  test("text is stored as text, exactly as entered: no apostrophe, no formula", () => {
    const cell = sheet.getRow(2).getCell(col("Lithology"));
    expect(cell.type).toBe(ExcelJS.ValueType.String);
    expect(cell.value).toBe("=1+2");
    expect(sheet.getRow(2).getCell(col("Alteration")).value).toBe("-5 shelf");
    expect(sheet.getRow(2).getCell(col("Storage")).value).toBe("-2+3+cmd|' /C calc'!A0");
  });

  test("booleans and instants are typed cells", () => {
    expect(sheet.getRow(2).getCell(col("Suspected asbestos")).value).toBe(true);
    expect(sheet.getRow(3).getCell(col("Suspected asbestos")).value).toBe(false);
    expect((sheet.getRow(3).getCell(col("Collected (UTC)")).value as Date).toISOString()).toBe("2026-03-14T09:15:00.000Z");
  });
});

describe("CSV export (read back with papaparse)", () => {
  test("only what a spreadsheet would evaluate is guarded (OWASP CSV Injection; rule in lib/csv/formula-guard)", () => {
    const parsed = Papa.parse<Record<string, string>>(registerCsvHeader() + registerCsvLines(rows), { header: true, skipEmptyLines: true }).data;
    expect(parsed[0].lithology).toBe("'=1+2");
    expect(parsed[0].alteration).toBe("-5 shelf");
    expect(parsed[0].description).toBe("'+A1");
    expect(parsed[0].storage_location).toBe("'-2+3+cmd|' /C calc'!A0");
    expect(parsed[1].storage_location).toBe("shelf B");
  });

  test("one instant format per column, with or without stored milliseconds", () => {
    const parsed = Papa.parse<Record<string, string>>(registerCsvHeader() + registerCsvLines(rows), { header: true, skipEmptyLines: true }).data;
    expect(parsed.map((r) => r.collected_at)).toEqual(["2026-03-14T08:06:00Z", "2026-03-14T09:15:00Z"]);
  });

  test("the guard is undone on import, and text that was not guarded keeps its apostrophe", () => {
    const recs = rows.map((r) => ({ ...r }));
    const csv = sampleCsvHeaderLine() + sampleCsvLines(recs);
    const back = parseSampleCsv(csv);
    expect(back.errors).toEqual([]);
    expect(back.rows[0].sample).toMatchObject({ lithology: "=1+2", alteration: "-5 shelf", description: "+A1" });
    expect(unguardFormula("'tis granite")).toBe("'tis granite");
  });

  test.each([
    ["=SUM(A1:A3)", true],
    ["@SUM(A1)", true],
    ["+A1", true],
    ["-$B$2", true],
    ["-2+3", true],
    ["\tcmd", true],
    ["-5 shelf", false],
    ["+ north wall", false],
    ["-5.2", false],
    ["granite", false],
  ])("%j evaluates in a spreadsheet: %s (common practice, OWASP CSV Injection)", (text, evaluates) => {
    expect(wouldEvaluate(text)).toBe(evaluates);
    expect(guardFormula(text)).toBe(evaluates ? `'${text}` : text);
  });
});
