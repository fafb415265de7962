import { eq } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, test } from "vitest";
import { GET as inviteInfoRoute, POST as acceptRoute } from "@/app/api/invitations/[token]/route";
import { DELETE as revokeRoute } from "@/app/api/projects/[projectId]/members/invitations/[invitationId]/route";
import { DELETE as removeRoute, PATCH as patchRoute } from "@/app/api/projects/[projectId]/members/[userId]/route";
import { GET as membersRoute, POST as inviteRoute } from "@/app/api/projects/[projectId]/members/route";
import { getDb } from "@/db";
import { invitations, projectMembers } from "@/db/schema";
import { hashToken } from "@/lib/dal/invitations";
import { call, makeWorld, signIn, type World } from "../helpers/app";
import { linkContaining, useFakeSmtp } from "../helpers/mail";

let w: World;
let mail: Awaited<ReturnType<typeof useFakeSmtp>>;

beforeAll(async () => {
  mail = await useFakeSmtp();
  w = await makeWorld();
});
afterAll(async () => {
  await mail.restore();
});

/** Invites an address as the lead and returns the token read from the captured e-mail's link. */
async function invite(email: string, role = "field_geologist") {
  const seen = mail.messages.length;
  const r = await call(inviteRoute, { method: "POST", params: { projectId: w.projectId }, cookie: w.cookies.lead, body: { email, role } });
  expect(r.status, JSON.stringify(r.json)).toBe(201);
  const m = mail.messages.slice(seen).find((x) => x.to.includes(email.toLowerCase()))!;
  const link = linkContaining(m.text, "/invite/")!;
  return { r, m, link, token: decodeURIComponent(link.split("/invite/")[1]) };
}

const tokenCall = (handler: (req: Request, ctx: { params: Promise<{ token: string }> }) => Promise<Response>, token: string, body?: unknown) => call(handler, { method: body === undefined ? "GET" : "POST", params: { token }, body });

describe("invitations", () => {
  test("the invitation e-mail links to /invite/<token>; only the token's SHA-256 is stored", async () => {
    const { r, m, link, token } = await invite("New.Geologist@Example.test");
    expect(r.json.invitation).toMatchObject({ email: "new.geologist@example.test", role: "field_geologist" });
    expect(r.json.invitation.tokenHash).toBeUndefined();
    expect(m.envelope.to).toEqual(["new.geologist@example.test"]);
    expect(m.subject).toMatch(/invited you to Test project \d+ on Lithodex$/);
    expect(link).toMatch(/^http:\/\/localhost:3000\/invite\/[A-Za-z0-9_-]{43}$/);
    expect(m.html).toContain(`href="${link}"`);
    const [row] = await getDb().select().from(invitations).where(eq(invitations.id, r.json.invitation.id));
    // SHA-256 of the token, hex (FIPS 180-4 digest length 256 bits = 64 hex digits), never the token itself.
    expect(row.tokenHash).toBe(hashToken(token));
    expect(row.tokenHash).toMatch(/^[0-9a-f]{64}$/);
    expect(row.tokenHash).not.toContain(token);
    const days = (row.expiresAt.getTime() - row.createdAt.getTime()) / 86_400_000;
    expect(days).toBeCloseTo(7, 2);
  });

  test("accept → sign in works → the new member sees the project; a second use is 410", async () => {
    const { token } = await invite("accept.me@example.test", "lab_analyst");
    const info = await tokenCall(inviteInfoRoute, token);
    expect(info.status).toBe(200);
    expect(info.json).toMatchObject({ email: "accept.me@example.test", role: "lab_analyst", existingAccount: false });
    const bad = await tokenCall(acceptRoute, token, { name: "", password: "short" });
    expect(bad.status).toBe(422);
    expect(bad.json.error.fields).toEqual({ name: ["Your name is required."], password: ["Use at least 12 characters (yours has 5); a passphrase of three or four unrelated words is easy to remember."] });
    // A long but common password is refused too (issue 11 §1), nothing is created.
    const common = await tokenCall(acceptRoute, token, { name: "Ana Lab", password: "password1234" });
    expect(common.status).toBe(422);
    expect(common.json.error.fields.password[0]).toMatch(/too easy to guess/);
    const ok = await tokenCall(acceptRoute, token, { name: "Ana Lab", password: "granite-quartz-42" });
    expect(ok.status, JSON.stringify(ok.json)).toBe(200);
    expect(ok.json).toMatchObject({ projectId: w.projectId, newAccount: true });
    const cookie = await signIn("accept.me@example.test", "granite-quartz-42");
    const members = await call(membersRoute, { params: { projectId: w.projectId }, cookie });
    expect(members.status).toBe(200);
    expect(members.json.members.find((m: { email: string }) => m.email === "accept.me@example.test").role).toBe("lab_analyst");
    expect(members.json.invitations).toBeNull();
    const again = await tokenCall(acceptRoute, token, { name: "Someone", password: "another-password" });
    expect(again.status).toBe(410);
    expect((await tokenCall(inviteInfoRoute, token)).status).toBe(410);
  });

  test("an unknown token is 404; an expired one is 410", async () => {
    expect((await tokenCall(acceptRoute, "not-a-real-token", { name: "X", password: "12345678" })).status).toBe(404);
    const { r, token } = await invite("late@example.test");
    await getDb().update(invitations).set({ expiresAt: new Date(Date.now() - 1000) }).where(eq(invitations.id, r.json.invitation.id));
    const res = await tokenCall(acceptRoute, token, { name: "Late", password: "12345678abc" });
    expect(res.status).toBe(410);
    expect(res.json.error.message).toContain("expired");
  });

  test("an existing account joins without a password change", async () => {
    const email = (await call(membersRoute, { params: { projectId: w.otherProjectId }, cookie: w.cookies.outsider })).json.members[0].email;
    const { token } = await invite(email, "consultant");
    expect((await tokenCall(inviteInfoRoute, token)).json.existingAccount).toBe(true);
    const ok = await tokenCall(acceptRoute, token, {});
    expect(ok.status).toBe(200);
    expect(ok.json.newAccount).toBe(false);
    const [m] = await getDb().select().from(projectMembers).where(eq(projectMembers.userId, w.userIds.outsider));
    expect(m).toBeDefined();
    expect((await call(membersRoute, { params: { projectId: w.projectId }, cookie: w.cookies.outsider })).status).toBe(200);
  });

  test("re-inviting replaces the old link; revoking kills it; an existing member cannot be invited", async () => {
    const first = await invite("twice@example.test");
    const second = await invite("twice@example.test");
    expect((await tokenCall(inviteInfoRoute, first.token)).status).toBe(404);
    expect((await tokenCall(inviteInfoRoute, second.token)).status).toBe(200);
    const del = await call(revokeRoute, { method: "DELETE", params: { projectId: w.projectId, invitationId: second.r.json.invitation.id }, cookie: w.cookies.lead });
    expect(del.status).toBe(200);
    expect((await tokenCall(inviteInfoRoute, second.token)).status).toBe(404);
    const member = (await call(membersRoute, { params: { projectId: w.projectId }, cookie: w.cookies.lead })).json.members.find((m: { role: string }) => m.role === "consultant");
    const dup = await call(inviteRoute, { method: "POST", params: { projectId: w.projectId }, cookie: w.cookies.lead, body: { email: member.email, role: "lead" } });
    expect(dup.status).toBe(409);
  });

  test("only a lead invites, changes roles or removes; bad input is 422", async () => {
    for (const who of ["field_geologist", "lab_analyst", "consultant"] as const) {
      const r = await call(inviteRoute, { method: "POST", params: { projectId: w.projectId }, cookie: w.cookies[who], body: { email: "x@example.test", role: "lead" } });
      expect(r.status).toBe(403);
      expect((await call(removeRoute, { method: "DELETE", params: { projectId: w.projectId, userId: w.userIds.consultant }, cookie: w.cookies[who] })).status).toBe(403);
    }
    const bad = await call(inviteRoute, { method: "POST", params: { projectId: w.projectId }, cookie: w.cookies.lead, body: { email: "nope", role: "boss" } });
    expect(bad.status).toBe(422);
    expect(Object.keys(bad.json.error.fields).sort()).toEqual(["email", "role"]);
  });

  test("the last lead can be neither demoted nor removed; other members can", async () => {
    const demote = await call(patchRoute, { method: "PATCH", params: { projectId: w.projectId, userId: w.userIds.lead }, cookie: w.cookies.lead, body: { role: "consultant" } });
    expect(demote.status).toBe(409);
    const remove = await call(removeRoute, { method: "DELETE", params: { projectId: w.projectId, userId: w.userIds.lead }, cookie: w.cookies.lead });
    expect(remove.status).toBe(409);
    const promote = await call(patchRoute, { method: "PATCH", params: { projectId: w.projectId, userId: w.userIds.consultant }, cookie: w.cookies.lead, body: { role: "field_geologist" } });
    expect(promote.status).toBe(200);
    const gone = await call(removeRoute, { method: "DELETE", params: { projectId: w.projectId, userId: w.userIds.consultant }, cookie: w.cookies.lead });
    expect(gone.status).toBe(200);
    expect((await call(membersRoute, { params: { projectId: w.projectId }, cookie: w.cookies.consultant })).status).toBe(404);
  });
});
