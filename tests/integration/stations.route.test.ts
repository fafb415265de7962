import { and, count, eq } from "drizzle-orm";
import { beforeAll, describe, expect, test } from "vitest";
import { GET as getRoute, PATCH as patchRoute } from "@/app/api/projects/[projectId]/stations/[stationId]/route";
import { GET as listRoute, POST as createRoute } from "@/app/api/projects/[projectId]/stations/route";
import { POST as createSampleRoute } from "@/app/api/projects/[projectId]/samples/route";
import { getDb } from "@/db";
import { auditLog, stations } from "@/db/schema";
import { toUtm } from "@/lib/geo";
import { call, makeWorld, type World } from "../helpers/app";

let w: World;
beforeAll(async () => {
  w = await makeWorld();
});

const stationCount = async () => (await getDb().select({ n: count() }).from(stations).where(eq(stations.projectId, w.projectId)))[0].n;
const P = () => ({ projectId: w.projectId });

describe("stations route handlers against a real SQLite file", () => {
  test("a field geologist creates a station; the code comes from the station sequence, skipping a code already taken", async () => {
    // makeWorld inserted TPn-ST-001 by hand without touching the sequence, so the first issued code is ST-002.
    const r = await call(createRoute, {
      method: "POST",
      params: P(),
      cookie: w.cookies.field_geologist,
      body: { name: "Gossan knoll", lat: 37.741194, lon: -6.621306, elevationM: 312, elevationRef: "msl", horizontalAccuracyM: 4, locationSource: "device_gnss", locationFixedAt: "2026-03-14T09:05:22Z" },
    });
    expect(r.status, JSON.stringify(r.json)).toBe(201);
    expect(r.json.code).toMatch(/^TP\d+-ST-002$/);
    expect(r.json.version).toBe(1);
    expect(r.json.locationFixedAt).toBe("2026-03-14T09:05:22Z");
    const [entry] = await getDb().select().from(auditLog).where(eq(auditLog.entityId, r.json.id));
    expect(entry.action).toBe("create");
  });

  test("lab analysts and consultants cannot create stations (403) and nothing is written", async () => {
    const before = await stationCount();
    for (const who of ["lab_analyst", "consultant"] as const) {
      const r = await call(createRoute, { method: "POST", params: P(), cookie: w.cookies[who], body: { lat: 37.7, lon: -6.6 } });
      expect(r.status, who).toBe(403);
    }
    // even garbage gets 403, not 422: authorization comes first
    expect((await call(createRoute, { method: "POST", params: P(), cookie: w.cookies.consultant, body: { lat: 91 } })).status).toBe(403);
    expect(await stationCount()).toBe(before);
  });

  test("no session → 401; not a member → 404", async () => {
    expect((await call(listRoute, { params: P() })).status).toBe(401);
    expect((await call(listRoute, { params: P(), cookie: w.cookies.outsider })).status).toBe(404);
    expect((await call(getRoute, { params: { ...P(), stationId: w.stationId }, cookie: w.cookies.outsider })).status).toBe(404);
  });

  test("latitude 91, longitude 200, bad fix time → 422 with field messages and nothing written", async () => {
    const before = await stationCount();
    const r = await call(createRoute, { method: "POST", params: P(), cookie: w.cookies.lead, body: { lat: 91, lon: 200, locationFixedAt: "this morning", elevationRef: "geoid" } });
    expect(r.status).toBe(422);
    expect(Object.keys(r.json.error.fields).sort()).toEqual(["elevationRef", "lat", "locationFixedAt", "lon"]);
    expect(r.json.error.fields.lat[0]).toMatch(/between −90 and 90/);
    expect(await stationCount()).toBe(before);
  });

  test("a duplicate code is a 409 naming the field", async () => {
    const first = await call(createRoute, { method: "POST", params: P(), cookie: w.cookies.lead, body: { code: "DUP-ST-1", lat: 37.7, lon: -6.6 } });
    expect(first.status).toBe(201);
    const before = await stationCount();
    const dup = await call(createRoute, { method: "POST", params: P(), cookie: w.cookies.lead, body: { code: "dup-st-1", lat: 37.8, lon: -6.6 } });
    expect(dup.status).toBe(409);
    expect(dup.json.error.details.field).toBe("code");
    expect(await stationCount()).toBe(before);
  });

  test("list and detail: counts, structures and the station's samples", async () => {
    const s = await call(createSampleRoute, { method: "POST", params: P(), cookie: w.cookies.lead, body: { sampleType: "hand_sample", stationId: w.stationId } });
    expect(s.status).toBe(201);
    const list = await call(listRoute, { params: P(), cookie: w.cookies.consultant });
    expect(list.status).toBe(200);
    const row = list.json.items.find((i: { id: string }) => i.id === w.stationId);
    expect(row.sampleCount).toBe(1);
    const one = await call(getRoute, { params: { ...P(), stationId: w.stationId }, cookie: w.cookies.lab_analyst });
    expect(one.status).toBe(200);
    expect(one.json.samples.map((x: { id: string }) => x.id)).toEqual([s.json.id]);
    expect(one.json.structures).toEqual([]);
    const missing = await call(getRoute, { params: { ...P(), stationId: "nope" }, cookie: w.cookies.lead });
    expect(missing.status).toBe(404);
  });

  test("moving a station needs the current version; a stale edit gets 409 with the current record and changes nothing", async () => {
    const made = await call(createRoute, { method: "POST", params: P(), cookie: w.cookies.lead, body: { lat: 37.7, lon: -6.6, name: "Road cut" } });
    const params = { ...P(), stationId: made.json.id };
    const moved = await call(patchRoute, { method: "PATCH", params, cookie: w.cookies.field_geologist, body: { version: 1, lat: 37.7005, lon: -6.6012 } });
    expect(moved.status).toBe(200);
    expect(moved.json.version).toBe(2);
    const audits = await getDb().select().from(auditLog).where(and(eq(auditLog.entityId, made.json.id), eq(auditLog.action, "move")));
    expect(audits).toHaveLength(1);
    const stale = await call(patchRoute, { method: "PATCH", params, cookie: w.cookies.lead, body: { version: 1, name: "Road cut (km 4)" } });
    expect(stale.status).toBe(409);
    expect(stale.json.error.details.current.lat).toBe(37.7005);
    expect(stale.json.error.details.current.version).toBe(2);
    const got = await call(getRoute, { params, cookie: w.cookies.consultant });
    expect(got.json.name).toBe("Road cut");
    expect(got.json.lat).toBe(37.7005);
  });

  test("a lab analyst cannot move a station (403) and it stays put", async () => {
    const params = { ...P(), stationId: w.stationId };
    const r = await call(patchRoute, { method: "PATCH", params, cookie: w.cookies.lab_analyst, body: { version: 1, lat: 10, lon: 10 } });
    expect(r.status).toBe(403);
    const got = await call(getRoute, { params, cookie: w.cookies.lead });
    expect([got.json.lat, got.json.lon]).toEqual([37.7, -6.6]);
  });

  test("a stored station converts to UTM zone 29 north (zone formula: Snyder 1987, USGS PP 1395)", async () => {
    const got = await call(getRoute, { params: { ...P(), stationId: w.stationId }, cookie: w.cookies.lead });
    expect(toUtm(got.json.lat, got.json.lon)).toMatchObject({ zone: 29, hemisphere: "N" });
  });
});
