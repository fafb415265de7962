import { execFileSync } from "node:child_process";
import { randomBytes } from "node:crypto";
import { eq } from "drizzle-orm";
import Papa from "papaparse";
import { beforeAll, describe, expect, test } from "vitest";
import { getDb } from "@/db";
import { shareLinks } from "@/db/schema";
import { GET as goneRoute } from "@/app/share/[token]/gone/route";
import { DELETE as revokeRoute } from "@/app/api/projects/[projectId]/share-links/[linkId]/route";
import { GET as listRoute, POST as createLinkRoute } from "@/app/api/projects/[projectId]/share-links/route";
import { POST as createRoute } from "@/app/api/projects/[projectId]/samples/route";
import { GET as sharedExportRoute } from "@/app/api/share/[token]/export/[format]/route";
import { getSharedRegister } from "@/lib/dal/share-links";
import { call, makeWorld, type World } from "../helpers/app";
import { addScan } from "../helpers/phase-fixtures";

// Invented samples; a share link for "pyrite confirmed" must show exactly the samples where pyrite was confirmed.
let w: World;
beforeAll(async () => {
  w = await makeWorld();
  const ids: string[] = [];
  for (const [code, lat] of [["SHR-001", 37.70], ["SHR-002", 37.71], ["SHR-003", 37.72]] as const) {
    const r = await call(createRoute, { method: "POST", params: { projectId: w.projectId }, cookie: w.cookies.lead, body: { code, sampleType: "hand_sample", lat, lon: -6.6 } });
    ids.push(r.json.id);
  }
  await addScan(w.projectId, ids[0], { signedOff: true, phases: [{ mineral: "pyrite", status: "accepted", rank: 1, wt: 40 }, { mineral: "quartz", status: "accepted", rank: 2, wt: 60 }] });
  await addScan(w.projectId, ids[1], { signedOff: false, phases: [{ mineral: "pyrite", status: "candidate", rank: 1 }] });
  await addScan(w.projectId, ids[2], { signedOff: true, phases: [{ mineral: "quartz", status: "accepted", rank: 1, wt: 100 }] });
});

const create = (body: unknown, cookie = w.cookies.lead) => call(createLinkRoute, { method: "POST", path: "/", params: { projectId: w.projectId }, cookie, body });
const shared = (token: string, format = "csv") => call(sharedExportRoute, { path: "/", params: { token, format } });
const codes = (csv: string) => Papa.parse<Record<string, string>>(csv.replace(/^\uFEFF/, ""), { header: true, skipEmptyLines: true }).data.map((r) => r.code);

describe("share links", () => {
  test("a lead creates a link; the token is 32 random bytes (base64url) and only its SHA-256 is stored", async () => {
    const r = await create({ label: "Review for consultant", expiresInDays: 7, filter: { mineral: "pyrite", page: "3" } });
    expect(r.status).toBe(201);
    expect(r.json.token).toMatch(/^[A-Za-z0-9_-]{43}$/);
    expect(Buffer.from(r.json.token, "base64url")).toHaveLength(32);
    expect(r.json.url).toBe(`http://localhost:3000/share/${r.json.token}`);
    expect(r.json.filter).toEqual({ mineral: "pyrite", phase: "confirmed", leading: "3", sort: "code", dir: "asc" });
    const [row] = await getDb().select().from(shareLinks).where(eq(shareLinks.id, r.json.id));
    // Independent check with coreutils' sha256sum (FIPS 180-4 SHA-256).
    const expected = execFileSync("sha256sum", { input: r.json.token }).toString().split(" ")[0];
    expect(row.tokenHash).toBe(expected);
    expect(JSON.stringify(row)).not.toContain(r.json.token);
    expect(row.expiresAt.getTime() - Date.now()).toBeGreaterThan(6.9 * 86_400_000);
  });

  test("valid link: the public export holds only the filtered rows, in every format, without links into the app", async () => {
    const { json } = await create({ filter: { mineral: "pyrite" } });
    const csv = await shared(json.token);
    expect(csv.status).toBe(200);
    expect(codes(csv.json)).toEqual(["SHR-001"]);
    const geo = await shared(json.token, "geojson");
    expect(geo.json.features.map((f: { id: string }) => f.id)).toEqual(["SHR-001"]);
    expect(geo.json.features[0].properties.url).toBeUndefined();
    for (const format of ["xlsx", "kml", "pdf"]) expect((await shared(json.token, format)).status, format).toBe(200);
    expect((await shared(json.token, "docx")).status).toBe(422);
    const page = await getSharedRegister(json.token, "1");
    expect(page.total).toBe(1);
    expect(page.rows.map((r) => r.code)).toEqual(["SHR-001"]);
    expect(page.rows[0].phases.confirmed.map((p) => p.symbol)).toEqual(["Qz", "Py"]);
    expect(page.rows[0]).not.toHaveProperty("id");
  });

  test("a candidate link (phase=any) widens to samples where pyrite awaits review", async () => {
    const { json } = await create({ filter: { mineral: "pyrite", phase: "any" } });
    expect(codes((await shared(json.token)).json)).toEqual(["SHR-001", "SHR-002"]);
  });

  test("revoked → 410; expired → 410; unknown or malformed → 404; the gone page says why", async () => {
    const a = (await create({ filter: {} })).json;
    const rev = await call(revokeRoute, { method: "DELETE", params: { projectId: w.projectId, linkId: a.id }, cookie: w.cookies.lead });
    expect(rev.status).toBe(200);
    expect(rev.json.state).toBe("revoked");
    const r1 = await shared(a.token);
    expect(r1.status).toBe(410);
    expect(r1.json.error).toMatchObject({ code: "gone", details: { reason: "revoked" } });
    await expect(getSharedRegister(a.token, 1)).rejects.toMatchObject({ code: "gone" });

    const b = (await create({ filter: {}, expiresInDays: 1 })).json;
    await getDb().update(shareLinks).set({ expiresAt: new Date(Date.now() - 1000) }).where(eq(shareLinks.id, b.id));
    const r2 = await shared(b.token);
    expect(r2.status).toBe(410);
    expect(r2.json.error.details.reason).toBe("expired");

    expect((await shared(randomBytes(32).toString("base64url"))).status).toBe(404);
    expect((await shared("not-a-token")).status).toBe(404);

    const gone = await call(goneRoute, { path: `/share/${a.token}/gone`, params: { token: a.token } });
    expect(gone.status).toBe(410);
    expect(gone.headers.get("content-type")).toContain("text/html");
    expect(gone.json).toContain("This link was revoked");
    const expired = await call(goneRoute, { path: `/share/${b.token}/gone`, params: { token: b.token } });
    expect(expired.status).toBe(410);
    expect(expired.json).toContain("expired");
    expect((await call(goneRoute, { path: "/share/x/gone", params: { token: randomBytes(32).toString("base64url") } })).status).toBe(404);
  });

  test("only leads manage links: list shows states; consultant and others 403; outsider 404; bad input 422 with the field", async () => {
    const list = await call(listRoute, { params: { projectId: w.projectId }, cookie: w.cookies.lead });
    expect(list.status).toBe(200);
    expect(new Set(list.json.items.map((l: { state: string }) => l.state))).toEqual(new Set(["active", "revoked", "expired"]));
    expect(list.json.items.every((l: Record<string, unknown>) => !("token" in l) && !("tokenHash" in l))).toBe(true);
    for (const who of ["field_geologist", "lab_analyst", "consultant"] as const) {
      expect((await call(listRoute, { params: { projectId: w.projectId }, cookie: w.cookies[who] })).status, who).toBe(403);
      expect((await create({ filter: {} }, w.cookies[who])).status, who).toBe(403);
    }
    expect((await create({ filter: {} }, w.cookies.outsider)).status).toBe(404);
    expect((await call(listRoute, { params: { projectId: w.projectId } })).status).toBe(401);
    const bad = await create({ expiresInDays: 0, filter: {} });
    expect(bad.status).toBe(422);
    expect(bad.json.error.fields.expiresInDays).toBeDefined();
    const badFilter = await create({ filter: { phase: "sometimes" } });
    expect(badFilter.status).toBe(422);
    expect(badFilter.json.error.fields.phase).toBeDefined();
    const other = await call(revokeRoute, { method: "DELETE", params: { projectId: w.projectId, linkId: "no-such-link" }, cookie: w.cookies.lead });
    expect(other.status).toBe(404);
  });
});
