import { and, eq } from "drizzle-orm";
import { beforeAll, describe, expect, test } from "vitest";
import { GET as labView } from "@/app/api/lab/[token]/route";
import { POST as labReceive } from "@/app/api/lab/[token]/receive/route";
import { POST as labScans } from "@/app/api/lab/[token]/scans/route";
import { GET as labManifest } from "@/app/api/lab/[token]/manifest/route";
import { GET as goneRoute } from "@/app/lab/[token]/gone/route";
import { GET as listLinks, DELETE as revokeLinks } from "@/app/api/projects/[projectId]/submissions/[submissionId]/lab-link/route";
import { GET as memberManifest } from "@/app/api/projects/[projectId]/submissions/[submissionId]/manifest/route";
import { POST as createSubmissionRoute } from "@/app/api/projects/[projectId]/submissions/route";
import { POST as sendRoute } from "@/app/api/projects/[projectId]/submissions/[submissionId]/send/route";
import { getDb } from "@/db";
import { seedReferenceLibrary } from "@/db/seed/reference-library";
import { custodyEvents, labLinks, projects, samples, scans, submissions, user } from "@/db/schema";
import { hashLabToken } from "@/lib/dal/lab-links";
import type { OutboxMessage } from "@/lib/mail/outbox";
import { quartzCalciteXy } from "../fixtures/lab/handbook-scans";
import { call, makeWorld, type World } from "../helpers/app";
import { linkContaining, useFakeSmtp } from "../helpers/mail";

// Issue 11 §3: the dispatch e-mail to an outside lab carries the manifest as a PDF and a signed, expiring, revocable
// lab link (hashed like share links) that lets the lab record intake and upload scans for exactly the samples on that
// manifest, without an account. A lab whose address is a member's account gets no link and uses its role.

process.env.LITHODEX_JOBS = "manual";

const LAB = "reception@outside-lab.example.test";
let w: World;
let mail: Awaited<ReturnType<typeof useFakeSmtp>>;
const ids: Record<string, string> = {};
let subId = "";
let otherSubId = "";
let token = "";

const P = () => ({ projectId: w.projectId });
const T = (t = token) => ({ token: t });
const LAB_ORIGIN = { origin: "http://localhost:3000" };

async function makeSample(code: string) {
  const [s] = await getDb().insert(samples).values({ projectId: w.projectId, code, sampleType: "chip", status: "collected", weightKg: 1.1 }).returning();
  await getDb().insert(custodyEvents).values({ sampleId: s.id, event: "collected", occurredAt: new Date().toISOString(), actorName: "test", statusAfter: "collected" });
  return s.id;
}

async function dispatch(sampleIds: string[], labEmail = LAB) {
  const made = await call(createSubmissionRoute, { method: "POST", params: P(), cookie: w.cookies.field_geologist, body: { sampleIds, requestedAnalysis: ["XRD bulk"], labEmail } });
  expect(made.status, JSON.stringify(made.json)).toBe(201);
  const before = mail.messages.length;
  const sent = await call(sendRoute, { method: "POST", params: { ...P(), submissionId: made.json.id }, cookie: w.cookies.field_geologist, body: { waybill: "WB-LAB-1" } });
  expect(sent.status, JSON.stringify(sent.json)).toBe(200);
  for (let i = 0; i < 200 && mail.messages.length <= before; i++) await new Promise((r) => setTimeout(r, 25));
  expect(mail.messages.length).toBeGreaterThan(before);
  return { id: made.json.id as string, message: mail.messages[mail.messages.length - 1] as OutboxMessage };
}

const tokenOf = (m: OutboxMessage) => linkContaining(m.text, "/lab/")!.split("/lab/")[1];

function scanForm(sampleId: string, name: string, extra: Record<string, string> = { uploadedBy: "Ana Ruiz" }): FormData {
  const f = new FormData();
  f.set("sampleId", sampleId);
  for (const [k, v] of Object.entries(extra)) f.set(k, v);
  f.append("file", new Blob([quartzCalciteXy({ seed: 7 })], { type: "text/plain" }), name);
  return f;
}
const upload = (sampleId: string, name: string, t = token, extra?: Record<string, string>) => call(labScans, { method: "POST", params: T(t), rawBody: scanForm(sampleId, name, extra), headers: LAB_ORIGIN });

beforeAll(async () => {
  await seedReferenceLibrary();
  mail = await useFakeSmtp();
  w = await makeWorld();
  await getDb().update(projects).set({ labEmail: LAB }).where(eq(projects.id, w.projectId));
  for (const c of ["LL-0001", "LL-0002", "LL-0003", "LL-0004"]) ids[c] = await makeSample(c);
  const first = await dispatch([ids["LL-0001"], ids["LL-0002"]]);
  subId = first.id;
  token = tokenOf(first.message);
  otherSubId = (await dispatch([ids["LL-0004"]])).id;
});

describe("the dispatch e-mail", () => {
  test("carries the manifest as a PDF attachment and a lab link; only the token's hash is stored", async () => {
    const m = mail.messages.find((x) => x.subject.includes("Sample submission") && x.text?.includes(token))!;
    expect(m.to).toEqual([LAB]);
    expect(m.attachments).toHaveLength(1);
    const pdf = m.attachments![0];
    expect(pdf).toMatchObject({ contentType: "application/pdf" });
    expect(pdf.filename).toMatch(/^TP\d+-SUB-\d{4}-manifest\.pdf$/);
    // PDF files start with "%PDF-" and end with "%%EOF" (ISO 32000-1:2008, 7.5.2 and 7.5.5).
    const bytes = Buffer.from(pdf.contentBase64, "base64");
    expect(bytes.subarray(0, 5).toString("latin1")).toBe("%PDF-");
    expect(bytes.subarray(-8).toString("latin1")).toContain("%%EOF");
    expect(token).toMatch(/^[A-Za-z0-9_-]{43}$/);
    expect(m.text).toMatch(/no account needed/);
    expect(m.text).toMatch(/expires on \d{4}-\d{2}-\d{2} \d{2}:\d{2} UTC/);
    const [row] = await getDb().select().from(labLinks).where(eq(labLinks.submissionId, subId));
    expect(row.tokenHash).toBe(hashLabToken(token));
    expect(JSON.stringify(row)).not.toContain(token);
  });

  test("a lab whose address is a member's account (lab analyst) gets no lab link: it signs in and uses its role", async () => {
    const [analyst] = await getDb().select({ email: user.email }).from(user).where(eq(user.id, w.userIds.lab_analyst));
    const s = await makeSample("LL-0009");
    const { id, message } = await dispatch([s], analyst.email);
    expect(linkContaining(message.text, "/lab/")).toBeUndefined();
    expect(linkContaining(message.text, `/submissions/${id}/manifest`)).toBeDefined();
    expect(message.attachments?.[0]?.contentType).toBe("application/pdf");
    const links = await call(listLinks, { params: { ...P(), submissionId: id }, cookie: w.cookies.lead });
    expect(links.json.items).toEqual([]);
  });
});

describe("what the link opens, without an account", () => {
  test("the manifest of its submission only, and the PDF", async () => {
    const r = await call(labView, { params: T() });
    expect(r.status).toBe(200);
    expect(r.json.samples.map((s: { code: string }) => s.code)).toEqual(["LL-0001", "LL-0002"]);
    expect(r.json).toMatchObject({ canReceive: true, canUpload: false, submission: { status: "sent" } });
    const pdf = await labManifest(new Request(`http://localhost:3000/api/lab/${token}/manifest`), { params: Promise.resolve(T()) });
    expect(pdf.status).toBe(200);
    expect(pdf.headers.get("content-type")).toBe("application/pdf");
    expect(Buffer.from(await pdf.arrayBuffer()).subarray(0, 5).toString("latin1")).toBe("%PDF-");
  });

  test("an unknown or malformed token is 404; a state-changing request from another site is 403", async () => {
    expect((await call(labView, { params: T("x".repeat(43)) })).status).toBe(404);
    expect((await call(labView, { params: T("not-a-token") })).status).toBe(404);
    const cross = await call(labReceive, { method: "POST", params: T(), headers: { origin: "https://evil.example" }, body: { receivedBy: "X", items: [] } });
    expect(cross.status).toBe(403);
  });

  test("a scan before the intake is refused (409)", async () => {
    const r = await upload(ids["LL-0001"], "early.xy");
    expect(r.status).toBe(409);
    expect(r.json.error.message).toMatch(/Record the intake of TP\d+-SUB-\d{4} first/);
  });

  test("the intake needs the recorder's name and every bag; bags not on the manifest cannot be added", async () => {
    const items = [
      { sampleId: ids["LL-0001"], condition: "received" },
      { sampleId: ids["LL-0002"], condition: "damaged", note: "Bag torn at one corner" },
    ];
    const noName = await call(labReceive, { method: "POST", params: T(), headers: LAB_ORIGIN, body: { items } });
    expect(noName.status).toBe(422);
    expect(noName.json.error.fields.receivedBy[0]).toMatch(/Give your name/);
    const extra = await call(labReceive, { method: "POST", params: T(), headers: LAB_ORIGIN, body: { receivedBy: "Ana Ruiz", items: [...items, { sampleId: ids["LL-0003"], condition: "extra" }] } });
    expect(extra.status).toBe(422);
    expect(extra.json.error.fields["items.2.condition"][0]).toMatch(/not on the manifest cannot be added through the lab link/);
    expect((await getDb().select().from(submissions).where(eq(submissions.id, subId)))[0].status).toBe("sent");
    const ok = await call(labReceive, { method: "POST", params: T(), headers: LAB_ORIGIN, body: { receivedBy: "Ana Ruiz", labReference: "OL-77", items } });
    expect(ok.status, JSON.stringify(ok.json)).toBe(200);
    const [ev] = await getDb().select().from(custodyEvents).where(and(eq(custodyEvents.sampleId, ids["LL-0001"]), eq(custodyEvents.event, "received")));
    expect(ev).toMatchObject({ actorId: null, actorName: `Ana Ruiz (outside lab, ${LAB})`, statusAfter: "received", submissionId: subId });
    // The sender and the leads get the receipt.
    await expect.poll(() => mail.messages.some((m) => m.subject.includes("received by the lab") && m.text?.includes("Ana Ruiz"))).toBe(true);
  });

  test("scans are taken for the manifest's samples only: another sample of the project, or of another submission, is 404", async () => {
    expect((await upload(ids["LL-0003"], "not-listed.xy")).status).toBe(404);
    expect((await upload(ids["LL-0004"], "other-submission.xy")).status).toBe(404);
    expect((await upload("00000000-0000-4000-8000-000000000000", "nothing.xy")).status).toBe(404);
    expect((await upload(ids["LL-0001"], "no-name.xy", token, {})).status).toBe(422);
    const ok = await upload(ids["LL-0001"], "LL-0001.xy");
    expect(ok.status, JSON.stringify(ok.json)).toBe(201);
    expect(ok.json.scan).toMatchObject({ sampleCode: "LL-0001", originalName: "LL-0001.xy" });
    const [row] = await getDb().select().from(scans).where(eq(scans.id, ok.json.scan.id));
    expect(row).toMatchObject({ uploadedBy: null, sampleId: ids["LL-0001"], projectId: w.projectId });
    const [ev] = await getDb().select().from(custodyEvents).where(and(eq(custodyEvents.sampleId, ids["LL-0001"]), eq(custodyEvents.event, "scanned")));
    expect(ev.actorName).toBe(`Ana Ruiz (outside lab, ${LAB})`);
    const view = await call(labView, { params: T() });
    expect(view.json.samples[0].scans.map((s: { originalName: string }) => s.originalName)).toEqual(["LL-0001.xy"]);
  });
});

describe("revoked or expired → 410", () => {
  test("a lead withdraws the link: every lab request is 410 and the page answers 410 with the reason", async () => {
    const r = await call(revokeLinks, { method: "DELETE", params: { ...P(), submissionId: subId }, cookie: w.cookies.lead });
    expect(r.json).toEqual({ revoked: 1 });
    expect((await call(labView, { params: T() })).status).toBe(410);
    expect((await call(labView, { params: T() })).json.error.details.reason).toBe("revoked");
    expect((await upload(ids["LL-0002"], "after.xy")).status).toBe(410);
    expect((await call(labReceive, { method: "POST", params: T(), headers: LAB_ORIGIN, body: {} })).status).toBe(410);
    const page = await goneRoute(new Request(`http://localhost:3000/lab/${token}/gone`), { params: Promise.resolve(T()) });
    expect(page.status).toBe(410);
    expect(await page.text()).toContain("This lab link was withdrawn");
    const links = await call(listLinks, { params: { ...P(), submissionId: subId }, cookie: w.cookies.field_geologist });
    expect(links.json.items[0].state).toBe("revoked");
    // A consultant may not withdraw links.
    expect((await call(revokeLinks, { method: "DELETE", params: { ...P(), submissionId: subId }, cookie: w.cookies.consultant })).status).toBe(403);
  });

  test("an expired link is 410; resending the e-mail issues a new link and retires the old one", async () => {
    await getDb().update(submissions).set({ lastMailedAt: new Date(Date.now() - 3600_000) }).where(eq(submissions.id, otherSubId));
    const [first] = await getDb().select().from(labLinks).where(eq(labLinks.submissionId, otherSubId));
    const firstToken = tokenOf(mail.messages.find((m) => m.text?.includes("LL-0004"))!);
    expect(hashLabToken(firstToken)).toBe(first.tokenHash);
    const before = mail.messages.length;
    const resend = await call(sendRoute, { method: "POST", params: { ...P(), submissionId: otherSubId }, cookie: w.cookies.field_geologist, body: { resendEmail: true } });
    expect(resend.status).toBe(200);
    await expect.poll(() => mail.messages.length).toBeGreaterThan(before);
    const newToken = tokenOf(mail.messages[mail.messages.length - 1]);
    expect(newToken).not.toBe(firstToken);
    expect((await call(labView, { params: T(firstToken) })).status).toBe(410);
    expect((await call(labView, { params: T(newToken) })).status).toBe(200);
    await getDb().update(labLinks).set({ expiresAt: new Date(Date.now() - 1000) }).where(eq(labLinks.tokenHash, hashLabToken(newToken)));
    const expired = await call(labView, { params: T(newToken) });
    expect(expired.status).toBe(410);
    expect(expired.json.error.details.reason).toBe("expired");
  });
});

test("members download the manifest PDF; a non-member gets 404", async () => {
  const ok = await call(memberManifest, { params: { ...P(), submissionId: subId }, cookie: w.cookies.consultant });
  expect(ok.status).toBe(200);
  expect(ok.headers.get("content-type")).toBe("application/pdf");
  expect((await call(memberManifest, { params: { ...P(), submissionId: subId }, cookie: w.cookies.outsider })).status).toBe(404);
});
