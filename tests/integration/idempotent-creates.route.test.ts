/**
 * Replay-safe creates for the offline outbox. Semantics checked against the IETF HTTPAPI draft "The
 * Idempotency-Key HTTP Header Field" (Jena & Dalal, draft-ietf-httpapi-idempotency-key-header): a repeated
 * request with the same key returns the first result without a second side effect; the same key with a
 * different payload is refused with 422. Client ids are UUIDv7 (RFC 9562 §5.7) made by the `uuidv7` package.
 */
import { and, count, eq } from "drizzle-orm";
import { uuidv7 } from "uuidv7";
import { beforeAll, describe, expect, test } from "vitest";
import { POST as createSampleRoute } from "@/app/api/projects/[projectId]/samples/route";
import { PATCH as patchSampleRoute } from "@/app/api/projects/[projectId]/samples/[sampleId]/route";
import { POST as createStationRoute } from "@/app/api/projects/[projectId]/stations/route";
import { POST as createStructureRoute } from "@/app/api/projects/[projectId]/stations/[stationId]/structures/route";
import { getDb } from "@/db";
import { auditLog, custodyEvents, projects, samples, stations, structures } from "@/db/schema";
import { call, makeWorld, type World } from "../helpers/app";

let w: World;
beforeAll(async () => {
  w = await makeWorld();
});

const P = () => ({ projectId: w.projectId });
const rows = async (table: typeof stations | typeof samples | typeof structures, id: string) =>
  (await getDb().select({ n: count() }).from(table).where(eq(table.id, id)))[0].n;
const audits = async (id: string) => (await getDb().select({ n: count() }).from(auditLog).where(and(eq(auditLog.entityId, id), eq(auditLog.action, "create"))))[0].n;
const seqs = async () => (await getDb().select({ s: projects.sampleSeq, t: projects.stationSeq }).from(projects).where(eq(projects.id, w.projectId)))[0];

describe("idempotent creates (client id and Idempotency-Key) against a real SQLite file", () => {
  test("RFC 9562 §5.7: ids from the uuidv7 package carry version 7 and the 10xx variant, and the API keeps them", async () => {
    const id = uuidv7();
    // RFC 9562 §5.7: the 13th hex digit is the version (7); §4.1: the variant bits are 10 (hex 8, 9, a or b).
    expect(id).toMatch(/^[0-9a-f]{8}-[0-9a-f]{4}-7[0-9a-f]{3}-[89ab][0-9a-f]{3}-[0-9a-f]{12}$/);
    const r = await call(createStationRoute, { method: "POST", params: P(), cookie: w.cookies.field_geologist, body: { id, name: "Client-id knoll", lat: 37.74, lon: -6.62 } });
    expect(r.status, JSON.stringify(r.json)).toBe(201);
    expect(r.json.id).toBe(id);
  });

  test("a station sent twice with the same client id is created once: same body, one row, one audit entry, one code issued", async () => {
    const id = uuidv7();
    const body = { id, name: "Replay ridge", lat: 37.75, lon: -6.63, horizontalAccuracyM: 6, locationSource: "device_gnss" };
    const before = await seqs();
    const first = await call(createStationRoute, { method: "POST", params: P(), cookie: w.cookies.field_geologist, body });
    const again = await call(createStationRoute, { method: "POST", params: P(), cookie: w.cookies.field_geologist, body: { ...body } });
    expect(first.status, JSON.stringify(first.json)).toBe(201);
    expect(again.status).toBe(201);
    expect(again.json).toEqual(first.json);
    expect(await rows(stations, id)).toBe(1);
    expect(await audits(id)).toBe(1);
    expect((await seqs()).t - before.t).toBe(1);
  });

  test("a sample replayed with its Idempotency-Key after a later edit gets the first response (version 1), not the edited record", async () => {
    const id = uuidv7();
    const key = `outbox-${uuidv7()}`;
    const body = { id, sampleType: "hand_sample", lithology: "gossan", lat: 37.75, lon: -6.63 };
    const headers = { "idempotency-key": key };
    const first = await call(createSampleRoute, { method: "POST", params: P(), cookie: w.cookies.field_geologist, body, headers });
    expect(first.status, JSON.stringify(first.json)).toBe(201);
    const edit = await call(patchSampleRoute, { method: "PATCH", params: { ...P(), sampleId: id }, cookie: w.cookies.lead, body: { version: 1, lithology: "gossanous breccia" } });
    expect(edit.status, JSON.stringify(edit.json)).toBe(200);
    const replay = await call(createSampleRoute, { method: "POST", params: P(), cookie: w.cookies.field_geologist, body, headers });
    expect(replay.status).toBe(201);
    expect(replay.json).toEqual(first.json);
    expect(replay.json.version).toBe(1);
    expect(await rows(samples, id)).toBe(1);
    // One collection event: the custody trail is not doubled by the replay.
    expect((await getDb().select({ n: count() }).from(custodyEvents).where(eq(custodyEvents.sampleId, id)))[0].n).toBe(1);
  });

  test("the same key with a different request is refused (422) and nothing is written", async () => {
    const key = `outbox-${uuidv7()}`;
    const headers = { "idempotency-key": key };
    const first = await call(createSampleRoute, { method: "POST", params: P(), cookie: w.cookies.field_geologist, body: { sampleType: "soil", lithology: "red loam" }, headers });
    expect(first.status).toBe(201);
    const before = await seqs();
    const other = await call(createSampleRoute, { method: "POST", params: P(), cookie: w.cookies.field_geologist, body: { sampleType: "soil", lithology: "grey clay" }, headers });
    expect(other.status).toBe(422);
    expect(other.json.error.fields.idempotencyKey[0]).toMatch(/different request/);
    expect((await seqs()).s).toBe(before.s);
  });

  test("three replays racing each other create one sample and all get the same answer", async () => {
    const id = uuidv7();
    const body = { id, sampleType: "hand_sample", lithology: "quartz vein" };
    const answers = await Promise.all([0, 1, 2].map(() => call(createSampleRoute, { method: "POST", params: P(), cookie: w.cookies.field_geologist, body })));
    for (const a of answers) expect(a.status, JSON.stringify(a.json)).toBe(201);
    expect(answers[1].json).toEqual(answers[0].json);
    expect(answers[2].json).toEqual(answers[0].json);
    expect(await rows(samples, id)).toBe(1);
  });

  test("a structural measurement replayed with its client id is stored once", async () => {
    const id = uuidv7();
    const body = { id, convention: "dip_dipdir", feature: "bedding", dipDirection: 135, dip: 40 };
    const params = { ...P(), stationId: w.stationId };
    const a = await call(createStructureRoute, { method: "POST", params, cookie: w.cookies.field_geologist, body });
    const b = await call(createStructureRoute, { method: "POST", params, cookie: w.cookies.field_geologist, body });
    expect(a.status, JSON.stringify(a.json)).toBe(201);
    expect(b.json).toEqual(a.json);
    expect(await rows(structures, id)).toBe(1);
  });

  test("the role check comes first: a consultant replaying a client id gets 403; another person's id is a 409, not their record", async () => {
    const id = uuidv7();
    const c = await call(createStationRoute, { method: "POST", params: P(), cookie: w.cookies.consultant, body: { id, lat: 37.7, lon: -6.6 } });
    expect(c.status).toBe(403);
    expect(await rows(stations, id)).toBe(0);
    const mine = await call(createStationRoute, { method: "POST", params: P(), cookie: w.cookies.field_geologist, body: { id, lat: 37.7, lon: -6.6 } });
    expect(mine.status).toBe(201);
    const theirs = await call(createStationRoute, { method: "POST", params: P(), cookie: w.cookies.lead, body: { id, lat: 37.7, lon: -6.6 } });
    expect(theirs.status).toBe(409);
    expect(theirs.json.error.message).toMatch(/already exists/);
  });

  test("a malformed client id or key is a 422 naming the field", async () => {
    const bad = await call(createSampleRoute, { method: "POST", params: P(), cookie: w.cookies.field_geologist, body: { id: "sample-1", sampleType: "soil" } });
    expect(bad.status).toBe(422);
    expect(bad.json.error.fields.id[0]).toMatch(/UUID/);
    const badKey = await call(createSampleRoute, { method: "POST", params: P(), cookie: w.cookies.field_geologist, body: { sampleType: "soil" }, headers: { "idempotency-key": "a b" } });
    expect(badKey.status).toBe(422);
    expect(badKey.json.error.fields.idempotencyKey[0]).toMatch(/printable/);
  });
});
