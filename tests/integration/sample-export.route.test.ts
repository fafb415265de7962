import { check, getIssues } from "@placemarkio/check-geojson";
import Papa from "papaparse";
import { beforeAll, describe, expect, test } from "vitest";
import { GET as exportRoute } from "@/app/api/projects/[projectId]/samples/export/route";
import { POST as importRoute } from "@/app/api/projects/[projectId]/samples/import/route";
import { POST as createRoute } from "@/app/api/projects/[projectId]/samples/route";
import { parseSampleCsv } from "@/lib/csv";
import { call, makeWorld, type World } from "../helpers/app";

let w: World;
beforeAll(async () => {
  w = await makeWorld();
  const mk = (body: Record<string, unknown>) => call(createRoute, { method: "POST", params: { projectId: w.projectId }, cookie: w.cookies.lead, body });
  // Invented samples; real coordinates in the Iberian Pyrite Belt.
  await mk({ code: "EXP-001", sampleType: "hand_sample", lithology: "rhyolite", lat: 37.712345, lon: -6.612345, collectedAt: "2026-03-14T10:05:00Z", description: "Gossan, “oxidised” cap" });
  await mk({ code: "EXP-002", sampleType: "soil", lat: 37.7, lon: -6.5 });
  await mk({ code: "EXP-003", sampleType: "soil", stationId: w.stationId }); // no own position: the station's (37.7 N, 6.6 W)
  await mk({ code: "EXP-004", sampleType: "float" }); // unlocated
});

const get = (query: string, cookie = w.cookies.consultant) => call(exportRoute, { path: `/api/projects/x/samples/export?${query}`, params: { projectId: w.projectId }, cookie });

describe("register export", () => {
  test("CSV of a filter: header, rows, filename; it imports back without errors", async () => {
    const r = await get("format=csv&sampleType=soil");
    expect(r.status).toBe(200);
    expect(r.headers.get("content-type")).toBe("text/csv; charset=utf-8");
    expect(r.headers.get("content-disposition")).toMatch(/^attachment; filename="TP\d+-samples-\d{4}-\d{2}-\d{2}\.csv"$/);
    const text = r.json as string;
    const rows = Papa.parse<Record<string, string>>(text.replace(/^\uFEFF/, ""), { header: true, skipEmptyLines: true }).data;
    expect(rows.map((x) => x.code)).toEqual(["EXP-002", "EXP-003"]);
    expect(rows[1].station_code).toMatch(/-ST-001$/);
    const back = parseSampleCsv(text);
    expect(back.errors).toEqual([]);
    expect(back.rows).toHaveLength(2);
  });

  test("GeoJSON (RFC 7946) passes @placemarkio/check-geojson; positions are [lon, lat]; no crs member", async () => {
    const r = await get("format=geojson");
    expect(r.status).toBe(200);
    expect(r.headers.get("content-type")).toBe("application/geo+json");
    const text = JSON.stringify(r.json);
    expect(getIssues(text)).toEqual([]);
    const fc = check(text) as unknown as { type: string; crs?: unknown; features: { id: string; geometry: { coordinates: number[] } | null; properties: Record<string, unknown> }[] };
    expect(fc.type).toBe("FeatureCollection");
    expect("crs" in fc).toBe(false);
    const byCode = Object.fromEntries(fc.features.map((f) => [f.id, f]));
    // RFC 7946 §3.1.1: longitude first, then latitude.
    expect(byCode["EXP-001"].geometry!.coordinates).toEqual([-6.612345, 37.712345]);
    expect(byCode["EXP-003"].geometry!.coordinates).toEqual([-6.6, 37.7]);
    expect(byCode["EXP-003"].properties.position_source).toBe("station");
    expect(byCode["EXP-004"].geometry).toBeNull();
    expect(byCode["EXP-001"].properties.url).toMatch(/\/projects\/.+\/samples\/.+/);
  });

  test("the bbox filter (west,south,east,north) applies to the export", async () => {
    const r = await get("format=geojson&bbox=-6.7,37.65,-6.55,37.75");
    expect((r.json.features as { id: string }[]).map((f) => f.id)).toEqual(["EXP-001"]);
  });

  test("an empty result is still a valid FeatureCollection", async () => {
    const r = await get("format=geojson&lithology=nothing-like-this");
    expect(getIssues(JSON.stringify(r.json))).toEqual([]);
    expect(r.json.features).toEqual([]);
  });

  test("an export larger than one page (2,100 + 4 rows, pages of 1,000) streams as one valid document", async () => {
    const lines = ["code,sample_type,lat,lon"];
    for (let i = 1; i <= 2100; i++) lines.push(`BIG-${String(i).padStart(4, "0")},stream_sediment,${(37.6 + i * 1e-5).toFixed(6)},-6.7`);
    const imp = await call(importRoute, { method: "POST", path: "/?mode=commit", params: { projectId: w.projectId }, cookie: w.cookies.lead, body: { csv: lines.join("\n") } });
    expect(imp.status).toBe(201);
    const r = await get("format=geojson");
    expect(getIssues(JSON.stringify(r.json))).toEqual([]);
    expect(r.json.features).toHaveLength(2104);
    const csv = await get("format=csv&sampleType=stream_sediment&sort=code&dir=desc");
    const codes = Papa.parse<Record<string, string>>((csv.json as string).replace(/^\uFEFF/, ""), { header: true, skipEmptyLines: true }).data.map((x) => x.code);
    expect(codes).toHaveLength(2100);
    expect(codes[0]).toBe("BIG-2100");
    expect(new Set(codes).size).toBe(2100);
  });

  test("roles: every member may export; outsider 404, no session 401; bad format or filter 422", async () => {
    for (const who of ["lead", "field_geologist", "lab_analyst", "consultant"] as const) expect((await get("format=csv", w.cookies[who])).status).toBe(200);
    expect((await get("format=csv", w.cookies.outsider)).status).toBe(404);
    expect((await call(exportRoute, { path: "/?format=csv", params: { projectId: w.projectId } })).status).toBe(401);
    expect((await get("format=kml")).status).toBe(422);
    const bad = await get("format=csv&bbox=west");
    expect(bad.status).toBe(422);
    expect(bad.json.error.fields.bbox).toBeDefined();
  });
});
