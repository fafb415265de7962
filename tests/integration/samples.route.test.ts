import { count, eq } from "drizzle-orm";
import { beforeAll, describe, expect, test } from "vitest";
import { GET as listRoute, POST as createRoute } from "@/app/api/projects/[projectId]/samples/route";
import { GET as getRoute, PATCH as patchRoute } from "@/app/api/projects/[projectId]/samples/[sampleId]/route";
import { getDb } from "@/db";
import { auditLog, samples } from "@/db/schema";
import { call, makeWorld, type World } from "../helpers/app";

let w: World;
beforeAll(async () => {
  w = await makeWorld();
});

const sampleCount = async () => (await getDb().select({ n: count() }).from(samples).where(eq(samples.projectId, w.projectId)))[0].n;

describe("samples route handlers against a real SQLite file", () => {
  test("a field geologist creates a sample; the code comes from the project sequence", async () => {
    const r = await call(createRoute, {
      method: "POST",
      params: { projectId: w.projectId },
      cookie: w.cookies.field_geologist,
      body: { sampleType: "hand_sample", lithology: "rhyolite", stationId: w.stationId, lat: 37.71, lon: -6.61, collectedAt: "2026-03-14T10:05:00Z", collectedTz: "Europe/Madrid" },
    });
    expect(r.status).toBe(201);
    expect(r.json.code).toMatch(/^TP\d+-000001$/);
    expect(r.json.version).toBe(1);
    const [entry] = await getDb().select().from(auditLog).where(eq(auditLog.entityId, r.json.id));
    expect(entry.action).toBe("create");
  });

  test("a consultant is refused with 403 and nothing is written", async () => {
    const before = await sampleCount();
    const r = await call(createRoute, { method: "POST", params: { projectId: w.projectId }, cookie: w.cookies.consultant, body: { sampleType: "soil" } });
    expect(r.status).toBe(403);
    expect(r.json.error.code).toBe("forbidden");
    expect(await sampleCount()).toBe(before);
  });

  test("no session → 401; not a member → 404", async () => {
    expect((await call(listRoute, { params: { projectId: w.projectId } })).status).toBe(401);
    expect((await call(listRoute, { params: { projectId: w.projectId }, cookie: w.cookies.outsider })).status).toBe(404);
  });

  test("bad input gets 422 with field messages and writes nothing", async () => {
    const before = await sampleCount();
    const r = await call(createRoute, {
      method: "POST",
      params: { projectId: w.projectId },
      cookie: w.cookies.lead,
      body: { sampleType: "boulder", lat: 91, lon: -6.6, collectedAt: "yesterday" },
    });
    expect(r.status).toBe(422);
    expect(Object.keys(r.json.error.fields).sort()).toEqual(["collectedAt", "lat", "sampleType"]);
    expect(r.json.error.fields.lat[0]).toMatch(/between −90 and 90/);
    expect(await sampleCount()).toBe(before);
  });

  test("malformed JSON is a 400", async () => {
    const r = await call(createRoute, { method: "POST", params: { projectId: w.projectId }, cookie: w.cookies.lead, rawBody: "{not json", headers: { "content-type": "application/json" } });
    expect(r.status).toBe(400);
  });

  test("unknown station and duplicate code are refused", async () => {
    const bad = await call(createRoute, { method: "POST", params: { projectId: w.projectId }, cookie: w.cookies.lead, body: { sampleType: "soil", stationId: "nope" } });
    expect(bad.status).toBe(422);
    expect(bad.json.error.fields.stationId).toBeDefined();
    const first = await call(createRoute, { method: "POST", params: { projectId: w.projectId }, cookie: w.cookies.lead, body: { sampleType: "soil", code: "DUP-0001" } });
    expect(first.status).toBe(201);
    const dup = await call(createRoute, { method: "POST", params: { projectId: w.projectId }, cookie: w.cookies.lead, body: { sampleType: "soil", code: "dup-0001" } });
    expect(dup.status).toBe(409);
    expect(dup.json.error.details.field).toBe("code");
  });

  test("edits need the current version: a stale form gets 409 with the current record", async () => {
    const made = await call(createRoute, { method: "POST", params: { projectId: w.projectId }, cookie: w.cookies.lead, body: { sampleType: "chip" } });
    const params = { projectId: w.projectId, sampleId: made.json.id };
    const ok = await call(patchRoute, { method: "PATCH", params, cookie: w.cookies.field_geologist, body: { version: 1, lithology: "dacite" } });
    expect(ok.status).toBe(200);
    expect(ok.json.version).toBe(2);
    const stale = await call(patchRoute, { method: "PATCH", params, cookie: w.cookies.lead, body: { version: 1, lithology: "andesite" } });
    expect(stale.status).toBe(409);
    expect(stale.json.error.details.current.lithology).toBe("dacite");
    const got = await call(getRoute, { params, cookie: w.cookies.consultant });
    expect(got.json.lithology).toBe("dacite");
  });

  test("the register pages, sorts and filters on the server", async () => {
    for (const lith of ["basalt", "basalt", "shale"]) {
      await call(createRoute, { method: "POST", params: { projectId: w.projectId }, cookie: w.cookies.lead, body: { sampleType: "hand_sample", lithology: lith } });
    }
    const r = await call(listRoute, { params: { projectId: w.projectId }, path: "/x?lithology=basalt&pageSize=1&sort=code&dir=desc", cookie: w.cookies.consultant });
    expect(r.status).toBe(200);
    expect(r.json.total).toBe(2);
    expect(r.json.items).toHaveLength(1);
    const bad = await call(listRoute, { params: { projectId: w.projectId }, path: "/x?pageSize=100000", cookie: w.cookies.consultant });
    expect(bad.status).toBe(422);
    expect(bad.json.error.fields.pageSize).toBeDefined();
  });
});
