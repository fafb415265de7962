import { count, eq } from "drizzle-orm";
import { beforeAll, describe, expect, test } from "vitest";
import { DELETE as deleteRoute } from "@/app/api/projects/[projectId]/stations/[stationId]/structures/[structureId]/route";
import { GET as listRoute, POST as createRoute } from "@/app/api/projects/[projectId]/stations/[stationId]/structures/route";
import { POST as createStationRoute } from "@/app/api/projects/[projectId]/stations/route";
import { getDb } from "@/db";
import { structures } from "@/db/schema";
import { call, makeWorld, type World } from "../helpers/app";

let w: World;
beforeAll(async () => {
  w = await makeWorld();
});

const P = () => ({ projectId: w.projectId, stationId: w.stationId });
const structureCount = async () => (await getDb().select({ n: count() }).from(structures).where(eq(structures.stationId, w.stationId)))[0].n;
const post = (body: unknown, who: keyof World["cookies"] = "field_geologist", params = P()) => call(createRoute, { method: "POST", params, cookie: w.cookies[who], body });

describe("structural measurements at a station", () => {
  test("bedding 030/40 by the right-hand rule is stored as dip direction 120, dip 40 (right-hand rule, common practice)", async () => {
    const r = await post({ convention: "rhr", feature: "bedding", strike: 30, dip: 40, generation: "s0" });
    expect(r.status, JSON.stringify(r.json)).toBe(201);
    expect(r.json).toMatchObject({ kind: "planar", dipDirection: 120, dip: 40, convention: "rhr", generation: "S0", rawAzimuth: 30, declinationApplied: false });
  });

  test("dip 95, strike 400 → 422 naming both fields; nothing written", async () => {
    const before = await structureCount();
    const r = await post({ convention: "rhr", feature: "bedding", strike: 400, dip: 95 });
    expect(r.status).toBe(422);
    expect(r.json.error.fields.strike[0]).toMatch(/Strike must be between 0 and 360/);
    expect(r.json.error.fields.dip[0]).toMatch(/Dip must be between 0 and 90/);
    const line = await post({ convention: "trend_plunge", feature: "lineation", trend: -5, plunge: 91 });
    expect(Object.keys(line.json.error.fields).sort()).toEqual(["plunge", "trend"]);
    const feature = await post({ convention: "rhr", feature: "slickenline", strike: 10, dip: 10 });
    expect(feature.json.error.fields.feature).toBeDefined();
    expect(await structureCount()).toBe(before);
  });

  test("a magnetic reading is turned to true north: true = magnetic + declination, east positive (common practice; NOAA/BGS World Magnetic Model)", async () => {
    const r = await post({ convention: "dip_dipdir", feature: "foliation", dipDirection: 100, dip: 55, azimuthRef: "magnetic", declinationDeg: -1.5 });
    expect(r.status).toBe(201);
    expect(r.json).toMatchObject({ dipDirection: 98.5, rawAzimuth: 100, declinationDeg: -1.5, declinationApplied: true });
    const missing = await post({ convention: "dip_dipdir", feature: "foliation", dipDirection: 100, dip: 55, azimuthRef: "magnetic" });
    expect(missing.status).toBe(422);
    expect(missing.json.error.fields.declinationDeg[0]).toMatch(/declination/);
  });

  test("a lineation by rake 45° on plane 120/40 is stored as trend ≈ 067.5, plunge ≈ 27.0 (verified with an independent vector calculation)", async () => {
    const plane = await post({ convention: "dip_dipdir", feature: "fault", dipDirection: 120, dip: 40 });
    const r = await post({ convention: "rake", feature: "slickenline", rake: 45, planeId: plane.json.id });
    expect(r.status, JSON.stringify(r.json)).toBe(201);
    expect(r.json.trend).toBeCloseTo(67.5, 1);
    expect(r.json.plunge).toBeCloseTo(27.0, 1);
    expect(r.json.planeId).toBe(plane.json.id);
  });

  test("a lineation measured on a plane must lie in it (|line·normal| < sin 10°, common practice)", async () => {
    const plane = await post({ convention: "dip_dipdir", feature: "foliation", dipDirection: 120, dip: 40 });
    const ok = await post({ convention: "trend_plunge", feature: "lineation", trend: 67, plunge: 27, planeId: plane.json.id });
    expect(ok.status).toBe(201);
    const before = await structureCount();
    const off = await post({ convention: "trend_plunge", feature: "lineation", trend: 300, plunge: 30, planeId: plane.json.id });
    expect(off.status).toBe(422);
    expect(off.json.error.fields.trend[0]).toMatch(/300\/30 is .*° off plane 120\/40/);
    expect(await structureCount()).toBe(before);
  });

  test("a plane from another station, or no plane at all, is refused", async () => {
    const other = await call(createStationRoute, { method: "POST", params: { projectId: w.projectId }, cookie: w.cookies.lead, body: { lat: 37.71, lon: -6.61 } });
    const foreign = await post({ convention: "rhr", feature: "bedding", strike: 10, dip: 20 }, "lead", { projectId: w.projectId, stationId: other.json.id });
    const r = await post({ convention: "rake", feature: "lineation", rake: 30, planeId: foreign.json.id });
    expect(r.status).toBe(422);
    expect(r.json.error.fields.planeId[0]).toMatch(/No such plane at this station/);
    const none = await post({ convention: "rake", feature: "lineation", rake: 30 });
    expect(none.json.error.fields.planeId).toBeDefined();
  });

  test("unknown station → 404; lab analyst and consultant → 403 with nothing written", async () => {
    expect((await post({ convention: "rhr", feature: "bedding", strike: 10, dip: 20 }, "lead", { projectId: w.projectId, stationId: "nope" })).status).toBe(404);
    const before = await structureCount();
    expect((await post({ convention: "rhr", feature: "bedding", strike: 10, dip: 20 }, "lab_analyst")).status).toBe(403);
    expect((await post({ convention: "rhr", feature: "bedding", strike: 10, dip: 20 }, "consultant")).status).toBe(403);
    expect((await post({ convention: "rhr", feature: "bedding", strike: 10, dip: 20 }, "outsider")).status).toBe(404);
    expect(await structureCount()).toBe(before);
  });

  test("any member lists; deleting a plane keeps its lineations but unlinks them", async () => {
    const plane = await post({ convention: "dip_dipdir", feature: "vein", dipDirection: 200, dip: 70 });
    const line = await post({ convention: "rake", feature: "lineation", rake: 90, planeId: plane.json.id });
    expect(line.json.trend).toBeCloseTo(200, 6); // rake 90 = dip line (definition of rake)
    expect(line.json.plunge).toBeCloseTo(70, 6);
    const consultantDelete = await call(deleteRoute, { method: "DELETE", params: { ...P(), structureId: plane.json.id }, cookie: w.cookies.consultant });
    expect(consultantDelete.status).toBe(403);
    const del = await call(deleteRoute, { method: "DELETE", params: { ...P(), structureId: plane.json.id }, cookie: w.cookies.lead });
    expect(del.status).toBe(204);
    const list = await call(listRoute, { params: P(), cookie: w.cookies.consultant });
    expect(list.status).toBe(200);
    const kept = list.json.items.find((s: { id: string }) => s.id === line.json.id);
    expect(kept.planeId).toBeNull();
    expect(list.json.items.some((s: { id: string }) => s.id === plane.json.id)).toBe(false);
  });
});
