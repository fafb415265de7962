/**
 * Uploading scans as labs export them: a d-spacing column converted with the form's anode, counts per second with the
 * form's time per step, and the form's Kα2 choice carried into processing. The quartz + calcite scan is built from
 * handbook d–I lists (tests/fixtures/lab/handbook-scans.ts); the d column is made with Bragg's law in the test.
 */
import { eq } from "drizzle-orm";
import { beforeAll, describe, expect, test } from "vitest";
import { POST as uploadRoute } from "@/app/api/projects/[projectId]/scans/route";
import { getDb } from "@/db";
import { seedReferenceLibrary } from "@/db/seed/reference-library";
import { processingRuns, projects, samples } from "@/db/schema";
import { drainProcessingQueue, type RunParams } from "@/lib/jobs";
import { quartzCalciteScan } from "../fixtures/lab/handbook-scans";
import { call, makeWorld, type World } from "../helpers/app";

process.env.LITHODEX_JOBS = "manual";

let w: World;
const sampleIds: string[] = [];
const CU_KA1 = 1.540598; // the anode table's Cu Kα1 (ITC Vol. C Table 4.2.2.1, from memory there)
const DEG = Math.PI / 180;

beforeAll(async () => {
  await seedReferenceLibrary();
  w = await makeWorld();
  const [p] = await getDb().select({ code: projects.code }).from(projects).where(eq(projects.id, w.projectId));
  for (let n = 50; n < 56; n++) {
    const [s] = await getDb().insert(samples).values({ projectId: w.projectId, code: `${p.code}-0000${n}`, sampleType: "hand_sample", status: "prepared" }).returning();
    sampleIds.push(s.id);
  }
});

const upload = (cookie: string, sampleId: string, name: string, text: string, fields: Record<string, string> = {}) => {
  const f = new FormData();
  for (const [k, v] of Object.entries({ sampleId, ...fields })) f.set(k, v);
  f.append("file", new Blob([text], { type: "text/plain" }), name);
  return call(uploadRoute, { method: "POST", params: { projectId: w.projectId }, cookie, rawBody: f });
};

const runParams = async (runId: string) => {
  const [run] = await getDb().select({ params: processingRuns.paramsJson, status: processingRuns.status }).from(processingRuns).where(eq(processingRuns.id, runId));
  return { ...(run.params as unknown as RunParams), status: run.status };
};

/** The handbook scan written as "d (Å);Intensity" with decimal commas, d decreasing (2θ increasing). */
function dCsv(seed: number): string {
  const s = quartzCalciteScan({ seed });
  const lines = Array.from(s.twoTheta, (t, i) => `${(CU_KA1 / (2 * Math.sin((t / 2) * DEG))).toFixed(6).replace(".", ",")};${s.counts[i]}`);
  return `d (Å);Intensity\n${lines.join("\n")}\n`;
}

describe("upload: d instead of 2θ, counts per second, Kα2 choice", () => {
  test("a d-spacing file without a wavelength is refused with the header line and what is needed; with the form's anode it is read", async () => {
    const text = dCsv(31);
    const bad = await upload(w.cookies.lab_analyst, sampleIds[0], "d-only.csv", text);
    expect(bad.status).toBe(422);
    expect(bad.json.error.details.problems[0]).toMatchObject({ code: "NEEDS_WAVELENGTH", line: 1, column: 1 });
    expect(bad.json.error.message).toMatch(/needs the wavelength/);
    const ok = await upload(w.cookies.lab_analyst, sampleIds[0], "d-only.csv", text, { anode: "Cu" });
    expect(ok.status).toBe(201);
    // Back through Bragg's law: the first point is 2θ = 10° again (rounding of d to 6 decimals ≈ 1e-5°).
    expect(ok.json.scan.twoThetaStart).toBeCloseTo(10, 3);
    expect(ok.json.scan.settingsJson.notes.join(" ")).toMatch(/d-spacings: converted to 2θ/);
    const d = await drainProcessingQueue();
    expect(d.failed).toBe(0);
    expect((await runParams(ok.json.runId)).status).toBe("done");
  });

  test("counts per second with the form's time per step are processed as counts", async () => {
    const s = quartzCalciteScan({ seed: 32 });
    const text = `# anode: Cu\n2Theta (deg),Intensity [cps]\n${Array.from(s.twoTheta, (t, i) => `${t.toFixed(2)},${(s.counts[i] / 2).toFixed(3)}`).join("\n")}\n`;
    const r = await upload(w.cookies.lab_analyst, sampleIds[1], "cps.csv", text, { timePerStepS: "2" });
    expect(r.status).toBe(201);
    expect(r.json.scan.settingsJson.notes.join(" ")).toMatch(/multiplied by the counting time \(2 s/);
    await drainProcessingQueue();
    const p = await runParams(r.json.runId);
    expect(p.status).toBe("done");
    expect(p.resolved?.processing.noise.model).toBe("auto"); // counts again: counting statistics apply
  });

  test.each([
    ["absent", "no"],
    ["present", "yes"],
  ])("the form's Kα2 choice '%s' becomes the run's kAlpha2 mode '%s' and is recorded as decided by the analyst", async (choice, mode) => {
    const s = quartzCalciteScan({ seed: choice === "absent" ? 33 : 34 });
    const text = `# anode: Cu\n${Array.from(s.twoTheta, (t, i) => `${t.toFixed(2)} ${s.counts[i]}`).join("\n")}\n`;
    const r = await upload(w.cookies.lab_analyst, sampleIds[choice === "absent" ? 2 : 3], `ka2-${choice}.xy`, text, { kAlpha2: choice });
    expect(r.status).toBe(201);
    expect((await runParams(r.json.runId)).requested).toEqual({ processing: { kAlpha2: { mode } } });
    await drainProcessingQueue();
    const p = await runParams(r.json.runId);
    expect(p.resolved?.processing.kAlpha2).toMatchObject({ mode, decidedBy: "mode", present: mode === "yes" });
  });

  test("no choice (auto): the run decides from the peak shapes (the handbook scan has Kα2) and says how", async () => {
    const s = quartzCalciteScan({ seed: 35 });
    const text = `# anode: Cu\n${Array.from(s.twoTheta, (t, i) => `${t.toFixed(2)} ${s.counts[i]}`).join("\n")}\n`;
    const r = await upload(w.cookies.lab_analyst, sampleIds[4], "ka2-auto.xy", text, { kAlpha2: "auto" });
    expect(r.status).toBe(201);
    expect((await runParams(r.json.runId)).requested).toEqual({});
    await drainProcessingQueue();
    expect((await runParams(r.json.runId)).resolved?.processing.kAlpha2).toMatchObject({ mode: "auto", decidedBy: "profile", present: true });
  });

  test("an unknown Kα2 choice is a field error; roles are unchanged (a consultant still gets 403)", async () => {
    const s = quartzCalciteScan({ seed: 36 });
    const text = `# anode: Cu\n${Array.from(s.twoTheta, (t, i) => `${t.toFixed(2)} ${s.counts[i]}`).join("\n")}\n`;
    const bad = await upload(w.cookies.lab_analyst, sampleIds[5], "ka2-bad.xy", text, { kAlpha2: "sometimes" });
    expect(bad.status).toBe(422);
    expect(bad.json.error.fields.kAlpha2[0]).toMatch(/auto, present or absent/);
    const consultant = await upload(w.cookies.consultant, sampleIds[5], "ka2.xy", text, { kAlpha2: "absent" });
    expect(consultant.status).toBe(403);
  });
});
