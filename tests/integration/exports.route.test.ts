import { execFileSync } from "node:child_process";
import { existsSync, mkdtempSync, writeFileSync, readFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { check, getIssues } from "@placemarkio/check-geojson";
import { kml as kmlToGeoJson } from "@tmcw/togeojson";
import { DOMParser } from "@xmldom/xmldom";
import ExcelJS from "exceljs";
import Papa from "papaparse";
import sharp from "sharp";
import { beforeAll, describe, expect, test } from "vitest";
import { GET as projectsRoute } from "@/app/api/projects/route";
import { GET as exportRoute } from "@/app/api/projects/[projectId]/exports/[format]/route";
import { POST as createRoute } from "@/app/api/projects/[projectId]/samples/route";
import { POST as shareCreateRoute } from "@/app/api/projects/[projectId]/share-links/route";
import { parseSampleCsv } from "@/lib/csv";
import { IDENTIFICATION_CAVEAT } from "@/lib/export";
import { call, makeWorld, type World } from "../helpers/app";
import { addScan } from "../helpers/phase-fixtures";

/*
 * Invented samples on real Iberian Pyrite Belt coordinates, with scans written straight to the database
 * (tests/helpers/phase-fixtures). Confirmed = accepted on a signed-off scan (common practice: a candidate is not an identification).
 */
let w: World;
const ids: Record<string, string> = {};

beforeAll(async () => {
  w = await makeWorld();
  const mk = async (key: string, body: Record<string, unknown>) => {
    const r = await call(createRoute, { method: "POST", params: { projectId: w.projectId }, cookie: w.cookies.lead, body });
    expect(r.status).toBe(201);
    ids[key] = r.json.id;
  };
  await mk("A", { code: "EXR-001", sampleType: "hand_sample", lithology: "gossan", lat: 37.712345, lon: -6.612345, elevationM: 212.5, collectedAt: "2026-03-14T10:05:00Z", collectorName: "Ana Ruiz", weightKg: 1.25, description: "=SUM(A1) looks like a formula" });
  await mk("B", { code: "EXR-002", sampleType: "soil", stationId: w.stationId, lithology: "shale", collectedAt: "2026-03-15T08:30:00Z", suspectedAsbestos: true });
  await mk("C", { code: "EXR-003", sampleType: "chip", lat: 37.65, lon: -6.5, lithology: "rhyolite" });
  await mk("D", { code: "EXR-004", sampleType: "float" }); // no position at all
  await addScan(w.projectId, ids.A, { signedOff: true, name: "EXR-001_Cu.xy", phases: [{ mineral: "quartz", status: "accepted", rank: 1, wt: 55 }, { mineral: "goethite", status: "accepted", rank: 2, wt: 30.25 }, { mineral: "pyrite", status: "accepted", rank: 3, wt: 14.75 }] });
  await addScan(w.projectId, ids.B, { signedOff: true, phases: [{ mineral: "chrysotile", status: "accepted", rank: 1, wt: 8 }, { mineral: "quartz", status: "accepted", rank: 2, wt: 92 }] });
  await addScan(w.projectId, ids.C, { signedOff: false, phases: [{ mineral: "pyrite", status: "candidate", rank: 1 }, { mineral: "sphalerite", status: "candidate", rank: 2 }] });
});

const get = (format: string, query = "", cookie: string | undefined = w.cookies.consultant) =>
  call(exportRoute, { path: `/api/projects/x/exports/${format}?${query}`, params: { projectId: w.projectId, format }, cookie });

/** Raw bytes of a binary export (the call helper reads text). */
async function bytes(format: string, query = "", cookie = w.cookies.consultant): Promise<{ status: number; headers: Headers; body: Buffer }> {
  const headers = new Headers({ cookie });
  const res = await exportRoute(new Request(`http://localhost:3000/api/projects/x/exports/${format}?${query}`, { headers }), { params: Promise.resolve({ projectId: w.projectId, format }) });
  return { status: res.status, headers: res.headers, body: Buffer.from(await res.arrayBuffer()) };
}

type Feature = { id?: string; type: string; geometry: { type: string; coordinates: number[] } | null; properties: Record<string, unknown> };

describe("GeoJSON export", () => {
  test("passes @placemarkio/check-geojson (RFC 7946); positions [lon, lat]; no crs; phases as attributes", async () => {
    const r = await get("geojson");
    expect(r.status).toBe(200);
    expect(r.headers.get("content-type")).toBe("application/geo+json");
    const text = JSON.stringify(r.json);
    expect(getIssues(text)).toEqual([]);
    const fc = check(text) as unknown as { type: string; features: Feature[] };
    expect("crs" in fc).toBe(false);
    const by = Object.fromEntries(fc.features.map((f) => [f.id, f]));
    // RFC 7946 §3.1.1: longitude first.
    expect(by["EXR-001"].geometry!.coordinates).toEqual([-6.612345, 37.712345]);
    expect(by["EXR-002"].geometry!.coordinates).toEqual([-6.6, 37.7]); // the station's position
    expect(by["EXR-004"].geometry).toBeNull();
    expect(by["EXR-001"].properties).toMatchObject({ phase_status: "confirmed", confirmed_phases: "quartz 55; goethite 30.3; pyrite 14.8", confirmed_symbols: "Qz 55; Gth 30.3; Py 14.8", candidate_phases_unconfirmed: "" });
    expect(by["EXR-003"].properties).toMatchObject({ phase_status: "candidate", confirmed_phases: "", candidate_phases_unconfirmed: "pyrite; sphalerite" });
    expect(by["EXR-002"].properties.asbestiform_phase).toBe(true);
  });

  test("the mineral filter keeps only samples where the mineral is confirmed; phase=any adds candidates", async () => {
    const codes = async (q: string) => ((await get("geojson", q)).json.features as Feature[]).map((f) => f.id).sort();
    expect(await codes("mineral=pyrite")).toEqual(["EXR-001"]);
    expect(await codes("mineral=pyrite&phase=any")).toEqual(["EXR-001", "EXR-003"]);
    expect(await codes("mineral=quartz&lithology=shale")).toEqual(["EXR-002"]);
    expect(await codes("group=sulfide&phase=candidate")).toEqual(["EXR-003"]);
  });
});

describe("KML export", () => {
  test("KML 2.2 parsed by @tmcw/togeojson gives the same features as the GeoJSON export", async () => {
    const [k, g] = await Promise.all([get("kml"), get("geojson")]);
    expect(k.status).toBe(200);
    expect(k.headers.get("content-type")).toBe("application/vnd.google-earth.kml+xml");
    const text = k.json as string;
    expect(text).toContain('<kml xmlns="http://www.opengis.net/kml/2.2">');
    const errors: string[] = [];
    const doc = new DOMParser({ onError: (level, msg) => level !== "warning" && errors.push(msg) }).parseFromString(text, "text/xml");
    expect(errors).toEqual([]);
    const fromKml = kmlToGeoJson(doc as unknown as Document) as unknown as { features: Feature[] };
    const geo = g.json.features as Feature[];
    expect(fromKml.features).toHaveLength(geo.length);
    const byName = new Map(fromKml.features.map((f) => [f.properties.name, f]));
    for (const f of geo) {
      const kf = byName.get(f.id)!;
      expect(kf, f.id).toBeDefined();
      // KML coordinates are lon,lat: togeojson reads them into [lon, lat] (OGC 07-147r2 §10.4).
      expect(kf.geometry?.coordinates ?? null).toEqual(f.geometry?.coordinates ?? null);
      for (const [key, value] of Object.entries(f.properties)) {
        if (value === null || value === "") expect(kf.properties[key], key).toBeUndefined();
        // xs:boolean 1/0 (what GDAL's KML drivers read as integers; see lib/export/kml-writer).
        else if (typeof value === "boolean") expect(String(text.includes(`<SimpleData name="${key}">${value ? 1 : 0}</SimpleData>`)), key).toBe("true");
        else expect(kf.properties[key], `${f.id}.${key}`).toEqual(value);
      }
    }
  });
});

describe("XLSX export", () => {
  test("reopened with exceljs: typed cells (numbers, dates, booleans), phases sheet, caveat", async () => {
    const r = await bytes("xlsx");
    expect(r.status).toBe(200);
    expect(r.headers.get("content-disposition")).toMatch(/filename="TP\d+-samples-\d{4}-\d{2}-\d{2}\.xlsx"/);
    const wb = new ExcelJS.Workbook();
    await wb.xlsx.load(r.body as unknown as ArrayBuffer);
    expect(wb.worksheets.map((s) => s.name)).toEqual(["About", "Register", "Phases"]);
    const reg = wb.getWorksheet("Register")!;
    const header = (reg.getRow(1).values as unknown[]).slice(1);
    const col = (name: string) => header.indexOf(name) + 1;
    const rowOf = (code: string) => {
      for (let i = 2; i <= reg.rowCount; i++) if (reg.getRow(i).getCell(1).value === code) return reg.getRow(i);
      throw new Error(code);
    };
    const a = rowOf("EXR-001");
    expect(a.getCell(col("Latitude (WGS84 °)")).type).toBe(ExcelJS.ValueType.Number);
    expect(a.getCell(col("Latitude (WGS84 °)")).value).toBe(37.712345);
    expect(a.getCell(col("Elevation (m)")).value).toBe(212.5);
    expect(a.getCell(col("Weight (kg)")).value).toBe(1.25);
    const collected = a.getCell(col("Collected (UTC)"));
    expect(collected.type).toBe(ExcelJS.ValueType.Date);
    expect((collected.value as Date).toISOString()).toBe("2026-03-14T10:05:00.000Z");
    expect(rowOf("EXR-002").getCell(col("Suspected asbestos")).type).toBe(ExcelJS.ValueType.Boolean);
    expect(rowOf("EXR-002").getCell(col("Suspected asbestos")).value).toBe(true);
    // Formula-like text is a string cell, stored as entered: XLSX never evaluates a string cell.
    expect(a.getCell(col("Description")).type).toBe(ExcelJS.ValueType.String);
    expect(a.getCell(col("Description")).value).toBe("=SUM(A1) looks like a formula");
    expect(a.getCell(col("Confirmed phases (wt%)")).value).toBe("quartz 55; goethite 30.3; pyrite 14.8");
    const ph = wb.getWorksheet("Phases")!;
    const phaseRows = ph.getSheetValues().slice(2).filter(Boolean) as unknown[][];
    const goethite = phaseRows.find((x) => x[1] === "EXR-001" && x[2] === "goethite")!;
    expect(goethite[6]).toBe(30.25);
    expect(phaseRows.find((x) => x[1] === "EXR-003" && x[2] === "sphalerite")![5]).toBe("candidate (unconfirmed)");
    const about = wb.getWorksheet("About")!;
    expect(JSON.stringify(about.getSheetValues())).toContain("They are not an identification");
  });
});

describe("CSV export", () => {
  test("register columns then phase columns; imports back without errors", async () => {
    const r = await get("csv", "sort=code");
    expect(r.status).toBe(200);
    const text = r.json as string;
    const rows = Papa.parse<Record<string, string>>(text.replace(/^\uFEFF/, ""), { header: true, skipEmptyLines: true }).data;
    expect(rows.map((x) => x.code)).toEqual(["EXR-001", "EXR-002", "EXR-003", "EXR-004"]);
    expect(rows[0].confirmed_phases).toBe("quartz 55; goethite 30.3; pyrite 14.8");
    expect(rows[2].candidate_phases_unconfirmed).toBe("pyrite; sphalerite");
    const back = parseSampleCsv(text);
    expect(back.errors).toEqual([]);
    expect(back.rows).toHaveLength(4);
  });
});

const hasPoppler = existsSync("/usr/bin/pdftoppm") && existsSync("/usr/bin/pdftotext");

describe("PDF report", () => {
  test.skipIf(!hasPoppler)("renders with poppler (pdftoppm) to a non-blank page; text has the table, phases, methods and the caveats", async () => {
    const r = await bytes("pdf");
    expect(r.status).toBe(200);
    expect(r.headers.get("content-type")).toBe("application/pdf");
    expect(r.body.subarray(0, 5).toString()).toBe("%PDF-");
    const dir = mkdtempSync(join(tmpdir(), "lithodex-pdf-"));
    const file = join(dir, "report.pdf");
    writeFileSync(file, r.body);
    execFileSync("/usr/bin/pdftoppm", ["-png", "-r", "60", "-f", "1", "-l", "1", file, join(dir, "page")]);
    const png = readFileSync(join(dir, "page-1.png"));
    const stats = await sharp(png).stats();
    expect(stats.channels.slice(0, 3).some((c) => c.stdev > 10)).toBe(true);
    const text = execFileSync("/usr/bin/pdftotext", ["-raw", file, "-"]).toString().replace(/\s+/g, " ");
    for (const code of ["EXR-001", "EXR-002", "EXR-003", "EXR-004"]) expect(text).toContain(code);
    expect(text).toContain("quartz 55; goethite 30.3; pyrite 14.8");
    expect(text).toContain(IDENTIFICATION_CAVEAT.replace(/\s+/g, " ").slice(0, 80));
    expect(text).toContain("Possible asbestiform mineral");
    expect(text).toContain("Cu Kα1 λ = 1.54059 Å");
    expect(text).toContain("Structure reference");
    // Methods as sentences (lib/export/methods-text), no JSON record.
    expect(text).toContain("Background by SNIP");
    expect(text).not.toMatch(/[{}]|"\w+":/);
    // Fonts (poppler's pdffonts): the shipped DejaVu Sans, embedded as subsets; no non-embedded base-14 font.
    const fonts = execFileSync("/usr/bin/pdffonts", [file]).toString().split("\n").slice(2).filter(Boolean);
    expect(fonts.length).toBeGreaterThan(0);
    for (const line of fonts) {
      expect(line).toMatch(/^[A-Z]{6}\+DejaVuSans(-Bold)?\s/);
      expect(line.split(/\s+/).slice(-5, -4)[0], line).toBe("yes");
    }
  }, 60_000);
});

describe("roles and filters on every export", () => {
  test("every member 200; outsider 404; no session 401; consultant is read-only", async () => {
    for (const format of ["csv", "xlsx", "geojson", "kml", "pdf"]) {
      for (const who of ["lead", "field_geologist", "lab_analyst", "consultant", "admin"] as const) expect((await bytes(format, "", w.cookies[who])).status, `${who} ${format}`).toBe(200);
      expect((await get(format, "", w.cookies.outsider)).status, `outsider ${format}`).toBe(404);
      expect((await call(exportRoute, { path: "/", params: { projectId: w.projectId, format } })).status, `anonymous ${format}`).toBe(401);
      const bad = await get(format, "phase=sometimes");
      expect(bad.status).toBe(422);
      expect(bad.json.error.fields.phase).toBeDefined();
    }
    expect((await get("docx")).status).toBe(422);
    // An outsider learns nothing about the project, whatever the format.
    expect((await get("docx", "", w.cookies.outsider)).status).toBe(404);
  }, 120_000);

  test("a consultant sees only its own projects, cannot write, cannot create share links, and exports another project's register never", async () => {
    const list = await call(projectsRoute, { cookie: w.cookies.consultant });
    expect(list.json.items.map((p: { id: string }) => p.id)).toEqual([w.projectId]);
    const write = await call(createRoute, { method: "POST", params: { projectId: w.projectId }, cookie: w.cookies.consultant, body: { sampleType: "soil" } });
    expect(write.status).toBe(403);
    const share = await call(shareCreateRoute, { method: "POST", params: { projectId: w.projectId }, cookie: w.cookies.consultant, body: { expiresInDays: 3 } });
    expect(share.status).toBe(403);
    const other = await call(exportRoute, { path: "/", params: { projectId: w.otherProjectId, format: "csv" }, cookie: w.cookies.consultant });
    expect(other.status).toBe(404);
  });
});
