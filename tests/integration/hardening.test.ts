/**
 * The defects listed in issue 12: a bad escape in a station key (500 before the access check), an IGSN of another
 * project answering 409 (existence oracle), bidi controls in photo names, and sign-in throttling that rotating
 * X-Forwarded-For escaped. Each check is against the behaviour the issue asks for.
 */
import sharp from "sharp";
import { and, eq } from "drizzle-orm";
import { beforeAll, describe, expect, test } from "vitest";
import { POST as authPost } from "@/app/api/auth/[...all]/route";
import { GET as stationRoute } from "@/app/api/projects/[projectId]/phase-map/stations/[stationKey]/route";
import { GET as photoBytes } from "@/app/api/projects/[projectId]/photos/[photoId]/[variant]/route";
import { POST as uploadPhoto } from "@/app/api/projects/[projectId]/samples/[sampleId]/photos/route";
import { PATCH as patchSample } from "@/app/api/projects/[projectId]/samples/[sampleId]/route";
import { POST as importSamples } from "@/app/api/projects/[projectId]/samples/import/route";
import { POST as createSample } from "@/app/api/projects/[projectId]/samples/route";
import { getDb } from "@/db";
import { auditLog } from "@/db/schema";
import { IGSN_NOT_ACCEPTED } from "@/lib/dal/samples";
import { PEER_HEADER } from "@/lib/security/client-address";
import { ACCOUNT_RULE } from "@/lib/security/throttle";
import { call, makeWorld, PASSWORD, type World } from "../helpers/app";

let w: World;
let other: World;
beforeAll(async () => {
  w = await makeWorld();
  other = await makeWorld();
});

describe("a stray % escape in a phase-map station key", () => {
  test("is a 400 for a member and a 404 for a non-member — never a 500", async () => {
    const member = await call(stationRoute, { params: { projectId: w.projectId, stationKey: "%" }, cookie: w.cookies.consultant });
    expect(member.status).toBe(400);
    const outsider = await call(stationRoute, { params: { projectId: w.projectId, stationKey: "%" }, cookie: w.cookies.outsider });
    expect(outsider.status).toBe(404);
  });
});

describe("an IGSN registered in another project", () => {
  test("answers like any invalid value (422 on the igsn field), not 409, when the caller cannot see that project", async () => {
    const igsn = `10.58052/OTHER${Date.now()}`;
    const mine = await call(createSample, { method: "POST", params: { projectId: other.projectId }, cookie: other.cookies.lead, body: { sampleType: "hand_sample", igsn } });
    expect(mine.status).toBe(201);
    const probe = await call(createSample, { method: "POST", params: { projectId: w.projectId }, cookie: w.cookies.lead, body: { sampleType: "hand_sample", igsn } });
    expect(probe.status).toBe(422);
    expect(probe.json.error.fields.igsn).toEqual([IGSN_NOT_ACCEPTED]);
    // the same IGSN in the caller's own project is a 409 naming the sample
    const again = await call(createSample, { method: "POST", params: { projectId: other.projectId }, cookie: other.cookies.lead, body: { sampleType: "hand_sample", igsn } });
    expect(again.status).toBe(409);
    expect(again.json.error.message).toContain(mine.json.code);
    // editing a sample to that IGSN, and the CSV import preview, do not reveal it either
    const s = await call(createSample, { method: "POST", params: { projectId: w.projectId }, cookie: w.cookies.lead, body: { sampleType: "hand_sample" } });
    const edit = await call(patchSample, { method: "PATCH", params: { projectId: w.projectId, sampleId: s.json.id }, cookie: w.cookies.lead, body: { version: s.json.version, igsn } });
    expect(edit.status).toBe(422);
    const preview = await call(importSamples, { method: "POST", path: "/?mode=preview", params: { projectId: w.projectId }, cookie: w.cookies.lead, body: { csv: `sample type,igsn\nhand_sample,${igsn}\n` } });
    expect(preview.status).toBe(200);
    expect(preview.json.errors.map((e: { message: string }) => e.message)).toContain(IGSN_NOT_ACCEPTED);
    expect(JSON.stringify(preview.json)).not.toMatch(/registered/);
  });
});

describe("file names with bidi controls", () => {
  test("U+202E in a photo name is removed before storing, and the download name cannot end in .exe", async () => {
    const s = await call(createSample, { method: "POST", params: { projectId: w.projectId }, cookie: w.cookies.lead, body: { sampleType: "hand_sample" } });
    const jpeg = await sharp({ create: { width: 64, height: 48, channels: 3, background: { r: 90, g: 80, b: 70 } } }).jpeg().toBuffer();
    const form = new FormData();
    form.append("files", new File([new Uint8Array(jpeg)], "rtl-\u202Egpj.exe", { type: "image/jpeg" }));
    const req = new Request("http://localhost:3000/x", { method: "POST", headers: { cookie: w.cookies.lead }, body: form });
    const res = await uploadPhoto(req, { params: Promise.resolve({ projectId: w.projectId, sampleId: s.json.id }) });
    expect(res.status).toBe(201);
    const body = await res.json();
    const photo = (body.items ?? body.photos ?? body)[0];
    expect(photo.originalName).toBe("rtl-gpj.exe");
    expect(photo.originalName).not.toMatch(/[\u202a-\u202e\u2066-\u2069]/);
    const dl = await call(photoBytes, { params: { projectId: w.projectId, photoId: photo.id, variant: "original" }, cookie: w.cookies.consultant });
    expect(dl.headers.get("content-disposition")).not.toMatch(/%E2%80%AE/i); // the UTF-8 of U+202E
  });
});

describe("sign-in throttling", () => {
  const attempt = (email: string, password: string, headers: Record<string, string>) =>
    authPost(
      new Request("http://localhost:3000/api/auth/sign-in/email", {
        method: "POST",
        headers: { "content-type": "application/json", origin: "http://localhost:3000", ...headers },
        body: JSON.stringify({ email, password }),
      }),
    );

  test("rotating X-Forwarded-For does not reset the per-account count: the account locks (429) and the attempts are audited", async () => {
    const victim = "field_geologist.1@example.test"; // the first world's field geologist (tests/helpers/app.ts)
    const statuses: number[] = [];
    for (let i = 0; i < ACCOUNT_RULE.lockAfter + 1; i++) {
      const started = Date.now();
      const res = await attempt(victim, "wrong-password", { "x-forwarded-for": `198.51.100.${i}`, [PEER_HEADER]: `203.0.113.${i}` });
      statuses.push(res.status);
      if (i === ACCOUNT_RULE.free + 1) expect(Date.now() - started).toBeGreaterThanOrEqual(ACCOUNT_RULE.baseDelayMs * 2 - 50);
    }
    expect(statuses.slice(0, ACCOUNT_RULE.lockAfter)).toEqual(Array(ACCOUNT_RULE.lockAfter).fill(401));
    expect(statuses.at(-1)).toBe(429);
    // even the right password is refused while locked
    const locked = await attempt(victim, PASSWORD, { [PEER_HEADER]: "203.0.113.250" });
    expect(locked.status).toBe(429);
    expect(Number(locked.headers.get("retry-after"))).toBeGreaterThan(60);
    const rows = await getDb().select({ action: auditLog.action }).from(auditLog).where(and(eq(auditLog.entity, "account"), eq(auditLog.entityId, victim)));
    expect(rows.filter((r) => r.action === "sign_in_failed")).toHaveLength(ACCOUNT_RULE.lockAfter);
    expect(rows.some((r) => r.action === "sign_in_locked")).toBe(true);
  }, 120_000);
});
