import { and, count, eq } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, test } from "vitest";
import { GET as historyRoute } from "@/app/api/projects/[projectId]/samples/[sampleId]/custody/route";
import { GET as detailRoute } from "@/app/api/projects/[projectId]/submissions/[submissionId]/route";
import { POST as batchCustodyRoute } from "@/app/api/projects/[projectId]/submissions/[submissionId]/custody/route";
import { POST as receiveRoute } from "@/app/api/projects/[projectId]/submissions/[submissionId]/receive/route";
import { POST as sampleCustodyRoute } from "@/app/api/projects/[projectId]/submissions/[submissionId]/samples/[sampleId]/custody/route";
import { POST as reopenRoute } from "@/app/api/projects/[projectId]/scans/[scanId]/reopen/route";
import { POST as sendRoute } from "@/app/api/projects/[projectId]/submissions/[submissionId]/send/route";
import { GET as listRoute, POST as createRoute } from "@/app/api/projects/[projectId]/submissions/route";
import { getDb } from "@/db";
import { auditLog, custodyEvents, projects, samples, scans, submissions, user } from "@/db/schema";
import { notifySignOff } from "@/lib/dal/notifications";
import type { OutboxMessage } from "@/lib/mail/outbox";
import { call, makeWorld, type World } from "../helpers/app";
import { linkContaining, useFakeSmtp } from "../helpers/mail";

// The workflow under test is the field → lab hand-off and chain of custody (common practice; ISO/IEC 17025:2017
// clause 7.4) and the usual sample lifecycle (planned → collected → dispatched → received → prepared → scanned → … → reported).

const LAB = "reception@lab.example.test";
let w: World;
let mail: Awaited<ReturnType<typeof useFakeSmtp>>;
let ids: string[] = [];
let flaggedCode = "";
let foreignSampleId = "";

async function makeSample(projectId: string, code: string, extra: Partial<typeof samples.$inferInsert> = {}) {
  const [s] = await getDb()
    .insert(samples)
    .values({ projectId, code, sampleType: "chip", status: "collected", weightKg: 1.2, ...extra })
    .returning();
  return s;
}

const counts = async () => {
  const db = getDb();
  const [[sub], [ev]] = await Promise.all([
    db.select({ n: count() }).from(submissions).where(eq(submissions.projectId, w.projectId)),
    db.select({ n: count() }).from(custodyEvents),
  ]);
  return { submissions: sub.n, events: ev.n };
};

const emailOf = async (userId: string) => (await getDb().select({ email: user.email }).from(user).where(eq(user.id, userId)))[0].email;

const statusOf = async (id: string) => (await getDb().select({ status: samples.status }).from(samples).where(eq(samples.id, id)))[0].status;

beforeAll(async () => {
  mail = await useFakeSmtp();
  w = await makeWorld();
  await getDb().update(projects).set({ labEmail: LAB }).where(eq(projects.id, w.projectId));
  const a = await makeSample(w.projectId, "SUBT-0001");
  const b = await makeSample(w.projectId, "SUBT-0002", { suspectedAsbestos: true, sampleType: "hand_sample" });
  const c = await makeSample(w.projectId, "SUBT-0003", { sampleType: "soil", weightKg: 0.8 });
  ids = [a.id, b.id, c.id];
  flaggedCode = b.code;
  foreignSampleId = (await makeSample(w.otherProjectId, "OTHER-0001")).id;
});

afterAll(async () => {
  await mail.restore();
});

const T = (min: number) => new Date(Date.UTC(2026, 2, 20, 8, min)).toISOString();

describe("submission → sent → received → prepared → scanned", () => {
  let subId = "";
  let subCode = "";

  test("a field geologist creates a draft; flagged samples are added to the hazards; the lab e-mail defaults to the project's", async () => {
    const r = await call(createRoute, {
      method: "POST",
      params: { projectId: w.projectId },
      cookie: w.cookies.field_geologist,
      body: { sampleIds: ids, requestedAnalysis: ["XRD bulk", "XRD clay fraction"], priority: "high", hazards: "Sulfide-rich: may self-heat.", qaqcNote: "1 blank (clean quartz sand) inserted" },
    });
    expect(r.status, JSON.stringify(r.json)).toBe(201);
    subId = r.json.id;
    subCode = r.json.code;
    expect(subCode).toMatch(/^TP\d+-SUB-0001$/);
    expect(r.json.status).toBe("draft");
    expect(r.json.labEmail).toBe(LAB);
    expect(r.json.requestedAnalysis).toBe("XRD bulk; XRD clay fraction");
    expect(r.json.hazards).toContain("Sulfide-rich");
    expect(r.json.hazards).toContain(`Suspected asbestos (flagged at collection): ${flaggedCode}`);
    const list = await call(listRoute, { params: { projectId: w.projectId }, cookie: w.cookies.consultant });
    expect(list.status).toBe(200);
    expect(list.json.items.find((s: { id: string }) => s.id === subId)).toMatchObject({ sampleCount: 3, hazardCount: 1, status: "draft" });
  });

  test("a sample already on an open submission cannot go on a second one", async () => {
    const before = await counts();
    const r = await call(createRoute, { method: "POST", params: { projectId: w.projectId }, cookie: w.cookies.lead, body: { sampleIds: [ids[0]], requestedAnalysis: ["XRD bulk"] } });
    expect(r.status).toBe(422);
    expect(r.json.error.fields.sampleIds[0]).toContain(`already on submission ${subCode}`);
    expect(await counts()).toEqual(before);
  });

  test("sending e-mails the lab (through the real fake SMTP server) and records a dispatched event per sample with the waybill", async () => {
    const seen = mail.messages.length;
    const r = await call(sendRoute, {
      method: "POST",
      params: { projectId: w.projectId, submissionId: subId },
      cookie: w.cookies.field_geologist,
      body: { waybill: "WB-7734-2026", courier: "Invented Couriers S.L.", occurredAt: T(0), sealNumber: "SEAL-0042", location: "Camp store" },
    });
    expect(r.status, JSON.stringify(r.json)).toBe(200);
    expect(r.json.mail).toMatchObject({ sent: true, to: [LAB] });
    expect(r.json.submission.status).toBe("sent");
    const msgs: OutboxMessage[] = mail.messages.slice(seen);
    expect(msgs).toHaveLength(1);
    const m = msgs[0];
    expect(m.via).toBe("smtp");
    // SMTP envelope (RFC 5321 RCPT TO): the lab, plus a copy to the sender.
    const sender = await emailOf(w.userIds.field_geologist);
    expect(m.envelope.to.sort()).toEqual([LAB, sender].sort());
    expect(m.to).toEqual([LAB]);
    expect(m.cc).toEqual([sender]);
    expect(m.subject).toContain(subCode);
    expect(m.subject).toContain("3 samples");
    const link = linkContaining(m.text, "/submissions/");
    expect(link).toBe(`http://localhost:3000/projects/${w.projectId}/submissions/${subId}/manifest`);
    expect(m.html).toContain(`href="${link}"`);
    expect(m.text).toContain("WB-7734-2026");
    expect(m.text).toContain(`${flaggedCode}  Hand sample  1.2 kg  SUSPECTED ASBESTOS`);
    const events = await getDb().select().from(custodyEvents).where(and(eq(custodyEvents.submissionId, subId), eq(custodyEvents.event, "dispatched")));
    expect(events).toHaveLength(3);
    expect(events.every((e) => e.waybill === "WB-7734-2026" && e.handedTo === "Invented Couriers S.L." && e.sealNumber === "SEAL-0042" && e.occurredAt === T(0))).toBe(true);
    for (const id of ids) expect(await statusOf(id)).toBe("dispatched");
    const [moved] = await getDb().select().from(samples).where(eq(samples.id, ids[0]));
    expect(moved.storageLocation).toBe("In transit (waybill WB-7734-2026)");
  });

  test("sending twice is a 409 and writes nothing; resendEmail only re-sends the message", async () => {
    const before = await counts();
    const again = await call(sendRoute, { method: "POST", params: { projectId: w.projectId, submissionId: subId }, cookie: w.cookies.lead, body: { waybill: "WB-2" } });
    expect(again.status).toBe(409);
    expect(await counts()).toEqual(before);
    const seen = mail.messages.length;
    // Resending is throttled (issue 11 §2): right after the dispatch it is 429 with Retry-After, and nothing is sent.
    const tooSoon = await call(sendRoute, { method: "POST", params: { projectId: w.projectId, submissionId: subId }, cookie: w.cookies.lead, body: { resendEmail: true } });
    expect(tooSoon.status).toBe(429);
    expect(Number(tooSoon.headers.get("retry-after"))).toBeGreaterThan(500);
    expect(tooSoon.json.error.message).toMatch(/send it again in \d+ min/);
    expect(mail.messages.length).toBe(seen);
    // Eleven minutes later (the clock is moved by rewriting the last mailing time) one resend goes out.
    await getDb().update(submissions).set({ lastMailedAt: new Date(Date.now() - 11 * 60_000) }).where(eq(submissions.id, subId));
    const resend = await call(sendRoute, { method: "POST", params: { projectId: w.projectId, submissionId: subId }, cookie: w.cookies.lead, body: { resendEmail: true } });
    expect(resend.status).toBe(200);
    expect(mail.messages.length).toBe(seen + 1);
    expect(await counts()).toEqual(before);
    // A second click at once is throttled again.
    expect((await call(sendRoute, { method: "POST", params: { projectId: w.projectId, submissionId: subId }, cookie: w.cookies.lead, body: { resendEmail: true } })).status).toBe(429);
    expect(mail.messages.length).toBe(seen + 1);
  });

  test("a field geologist cannot record the lab's intake (the sender does not confirm its own receipt)", async () => {
    const r = await call(receiveRoute, {
      method: "POST",
      params: { projectId: w.projectId, submissionId: subId },
      cookie: w.cookies.field_geologist,
      body: { items: ids.map((sampleId) => ({ sampleId, condition: "received" })) },
    });
    expect(r.status).toBe(403);
  });

  test("an intake that leaves out a bag on the manifest is 422 and writes nothing", async () => {
    const before = await counts();
    const r = await call(receiveRoute, {
      method: "POST",
      params: { projectId: w.projectId, submissionId: subId },
      cookie: w.cookies.lab_analyst,
      body: { items: [{ sampleId: ids[0], condition: "received" }, { sampleId: ids[1], condition: "damaged" }] },
    });
    expect(r.status).toBe(422);
    expect(r.json.error.fields["items.1.note"]).toEqual(["Describe the damage."]);
    const r2 = await call(receiveRoute, {
      method: "POST",
      params: { projectId: w.projectId, submissionId: subId },
      cookie: w.cookies.lab_analyst,
      body: { items: [{ sampleId: ids[0], condition: "received" }, { sampleId: foreignSampleId, condition: "received" }] },
    });
    expect(r2.status).toBe(422);
    expect(r2.json.error.fields["items.1.sampleId"][0]).toContain("No sample with id");
    expect(r2.json.error.fields.items.join(" ")).toMatch(/SUBT-0002 is on the manifest but has no intake condition/);
    expect(await counts()).toEqual(before);
  });

  test("the lab analyst records intake with per-bag condition and location; the sender and leads get a receipt", async () => {
    const seen = mail.messages.length;
    const r = await call(receiveRoute, {
      method: "POST",
      params: { projectId: w.projectId, submissionId: subId },
      cookie: w.cookies.lab_analyst,
      body: {
        receivedAt: T(60),
        labReference: "LAB-26-0117",
        location: "Lab reception, shelf R2",
        sealNumber: "SEAL-0042",
        items: [
          { sampleId: ids[0], condition: "received", weightKg: 1.18 },
          { sampleId: ids[1], condition: "damaged", note: "Bag split at the seam; contents double-bagged.", location: "Hazard cabinet H1" },
          { sampleId: ids[2], condition: "received" },
        ],
      },
    });
    expect(r.status, JSON.stringify(r.json)).toBe(200);
    expect(r.json.submission).toMatchObject({ status: "received", labReference: "LAB-26-0117" });
    expect(r.json.mail.sent).toBe(true);
    const receipt = mail.messages.slice(seen).find((m) => m.subject.includes("received by the lab"))!;
    expect(receipt.subject).toBe(`Submission ${subCode} received by the lab — 1 discrepancy`);
    expect(receipt.to.sort()).toEqual([await emailOf(w.userIds.field_geologist), await emailOf(w.userIds.lead)].sort());
    expect(receipt.text).toContain("SUBT-0002: damaged — Bag split at the seam");
    const [s0] = await getDb().select().from(samples).where(eq(samples.id, ids[0]));
    expect(s0).toMatchObject({ status: "received", storageLocation: "Lab reception, shelf R2", weightKg: 1.18 });
    const [s1] = await getDb().select().from(samples).where(eq(samples.id, ids[1]));
    expect(s1.storageLocation).toBe("Hazard cabinet H1");
  });

  test("a duplicate intake is 409 and writes nothing", async () => {
    const before = await counts();
    const r = await call(receiveRoute, {
      method: "POST",
      params: { projectId: w.projectId, submissionId: subId },
      cookie: w.cookies.lab_analyst,
      body: { items: ids.map((sampleId) => ({ sampleId, condition: "received" })) },
    });
    expect(r.status).toBe(409);
    expect(r.json.error.message).toContain("already received");
    expect(await counts()).toEqual(before);
  });

  test("preparation for the batch, then a scan of one sample; the submission is in progress", async () => {
    const prep = await call(batchCustodyRoute, {
      method: "POST",
      params: { projectId: w.projectId, submissionId: subId },
      cookie: w.cookies.lab_analyst,
      body: { sampleIds: ids, event: "prepared", occurredAt: T(120), location: "Prep lab, jaw crusher bay", note: "Dried at 40 °C, crushed, micronized", handledBy: "J. Ortega (technician)" },
    });
    expect(prep.status, JSON.stringify(prep.json)).toBe(201);
    expect(prep.json.results.map((x: { from: string; to: string }) => `${x.from}→${x.to}`)).toEqual(["received→prepared", "received→prepared", "received→prepared"]);
    const scan = await call(sampleCustodyRoute, {
      method: "POST",
      params: { projectId: w.projectId, submissionId: subId, sampleId: ids[0] },
      cookie: w.cookies.lab_analyst,
      body: { event: "scanned", occurredAt: T(180), location: "XRD room 2", sealNumber: null },
    });
    expect(scan.status, JSON.stringify(scan.json)).toBe(201);
    const d = await call(detailRoute, { params: { projectId: w.projectId, submissionId: subId }, cookie: w.cookies.consultant });
    expect(d.json.status).toBe("in_progress");
  });

  test("the custody history lists who, when and where, in order", async () => {
    const r = await call(historyRoute, { params: { projectId: w.projectId, sampleId: ids[0] }, cookie: w.cookies.consultant });
    expect(r.status).toBe(200);
    const rows = r.json.events.map((e: Record<string, unknown>) => [e.event, e.occurredAt, e.location, e.actorName]);
    expect(rows).toEqual([
      ["dispatched", T(0), "Camp store", expect.stringMatching(/^field_geologist /)],
      ["received", T(60), "Lab reception, shelf R2", expect.stringMatching(/^lab_analyst /)],
      ["prepared", T(120), "Prep lab, jaw crusher bay", "J. Ortega (technician)"],
      ["scanned", T(180), "XRD room 2", expect.stringMatching(/^lab_analyst /)],
    ]);
    expect(r.json.events[1].submissionCode).toBe(subCode);
    const damaged = await call(historyRoute, { params: { projectId: w.projectId, sampleId: ids[1] }, cookie: w.cookies.lead });
    expect(damaged.json.intakeFlags).toEqual([expect.objectContaining({ submissionCode: subCode, condition: "damaged" })]);
  });

  test("the status never goes back silently: 409, unless 'keep' (late entry) or 'reset' with a note", async () => {
    const before = await counts();
    const back = await call(sampleCustodyRoute, { method: "POST", params: { projectId: w.projectId, submissionId: subId, sampleId: ids[0] }, cookie: w.cookies.lab_analyst, body: { event: "prepared", occurredAt: T(150) } });
    expect(back.status).toBe(409);
    expect(back.json.error.message).toContain('already "scanned"');
    expect(await counts()).toEqual(before);
    const noNote = await call(sampleCustodyRoute, { method: "POST", params: { projectId: w.projectId, submissionId: subId, sampleId: ids[0] }, cookie: w.cookies.lab_analyst, body: { event: "prepared", statusPolicy: "reset" } });
    expect(noNote.status).toBe(422);
    expect(noNote.json.error.fields.note[0]).toContain("note is required");
    const late = await call(sampleCustodyRoute, { method: "POST", params: { projectId: w.projectId, submissionId: subId, sampleId: ids[0] }, cookie: w.cookies.lab_analyst, body: { event: "prepared", occurredAt: T(150), statusPolicy: "keep", note: "Second split prepared for the clay fraction" } });
    expect(late.status).toBe(201);
    expect(late.json.results[0]).toMatchObject({ from: "scanned", to: "scanned", change: "keep" });
    expect(await statusOf(ids[0])).toBe("scanned");
  });

  test("sign-off of every sample marks the submission reported and e-mails the leads once", async () => {
    const db = getDb();
    const seen = mail.messages.length;
    const addScan = (sampleId: string) =>
      db
        .insert(scans)
        .values({ projectId: w.projectId, sampleId, fileKey: `k-${sampleId}`, originalName: "a.xy", sha256: "0".repeat(64), format: "xy", wavelengthA: 1.5406, status: "signed_off", signedOffBy: w.userIds.lab_analyst, signedOffAt: new Date() })
        .returning();
    const [s1] = await addScan(ids[0]);
    const first = await notifySignOff({ projectId: w.projectId, scanId: s1.id, sampleId: ids[0], signedOffBy: w.userIds.lab_analyst });
    expect(first.mailedTo).toEqual([await emailOf(w.userIds.lead)]);
    expect(first.reportedSubmissions).toEqual([]);
    const msg = mail.messages.slice(seen)[0];
    expect(msg.subject).toBe("Results signed off for sample SUBT-0001");
    expect(linkContaining(msg.text, "/scans/")).toBe(`http://localhost:3000/projects/${w.projectId}/scans/${s1.id}`);
    // A signed-off scan from before this submission was sent (an earlier batch) does not count.
    await db.insert(scans).values({ projectId: w.projectId, sampleId: ids[1], fileKey: "old", originalName: "old.xy", sha256: "1".repeat(64), format: "xy", wavelengthA: 1.5406, status: "signed_off", signedOffAt: new Date(Date.UTC(2026, 0, 5)), createdAt: new Date(Date.UTC(2026, 0, 5)) });
    const [s3] = await addScan(ids[2]);
    const notYet = await notifySignOff({ projectId: w.projectId, scanId: s3.id, sampleId: ids[2], signedOffBy: w.userIds.lab_analyst });
    expect(notYet.reportedSubmissions).toEqual([]);
    const [s2] = await addScan(ids[1]);
    const last = await notifySignOff({ projectId: w.projectId, scanId: s2.id, sampleId: ids[1], signedOffBy: w.userIds.lab_analyst });
    expect(last.reportedSubmissions).toEqual([subId]);
    const again = await notifySignOff({ projectId: w.projectId, scanId: s3.id, sampleId: ids[2], signedOffBy: w.userIds.lab_analyst });
    expect(again.reportedSubmissions).toEqual([]);
    const reported = mail.messages.slice(seen).filter((m) => m.subject.startsWith(`Submission ${subCode}: results signed off`));
    expect(reported).toHaveLength(1);
    expect(reported[0].subject).toBe(`Submission ${subCode}: results signed off for all 3 samples`);
    const [sub] = await db.select().from(submissions).where(eq(submissions.id, subId));
    expect(sub.status).toBe("reported");
    expect(await statusOf(ids[1])).toBe("reported");

    // Reopening one of those sign-offs takes the submission back to "in progress"; signing again reports it again.
    const reopened = await call(reopenRoute, { method: "POST", params: { projectId: w.projectId, scanId: s2.id }, cookie: w.cookies.lead, body: { reason: "Second look at the chlorite" } });
    expect(reopened.status).toBe(200);
    expect(reopened.json.reopenedSubmissions).toEqual([subCode]);
    const [back] = await db.select().from(submissions).where(eq(submissions.id, subId));
    expect(back).toMatchObject({ status: "in_progress", reportedAt: null });
    const trail = await db.select().from(auditLog).where(and(eq(auditLog.entityId, subId), eq(auditLog.action, "reopen")));
    expect(trail).toHaveLength(1);
    await db.update(scans).set({ status: "signed_off", signedOffBy: w.userIds.lab_analyst, signedOffAt: new Date() }).where(eq(scans.id, s2.id));
    const resigned = await notifySignOff({ projectId: w.projectId, scanId: s2.id, sampleId: ids[1], signedOffBy: w.userIds.lab_analyst });
    expect(resigned.reportedSubmissions).toEqual([subId]);
    expect(mail.messages.slice(seen).filter((m) => m.subject.startsWith(`Submission ${subCode}: results signed off`))).toHaveLength(2);
  });
});

describe("roles and bad input", () => {
  let draftId = "";
  beforeAll(async () => {
    const s = await makeSample(w.projectId, "SUBT-0101");
    const r = await call(createRoute, { method: "POST", params: { projectId: w.projectId }, cookie: w.cookies.lead, body: { sampleIds: [s.id], requestedAnalysis: ["XRD bulk"] } });
    draftId = r.json.id;
  });

  test("a consultant gets 403 on every write, whatever the body", async () => {
    const p = { projectId: w.projectId, submissionId: draftId };
    const before = await counts();
    const writes = [
      call(createRoute, { method: "POST", params: { projectId: w.projectId }, cookie: w.cookies.consultant, body: { sampleIds: [ids[0]], requestedAnalysis: ["XRD bulk"] } }),
      call(createRoute, { method: "POST", params: { projectId: w.projectId }, cookie: w.cookies.consultant, body: {} }),
      call(sendRoute, { method: "POST", params: p, cookie: w.cookies.consultant, body: { waybill: "X" } }),
      call(receiveRoute, { method: "POST", params: p, cookie: w.cookies.consultant, body: { items: [] } }),
      call(batchCustodyRoute, { method: "POST", params: p, cookie: w.cookies.consultant, body: { sampleIds: [ids[0]], event: "transferred" } }),
      call(sampleCustodyRoute, { method: "POST", params: { ...p, sampleId: ids[0] }, cookie: w.cookies.consultant, body: { event: "prepared" } }),
    ];
    for (const r of await Promise.all(writes)) expect(r.status).toBe(403);
    expect(await counts()).toEqual(before);
  });

  test("a lab analyst cannot create or send a submission", async () => {
    const c = await call(createRoute, { method: "POST", params: { projectId: w.projectId }, cookie: w.cookies.lab_analyst, body: { sampleIds: [ids[0]], requestedAnalysis: ["XRD bulk"] } });
    expect(c.status).toBe(403);
    const s = await call(sendRoute, { method: "POST", params: { projectId: w.projectId, submissionId: draftId }, cookie: w.cookies.lab_analyst, body: { waybill: "X" } });
    expect(s.status).toBe(403);
  });

  test("a non-member gets 404 and no session gets 401", async () => {
    expect((await call(listRoute, { params: { projectId: w.projectId }, cookie: w.cookies.outsider })).status).toBe(404);
    expect((await call(detailRoute, { params: { projectId: w.projectId, submissionId: draftId }, cookie: w.cookies.outsider })).status).toBe(404);
    expect((await call(listRoute, { params: { projectId: w.projectId } })).status).toBe(401);
  });

  test("unknown sample, another project's sample, empty selection: 422 with field messages, nothing written", async () => {
    const before = await counts();
    const [{ seq }] = await getDb().select({ seq: projects.submissionSeq }).from(projects).where(eq(projects.id, w.projectId));
    const post = (body: unknown) => call(createRoute, { method: "POST", params: { projectId: w.projectId }, cookie: w.cookies.lead, body });
    const unknown = await post({ sampleIds: ["no-such-id"], requestedAnalysis: ["XRD bulk"] });
    expect(unknown.status).toBe(422);
    expect(unknown.json.error.fields.sampleIds).toEqual(["No sample with id no-such-id in this project."]);
    const foreign = await post({ sampleIds: [foreignSampleId], requestedAnalysis: ["XRD bulk"] });
    expect(foreign.status).toBe(422);
    // Another project's sample reads exactly like an unknown one: other projects stay invisible.
    expect(foreign.json.error.fields.sampleIds).toEqual([`No sample with id ${foreignSampleId} in this project.`]);
    const empty = await post({ sampleIds: [], requestedAnalysis: [] });
    expect(empty.status).toBe(422);
    expect(empty.json.error.fields).toMatchObject({ sampleIds: ["Select at least one sample."], requestedAnalysis: ["Choose at least one analysis, e.g. XRD bulk."] });
    const twice = await post({ sampleIds: ["a", "a"], requestedAnalysis: ["XRD bulk"], priority: "asap", labEmail: "not-an-address" });
    expect(twice.status).toBe(422);
    expect(Object.keys(twice.json.error.fields).sort()).toEqual(["labEmail", "priority", "sampleIds"]);
    expect(await counts()).toEqual(before);
    const [{ seq: after }] = await getDb().select({ seq: projects.submissionSeq }).from(projects).where(eq(projects.id, w.projectId));
    expect(after).toBe(seq);
  });

  test("sending without a waybill, or with a time in the future, is 422", async () => {
    const p = { projectId: w.projectId, submissionId: draftId };
    const r = await call(sendRoute, { method: "POST", params: p, cookie: w.cookies.lead, body: {} });
    expect(r.status).toBe(422);
    expect(r.json.error.fields.waybill[0]).toContain("waybill");
    const future = await call(sendRoute, { method: "POST", params: p, cookie: w.cookies.lead, body: { waybill: "W", occurredAt: "2099-01-01T00:00:00Z" } });
    expect(future.status).toBe(422);
    expect(future.json.error.fields.occurredAt).toEqual(["The time cannot be in the future."]);
  });

  test("lab steps before intake are refused with 409", async () => {
    const d = await call(detailRoute, { params: { projectId: w.projectId, submissionId: draftId }, cookie: w.cookies.lead });
    const r = await call(sampleCustodyRoute, { method: "POST", params: { projectId: w.projectId, submissionId: draftId, sampleId: d.json.samples[0].id }, cookie: w.cookies.lab_analyst, body: { event: "prepared" } });
    expect(r.status).toBe(409);
    expect(r.json.error.message).toContain("record its intake");
  });
});
