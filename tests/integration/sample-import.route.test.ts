import { count, eq } from "drizzle-orm";
import { beforeAll, describe, expect, test } from "vitest";
import { POST as importRoute } from "@/app/api/projects/[projectId]/samples/import/route";
import { getDb } from "@/db";
import { auditLog, projects, samples } from "@/db/schema";
import { call, makeWorld, type World } from "../helpers/app";

let w: World;
let stationCode: string;
beforeAll(async () => {
  w = await makeWorld();
  const [p] = await getDb().select({ code: projects.code }).from(projects).where(eq(projects.id, w.projectId));
  stationCode = `${p.code}-ST-001`; // the station makeWorld() creates
});

const sampleCount = async () => (await getDb().select({ n: count() }).from(samples).where(eq(samples.projectId, w.projectId)))[0].n;

/** An invented 5,000-row register: positions spread over the demo district, one station reference per 10 rows. */
function registerCsv(rows: number, bad?: { row: number; lat: string }): string {
  const lines = ["code,station_code,sample_type,lithology,collected_at,collected_tz,lat,lon,suspected_asbestos"];
  for (let i = 1; i <= rows; i++) {
    const lat = bad && bad.row === i ? bad.lat : (37.6 + (i % 97) * 0.001).toFixed(6);
    const lon = (-6.7 + (i % 89) * 0.001).toFixed(6);
    lines.push(`IMP-${String(i).padStart(5, "0")},${i % 10 === 0 ? stationCode : ""},${i % 3 ? "soil" : "hand_sample"},${i % 3 ? "" : "rhyolite"},2026-03-${String((i % 28) + 1).padStart(2, "0")}T10:00:00Z,Europe/Madrid,${lat},${lon},no`);
  }
  return lines.join("\n") + "\n";
}

const params = () => ({ projectId: w.projectId });

describe("sample import (preview and all-or-nothing commit)", () => {
  test("5,000 rows with one bad latitude: preview and commit both report line and column; nothing is written", async () => {
    const csv = registerCsv(5000, { row: 3120, lat: "137.5" });
    const before = await sampleCount();
    const preview = await call(importRoute, { method: "POST", path: "/?mode=preview", params: params(), cookie: w.cookies.field_geologist, body: { csv } });
    expect(preview.status).toBe(200);
    expect(preview.json.rowCount).toBe(5000);
    expect(preview.json.validRowCount).toBe(4999);
    expect(preview.json.mapping.lat).toBe("lat");
    // Data row 3120 sits on file line 3121 (the header is line 1).
    expect(preview.json.errors).toEqual([{ line: 3121, column: "lat", field: "lat", message: "Latitude must be between −90 and 90." }]);

    const commit = await call(importRoute, { method: "POST", path: "/?mode=commit", params: params(), cookie: w.cookies.field_geologist, body: { csv } });
    expect(commit.status).toBe(422);
    expect(commit.json.error.message).toMatch(/1 problem in the file; nothing was imported/);
    expect(commit.json.error.details.errors[0]).toMatchObject({ line: 3121, column: "lat" });
    expect(await sampleCount()).toBe(before);
  });

  test("the fixed file imports all 5,000 rows in one go, with stations resolved by code and an audit trail", async () => {
    const before = await sampleCount();
    const commit = await call(importRoute, { method: "POST", path: "/?mode=commit", params: params(), cookie: w.cookies.field_geologist, body: { csv: registerCsv(5000) } });
    expect(commit.status).toBe(201);
    expect(commit.json).toEqual({ imported: 5000, firstCode: "IMP-00001", lastCode: "IMP-05000" });
    expect(await sampleCount()).toBe(before + 5000);
    const [s10] = await getDb().select().from(samples).where(eq(samples.code, "IMP-00010"));
    expect(s10.stationId).toBe(w.stationId);
    expect(s10.lat).toBeCloseTo(37.61, 6);
    expect(s10.collectedTz).toBe("Europe/Madrid");
    const [{ n }] = await getDb().select({ n: count() }).from(auditLog).where(eq(auditLog.entityId, s10.id));
    expect(n).toBe(1);
  });

  test("importing the same codes again is refused row by row; nothing is written", async () => {
    const before = await sampleCount();
    const r = await call(importRoute, { method: "POST", path: "/?mode=commit", params: params(), cookie: w.cookies.lead, body: { csv: registerCsv(3) } });
    expect(r.status).toBe(422);
    expect(r.json.error.details.errors.map((e: { line: number }) => e.line)).toEqual([2, 3, 4]);
    expect(r.json.error.details.errors[0].message).toBe("Sample code IMP-00001 is already used in this project.");
    expect(await sampleCount()).toBe(before);
  });

  test("rows without a code get the next codes of the project sequence; unknown stations are reported", async () => {
    const ok = await call(importRoute, {
      method: "POST",
      path: "/?mode=commit",
      params: params(),
      cookie: w.cookies.lead,
      body: { csv: "Type;Lat;Lon\nsoil;37,7;-6,6\nfloat;;\n" },
    });
    expect(ok.status).toBe(201);
    expect(ok.json.firstCode).toMatch(/^TP\d+-000001$/);
    expect(ok.json.lastCode).toMatch(/^TP\d+-000002$/);
    const bad = await call(importRoute, { method: "POST", path: "/?mode=preview", params: params(), cookie: w.cookies.lead, body: { csv: "sample_type,station\nsoil,NOPE-ST-9\n" } });
    expect(bad.json.errors[0]).toMatchObject({ line: 2, column: "station", field: "stationCode" });
  });

  test("roles: consultant and lab analyst 403, outsider 404, no session 401 — whatever they send", async () => {
    for (const who of ["consultant", "lab_analyst"] as const) {
      const r = await call(importRoute, { method: "POST", path: "/?mode=commit", params: params(), cookie: w.cookies[who], body: { csv: registerCsv(2) } });
      expect(r.status).toBe(403);
    }
    expect((await call(importRoute, { method: "POST", path: "/?mode=preview", params: params(), cookie: w.cookies.consultant, body: { nonsense: 1 } })).status).toBe(403);
    expect((await call(importRoute, { method: "POST", path: "/?mode=preview", params: params(), cookie: w.cookies.outsider, body: { csv: "x" } })).status).toBe(404);
    expect((await call(importRoute, { method: "POST", path: "/?mode=preview", params: params(), body: { csv: "x" } })).status).toBe(401);
  });

  test("bad requests: unknown mode, missing csv", async () => {
    expect((await call(importRoute, { method: "POST", path: "/?mode=later", params: params(), cookie: w.cookies.lead, body: { csv: "a" } })).status).toBe(422);
    const r = await call(importRoute, { method: "POST", path: "/?mode=preview", params: params(), cookie: w.cookies.lead, body: {} });
    expect(r.status).toBe(422);
    expect(r.json.error.fields.csv).toBeDefined();
  });
});
