import { readFileSync } from "node:fs";
import { join } from "node:path";
import { and, eq } from "drizzle-orm";
import { beforeAll, describe, expect, test } from "vitest";
import { POST as uploadRoute } from "@/app/api/projects/[projectId]/scans/route";
import { GET as getRoute } from "@/app/api/projects/[projectId]/scans/[scanId]/route";
import { PATCH as decideRoute } from "@/app/api/projects/[projectId]/scans/[scanId]/phases/[phaseId]/route";
import { POST as processRoute } from "@/app/api/projects/[projectId]/scans/[scanId]/process/route";
import { POST as refitRoute } from "@/app/api/projects/[projectId]/scans/[scanId]/refit/route";
import { POST as signOffRoute } from "@/app/api/projects/[projectId]/scans/[scanId]/sign-off/route";
import { getDb } from "@/db";
import { seedReferenceLibrary } from "@/db/seed/reference-library";
import { auditLog, processingRuns, referencePhases, samples, scans } from "@/db/schema";
import type { SignOffRecord } from "@/lib/dal/scan-review";
import { drainProcessingQueue, expandSparse, type RunProfile } from "@/lib/jobs";
import { call, makeWorld, type World } from "../helpers/app";

// The queue is driven by the test (drainProcessingQueue).
process.env.LITHODEX_JOBS = "manual";

/**
 * Synthetic scan made with cctbx by the project's test-data set (tests/fixtures/scans/forsterite-marble.md): calcite
 * 60, dolomite 25, forsterite 15 wt%, Cu Kα1 + Kα2, 3751 points. No header, so the anode comes from the form.
 */
const MARBLE = readFileSync(join(import.meta.dirname, "../fixtures/scans/forsterite-marble.xy"), "utf8");
const TRUTH: Record<string, number> = { calcite: 60, dolomite: 25, forsterite: 15 };

interface Phase {
  id: string;
  referencePhaseId: string;
  mineral: string;
  rank: number | null;
  status: string;
  fitted: boolean;
  wtPercent: number | null;
  wtSigma: number | null;
  fit: { evidence: { aloneLines: { d: number; hkl: number[] }[]; profileShare: number; deltaBic: number }; rirWtPercent: number | null } | null;
}
interface Detail {
  scan: { status: string; currentRunId: string; signOffJson: SignOffRecord | null };
  runs: { id: string; current: boolean; refit: { fromRunId: string; phaseCount: number } | null }[];
  run: { id: string; profile: RunProfile; unexplained: { d: number }[]; phases: Phase[] };
}

let w: World;
let scanId: string;
const ids: Record<string, string> = {};

const get = async (cookie = w.cookies.lab_analyst): Promise<Detail> => (await call(getRoute, { params: { projectId: w.projectId, scanId }, cookie })).json;
const refit = (body: unknown, cookie = w.cookies.lab_analyst) => call(refitRoute, { method: "POST", params: { projectId: w.projectId, scanId }, cookie, body });
const fitted = (d: Detail) => d.run.phases.filter((p) => p.fitted);

beforeAll(async () => {
  await seedReferenceLibrary();
  w = await makeWorld();
  for (const r of await getDb().select({ id: referencePhases.id, mineral: referencePhases.mineral }).from(referencePhases).where(eq(referencePhases.builtin, true))) ids[r.mineral] = r.id;
  const [s] = await getDb().insert(samples).values({ projectId: w.projectId, code: "RF-000001", sampleType: "hand_sample", status: "prepared" }).returning();
  const f = new FormData();
  f.set("sampleId", s.id);
  f.set("anode", "Cu");
  f.append("file", new Blob([MARBLE], { type: "text/plain" }), "forsterite-marble.xy");
  const up = await call(uploadRoute, { method: "POST", params: { projectId: w.projectId }, cookie: w.cookies.lab_analyst, rawBody: f });
  expect(up.status, JSON.stringify(up.json)).toBe(201);
  scanId = up.json.scan.id;
  await drainProcessingQueue();
});

describe("processing fits the whole pattern and stores it for the review page", () => {
  test("fitted phases calcite, dolomite, forsterite with Hill & Howard wt% ± σ near the test-data set's 60 : 25 : 15", async () => {
    const d = await get();
    const phases = fitted(d);
    expect(phases.map((p) => p.mineral)).toEqual(expect.arrayContaining(Object.keys(TRUTH)));
    // Normalised to 100 % (Hill & Howard 1987, eq. 5: W_p = S_p(ZMV)_p / Σ S_i(ZMV)_i).
    expect(phases.reduce((s, p) => s + (p.wtPercent ?? 0), 0)).toBeCloseTo(100, 0);
    for (const [mineral, wt] of Object.entries(TRUTH)) {
      const p = phases.find((x) => x.mineral === mineral)!;
      // Wiring check with a wide window (the method's accuracy is scored on the whole test-data set, not here).
      expect(Math.abs(p.wtPercent! - wt), mineral).toBeLessThan(10);
      expect(p.wtSigma).toBeGreaterThan(0);
      expect(p.status).toBe("candidate");
      expect(p.fit!.evidence.deltaBic).toBeGreaterThan(10);
    }
    // Every fitted phase is still a candidate; the search's ranked list stays beside it.
    expect(d.run.phases.some((p) => !p.fitted && p.rank != null)).toBe(true);
    expect(d.run.profile.fit!.chosenBy).toBe("fit");
    expect(d.run.profile.quantification).toMatch(/Hill & Howard.*semi-quantitative/);
  });

  test("evidence: each phase's strongest stand-alone line at its published d-spacing", async () => {
    const d = await get();
    // Calcite 104 d 3.035 Å (PDF 5-586), dolomite 104 d 2.886 Å (PDF 36-426), forsterite 112 d 2.457 Å (PDF 34-189);
    // values written from memory of those reference patterns.
    const published: [string, number[], number][] = [
      ["calcite", [1, 0, 4], 3.035],
      ["dolomite", [1, 0, 4], 2.886],
      ["forsterite", [1, 1, 2], 2.457],
    ];
    for (const [mineral, hkl, dRef] of published) {
      const p = fitted(d).find((x) => x.mineral === mineral)!;
      const line = p.fit!.evidence.aloneLines.find((l) => l.hkl.join() === hkl.join());
      expect(line, `${mineral} ${hkl.join("")}`).toBeDefined();
      expect(Math.abs(line!.d - dRef)).toBeLessThan(0.005);
    }
  });

  test("curves: difference = observed − calculated, phases on the fit's background add up to the calculated profile, Rwp as Young (1993) defines it", async () => {
    const { profile } = (await get()).run;
    const fit = profile.fit!;
    const n = profile.twoTheta.length;
    expect(n).toBe(3751);
    expect(fit.calculated).toHaveLength(n);
    expect(fit.difference).toHaveLength(n);
    let worst = 0;
    const sum = [...fit.background];
    for (const p of fit.phases) expandSparse(p.profile, n).forEach((v, i) => (sum[i] += v));
    let worstSum = 0;
    for (let i = 0; i < n; i++) {
      worst = Math.max(worst, Math.abs(profile.raw[i] - fit.calculated[i] - fit.difference[i]));
      worstSum = Math.max(worstSum, Math.abs(sum[i] - fit.calculated[i]));
    }
    expect(worst).toBeLessThan(0.11); // rounding to 0.1 count
    // Sparse profiles drop values below 0.1 % of each phase's maximum (a few counts on a 18,000-count peak).
    expect(worstSum).toBeLessThan(0.002 * Math.max(...fit.calculated) + 1);
    // Rwp = [Σ w (y_o − y_c)² / Σ w y_o²]^½ with Poisson weights w = 1/y_o (Young 1993, "The Rietveld Method", ch. 1).
    let num = 0;
    let den = 0;
    for (let i = 0; i < n; i++) {
      const wi = 1 / Math.max(profile.raw[i], 1);
      num += wi * (profile.raw[i] - fit.calculated[i]) ** 2;
      den += wi * profile.raw[i] ** 2;
    }
    expect(100 * Math.sqrt(num / den)).toBeCloseTo(fit.stats.rwp, 1);
    // χ² = (Rwp/Rexp)² (Young 1993).
    expect(fit.stats.gof).toBeCloseTo((fit.stats.rwp / fit.stats.rexp) ** 2, 1);
    const bytes = JSON.stringify(profile).length;
    console.info(`stored profile: ${(bytes / 1024).toFixed(0)} KiB (fit ${(JSON.stringify(fit).length / 1024).toFixed(0)} KiB) for ${n} points`);
    expect(bytes).toBeLessThan(400 * 1024);
  });
});

describe("refit with the analyst's phases", () => {
  test("the body is checked: 1–10 known ids, each once; a consultant, field geologist or outsider cannot refit", async () => {
    const runs = (await getDb().select({ id: processingRuns.id }).from(processingRuns).where(eq(processingRuns.scanId, scanId))).length;
    const empty = await refit({ phaseIds: [] });
    expect(empty.status).toBe(422);
    expect(empty.json.error.fields.phaseIds[0]).toMatch(/at least one/);
    const many = await refit({ phaseIds: Object.values(ids).slice(0, 11) });
    expect(many.json.error.fields.phaseIds[0]).toMatch(/at most 10/);
    const twice = await refit({ phaseIds: [ids.calcite, ids.calcite] });
    expect(twice.json.error.fields.phaseIds[0]).toMatch(/once/);
    const unknown = await refit({ phaseIds: [ids.calcite, "no-such-phase"] });
    expect(unknown.status).toBe(422);
    expect(unknown.json.error.fields["phaseIds.1"][0]).toMatch(/reference library/);
    const extra = await refit({ phaseIds: [ids.calcite], mode: "fast" });
    expect(extra.status).toBe(422);
    const missing = await refit({});
    expect(missing.status).toBe(422);
    expect((await refit({ phaseIds: [ids.calcite] }, w.cookies.consultant)).status).toBe(403);
    expect((await refit({ phaseIds: [ids.calcite] }, w.cookies.field_geologist)).status).toBe(403);
    expect((await refit({ phaseIds: [ids.calcite] }, w.cookies.outsider)).status).toBe(404);
    // Nothing was stored by any refused request.
    expect((await getDb().select({ id: processingRuns.id }).from(processingRuns).where(eq(processingRuns.scanId, scanId))).length).toBe(runs);
  });

  test("removing forsterite: a new current run, Rwp rises (a nested model cannot fit better), its acceptance is withdrawn, earlier runs kept; under a second", async () => {
    const before = await get();
    const firstRun = before.run.id;
    const rwp0 = before.run.profile.fit!.stats.rwp;
    // Accept calcite and forsterite first: calcite stays accepted (still fitted), forsterite leaves the fit.
    for (const m of ["calcite", "forsterite"]) {
      const p = fitted(before).find((x) => x.mineral === m)!;
      const r = await call(decideRoute, { method: "PATCH", params: { projectId: w.projectId, scanId, phaseId: p.id }, cookie: w.cookies.lab_analyst, body: { status: "accepted" } });
      expect(r.status).toBe(200);
    }
    const r = await refit({ phaseIds: [ids.calcite, ids.dolomite] });
    expect(r.status, JSON.stringify(r.json)).toBe(201);
    console.info(`refit of a ${before.run.profile.twoTheta.length}-point scan with 2 phases: ${r.json.elapsedMs} ms on the server`);
    // Target: under a second; the check leaves room for a busy shared machine.
    expect(r.json.elapsedMs).toBeLessThan(1500);
    expect(r.json.fromRunId).toBe(firstRun);
    expect(r.json.phases.map((p: { mineral: string }) => p.mineral).sort()).toEqual(["calcite", "dolomite"]);
    expect(r.json.stats.rwp).toBeGreaterThan(rwp0);
    expect(r.json.withdrawn).toEqual(["forsterite"]);

    const after = await get();
    expect(after.scan.currentRunId).toBe(r.json.runId);
    expect(after.runs.map((x) => x.id)).toEqual(expect.arrayContaining([firstRun, r.json.runId]));
    expect(after.runs.find((x) => x.id === r.json.runId)!.refit).toEqual({ fromRunId: firstRun, phaseCount: 2 });
    expect(after.run.profile.fit!.chosenBy).toBe("analyst");
    expect(after.run.profile.fit!.stats.rwp).toBe(r.json.stats.rwp);
    expect(fitted(after).map((p) => p.mineral).sort()).toEqual(["calcite", "dolomite"]);
    expect(after.run.phases.find((p) => p.mineral === "calcite")!.status).toBe("accepted");
    const fo = after.run.phases.find((p) => p.mineral === "forsterite");
    if (fo) expect(fo.status).toBe("candidate");
    // Forsterite's lines are now unexplained: its 112 line (d 2.457 Å, PDF 34-189 from memory) is listed.
    expect(after.run.unexplained.some((u) => Math.abs(u.d - 2.457) < 0.01)).toBe(true);
    // The first run is unchanged.
    const [old] = await getDb().select({ profile: processingRuns.profileJson }).from(processingRuns).where(eq(processingRuns.id, firstRun));
    expect((old.profile as unknown as RunProfile).fit!.stats.rwp).toBe(rwp0);
    const [entry] = await getDb().select().from(auditLog).where(and(eq(auditLog.entityId, scanId), eq(auditLog.action, "refit")));
    expect(entry.afterJson).toMatchObject({ currentRunId: r.json.runId, phases: ["calcite", "dolomite"], withdrawn: ["forsterite"] });
  });

  test("putting forsterite back restores the first fit's Rwp", async () => {
    const first = (await getDb().select({ profile: processingRuns.profileJson, params: processingRuns.paramsJson }).from(processingRuns).where(eq(processingRuns.scanId, scanId))).find(
      (r) => !(r.params as { refit?: unknown }).refit,
    )!;
    const rwp0 = (first.profile as unknown as RunProfile).fit!.stats.rwp;
    const r = await refit({ phaseIds: [ids.calcite, ids.dolomite, ids.forsterite] });
    expect(r.status).toBe(201);
    expect(Math.abs(r.json.stats.rwp - rwp0) / rwp0).toBeLessThan(0.05);
  });

  test("no refit while a new run is queued; none after sign-off, which records the fit statistics with the phases", async () => {
    const q = await call(processRoute, { method: "POST", params: { projectId: w.projectId, scanId }, cookie: w.cookies.lab_analyst, body: {} });
    expect(q.status).toBe(202);
    const busy = await refit({ phaseIds: [ids.calcite] });
    expect(busy.status).toBe(409);
    await drainProcessingQueue();
    const d = await get();
    for (const p of fitted(d)) {
      const r = await call(decideRoute, { method: "PATCH", params: { projectId: w.projectId, scanId, phaseId: p.id }, cookie: w.cookies.lab_analyst, body: { status: "accepted" } });
      expect(r.status).toBe(200);
    }
    const so = await call(signOffRoute, { method: "POST", params: { projectId: w.projectId, scanId }, cookie: w.cookies.lab_analyst, body: { confirm: true } });
    expect(so.status).toBe(200);
    const [row] = await getDb().select({ rec: scans.signOffJson }).from(scans).where(eq(scans.id, scanId));
    const rec = row.rec as unknown as SignOffRecord;
    const stats = d.run.profile.fit!.stats;
    expect(rec.runId).toBe(d.run.id);
    expect(rec.fit).toMatchObject({ rwp: stats.rwp, rexp: stats.rexp, gof: stats.gof, semiQuantitative: true });
    expect(rec.phases.map((p) => p.mineral).sort()).toEqual(fitted(d).map((p) => p.mineral).sort());
    for (const p of rec.phases) {
      expect(p.fitted).toBe(true);
      expect(p.wtSigma).toBeGreaterThan(0);
    }
    const signed = await get(w.cookies.consultant);
    expect(signed.scan.signOffJson!.fit!.rwp).toBe(stats.rwp);
    const [entry] = await getDb().select().from(auditLog).where(and(eq(auditLog.entityId, scanId), eq(auditLog.action, "sign_off")));
    expect(entry.afterJson).toMatchObject({ fit: { rwp: stats.rwp, gof: stats.gof } });
    const late = await refit({ phaseIds: [ids.calcite] });
    expect(late.status).toBe(409);
  });
});
