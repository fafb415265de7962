/**
 * Access matrix generated from the route files under app/api (issue 12): every exported method of every route.ts
 * must have a row in ACCESS below — a new route without one fails this test — and every row is exercised as no
 * session, a member of another project, each project role and a site admin. The expected status follows from the
 * permission table (lib/dal/permissions.ts): no session 401, non-member 404, member without the permission 403 — for
 * state-changing routes before the body is even looked at — and allowed callers never 401/403/500. Cross-project ids
 * in the URL and in the body are checked separately.
 */
import { beforeAll, describe, expect, test } from "vitest";
import { PERMISSIONS, type Permission } from "@/lib/dal/permissions";
import type { ProjectRole } from "@/db/schema";
import { call, makeWorld, type World } from "../helpers/app";

type Access = Permission | "public" | "signed-in" | "site-admin" | "auth" | "reference.import:any";

/** METHOD path → who may call it. Paths as in app/api with [params]. */
const ACCESS: Record<string, Access> = {
  "GET /api/auth/[...all]": "auth",
  "POST /api/auth/[...all]": "auth",
  "GET /api/admin/users": "site-admin",
  "POST /api/admin/users": "site-admin",
  "PATCH /api/admin/users/[userId]": "site-admin",
  "POST /api/admin/users/[userId]/sign-out": "site-admin",
  "POST /api/admin/users/[userId]/password-reset": "site-admin",
  "GET /api/password-links/[token]": "public",
  "POST /api/password-links/[token]": "public",
  "POST /api/projects": "site-admin",
  "PATCH /api/projects/[projectId]": "project.manage",
  "POST /api/projects/[projectId]/archive": "project.manage",
  "GET /api/health": "public",
  "GET /api/invitations/[token]": "public",
  "GET /api/lab/[token]": "public",
  "POST /api/lab/[token]/receive": "public",
  "POST /api/lab/[token]/scans": "public",
  "GET /api/lab/[token]/manifest": "public",
  "POST /api/invitations/[token]": "public",
  "GET /api/projects": "signed-in",
  "GET /api/projects/[projectId]": "project.read",
  "GET /api/projects/[projectId]/audit": "audit.read",
  "GET /api/projects/[projectId]/audit/export": "audit.read",
  "GET /api/projects/[projectId]/exports/[format]": "export.read",
  "PATCH /api/projects/[projectId]/members/[userId]": "project.manage",
  "DELETE /api/projects/[projectId]/members/[userId]": "project.manage",
  "DELETE /api/projects/[projectId]/members/invitations/[invitationId]": "project.manage",
  "GET /api/projects/[projectId]/members": "project.read",
  "POST /api/projects/[projectId]/members": "project.manage",
  "GET /api/projects/[projectId]/phase-map/minerals": "project.read",
  "GET /api/projects/[projectId]/phase-map": "project.read",
  "GET /api/projects/[projectId]/phase-map/stations/[stationKey]": "project.read",
  "GET /api/projects/[projectId]/photos/[photoId]/[variant]": "project.read",
  "POST /api/projects/[projectId]/photos/[photoId]/apply-location": "sample.write",
  "GET /api/projects/[projectId]/photos/[photoId]": "project.read",
  "PATCH /api/projects/[projectId]/photos/[photoId]": "sample.write",
  "DELETE /api/projects/[projectId]/photos/[photoId]": "sample.write",
  "POST /api/projects/[projectId]/photo-uploads": "sample.write",
  "HEAD /api/projects/[projectId]/photo-uploads/[uploadId]": "sample.write",
  "PATCH /api/projects/[projectId]/photo-uploads/[uploadId]": "sample.write",
  "DELETE /api/projects/[projectId]/photo-uploads/[uploadId]": "sample.write",
  "GET /api/projects/[projectId]/samples/[sampleId]/custody": "project.read",
  "POST /api/projects/[projectId]/samples/[sampleId]/custody": "custody.write",
  "GET /api/projects/[projectId]/samples/[sampleId]/photos": "project.read",
  "POST /api/projects/[projectId]/samples/[sampleId]/photos": "sample.write",
  "GET /api/projects/[projectId]/samples/[sampleId]": "project.read",
  "PATCH /api/projects/[projectId]/samples/[sampleId]": "sample.write",
  "GET /api/projects/[projectId]/samples/export": "export.read",
  "POST /api/projects/[projectId]/samples/import": "sample.write",
  "GET /api/projects/[projectId]/samples": "project.read",
  "GET /api/projects/[projectId]/sample-code-blocks": "sample.write",
  "POST /api/projects/[projectId]/sample-code-blocks": "sample.write",
  "POST /api/projects/[projectId]/samples": "sample.write",
  "GET /api/projects/[projectId]/scans/[scanId]/file": "project.read",
  "PATCH /api/projects/[projectId]/scans/[scanId]/note": "phase.review",
  "PATCH /api/projects/[projectId]/scans/[scanId]/phases/[phaseId]": "phase.review",
  "POST /api/projects/[projectId]/scans/[scanId]/phases": "phase.review",
  "POST /api/projects/[projectId]/scans/[scanId]/process": "scan.write",
  "POST /api/projects/[projectId]/scans/[scanId]/refit": "phase.review",
  // The route lets members through; the DAL allows a lead, a site admin or the signing analyst (custody-and-review tests).
  "POST /api/projects/[projectId]/scans/[scanId]/reopen": "project.read",
  "GET /api/projects/[projectId]/scans/[scanId]/sign-offs": "project.read",
  "GET /api/projects/[projectId]/scans/[scanId]": "project.read",
  "PATCH /api/projects/[projectId]/scans/[scanId]": "phase.review",
  "POST /api/projects/[projectId]/scans/[scanId]/sign-off": "phase.review",
  "POST /api/projects/[projectId]/scans/bulk": "scan.write",
  "GET /api/projects/[projectId]/scans": "project.read",
  "POST /api/projects/[projectId]/scans": "scan.write",
  "DELETE /api/projects/[projectId]/share-links/[linkId]": "share.manage",
  "GET /api/projects/[projectId]/share-links": "share.manage",
  "POST /api/projects/[projectId]/share-links": "share.manage",
  "GET /api/projects/[projectId]/stations/[stationId]/photos": "project.read",
  "POST /api/projects/[projectId]/stations/[stationId]/photos": "station.write",
  "GET /api/projects/[projectId]/stations/[stationId]": "project.read",
  "PATCH /api/projects/[projectId]/stations/[stationId]": "station.write",
  "DELETE /api/projects/[projectId]/stations/[stationId]/structures/[structureId]": "station.write",
  "PATCH /api/projects/[projectId]/stations/[stationId]/structures/[structureId]": "station.write",
  "GET /api/projects/[projectId]/stations/[stationId]/structures": "project.read",
  "POST /api/projects/[projectId]/stations/[stationId]/structures": "station.write",
  "GET /api/projects/[projectId]/stations": "project.read",
  "GET /api/projects/[projectId]/structures": "project.read",
  "POST /api/projects/[projectId]/stations": "station.write",
  "POST /api/projects/[projectId]/submissions/[submissionId]/custody": "custody.write",
  "GET /api/projects/[projectId]/submissions/[submissionId]/lab-link": "submission.write",
  "DELETE /api/projects/[projectId]/submissions/[submissionId]/lab-link": "submission.write",
  "GET /api/projects/[projectId]/submissions/[submissionId]/manifest": "project.read",
  "POST /api/projects/[projectId]/submissions/[submissionId]/receive": "lab.intake",
  "GET /api/projects/[projectId]/submissions/[submissionId]": "project.read",
  "POST /api/projects/[projectId]/submissions/[submissionId]/samples/[sampleId]/custody": "custody.write",
  "POST /api/projects/[projectId]/submissions/[submissionId]/send": "submission.write",
  "GET /api/projects/[projectId]/submissions": "project.read",
  "POST /api/projects/[projectId]/submissions": "submission.write",
  "DELETE /api/projects/[projectId]/tile-packages/[pkgId]": "tiles.manage",
  "GET /api/projects/[projectId]/tile-packages/[pkgId]/tiles/[z]/[x]/[y]": "project.read",
  "GET /api/projects/[projectId]/tile-packages": "project.read",
  "POST /api/projects/[projectId]/tile-packages": "tiles.manage",
  "GET /api/reference-phases/[referenceId]/cif": "signed-in",
  "GET /api/reference-phases/[referenceId]": "signed-in",
  "POST /api/reference-phases/import": "reference.import:any",
  "GET /api/reference-phases": "signed-in",
  "GET /api/share/[token]/export/[format]": "public",
};

const METHODS = ["GET", "HEAD", "POST", "PUT", "PATCH", "DELETE"] as const;
// eslint-disable-next-line @typescript-eslint/no-explicit-any
type Handler = (req: Request, ctx: { params: Promise<any> }) => Promise<Response>;

/** Every route module under app/api, loaded by vite's glob import (the file list is the source of truth). */
const modules = import.meta.glob<Record<string, unknown>>("/app/api/**/route.ts");
const routes: { key: string; path: string; method: string; load: () => Promise<Handler> }[] = [];
for (const [file, load] of Object.entries(modules)) {
  const path = file.replace(/^\/app/, "").replace(/\/route\.ts$/, "");
  for (const method of METHODS) routes.push({ key: `${method} ${path}`, path, method, load: async () => (await load())[method] as Handler });
}

const FAKE_ID = "00000000-0000-4000-8000-000000000000";
function paramsFor(path: string, projectId: string): Record<string, string> {
  const out: Record<string, string> = {};
  for (const [, name] of path.matchAll(/\[([^\]]+)\]/g)) {
    out[name] = name === "projectId" ? projectId : name === "format" ? "csv" : name === "variant" ? "thumb" : ["z", "x", "y"].includes(name) ? "0" : FAKE_ID;
  }
  return out;
}

let w: World;
beforeAll(async () => {
  w = await makeWorld();
});

describe("every route file has a row in the access matrix", () => {
  test("route × method found in app/api ⇔ row in ACCESS", async () => {
    const found: string[] = [];
    for (const r of routes) if (typeof (await r.load()) === "function") found.push(r.key);
    expect(found.length).toBeGreaterThan(60);
    const missing = found.filter((k) => !(k in ACCESS));
    const stale = Object.keys(ACCESS).filter((k) => !found.includes(k));
    expect(missing, "routes without a row in ACCESS (add one)").toEqual([]);
    expect(stale, "rows in ACCESS without a route").toEqual([]);
  });
});

const ROLES: (ProjectRole | "admin")[] = ["lead", "field_geologist", "lab_analyst", "consultant", "admin"];
const allowed = (role: ProjectRole | "admin", p: Permission) => role === "admin" || (PERMISSIONS[p].roles as readonly string[]).includes(role);

describe("every route × every caller", () => {
  test.each(Object.entries(ACCESS).filter(([, a]) => a !== "auth"))("%s (%s)", async (key, access) => {
    const route = routes.find((r) => r.key === key)!;
    const handler = await route.load();
    const [method] = key.split(" ");
    const unsafe = method !== "GET" && method !== "HEAD";
    const ask = async (cookie?: string) => {
      const r = await call(handler, { method, params: paramsFor(route.path, w.projectId), cookie, ...(unsafe && { body: {} }) });
      return r.status;
    };
    if (access === "public") {
      expect(await ask()).not.toBe(500);
      return;
    }
    expect(await ask(), "no session").toBe(401);
    if (access === "signed-in") {
      for (const who of [...ROLES, "outsider"] as const) expect([401, 403, 500], who).not.toContain(await ask(w.cookies[who]));
      return;
    }
    if (access === "site-admin") {
      for (const who of [...ROLES, "outsider"] as const) {
        const st = await ask(w.cookies[who]);
        if (who === "admin") expect([401, 403, 500], who).not.toContain(st);
        else expect(st, who).toBe(403);
      }
      return;
    }
    if (access === "reference.import:any") {
      for (const who of [...ROLES, "outsider"] as const) {
        const s = await ask(w.cookies[who]);
        // the outsider leads another project: a lead may not import, so 403 as well
        if (who === "admin" || who === "lab_analyst") expect([401, 403, 500], who).not.toContain(s);
        else expect(s, who).toBe(403);
      }
      return;
    }
    expect(await ask(w.cookies.outsider), "member of another project").toBe(404);
    for (const role of ROLES) {
      const s = await ask(w.cookies[role]);
      if (allowed(role, access as Permission)) expect([401, 403, 500], `${role} is allowed ${access}`).not.toContain(s);
      else expect(s, `${role} lacks ${access}`).toBe(403);
    }
  });
});

describe("ids of another project in the URL or the body", () => {
  test("a lead of this project cannot read, edit or use another project's samples and stations", async () => {
    const { GET: getSample, PATCH: patchSample } = await import("@/app/api/projects/[projectId]/samples/[sampleId]/route");
    const { POST: createSample } = await import("@/app/api/projects/[projectId]/samples/route");
    const { GET: getStation } = await import("@/app/api/projects/[projectId]/stations/[stationId]/route");
    const { POST: createSubmission } = await import("@/app/api/projects/[projectId]/submissions/route");
    const { POST: createStation } = await import("@/app/api/projects/[projectId]/stations/route");
    // records of the other project, made by the site admin
    const st = await call(createStation, { method: "POST", params: { projectId: w.otherProjectId }, cookie: w.cookies.admin, body: { lat: 1, lon: 1 } });
    const sa = await call(createSample, { method: "POST", params: { projectId: w.otherProjectId }, cookie: w.cookies.admin, body: { sampleType: "soil" } });
    expect([st.status, sa.status]).toEqual([201, 201]);
    const lead = w.cookies.lead;
    // their ids under this project's URL
    expect((await call(getSample, { params: { projectId: w.projectId, sampleId: sa.json.id }, cookie: lead })).status).toBe(404);
    expect((await call(patchSample, { method: "PATCH", params: { projectId: w.projectId, sampleId: sa.json.id }, cookie: lead, body: { version: 1, description: "x" } })).status).toBe(404);
    expect((await call(getStation, { params: { projectId: w.projectId, stationId: st.json.id }, cookie: lead })).status).toBe(404);
    // their ids in the body of a request to this project
    const sub = await call(createSubmission, { method: "POST", params: { projectId: w.projectId }, cookie: lead, body: { sampleIds: [sa.json.id], requestedAnalysis: ["XRD"] } });
    expect(sub.status).toBeGreaterThanOrEqual(400);
    expect(sub.status).toBeLessThan(500);
    const mine = await call(createSample, { method: "POST", params: { projectId: w.projectId }, cookie: lead, body: { sampleType: "soil", stationId: st.json.id } });
    expect(mine.status).toBeGreaterThanOrEqual(400);
    expect(mine.status).toBeLessThan(500);
    // the outsider (lead of the other project) with this project's ids: 404 whatever is in the body
    expect((await call(getSample, { params: { projectId: w.projectId, sampleId: sa.json.id }, cookie: w.cookies.outsider })).status).toBe(404);
    expect((await call(createSubmission, { method: "POST", params: { projectId: w.projectId }, cookie: w.cookies.outsider, body: { sampleIds: [sa.json.id] } })).status).toBe(404);
  });
});
