/**
 * Per-device blocks of reserved sample codes (issue 10) through the real route handlers on a temp SQLite file:
 * reserving advances the project sequence, two devices get disjoint blocks, the server's own generator skips them,
 * a reserved code is accepted only from its device's account, replays are idempotent (IETF HTTPAPI draft "The
 * Idempotency-Key HTTP Header Field", Jena & Dalal) and roles without sample.write are refused (DEVELOPERS.md matrix).
 */
import { and, count, eq } from "drizzle-orm";
import { beforeAll, describe, expect, test } from "vitest";
import { GET as listBlocks, POST as reserveRoute } from "@/app/api/projects/[projectId]/sample-code-blocks/route";
import { PATCH as patchSampleRoute } from "@/app/api/projects/[projectId]/samples/[sampleId]/route";
import { POST as importRoute } from "@/app/api/projects/[projectId]/samples/import/route";
import { POST as createSampleRoute } from "@/app/api/projects/[projectId]/samples/route";
import { getDb } from "@/db";
import { projects, reservedSampleCodes, samples } from "@/db/schema";
import { DEVICE_HEADER } from "@/lib/outbox/code-block-math";
import { call, makeWorld, type World } from "../helpers/app";

let w: World;
beforeAll(async () => {
  w = await makeWorld();
});

const PHONE = "device-phone-0001";
const TABLET = "device-tablet-0002";
const LEAD_PHONE = "device-lead-0003";

const reserve = (cookie: string, body: unknown, headers: Record<string, string> = {}) => call(reserveRoute, { method: "POST", params: { projectId: w.projectId }, cookie, body, headers });
const createSample = (cookie: string, body: Record<string, unknown>, device?: string) =>
  call(createSampleRoute, { method: "POST", params: { projectId: w.projectId }, cookie, body, headers: device ? { [DEVICE_HEADER]: device } : {} });
const seq = async () => (await getDb().select({ s: projects.sampleSeq }).from(projects).where(eq(projects.id, w.projectId)))[0].s;

describe("reserved sample code blocks", () => {
  let phoneCodes: string[] = [];
  let leadCodes: string[] = [];

  test("a field geologist's device reserves a block: consecutive codes of the project pattern, the sequence moves past them", async () => {
    const before = await seq();
    const r = await reserve(w.cookies.field_geologist, { deviceId: PHONE, deviceLabel: "Android phone", size: 5 });
    expect(r.status).toBe(201);
    phoneCodes = r.json.codes;
    // Default pattern {code}-{seq:6} (lib/validation/project.ts): TPn-000001 … with the next five sequence numbers.
    const prefix = (await getDb().select({ c: projects.code }).from(projects).where(eq(projects.id, w.projectId)))[0].c;
    expect(phoneCodes).toEqual([1, 2, 3, 4, 5].map((i) => `${prefix}-${String(before + i).padStart(6, "0")}`));
    expect(r.json).toMatchObject({ firstCode: phoneCodes[0], lastCode: phoneCodes[4], size: 5, used: 0, deviceLabel: "Android phone" });
    expect(await seq()).toBe(before + 5);
  });

  test("another device (the lead's) gets a disjoint block", async () => {
    const r = await reserve(w.cookies.lead, { deviceId: LEAD_PHONE, size: 5 });
    expect(r.status).toBe(201);
    leadCodes = r.json.codes;
    expect(leadCodes).toHaveLength(5);
    expect(leadCodes.filter((c) => phoneCodes.includes(c))).toEqual([]);
    const [{ n }] = await getDb().select({ n: count() }).from(reservedSampleCodes).where(eq(reservedSampleCodes.projectId, w.projectId));
    expect(n).toBe(10);
  });

  test("the server's own generator skips reserved codes (and a code typed earlier as a tag)", async () => {
    const s = await seq();
    // A pre-printed tag that happens to be the next code of the sequence is taken already.
    const prefix = phoneCodes[0].split("-")[0];
    const typedNext = `${prefix}-${String(s + 1).padStart(6, "0")}`;
    expect((await createSample(w.cookies.lead, { sampleType: "soil", code: typedNext })).status).toBe(201);
    const made = await createSample(w.cookies.lead, { sampleType: "soil" });
    expect(made.status).toBe(201);
    expect([...phoneCodes, ...leadCodes, typedNext]).not.toContain(made.json.code);
    expect(made.json.code).toBe(`${prefix}-${String(s + 2).padStart(6, "0")}`);
  });

  test("the device's own account creates a sample with its reserved code; the code is marked used", async () => {
    const r = await createSample(w.cookies.field_geologist, { sampleType: "chip", code: phoneCodes[0] }, PHONE);
    expect(r.status).toBe(201);
    expect(r.json.code).toBe(phoneCodes[0]);
    const [res] = await getDb().select().from(reservedSampleCodes).where(and(eq(reservedSampleCodes.projectId, w.projectId), eq(reservedSampleCodes.code, phoneCodes[0])));
    expect(res.sampleId).toBe(r.json.id);
    const list = await call(listBlocks, { params: { projectId: w.projectId }, path: `/api/projects/${w.projectId}/sample-code-blocks?deviceId=${PHONE}`, cookie: w.cookies.field_geologist });
    expect(list.status).toBe(200);
    expect(list.json.items).toHaveLength(1);
    expect(list.json.items[0]).toMatchObject({ used: 1, size: 5 });
  });

  test("a code reserved by another device is refused with a clear message naming the block, nothing written", async () => {
    const before = (await getDb().select({ n: count() }).from(samples).where(eq(samples.projectId, w.projectId)))[0].n;
    const r = await createSample(w.cookies.field_geologist, { sampleType: "chip", code: leadCodes[0] }, PHONE);
    expect(r.status).toBe(422);
    expect(r.json.error.fields.code[0]).toMatch(new RegExp(`Sample code ${leadCodes[0]} is reserved for lead \\d+'s device, block ${leadCodes[0]}–${leadCodes[4]}; only that device can use it`));
    // The same account on another of its devices is refused too: the labels printed on the phone belong to the phone.
    const t = await createSample(w.cookies.field_geologist, { sampleType: "chip", code: phoneCodes[1] }, TABLET);
    expect(t.status).toBe(422);
    expect(t.json.error.message).toMatch(/reserved for your other device \(Android phone\)/);
    expect((await getDb().select({ n: count() }).from(samples).where(eq(samples.projectId, w.projectId)))[0].n).toBe(before);
    // Editing a sample's code to another device's reserved code is refused the same way.
    const mine = await createSample(w.cookies.field_geologist, { sampleType: "chip" });
    const p = await call(patchSampleRoute, { method: "PATCH", params: { projectId: w.projectId, sampleId: mine.json.id }, cookie: w.cookies.field_geologist, body: { version: 1, code: leadCodes[1] } });
    expect(p.status).toBe(422);
  });

  test("a CSV import with another device's reserved code is refused whole; the importer's own reserved code is marked used", async () => {
    const before = (await getDb().select({ n: count() }).from(samples).where(eq(samples.projectId, w.projectId)))[0].n;
    const csv = (codes: string[]) => ["code,sample_type", ...codes.map((c) => `${c},soil`)].join("\n") + "\n";
    const refused = await call(importRoute, { method: "POST", path: "/?mode=commit", params: { projectId: w.projectId }, cookie: w.cookies.field_geologist, body: { csv: csv(["IMPORT-CB-1", leadCodes[2]]) } });
    expect(refused.status).toBe(422);
    expect(refused.json.error.message).toContain(`1 code in the file is reserved for another member's device: ${leadCodes[2]} (block ${leadCodes[0]}–${leadCodes[4]})`);
    expect((await getDb().select({ n: count() }).from(samples).where(eq(samples.projectId, w.projectId)))[0].n).toBe(before);
    const ok = await call(importRoute, { method: "POST", path: "/?mode=commit", params: { projectId: w.projectId }, cookie: w.cookies.field_geologist, body: { csv: csv(["IMPORT-CB-1", phoneCodes[3]]) } });
    expect(ok.status).toBe(201);
    const [res] = await getDb().select().from(reservedSampleCodes).where(and(eq(reservedSampleCodes.projectId, w.projectId), eq(reservedSampleCodes.code, phoneCodes[3])));
    expect(res.sampleId).toBeTruthy();
  });

  test("a create replayed with the same key returns the first sample; a reservation replayed returns the same block", async () => {
    const id = crypto.randomUUID();
    const body = { id, sampleType: "chip", code: phoneCodes[2] };
    const headers = { [DEVICE_HEADER]: PHONE, "idempotency-key": id };
    const a = await call(createSampleRoute, { method: "POST", params: { projectId: w.projectId }, cookie: w.cookies.field_geologist, body, headers });
    const b = await call(createSampleRoute, { method: "POST", params: { projectId: w.projectId }, cookie: w.cookies.field_geologist, body, headers });
    expect(a.status).toBe(201);
    expect(b.status).toBe(201);
    expect(b.json.id).toBe(a.json.id);
    expect((await getDb().select({ n: count() }).from(samples).where(eq(samples.code, phoneCodes[2])))[0].n).toBe(1);

    const before = await seq();
    const key = crypto.randomUUID();
    const r1 = await reserve(w.cookies.field_geologist, { deviceId: PHONE, size: 5 }, { "idempotency-key": key });
    const r2 = await reserve(w.cookies.field_geologist, { deviceId: PHONE, size: 5 }, { "idempotency-key": key });
    expect(r1.status).toBe(201);
    expect(r2.json.id).toBe(r1.json.id);
    expect(r2.json.codes).toEqual(r1.json.codes);
    expect(await seq()).toBe(before + 5);
  });

  test("roles without sample.write are refused (403), non-members 404, and bad input names the field", async () => {
    for (const role of ["lab_analyst", "consultant"] as const) {
      const r = await reserve(w.cookies[role], { deviceId: "device-x-000001" });
      expect(r.status).toBe(403);
    }
    expect((await reserve(w.cookies.outsider, { deviceId: "device-x-000001" })).status).toBe(404);
    const bad = await reserve(w.cookies.field_geologist, { deviceId: "x", size: 1000 });
    expect(bad.status).toBe(422);
    expect(Object.keys(bad.json.error.fields).sort()).toEqual(["deviceId", "size"]);
    // Past the cap of unused codes per device the next block is refused.
    let last = 0;
    for (let i = 0; i < 3; i++) last = (await reserve(w.cookies.lead, { deviceId: "device-hoard-01", size: 100 })).status;
    expect(last).toBe(422);
  });
});
