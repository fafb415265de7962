import { readFileSync } from "node:fs";
import { join } from "node:path";
import { and, asc, eq, sql } from "drizzle-orm";
import Papa from "papaparse";
import { beforeAll, describe, expect, test } from "vitest";
import { POST as uploadRoute } from "@/app/api/projects/[projectId]/scans/route";
import { GET as getRoute } from "@/app/api/projects/[projectId]/scans/[scanId]/route";
import { PATCH as decideRoute } from "@/app/api/projects/[projectId]/scans/[scanId]/phases/[phaseId]/route";
import { POST as manualRoute } from "@/app/api/projects/[projectId]/scans/[scanId]/phases/route";
import { POST as signOffRoute } from "@/app/api/projects/[projectId]/scans/[scanId]/sign-off/route";
import { POST as reopenRoute } from "@/app/api/projects/[projectId]/scans/[scanId]/reopen/route";
import { GET as historyRoute } from "@/app/api/projects/[projectId]/scans/[scanId]/sign-offs/route";
import { GET as exportRoute } from "@/app/api/projects/[projectId]/exports/[format]/route";
import { getDb } from "@/db";
import { seedReferenceLibrary } from "@/db/seed/reference-library";
import { custodyEvents, projectMembers, referencePhases, samples, scanSignOffs } from "@/db/schema";
import type { SignOffRecord } from "@/lib/dal/scan-review";
import { drainProcessingQueue } from "@/lib/jobs";
import { createUserWithPassword } from "@/lib/users";
import { call, makeWorld, PASSWORD, signIn, type World } from "../helpers/app";

// Issue 11 §5: a sign-off can be reopened by a lead or the signing analyst with a reason; every sign-off is kept as a
// version; the map and exports use the latest; every accepted phase carries a wt% or says why not, and the wt% of the
// accepted phases are recomputed together by the whole-pattern fit (refit with options.phaseIds).

process.env.LITHODEX_JOBS = "manual";

/** Synthetic scan made with cctbx (tests/fixtures/scans/forsterite-marble.md): calcite 60, dolomite 25, forsterite 15 wt%. */
const MARBLE = readFileSync(join(import.meta.dirname, "../fixtures/scans/forsterite-marble.xy"), "utf8");

interface Phase {
  id: string;
  referencePhaseId: string;
  mineral: string;
  status: string;
  fitted: boolean;
  wtPercent: number | null;
}

let w: World;
let scanId = "";
let sampleId = "";
let sampleCode = "";
let otherAnalyst = "";
const P = () => ({ projectId: w.projectId, scanId });
const detail = async () => (await call(getRoute, { params: P(), cookie: w.cookies.lab_analyst })).json as { scan: { status: string; currentRunId: string; signOffJson: SignOffRecord | null }; run: { id: string; phases: Phase[] } };
const decide = (phaseId: string, status: string) => call(decideRoute, { method: "PATCH", params: { ...P(), phaseId }, cookie: w.cookies.lab_analyst, body: { status } });
const signOff = (note?: string) => call(signOffRoute, { method: "POST", params: P(), cookie: w.cookies.lab_analyst, body: { confirm: true, ...(note && { note }) } });
const reopen = (cookie: string, body: unknown = { reason: "Forsterite lines are from the mount; recheck without it." }) => call(reopenRoute, { method: "POST", params: P(), cookie, body });
const history = async () => (await call(historyRoute, { params: P(), cookie: w.cookies.consultant })).json as { items: { version: number; current: boolean; reopenReason: string | null; reopenedByName: string | null; signedByName: string | null; record: SignOffRecord }[] };
async function confirmedInExport(): Promise<string> {
  const res = await call(exportRoute, { params: { projectId: w.projectId, format: "csv" }, cookie: w.cookies.consultant });
  const rows = Papa.parse<Record<string, string>>(String(res.json).replace(/^\uFEFF/, ""), { header: true, skipEmptyLines: true }).data;
  return rows.find((r) => r.code === sampleCode)?.confirmed_phases ?? "";
}

beforeAll(async () => {
  await seedReferenceLibrary();
  w = await makeWorld();
  const [s] = await getDb().insert(samples).values({ projectId: w.projectId, code: "SV-000001", sampleType: "hand_sample", status: "received" }).returning();
  sampleId = s.id;
  sampleCode = s.code;
  const f = new FormData();
  f.set("sampleId", s.id);
  f.set("anode", "Cu");
  f.append("file", new Blob([MARBLE], { type: "text/plain" }), "forsterite-marble.xy");
  const up = await call(uploadRoute, { method: "POST", params: { projectId: w.projectId }, cookie: w.cookies.lab_analyst, rawBody: f });
  expect(up.status, JSON.stringify(up.json)).toBe(201);
  scanId = up.json.scan.id;
  await drainProcessingQueue();
  const u = await createUserWithPassword({ email: `second.analyst.${Date.now()}@example.test`, name: "Second analyst", password: PASSWORD });
  await getDb().insert(projectMembers).values({ projectId: w.projectId, userId: u.id, role: "lab_analyst" });
  otherAnalyst = await signIn(u.email);
});

describe("versioned sign-offs, reopening and the latest used everywhere", () => {
  test("version 1: the fitted phases accepted as they are; the record has a wt% for each and no recompute", async () => {
    const d = await detail();
    const fitted = d.run.phases.filter((p) => p.fitted);
    expect(fitted.map((p) => p.mineral).sort()).toEqual(["calcite", "dolomite", "forsterite"]);
    for (const p of fitted) expect((await decide(p.id, "accepted")).status).toBe(200);
    const r = await signOff("First pass");
    expect(r.status, JSON.stringify(r.json)).toBe(200);
    expect(r.json).toMatchObject({ version: 1, recomputed: false });
    const rec = (await detail()).scan.signOffJson!;
    expect(rec.version).toBe(1);
    expect(rec.phases.every((p) => p.wtPercent != null)).toBe(true);
    expect(rec.phases.reduce((a, p) => a + p.wtPercent!, 0)).toBeCloseTo(100, 0);
    expect(await confirmedInExport()).toMatch(/calcite .*dolomite .*forsterite/);
  });

  test("only a lead, a site admin or the signing analyst may reopen, and only with a reason", async () => {
    for (const who of ["field_geologist", "consultant"] as const) expect((await reopen(w.cookies[who])).status, who).toBe(403);
    expect((await reopen(otherAnalyst)).status, "an analyst who did not sign").toBe(403);
    const noReason = await reopen(w.cookies.lead, {});
    expect(noReason.status).toBe(422);
    expect(noReason.json.error.fields.reason[0]).toMatch(/Say why/);
    expect((await detail()).scan.status).toBe("signed_off");
  });

  test("the lead reopens: the scan is under review, version 1 stays in the history with the reason, nothing is confirmed meanwhile", async () => {
    const r = await reopen(w.cookies.lead);
    expect(r.status, JSON.stringify(r.json)).toBe(200);
    expect(r.json).toMatchObject({ status: "processed", reopenedVersion: 1 });
    const h = await history();
    expect(h.items).toHaveLength(1);
    expect(h.items[0]).toMatchObject({ version: 1, current: false, reopenReason: "Forsterite lines are from the mount; recheck without it." });
    expect(h.items[0].reopenedByName).toMatch(/^lead \d+$/);
    expect(await confirmedInExport()).toBe("");
    const ev = await getDb().select().from(custodyEvents).where(eq(custodyEvents.sampleId, sampleId)).orderBy(asc(sql`rowid`));
    expect(ev.map((e) => e.event).slice(-2)).toEqual(["confirmed", "reopened"]);
    expect((await getDb().select({ status: samples.status }).from(samples).where(eq(samples.id, sampleId)))[0].status).toBe("processed");
    expect((await reopen(w.cookies.lead)).status).toBe(409);
  });

  test("version 2 without forsterite: the accepted phases are refitted together and the map and exports use it", async () => {
    const d = await detail();
    const forsterite = d.run.phases.find((p) => p.mineral === "forsterite")!;
    expect((await decide(forsterite.id, "rejected")).status).toBe(200);
    const before = (await detail()).scan.currentRunId;
    const r = await signOff("Without the mount's forsterite");
    expect(r.status, JSON.stringify(r.json)).toBe(200);
    expect(r.json).toMatchObject({ version: 2, recomputed: true, confirmed: expect.arrayContaining(["calcite", "dolomite"]) });
    const after = await detail();
    expect(after.scan.currentRunId).not.toBe(before);
    const rec = after.scan.signOffJson!;
    expect(rec).toMatchObject({ version: 2, recomputed: true, runId: after.scan.currentRunId });
    const wt = Object.fromEntries(rec.phases.map((p) => [p.mineral, p.wtPercent]));
    expect(Object.keys(wt).sort()).toEqual(["calcite", "dolomite"]);
    // Normalised over the accepted phases only: calcite : dolomite ≈ 60 : 25 of the cctbx mixture → ≈ 70.6 : 29.4.
    expect(wt.calcite! + wt.dolomite!).toBeCloseTo(100, 0);
    expect(Math.abs(wt.calcite! - 70.6)).toBeLessThan(6);
    const h = await history();
    expect(h.items.map((i) => [i.version, i.current])).toEqual([
      [2, true],
      [1, false],
    ]);
    expect(h.items[1].record.phases.map((p) => p.mineral).sort()).toEqual(["calcite", "dolomite", "forsterite"]);
    const exported = await confirmedInExport();
    expect(exported).toContain(`calcite ${wt.calcite}`);
    expect(exported).not.toContain("forsterite");
    const rows = await getDb().select().from(scanSignOffs).where(eq(scanSignOffs.scanId, scanId));
    expect(rows.map((r) => r.version).sort()).toEqual([1, 2]);
  });

  test("the signing analyst reopens; an accepted phase without a structure model says why it has no wt%", async () => {
    expect((await reopen(w.cookies.lab_analyst, { reason: "Add the phase seen in thin section." })).status).toBe(200);
    // A reference phase without whole-pattern fit data (as an imported CIF could be), added by hand.
    const [q] = await getDb().select().from(referencePhases).where(and(eq(referencePhases.mineral, "quartz"), eq(referencePhases.builtin, true)));
    const [bare] = await getDb()
      .insert(referencePhases)
      .values({ ...q, id: crypto.randomUUID(), mineral: "quartz (no model)", builtin: false, fitJson: null, rir: null, cellA: q.cellA + 0.001 })
      .returning();
    const added = await call(manualRoute, { method: "POST", params: P(), cookie: w.cookies.lab_analyst, body: { referencePhaseId: bare.id, note: "Seen in thin section" } });
    expect(added.status, JSON.stringify(added.json)).toBe(201);
    const r = await signOff();
    expect(r.status, JSON.stringify(r.json)).toBe(200);
    const rec = (await detail()).scan.signOffJson!;
    expect(rec.version).toBe(3);
    for (const p of rec.phases) {
      if (p.wtPercent == null) expect(p.wtNote, p.mineral).toMatch(/\w/);
      else expect(p.wtNote ?? null).toBeNull();
    }
    const noModel = rec.phases.find((p) => p.mineral === "quartz (no model)")!;
    expect(noModel.wtPercent).toBeNull();
    expect(noModel.wtNote).toMatch(/no structure/);
  });
});
