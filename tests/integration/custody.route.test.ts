import { count, eq } from "drizzle-orm";
import { beforeAll, describe, expect, test } from "vitest";
import { GET as historyRoute } from "@/app/api/projects/[projectId]/samples/[sampleId]/custody/route";
import { POST as batchRoute } from "@/app/api/projects/[projectId]/submissions/[submissionId]/custody/route";
import { POST as receiveRoute } from "@/app/api/projects/[projectId]/submissions/[submissionId]/receive/route";
import { POST as sampleRoute } from "@/app/api/projects/[projectId]/submissions/[submissionId]/samples/[sampleId]/custody/route";
import { POST as sendRoute } from "@/app/api/projects/[projectId]/submissions/[submissionId]/send/route";
import { POST as createRoute } from "@/app/api/projects/[projectId]/submissions/route";
import { getDb } from "@/db";
import { custodyEvents, projects, samples, submissionSamples, submissions } from "@/db/schema";
import { getActor } from "@/lib/dal/actor";
import { appendCustodyEvent } from "@/lib/dal/custody";
import { call, makeWorld, type World } from "../helpers/app";

// Chain-of-custody rules (common practice: every transfer with date-time, from/to, seal, condition; ISO/IEC 17025:2017
// clause 7.4 on the lab side) and the usual sample lifecycle; mail goes to the embedded outbox here (no SMTP configured), which is the default.

let w: World;
beforeAll(async () => {
  w = await makeWorld();
  await getDb().update(projects).set({ labEmail: "lab@example.test" }).where(eq(projects.id, w.projectId));
});

let n = 0;
async function received(k: number, { missing = [] as number[] } = {}) {
  const db = getDb();
  const list = [];
  for (let i = 0; i < k; i++) {
    const [s] = await db.insert(samples).values({ projectId: w.projectId, code: `CUS-${++n}`, sampleType: "core", status: "collected" }).returning();
    list.push(s.id);
  }
  const sub = await call(createRoute, { method: "POST", params: { projectId: w.projectId }, cookie: w.cookies.lead, body: { sampleIds: list, requestedAnalysis: ["XRD bulk"] } });
  const p = { projectId: w.projectId, submissionId: sub.json.id };
  expect((await call(sendRoute, { method: "POST", params: p, cookie: w.cookies.lead, body: { waybill: "HAND-CARRIED" } })).status).toBe(200);
  const items = list.map((sampleId, i) => ({ sampleId, condition: missing.includes(i) ? "missing" : "received" }));
  const r = await call(receiveRoute, { method: "POST", params: p, cookie: w.cookies.lab_analyst, body: { items, location: "Reception" } });
  expect(r.status, JSON.stringify(r.json)).toBe(200);
  return { p, ids: list };
}

const eventCount = async () => (await getDb().select({ n: count() }).from(custodyEvents))[0].n;
const statusOf = async (id: string) => (await getDb().select({ status: samples.status }).from(samples).where(eq(samples.id, id)))[0].status;

describe("custody steps", () => {
  test("a bag missing at intake gets no received event, blocks lab steps, and can arrive late", async () => {
    const { p, ids } = await received(2, { missing: [1] });
    expect(await statusOf(ids[1])).toBe("dispatched");
    const h = await call(historyRoute, { params: { projectId: w.projectId, sampleId: ids[1] }, cookie: w.cookies.consultant });
    expect(h.json.events.map((e: { event: string }) => e.event)).toEqual(["dispatched"]);
    expect(h.json.intakeFlags[0].condition).toBe("missing");
    const prep = await call(sampleRoute, { method: "POST", params: { ...p, sampleId: ids[1] }, cookie: w.cookies.lab_analyst, body: { event: "prepared" } });
    expect(prep.status).toBe(409);
    expect(prep.json.error.message).toContain("missing at intake");
    const late = await call(sampleRoute, { method: "POST", params: { ...p, sampleId: ids[1] }, cookie: w.cookies.lab_analyst, body: { event: "received", location: "Reception", note: "Arrived in a second parcel" } });
    expect(late.status).toBe(201);
    expect(await statusOf(ids[1])).toBe("received");
    const [line] = await getDb().select().from(submissionSamples).where(eq(submissionSamples.sampleId, ids[1]));
    expect(line.intakeCondition).toBe("received");
    const twice = await call(sampleRoute, { method: "POST", params: { ...p, sampleId: ids[0] }, cookie: w.cookies.lab_analyst, body: { event: "received" } });
    expect(twice.status).toBe(409);
  });

  test("a batch where one sample would move back is refused whole (all or nothing)", async () => {
    const { p, ids } = await received(3);
    expect((await call(sampleRoute, { method: "POST", params: { ...p, sampleId: ids[2] }, cookie: w.cookies.lab_analyst, body: { event: "scanned" } })).status).toBe(201);
    const before = await eventCount();
    const r = await call(batchRoute, { method: "POST", params: p, cookie: w.cookies.lab_analyst, body: { sampleIds: ids, event: "prepared" } });
    expect(r.status).toBe(409);
    expect(r.json.error.fields.sampleIds).toHaveLength(1);
    expect(r.json.error.fields.sampleIds[0]).toMatch(/^CUS-\d+: The sample is already "scanned"/);
    expect(await eventCount()).toBe(before);
    expect(await statusOf(ids[0])).toBe("received");
  });

  test("a sample not on the submission is 422 (batch) or 404 (single)", async () => {
    const { p, ids } = await received(1);
    const other = await received(1);
    const before = await eventCount();
    const r = await call(batchRoute, { method: "POST", params: p, cookie: w.cookies.lab_analyst, body: { sampleIds: [ids[0], other.ids[0]], event: "prepared" } });
    expect(r.status).toBe(422);
    expect(r.json.error.fields.sampleIds[0]).toContain(`No sample ${other.ids[0]}`);
    const one = await call(sampleRoute, { method: "POST", params: { ...p, sampleId: other.ids[0] }, cookie: w.cookies.lab_analyst, body: { event: "prepared" } });
    expect(one.status).toBe(404);
    expect(await eventCount()).toBe(before);
  });

  test("a field geologist may record a hand-over but no lab step; a discard needs a note", async () => {
    const { p, ids } = await received(1);
    const hand = await call(sampleRoute, { method: "POST", params: { ...p, sampleId: ids[0] }, cookie: w.cookies.field_geologist, body: { event: "transferred", handedTo: "Core shed, bay 3", sealNumber: "T-99" } });
    expect(hand.status).toBe(201);
    expect(hand.json.results[0].change).toBe("same");
    const lab = await call(sampleRoute, { method: "POST", params: { ...p, sampleId: ids[0] }, cookie: w.cookies.field_geologist, body: { event: "stored" } });
    expect(lab.status).toBe(403);
    const noNote = await call(sampleRoute, { method: "POST", params: { ...p, sampleId: ids[0] }, cookie: w.cookies.lab_analyst, body: { event: "discarded" } });
    expect(noNote.status).toBe(422);
    expect(noNote.json.error.fields.note[0]).toContain("disposed");
    const stored = await call(sampleRoute, { method: "POST", params: { ...p, sampleId: ids[0] }, cookie: w.cookies.lab_analyst, body: { event: "stored", location: "Pulp store, rack 4, box 12" } });
    expect(stored.status).toBe(201);
    const [s] = await getDb().select().from(samples).where(eq(samples.id, ids[0]));
    expect(s).toMatchObject({ status: "stored", storageLocation: "Pulp store, rack 4, box 12" });
    expect(s.version).toBeGreaterThan(1);
  });

  test("unknown event or bad fields are 422 with field names", async () => {
    const { p, ids } = await received(1);
    const r = await call(sampleRoute, { method: "POST", params: { ...p, sampleId: ids[0] }, cookie: w.cookies.lab_analyst, body: { event: "teleported", weightKg: -1, occurredAt: "last Tuesday", extra: 1 } });
    expect(r.status).toBe(422);
    expect(Object.keys(r.json.error.fields).sort()).toEqual(["_", "event", "occurredAt", "weightKg"]);
  });
});

describe("custody written by other modules", () => {
  test("a lab step without a submission (e.g. a scan upload) is filed under the sample's submission at the lab", async () => {
    const { p, ids } = await received(1);
    const actor = (await getActor(new Headers({ cookie: w.cookies.lab_analyst })))!;
    const [s] = await getDb().select().from(samples).where(eq(samples.id, ids[0]));
    await getDb().transaction((tx) => appendCustodyEvent(tx, actor, s, { projectId: w.projectId, submissionId: null, event: "scanned", occurredAt: new Date().toISOString(), note: "scan upload" }));
    const [ev] = await getDb().select().from(custodyEvents).where(eq(custodyEvents.note, "scan upload"));
    expect(ev.submissionId).toBe(p.submissionId);
    const [sub] = await getDb().select().from(submissions).where(eq(submissions.id, p.submissionId));
    expect(sub.status).toBe("in_progress");
  });
});
