import { beforeAll, describe, expect, test } from "vitest";
import { GET as listProjects } from "@/app/api/projects/route";
import { GET as getProject } from "@/app/api/projects/[projectId]/route";
import { GET as listSamples, POST as createSample } from "@/app/api/projects/[projectId]/samples/route";
import { GET as getSample, PATCH as patchSample } from "@/app/api/projects/[projectId]/samples/[sampleId]/route";
import { GET as listSubmissions, POST as createSubmission } from "@/app/api/projects/[projectId]/submissions/route";
import { GET as sampleCustody } from "@/app/api/projects/[projectId]/samples/[sampleId]/custody/route";
import { GET as listMembers, POST as inviteMember } from "@/app/api/projects/[projectId]/members/route";
import { GET as exportSamples } from "@/app/api/projects/[projectId]/samples/export/route";
import { POST as importSamples } from "@/app/api/projects/[projectId]/samples/import/route";
import { GET as listTilePackages } from "@/app/api/projects/[projectId]/tile-packages/route";
import { GET as listStations, POST as createStation } from "@/app/api/projects/[projectId]/stations/route";
import { PATCH as patchStation } from "@/app/api/projects/[projectId]/stations/[stationId]/route";
import { POST as addStructure } from "@/app/api/projects/[projectId]/stations/[stationId]/structures/route";
import { GET as listScans, POST as uploadScan } from "@/app/api/projects/[projectId]/scans/route";
import { POST as refitScan } from "@/app/api/projects/[projectId]/scans/[scanId]/refit/route";
import { GET as phaseMap } from "@/app/api/projects/[projectId]/phase-map/route";
import { GET as exportFormat } from "@/app/api/projects/[projectId]/exports/[format]/route";
import { GET as listShareLinks, POST as createShareLink } from "@/app/api/projects/[projectId]/share-links/route";
import { GET as auditLogRoute } from "@/app/api/projects/[projectId]/audit/route";
import { GET as signOffsRoute } from "@/app/api/projects/[projectId]/scans/[scanId]/sign-offs/route";
import { GET as auditExportRoute } from "@/app/api/projects/[projectId]/audit/export/route";
import { GET as listCodeBlocks, POST as reserveCodeBlock } from "@/app/api/projects/[projectId]/sample-code-blocks/route";
import { POST as openPhotoUpload } from "@/app/api/projects/[projectId]/photo-uploads/route";
import { eq } from "drizzle-orm";
import { getDb } from "@/db";
import { seedReferenceLibrary } from "@/db/seed/reference-library";
import { referencePhases, samples, stations, type ProjectRole } from "@/db/schema";
import { drainProcessingQueue } from "@/lib/jobs";
import { PERMISSIONS, type Permission } from "@/lib/dal/permissions";
import { quartzCalciteXy } from "../fixtures/lab/handbook-scans";
import { call, makeWorld, type World } from "../helpers/app";

/**
 * Every project route × every role. The expected status comes from the permission table in
 * lib/dal/permissions.ts: allowed → 2xx, member without the permission → 403, non-member → 404,
 * no session → 401. Add a row here with each new route.
 */
interface RouteCase {
  name: string;
  // eslint-disable-next-line @typescript-eslint/no-explicit-any
  handler: (req: Request, ctx: { params: Promise<any> }) => Promise<Response>;
  method: string;
  permission: Permission;
  params: (w: World, fixture: Fixture) => Record<string, string>;
  body?: (w: World, fixture: Fixture) => unknown;
  /** Request path with its query, when the route reads one. */
  path?: (w: World, fixture: Fixture) => string;
  headers?: (w: World, fixture: Fixture) => Record<string, string>;
}
interface Fixture {
  sampleId: string;
  stationId: string;
}

const ROUTES: RouteCase[] = [
  ...(["csv", "xlsx", "geojson", "kml"] as const).map(
    (format): RouteCase => ({ name: `GET export ${format}`, handler: exportFormat, method: "GET", permission: "export.read", params: (w) => ({ projectId: w.projectId, format }) }),
  ),
  { name: "GET audit log", handler: auditLogRoute, method: "GET", permission: "audit.read", params: (w) => ({ projectId: w.projectId }) },
  { name: "GET audit CSV", handler: auditExportRoute, method: "GET", permission: "audit.read", params: (w) => ({ projectId: w.projectId }) },
  { name: "GET share links", handler: listShareLinks, method: "GET", permission: "share.manage", params: (w) => ({ projectId: w.projectId }) },
  { name: "POST share link", handler: createShareLink, method: "POST", permission: "share.manage", params: (w) => ({ projectId: w.projectId }), body: () => ({ expiresInDays: 7, filter: { lithology: "gossan" } }) },
  { name: "GET stations", handler: listStations, method: "GET", permission: "project.read", params: (w) => ({ projectId: w.projectId }) },
  { name: "POST stations", handler: createStation, method: "POST", permission: "station.write", params: (w) => ({ projectId: w.projectId }), body: () => ({ name: "Matrix outcrop", lat: 37.71, lon: -6.61 }) },
  { name: "PATCH station (move)", handler: patchStation, method: "PATCH", permission: "station.write", params: (w, f) => ({ projectId: w.projectId, stationId: f.stationId }), body: () => ({ version: 1, lat: 37.72, lon: -6.62 }) },
  {
    name: "POST structure",
    handler: addStructure,
    method: "POST",
    permission: "station.write",
    params: (w, f) => ({ projectId: w.projectId, stationId: f.stationId }),
    body: () => ({ convention: "rhr", feature: "bedding", strike: 30, dip: 40 }),
  },
  { name: "GET scans", handler: listScans, method: "GET", permission: "project.read", params: (w) => ({ projectId: w.projectId }) },
  // Each allowed refit adds a run to the same processed scan (it stays reviewable).
  {
    name: "POST scan refit",
    handler: refitScan,
    method: "POST",
    permission: "phase.review",
    params: (w) => ({ projectId: w.projectId, scanId: review.scanId }),
    body: () => ({ phaseIds: review.phaseIds }),
  },
  // Reopening is allowed per person (lead, admin, the signing analyst): tests/integration/sign-off-versions.route.test.ts.
  { name: "GET scan sign-offs", handler: signOffsRoute, method: "GET", permission: "project.read", params: (w) => ({ projectId: w.projectId, scanId: review.scanId }) },
  { name: "GET phase map", handler: phaseMap, method: "GET", permission: "project.read", params: (w) => ({ projectId: w.projectId }) },
  { name: "GET project", handler: getProject, method: "GET", permission: "project.read", params: (w) => ({ projectId: w.projectId }) },
  { name: "GET samples", handler: listSamples, method: "GET", permission: "project.read", params: (w) => ({ projectId: w.projectId }) },
  { name: "POST samples", handler: createSample, method: "POST", permission: "sample.write", params: (w) => ({ projectId: w.projectId }), body: () => ({ sampleType: "soil" }) },
  { name: "GET sample", handler: getSample, method: "GET", permission: "project.read", params: (w, f) => ({ projectId: w.projectId, sampleId: f.sampleId }) },
  {
    name: "PATCH sample",
    handler: patchSample,
    method: "PATCH",
    permission: "sample.write",
    params: (w, f) => ({ projectId: w.projectId, sampleId: f.sampleId }),
    body: () => ({ version: 1, description: "edited" }),
  },
  // Lab hand-off (stateful steps — send, receive, custody — are covered per role in submissions/custody tests).
  { name: "GET submissions", handler: listSubmissions, method: "GET", permission: "project.read", params: (w) => ({ projectId: w.projectId }) },
  { name: "POST submissions", handler: createSubmission, method: "POST", permission: "submission.write", params: (w) => ({ projectId: w.projectId }), body: (_w, f) => ({ sampleIds: [f.sampleId], requestedAnalysis: ["XRD bulk"] }) },
  { name: "GET sample custody", handler: sampleCustody, method: "GET", permission: "project.read", params: (w, f) => ({ projectId: w.projectId, sampleId: f.sampleId }) },
  { name: "GET members", handler: listMembers, method: "GET", permission: "project.read", params: (w) => ({ projectId: w.projectId }) },
  { name: "POST members (invite)", handler: inviteMember, method: "POST", permission: "project.manage", params: (w) => ({ projectId: w.projectId }), body: () => ({ email: `rm-${crypto.randomUUID().slice(0, 8)}@example.test`, role: "consultant" }) },
  // Register import/export and map layers (uploads need a file body: see tile-packages.route.test.ts).
  { name: "GET samples export", handler: exportSamples, method: "GET", permission: "export.read", params: (w) => ({ projectId: w.projectId }) },
  { name: "POST samples import (preview)", handler: importSamples, method: "POST", permission: "sample.write", params: (w) => ({ projectId: w.projectId }), body: () => ({ csv: "sample_type\nsoil\n" }) },
  // Offline field work: a device's reserved sample codes, and a resumable (tus) photo upload opened for a sample.
  {
    name: "GET sample code blocks",
    handler: listCodeBlocks,
    method: "GET",
    permission: "sample.write",
    params: (w) => ({ projectId: w.projectId }),
    path: (w) => `/api/projects/${w.projectId}/sample-code-blocks?deviceId=matrix-device-0001`,
  },
  // A new device each time, so no call meets the per-device cap of unused codes.
  { name: "POST sample code block", handler: reserveCodeBlock, method: "POST", permission: "sample.write", params: (w) => ({ projectId: w.projectId }), body: () => ({ deviceId: crypto.randomUUID(), size: 5 }) },
  {
    name: "POST photo upload (open)",
    handler: openPhotoUpload,
    method: "POST",
    permission: "sample.write",
    params: (w) => ({ projectId: w.projectId }),
    headers: (_w, f) => ({ "tus-resumable": "1.0.0", "upload-length": "1024", "upload-metadata": tusMetadata({ clientPhotoId: crypto.randomUUID(), sampleId: f.sampleId, filename: "outcrop.jpg" }) }),
  },
  { name: "GET tile packages", handler: listTilePackages, method: "GET", permission: "project.read", params: (w) => ({ projectId: w.projectId }) },
];

/** tus 1.0.0 Upload-Metadata: comma-separated "key base64(value)" pairs. */
const tusMetadata = (m: Record<string, string>) =>
  Object.entries(m)
    .map(([k, v]) => `${k} ${Buffer.from(v, "utf8").toString("base64")}`)
    .join(",");

const ROLES: (ProjectRole | "admin" | "outsider")[] = ["lead", "field_geologist", "lab_analyst", "consultant", "admin", "outsider"];

let w: World;
/** A processed scan (handbook quartz + calcite, tests/fixtures/lab/handbook-scans.ts) and the phases to refit it with. */
const review = { scanId: "", phaseIds: [] as string[] };
beforeAll(async () => {
  w = await makeWorld();
  await seedReferenceLibrary();
  const [s] = await getDb().insert(samples).values({ projectId: w.projectId, code: "RM-SCAN-1", sampleType: "chip", status: "prepared" }).returning();
  const f = new FormData();
  f.set("sampleId", s.id);
  f.append("file", new Blob([quartzCalciteXy()]), "RM-SCAN-1.xy");
  const up = await call(uploadScan, { method: "POST", params: { projectId: w.projectId }, cookie: w.cookies.lab_analyst, rawBody: f });
  if (up.status !== 201) throw new Error(`fixture scan upload failed: ${JSON.stringify(up.json)}`);
  await drainProcessingQueue();
  review.scanId = up.json.scan.id;
  const phases = await getDb().select({ id: referencePhases.id, mineral: referencePhases.mineral }).from(referencePhases).where(eq(referencePhases.builtin, true));
  review.phaseIds = phases.filter((p) => p.mineral === "quartz" || p.mineral === "calcite").map((p) => p.id);
});

/** A fresh sample per call so PATCH with version 1 is always current. */
async function fixture(): Promise<Fixture> {
  const [s] = await getDb().insert(samples).values({ projectId: w.projectId, code: `RM-${crypto.randomUUID().slice(0, 8).toUpperCase()}`, sampleType: "chip" }).returning();
  const [st] = await getDb().insert(stations).values({ projectId: w.projectId, code: `RM-ST-${crypto.randomUUID().slice(0, 8).toUpperCase()}`, lat: 37.7, lon: -6.6 }).returning();
  return { sampleId: s.id, stationId: st.id };
}

function expected(role: (typeof ROLES)[number], permission: Permission): number | "2xx" {
  if (role === "outsider") return 404;
  if (role === "admin") return "2xx";
  return (PERMISSIONS[permission].roles as readonly string[]).includes(role) ? "2xx" : 403;
}

describe("role matrix: every route × every role", () => {
  for (const route of ROUTES) {
    for (const role of ROLES) {
      const want = expected(role, route.permission);
      test(`${route.name} as ${role} → ${want}`, async () => {
        const f = await fixture();
        const r = await call(route.handler, { method: route.method, path: route.path?.(w, f), params: route.params(w, f), cookie: w.cookies[role], body: route.body?.(w, f), headers: route.headers?.(w, f) });
        if (want === "2xx") expect(r.status, JSON.stringify(r.json)).toBeGreaterThanOrEqual(200);
        if (want === "2xx") expect(r.status).toBeLessThan(300);
        else expect(r.status).toBe(want);
      });
    }
    test(`${route.name} without a session → 401`, async () => {
      const f = await fixture();
      const r = await call(route.handler, { method: route.method, path: route.path?.(w, f), params: route.params(w, f), body: route.body?.(w, f), headers: route.headers?.(w, f) });
      expect(r.status).toBe(401);
      expect(r.json.error.code).toBe("unauthorized");
    });
  }

  test("the project list shows only the caller's projects", async () => {
    const outsider = await call(listProjects, { cookie: w.cookies.outsider });
    expect(outsider.json.items.map((p: { id: string }) => p.id)).toEqual([w.otherProjectId]);
    const admin = await call(listProjects, { cookie: w.cookies.admin });
    expect(admin.json.items.map((p: { id: string }) => p.id)).toEqual(expect.arrayContaining([w.projectId, w.otherProjectId]));
  });
});
