import { and, asc, count, eq, sql } from "drizzle-orm";
import { beforeAll, describe, expect, test } from "vitest";
import { POST as createSampleRoute } from "@/app/api/projects/[projectId]/samples/route";
import { PATCH as patchSampleRoute } from "@/app/api/projects/[projectId]/samples/[sampleId]/route";
import { POST as sampleEventRoute } from "@/app/api/projects/[projectId]/samples/[sampleId]/custody/route";
import { POST as importRoute } from "@/app/api/projects/[projectId]/samples/import/route";
import { POST as uploadRoute } from "@/app/api/projects/[projectId]/scans/route";
import { POST as bulkRoute } from "@/app/api/projects/[projectId]/scans/bulk/route";
import { POST as createSubmissionRoute } from "@/app/api/projects/[projectId]/submissions/route";
import { POST as sendRoute } from "@/app/api/projects/[projectId]/submissions/[submissionId]/send/route";
import { POST as receiveRoute } from "@/app/api/projects/[projectId]/submissions/[submissionId]/receive/route";
import { POST as batchCustodyRoute } from "@/app/api/projects/[projectId]/submissions/[submissionId]/custody/route";
import { getDb } from "@/db";
import { seedReferenceLibrary } from "@/db/seed/reference-library";
import { custodyEvents, projects, samples, scans, submissions } from "@/db/schema";
import { drainProcessingQueue } from "@/lib/jobs";
import { statusFromEvents } from "@/lib/custody";
import { quartzCalciteXy } from "../fixtures/lab/handbook-scans";
import { call, makeWorld, type World } from "../helpers/app";
import { useFakeSmtp } from "../helpers/mail";

// Issue 11 §2: a sample's status follows its custody and review events and is never written by a client; a scan
// needs a recorded intake (or an in-house lab's explicit "received directly"); whoever dispatched a submission cannot
// confirm its receipt, the lead included.

process.env.LITHODEX_JOBS = "manual";

let w: World;
const P = () => ({ projectId: w.projectId });

beforeAll(async () => {
  await seedReferenceLibrary();
  await useFakeSmtp();
  w = await makeWorld();
  await getDb().update(projects).set({ labEmail: "reception@lab.example.test" }).where(eq(projects.id, w.projectId));
});

const newSample = async (cookie = w.cookies.field_geologist, body: Record<string, unknown> = {}) => {
  const r = await call(createSampleRoute, { method: "POST", params: P(), cookie, body: { sampleType: "chip", ...body } });
  expect(r.status, JSON.stringify(r.json)).toBe(201);
  return r.json as { id: string; code: string; status: string; version: number };
};
const sampleRow = async (id: string) => (await getDb().select().from(samples).where(eq(samples.id, id)))[0];
const eventsOf = async (id: string) => getDb().select().from(custodyEvents).where(eq(custodyEvents.sampleId, id)).orderBy(asc(sql`rowid`));
const scanCount = async () => (await getDb().select({ n: count() }).from(scans).where(eq(scans.projectId, w.projectId)))[0].n;

function scanForm(sampleId: string, name: string, seed: number): FormData {
  const f = new FormData();
  f.set("sampleId", sampleId);
  f.append("file", new Blob([quartzCalciteXy({ seed })], { type: "text/plain" }), name);
  return f;
}
const upload = (sampleId: string, name: string, seed: number) => call(uploadRoute, { method: "POST", params: P(), cookie: w.cookies.lab_analyst, rawBody: scanForm(sampleId, name, seed) });

async function sendSubmission(sampleIds: string[], sender: string) {
  const made = await call(createSubmissionRoute, { method: "POST", params: P(), cookie: sender, body: { sampleIds, requestedAnalysis: ["XRD bulk"] } });
  expect(made.status, JSON.stringify(made.json)).toBe(201);
  const sent = await call(sendRoute, { method: "POST", params: { ...P(), submissionId: made.json.id }, cookie: sender, body: { waybill: "WB-RULES-1" } });
  expect(sent.status, JSON.stringify(sent.json)).toBe(200);
  return made.json.id as string;
}
const receive = (submissionId: string, sampleIds: string[], cookie: string) =>
  call(receiveRoute, { method: "POST", params: { ...P(), submissionId }, cookie, body: { items: sampleIds.map((sampleId) => ({ sampleId, condition: "received" })) } });

describe("status is derived from events, never client-writable", () => {
  test("creating a sample records its collection; a planned sample has no event until it is collected", async () => {
    const s = await newSample();
    expect(s).toMatchObject({ status: "collected", version: 1 });
    const ev = await eventsOf(s.id);
    expect(ev.map((e) => [e.event, e.statusAfter])).toEqual([["collected", "collected"]]);

    const planned = await newSample(w.cookies.field_geologist, { planned: true });
    expect(planned.status).toBe("planned");
    expect(await eventsOf(planned.id)).toEqual([]);
    // The lab cannot record a collection (sample.write); the field geologist can, once.
    expect((await call(sampleEventRoute, { method: "POST", params: { ...P(), sampleId: planned.id }, cookie: w.cookies.lab_analyst, body: { event: "collected" } })).status).toBe(403);
    const took = await call(sampleEventRoute, { method: "POST", params: { ...P(), sampleId: planned.id }, cookie: w.cookies.field_geologist, body: { event: "collected", location: "Trench 3" } });
    expect(took.status, JSON.stringify(took.json)).toBe(201);
    expect(took.json).toMatchObject({ from: "planned", to: "collected" });
    const again = await call(sampleEventRoute, { method: "POST", params: { ...P(), sampleId: planned.id }, cookie: w.cookies.field_geologist, body: { event: "collected" } });
    expect(again.status).toBe(409);
  });

  test("PATCH with a status is 422 naming the field, and nothing changes", async () => {
    const s = await newSample();
    const before = await sampleRow(s.id);
    for (const status of ["confirmed", "reported", "received"]) {
      const r = await call(patchSampleRoute, { method: "PATCH", params: { ...P(), sampleId: s.id }, cookie: w.cookies.lead, body: { version: before.version, status } });
      expect(r.status).toBe(422);
      expect(r.json.error.fields.status[0]).toMatch(/cannot be set directly: it follows the custody and review events/);
    }
    expect(await sampleRow(s.id)).toEqual(before);
    expect(await eventsOf(s.id)).toHaveLength(1);
  });

  test("creating a sample 'reported' (or any status) is 422 and writes nothing", async () => {
    const [{ n: before }] = await getDb().select({ n: count() }).from(samples).where(eq(samples.projectId, w.projectId));
    const r = await call(createSampleRoute, { method: "POST", params: P(), cookie: w.cookies.field_geologist, body: { sampleType: "soil", status: "reported" } });
    expect(r.status).toBe(422);
    expect(Object.keys(r.json.error.fields)).toEqual(["status"]);
    const [{ n: after }] = await getDb().select({ n: count() }).from(samples).where(eq(samples.projectId, w.projectId));
    expect(after).toBe(before);
  });

  test("a CSV import cannot carry a lab status; collected rows get a collection event, planned rows none", async () => {
    const bad = await call(importRoute, { method: "POST", path: "/?mode=commit", params: P(), cookie: w.cookies.field_geologist, body: { csv: "code,sample_type,status\nIMP-0001,soil,confirmed\n" } });
    expect(bad.status).toBe(422);
    expect(bad.json.error.details.errors[0]).toMatchObject({ line: 2, column: "status", field: "status" });
    expect(bad.json.error.details.errors[0].message).toMatch(/Status "confirmed" cannot be imported/);
    const ok = await call(importRoute, { method: "POST", path: "/?mode=commit", params: P(), cookie: w.cookies.field_geologist, body: { csv: "code,sample_type,status\nIMP-0002,soil,collected\nIMP-0003,soil,planned\n" } });
    expect(ok.status, JSON.stringify(ok.json)).toBe(201);
    const rows = await getDb().select().from(samples).where(and(eq(samples.projectId, w.projectId), sql`${samples.code} like 'IMP-%'`)).orderBy(samples.code);
    expect(rows.map((r) => [r.code, r.status])).toEqual([
      ["IMP-0002", "collected"],
      ["IMP-0003", "planned"],
    ]);
    expect((await eventsOf(rows[0].id)).map((e) => e.event)).toEqual(["collected"]);
    expect(await eventsOf(rows[1].id)).toEqual([]);
  });
});

describe("a scan needs a recorded intake", () => {
  test("a scan for a sample the lab never received is 409 with what to do; nothing is stored", async () => {
    const s = await newSample();
    const n = await scanCount();
    const r = await upload(s.id, "early.xy", 1);
    expect(r.status).toBe(409);
    expect(r.json.error.message).toContain(`${s.code} is "Collected": the lab has not recorded its intake`);
    expect(r.json.error.message).toContain("Send it to the lab on a submission");
    expect(await scanCount()).toBe(n);
    expect((await eventsOf(s.id)).map((e) => e.event)).toEqual(["collected"]);
    // The bulk preview lists it as a problem for that file.
    const f = new FormData();
    f.append("files", new Blob([quartzCalciteXy({ seed: 2 })]), `${s.code}.xy`);
    const preview = await call(bulkRoute, { method: "POST", path: "/?mode=preview", params: P(), cookie: w.cookies.lab_analyst, rawBody: f });
    expect(preview.status, JSON.stringify(preview.json)).toBe(200);
    expect(preview.json.problems).toEqual([expect.objectContaining({ fileName: `${s.code}.xy`, field: "sampleId" })]);
  });

  test("dispatched but not received: still refused, naming the submission; after the lab's intake the scan is taken", async () => {
    const s = await newSample();
    const subId = await sendSubmission([s.id], w.cookies.field_geologist);
    const early = await upload(s.id, "in-transit.xy", 3);
    expect(early.status).toBe(409);
    expect(early.json.error.message).toMatch(/Record the intake of submission TP\d+-SUB-\d{4} first/);
    expect((await receive(subId, [s.id], w.cookies.lab_analyst)).status).toBe(200);
    const ok = await upload(s.id, "received.xy", 4);
    expect(ok.status, JSON.stringify(ok.json)).toBe(201);
    await drainProcessingQueue();
    // Custody reads collected → dispatched → received → scanned → processed (candidates ready), never collected → scanned.
    expect((await eventsOf(s.id)).map((e) => e.event)).toEqual(["collected", "dispatched", "received", "scanned", "processed"]);
    expect((await sampleRow(s.id)).status).toBe("processed");
  });

  test("in-house lab: 'received directly' needs the project setting, the lab role and a reason; then the scan is taken", async () => {
    const s = await newSample();
    const ev = (cookie: string, body: unknown) => call(sampleEventRoute, { method: "POST", params: { ...P(), sampleId: s.id }, cookie, body });
    const notInHouse = await ev(w.cookies.lab_analyst, { event: "received_directly", note: "Brought by hand" });
    expect(notInHouse.status).toBe(409);
    expect(notInHouse.json.error.message).toMatch(/not in-house/);
    await getDb().update(projects).set({ labInHouse: true }).where(eq(projects.id, w.projectId));
    const refused = await upload(s.id, "direct-early.xy", 5);
    expect(refused.status).toBe(409);
    expect(refused.json.error.message).toContain('Record "received directly" on the sample');
    expect((await ev(w.cookies.field_geologist, { event: "received_directly", note: "x" })).status).toBe(403);
    expect((await ev(w.cookies.consultant, { event: "received_directly", note: "x" })).status).toBe(403);
    const noWhy = await ev(w.cookies.lab_analyst, { event: "received_directly" });
    expect(noWhy.status).toBe(422);
    expect(noWhy.json.error.fields.note[0]).toMatch(/Say why/);
    const ok = await ev(w.cookies.lab_analyst, { event: "received_directly", note: "Core offcut brought to the in-house lab by the site geologist", location: "XRD prep room" });
    expect(ok.status, JSON.stringify(ok.json)).toBe(201);
    expect(ok.json).toMatchObject({ from: "collected", to: "received" });
    const [direct] = (await eventsOf(s.id)).filter((e) => e.event === "received_directly");
    expect(direct).toMatchObject({ actorId: w.userIds.lab_analyst, note: "Core offcut brought to the in-house lab by the site geologist", statusAfter: "received" });
    expect((await upload(s.id, "direct.xy", 6)).status).toBe(201);
    await getDb().update(projects).set({ labInHouse: false }).where(eq(projects.id, w.projectId));
  });
});

describe("separation of duties", () => {
  test("the lead who dispatched a submission cannot record its receipt; the lab analyst can", async () => {
    const a = await newSample(w.cookies.lead);
    const subId = await sendSubmission([a.id], w.cookies.lead);
    const events = (await eventsOf(a.id)).length;
    const self = await receive(subId, [a.id], w.cookies.lead);
    expect(self.status).toBe(403);
    expect(self.json.error.message).toMatch(/You recorded the dispatch of TP\d+-SUB-\d{4}, so you cannot also confirm its receipt/);
    expect((await getDb().select().from(submissions).where(eq(submissions.id, subId)))[0].status).toBe("sent");
    expect(await eventsOf(a.id)).toHaveLength(events);
    expect((await receive(subId, [a.id], w.cookies.lab_analyst)).status).toBe(200);
  });

  test("a site admin who dispatched is refused too, also for a late receipt of a bag missing at intake", async () => {
    const a = await newSample(w.cookies.admin);
    const b = await newSample(w.cookies.admin);
    const subId = await sendSubmission([a.id, b.id], w.cookies.admin);
    expect((await receive(subId, [a.id, b.id], w.cookies.admin)).status).toBe(403);
    const intake = await call(receiveRoute, {
      method: "POST",
      params: { ...P(), submissionId: subId },
      cookie: w.cookies.lab_analyst,
      body: { items: [{ sampleId: a.id, condition: "received" }, { sampleId: b.id, condition: "missing" }] },
    });
    expect(intake.status).toBe(200);
    const late = (cookie: string) => call(batchCustodyRoute, { method: "POST", params: { ...P(), submissionId: subId }, cookie, body: { event: "received", sampleIds: [b.id], note: "Found in the courier's van" } });
    expect((await late(w.cookies.admin)).status).toBe(403);
    expect((await late(w.cookies.lab_analyst)).status).toBe(201);
  });

  test("the resend limit: after five resends the e-mail is refused for good (429), naming what to do", async () => {
    const a = await newSample();
    const subId = await sendSubmission([a.id], w.cookies.field_geologist);
    await getDb().update(submissions).set({ mailCount: 6, lastMailedAt: new Date(Date.now() - 3600_000) }).where(eq(submissions.id, subId));
    const r = await call(sendRoute, { method: "POST", params: { ...P(), submissionId: subId }, cookie: w.cookies.field_geologist, body: { resendEmail: true } });
    expect(r.status).toBe(429);
    expect(r.json.error.message).toMatch(/already sent again 5 times; contact the lab directly/);
  });
});

test("every sample's status equals the status its latest event left (the status is derived from the events)", async () => {
  const all = await getDb().select({ id: samples.id, code: samples.code, status: samples.status }).from(samples).where(eq(samples.projectId, w.projectId));
  expect(all.length).toBeGreaterThan(10);
  for (const s of all) expect(statusFromEvents(await eventsOf(s.id)), s.code).toBe(s.status);
});
