import { eq } from "drizzle-orm";
import { beforeAll, describe, expect, test } from "vitest";
import { GET as listUsersRoute, POST as inviteRoute } from "@/app/api/admin/users/route";
import { PATCH as patchUserRoute } from "@/app/api/admin/users/[userId]/route";
import { POST as signOutRoute } from "@/app/api/admin/users/[userId]/sign-out/route";
import { POST as resetRoute } from "@/app/api/admin/users/[userId]/password-reset/route";
import { GET as linkInfoRoute, POST as useLinkRoute } from "@/app/api/password-links/[token]/route";
import { GET as listProjectsRoute, POST as createProjectRoute } from "@/app/api/projects/route";
import { GET as projectRoute, PATCH as patchProjectRoute } from "@/app/api/projects/[projectId]/route";
import { POST as archiveRoute } from "@/app/api/projects/[projectId]/archive/route";
import { GET as auditRoute } from "@/app/api/projects/[projectId]/audit/route";
import { GET as listSamplesRoute, POST as createSampleRoute } from "@/app/api/projects/[projectId]/samples/route";
import { getDb } from "@/db";
import { projectMembers, projects, session, user } from "@/db/schema";
import { call, makeWorld, signIn, type World } from "../helpers/app";
import { linkContaining, useFakeSmtp } from "../helpers/mail";

// Issue 11 §1: projects are created (site admin), edited (lead) and archived in the app; a site admin manages
// accounts (invite, disable/enable, force sign-out, password reset link; the last admin stays); password rules apply
// to the links.

let w: World;
let mail: Awaited<ReturnType<typeof useFakeSmtp>>;

beforeAll(async () => {
  mail = await useFakeSmtp();
  w = await makeWorld();
});

const waitMail = async (to: string) => {
  for (let i = 0; i < 200; i++) {
    const m = [...mail.messages].reverse().find((x) => x.to.includes(to));
    if (m) return m;
    await new Promise((r) => setTimeout(r, 25));
  }
  throw new Error(`no mail to ${to}`);
};

describe("projects", () => {
  let projectId = "";

  test("a site admin creates a project and becomes its lead; others get 403; a taken or bad code is refused", async () => {
    const body = { code: "nwp", name: "New west prospect", region: "Invented range", timeZone: "America/Argentina/Catamarca", labEmail: "Lab@Example.test" };
    expect((await call(createProjectRoute, { method: "POST", cookie: w.cookies.lead, body })).status).toBe(403);
    const r = await call(createProjectRoute, { method: "POST", cookie: w.cookies.admin, body });
    expect(r.status, JSON.stringify(r.json)).toBe(201);
    expect(r.json).toMatchObject({ code: "NWP", labEmail: "lab@example.test", timeZone: "America/Argentina/Catamarca", version: 1, archivedAt: null });
    projectId = r.json.id;
    const [m] = await getDb().select().from(projectMembers).where(eq(projectMembers.projectId, projectId));
    expect(m).toMatchObject({ userId: w.userIds.admin, role: "lead" });
    const dup = await call(createProjectRoute, { method: "POST", cookie: w.cookies.admin, body: { ...body, name: "Again" } });
    expect(dup.status).toBe(409);
    expect(dup.json.error).toMatchObject({ message: "Project code NWP is already used by another project.", details: { field: "code" } });
    const bad = await call(createProjectRoute, { method: "POST", cookie: w.cookies.admin, body: { code: "9X", name: "x", timeZone: "Mars/Olympus" } });
    expect(bad.status).toBe(422);
    expect(Object.keys(bad.json.error.fields).sort()).toEqual(["code", "name", "timeZone"]);
  });

  test("the lead edits the settings with the version read; a stale form is 409; field and consultant get 403", async () => {
    const p = { projectId: w.projectId };
    const [before] = await getDb().select().from(projects).where(eq(projects.id, w.projectId));
    const ok = await call(patchProjectRoute, { method: "PATCH", params: p, cookie: w.cookies.lead, body: { version: before.version, region: "Sierra Norte (invented)", labInHouse: true, defaultAnode: "Co" } });
    expect(ok.status, JSON.stringify(ok.json)).toBe(200);
    expect(ok.json).toMatchObject({ region: "Sierra Norte (invented)", labInHouse: true, defaultAnode: "Co", version: before.version + 1 });
    const stale = await call(patchProjectRoute, { method: "PATCH", params: p, cookie: w.cookies.lead, body: { version: before.version, region: "Old form" } });
    expect(stale.status).toBe(409);
    expect(stale.json.error.details.current.region).toBe("Sierra Norte (invented)");
    for (const who of ["field_geologist", "lab_analyst", "consultant"] as const) {
      expect((await call(patchProjectRoute, { method: "PATCH", params: p, cookie: w.cookies[who], body: { version: 2 } })).status, who).toBe(403);
    }
  });

  test("a sample-code pattern issues the next codes; an unusable pattern is 422 naming why; the code is fixed once samples exist", async () => {
    const params = { projectId };
    const [p] = await getDb().select().from(projects).where(eq(projects.id, projectId));
    const bad = await call(patchProjectRoute, { method: "PATCH", params, cookie: w.cookies.admin, body: { version: p.version, sampleCodePattern: "{code}-{yyyy}" } });
    expect(bad.status).toBe(422);
    expect(bad.json.error.fields.sampleCodePattern[0]).toMatch(/exactly one \{seq:N\}/);
    const good = await call(patchProjectRoute, { method: "PATCH", params, cookie: w.cookies.admin, body: { version: p.version, sampleCodePattern: "{code}-{yyyy}-{seq:4}" } });
    expect(good.status, JSON.stringify(good.json)).toBe(200);
    const s = await call(createSampleRoute, { method: "POST", params, cookie: w.cookies.admin, body: { sampleType: "soil" } });
    expect(s.json.code).toBe(`NWP-${new Date().getUTCFullYear()}-0001`);
    const code = await call(patchProjectRoute, { method: "PATCH", params, cookie: w.cookies.admin, body: { version: good.json.version, code: "NWQ" } });
    expect(code.status).toBe(409);
    expect(code.json.error.message).toMatch(/prefixes the 1 sample codes already issued/);
  });

  test("an archived project is read-only: reads, exports and the audit work, writes are 409; the lead brings it back", async () => {
    const params = { projectId };
    expect((await call(archiveRoute, { method: "POST", params, cookie: w.cookies.admin, body: { archived: true } })).status).toBe(200);
    const write = await call(createSampleRoute, { method: "POST", params, cookie: w.cookies.admin, body: { sampleType: "soil" } });
    expect(write.status).toBe(409);
    expect(write.json.error.message).toMatch(/archived and read-only/);
    expect((await call(listSamplesRoute, { params, cookie: w.cookies.admin })).status).toBe(200);
    expect((await call(projectRoute, { params, cookie: w.cookies.admin })).status).toBe(200);
    const audit = await call(auditRoute, { params, path: "/?action=archive", cookie: w.cookies.admin });
    expect(audit.json.items.map((e: { action: string }) => e.action)).toEqual(["archive"]);
    const list = await call(listProjectsRoute, { cookie: w.cookies.admin });
    expect(list.json.items.find((x: { id: string }) => x.id === projectId).archivedAt).not.toBeNull();
    expect((await call(archiveRoute, { method: "POST", params, cookie: w.cookies.admin, body: { archived: false } })).status).toBe(200);
    expect((await call(createSampleRoute, { method: "POST", params, cookie: w.cookies.admin, body: { sampleType: "soil" } })).status).toBe(201);
  });
});

describe("site admin: accounts", () => {
  let invitedId = "";
  let token = "";

  test("only a site admin lists and invites; the invitee gets a single-use link to set a password", async () => {
    expect((await call(listUsersRoute, { cookie: w.cookies.lead })).status).toBe(403);
    const list = await call(listUsersRoute, { cookie: w.cookies.admin });
    expect(list.status).toBe(200);
    expect(list.json.items.some((u: { id: string; siteAdmin: boolean }) => u.id === w.userIds.admin && u.siteAdmin)).toBe(true);
    const r = await call(inviteRoute, { method: "POST", cookie: w.cookies.admin, body: { name: "Rosa Quintana", email: "Rosa.Quintana@example.test" } });
    expect(r.status, JSON.stringify(r.json)).toBe(201);
    expect(r.json.mail.sent).toBe(true);
    invitedId = r.json.user.id;
    const m = await waitMail("rosa.quintana@example.test");
    const link = linkContaining(m.text, "/set-password/")!;
    token = link.split("/set-password/")[1];
    expect((await call(linkInfoRoute, { params: { token } })).json).toMatchObject({ email: "rosa.quintana@example.test", purpose: "invite" });
    expect((await call(inviteRoute, { method: "POST", cookie: w.cookies.admin, body: { name: "Again", email: "rosa.quintana@example.test" } })).status).toBe(409);
  });

  test("the password rules apply to the link; a good password works once and lets the person sign in", async () => {
    const weak = await call(useLinkRoute, { method: "POST", params: { token }, headers: { origin: "http://localhost:3000" }, body: { password: "rosaquintana1" } });
    expect(weak.status).toBe(422);
    expect(weak.json.error.fields.password[0]).toMatch(/too easy to guess/);
    const short = await call(useLinkRoute, { method: "POST", params: { token }, headers: { origin: "http://localhost:3000" }, body: { password: "short" } });
    expect(short.json.error.fields.password[0]).toMatch(/at least 12 characters/);
    const ok = await call(useLinkRoute, { method: "POST", params: { token }, headers: { origin: "http://localhost:3000" }, body: { password: "basalt lantern orchard tide" } });
    expect(ok.status, JSON.stringify(ok.json)).toBe(200);
    expect(await signIn("rosa.quintana@example.test", "basalt lantern orchard tide")).toContain("session");
    expect((await call(useLinkRoute, { method: "POST", params: { token }, headers: { origin: "http://localhost:3000" }, body: { password: "another granite kettle" } })).status).toBe(410);
  });

  test("disabling signs the person out everywhere and blocks sign-in; enabling restores it", async () => {
    const cookie = await signIn("rosa.quintana@example.test", "basalt lantern orchard tide");
    expect((await call(listProjectsRoute, { cookie })).status).toBe(200);
    const off = await call(patchUserRoute, { method: "PATCH", params: { userId: invitedId }, cookie: w.cookies.admin, body: { disabled: true, reason: "Left the company" } });
    expect(off.json).toMatchObject({ disabled: true });
    expect((await call(listProjectsRoute, { cookie })).status).toBe(401);
    await expect(signIn("rosa.quintana@example.test", "basalt lantern orchard tide")).rejects.toThrow(/sign-in failed/);
    expect((await call(patchUserRoute, { method: "PATCH", params: { userId: invitedId }, cookie: w.cookies.admin, body: { disabled: false } })).json.disabled).toBe(false);
    expect(await signIn("rosa.quintana@example.test", "basalt lantern orchard tide")).toContain("session");
  });

  test("force sign-out ends every session; a reset link is e-mailed; the last site admin cannot disable or demote themself", async () => {
    const cookie = await signIn("rosa.quintana@example.test", "basalt lantern orchard tide");
    const out = await call(signOutRoute, { method: "POST", params: { userId: invitedId }, cookie: w.cookies.admin });
    expect(out.json.sessionsEnded).toBeGreaterThanOrEqual(1);
    expect((await getDb().select().from(session).where(eq(session.userId, invitedId))).length).toBe(0);
    expect((await call(listProjectsRoute, { cookie })).status).toBe(401);
    const reset = await call(resetRoute, { method: "POST", params: { userId: invitedId }, cookie: w.cookies.admin });
    expect(reset.json.mail.sent).toBe(true);
    expect(linkContaining((await waitMail("rosa.quintana@example.test")).text, "/set-password/")).toBeDefined();
    // Every other admin in this database is disabled for the check, then restored.
    const others = (await getDb().select({ id: user.id }).from(user).where(eq(user.role, "admin"))).filter((u) => u.id !== w.userIds.admin);
    for (const o of others) await getDb().update(user).set({ banned: true }).where(eq(user.id, o.id));
    const self = await call(patchUserRoute, { method: "PATCH", params: { userId: w.userIds.admin }, cookie: w.cookies.admin, body: { disabled: true } });
    expect(self.status).toBe(409);
    expect(self.json.error.message).toBe("You are the last site admin: make someone else a site admin first.");
    expect((await call(patchUserRoute, { method: "PATCH", params: { userId: w.userIds.admin }, cookie: w.cookies.admin, body: { siteAdmin: false } })).status).toBe(409);
    // With a second admin, the first may step down.
    expect((await call(patchUserRoute, { method: "PATCH", params: { userId: invitedId }, cookie: w.cookies.admin, body: { siteAdmin: true } })).json.siteAdmin).toBe(true);
    expect((await call(patchUserRoute, { method: "PATCH", params: { userId: w.userIds.admin }, cookie: w.cookies.admin, body: { siteAdmin: false } })).status).toBe(200);
    await getDb().update(user).set({ role: "admin" }).where(eq(user.id, w.userIds.admin));
    for (const o of others) await getDb().update(user).set({ banned: false }).where(eq(user.id, o.id));
  });
});
