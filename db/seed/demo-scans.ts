/**
 * Demo XRD scans for the invented Arroyo Pinar scenario. Every scan is SYNTHETIC: made with lib/science/synthetic
 * from the shipped calculated patterns (invented mixtures, seeded Poisson noise), written as XY text into file
 * storage at seed time, then processed by the real job runner (peak-list search and whole-pattern fit). Mixtures are plausible for each lithology, not
 * measurements. Twelve samples are scanned: eight signed off with confirmed phases, three awaiting review (one in
 * the diabase with a tremolite candidate, so the asbestos caution shows) and one left queued (processed when the
 * app starts serving scans).
 */
import { and, eq, inArray } from "drizzle-orm";
import { getDb } from "@/db";
import { auditLog, custodyEvents, phaseResults, processingRuns, projects, referencePhases, samples, scanSignOffs, scans, user } from "@/db/schema";
import type { SignOffRecord } from "@/lib/dal/scan-review";
import { drainProcessingQueue, PIPELINE_VERSION, writeSampleEvent, type RunParams, type RunProfile } from "@/lib/jobs";
import { findLibraryPhase, findReferencePattern } from "@/lib/science/minerals";
import { writeXy } from "@/lib/science/scan";
import { synthesizeScan, type SyntheticPhase } from "@/lib/science/synthetic";
import { getStorage, sha256Hex } from "@/lib/storage";
import { STATUS_RANK } from "@/lib/custody";

type Outcome = "signed_off" | "review" | "queued";

interface DemoScan {
  /** Demo sample code (stations in DEMO_STATIONS order, four samples each). */
  code: string;
  /** Mineral → weight (any unit). */
  mix: Record<string, number>;
  outcome: Outcome;
  /** Platy phase lying flat on the mount (March–Dollase r < 1), as in a front-loaded powder. */
  platy?: { mineral: string; hkl: [number, number, number]; r: number };
  zeroShift?: number;
  note?: string;
  /** A second run with other parameters (re-processing keeps the first). */
  reprocess?: RunParams["requested"];
}

/** The plan: which samples were scanned and what the (invented) mixtures are. */
export const DEMO_SCANS: DemoScan[] = [
  { code: "APR-000001", mix: { goethite: 45, hematite: 25, quartz: 20, jarosite: 10 }, outcome: "signed_off", note: "Gossan: Fe oxyhydroxides with jarosite; boxwork texture in hand specimen." },
  { code: "APR-000005", mix: { goethite: 55, hematite: 15, jarosite: 15, quartz: 15 }, outcome: "signed_off", zeroShift: 0.03 },
  { code: "APR-000013", mix: { pyrite: 60, sphalerite: 15, chalcopyrite: 10, quartz: 15 }, outcome: "signed_off", note: "Spoil-heap massive sulfide; chalcopyrite 112 overlaps calcite 104 region — no carbonate seen." },
  { code: "APR-000017", mix: { quartz: 50, muscovite: 35, pyrite: 15 }, outcome: "signed_off", platy: { mineral: "muscovite", hkl: [0, 0, 1], r: 0.8 }, note: "Sericitic rhyolite; sericite reported as muscovite (2M1 reference)." },
  { code: "APR-000021", mix: { clinochlore: 40, quartz: 35, albite: 25 }, outcome: "signed_off", platy: { mineral: "clinochlore", hkl: [0, 0, 1], r: 0.85 } },
  { code: "APR-000029", mix: { albite: 35, clinochlore: 30, tremolite: 20, quartz: 15 }, outcome: "review", note: "Diabase with propylitic alteration; suspected asbestos flagged at collection." },
  { code: "APR-000045", mix: { calcite: 55, dolomite: 25, quartz: 20 }, outcome: "signed_off" },
  { code: "APR-000049", mix: { gypsum: 80, halite: 20 }, outcome: "signed_off", platy: { mineral: "gypsum", hkl: [0, 1, 0], r: 0.85 }, note: "Dried at 35 °C to avoid dehydration of gypsum to bassanite." },
  { code: "APR-000053", mix: { quartz: 55, muscovite: 30, pyrite: 15 }, outcome: "review", platy: { mineral: "muscovite", hkl: [0, 0, 1], r: 0.75 }, reprocess: { processing: { expectedFwhmDeg: 0.12, peaks: { k: 4 } } } },
  { code: "APR-000057", mix: { quartz: 60, kaolinite: 40 }, outcome: "signed_off", platy: { mineral: "kaolinite", hkl: [0, 0, 1], r: 0.8 } },
  { code: "APR-000009", mix: { quartz: 45, muscovite: 25, clinochlore: 15, pyrite: 15 }, outcome: "review" },
  { code: "APR-000025", mix: { quartz: 85, hematite: 15 }, outcome: "queued" },
];

const INSTRUMENT = "Demo bench diffractometer (synthetic data)";

/** The synthetic XY text of one planned scan (deterministic). */
export function demoScanText(plan: DemoScan, seed: number): string {
  const phases: SyntheticPhase[] = Object.entries(plan.mix).map(([mineral, weight]) => {
    const pattern = findReferencePattern(mineral);
    if (!pattern) throw new Error(`demo scan ${plan.code}: ${mineral} is not in the shipped library`);
    const lib = findLibraryPhase(mineral)!;
    return {
      pattern,
      weight,
      ...(plan.platy?.mineral === mineral && { preferredOrientation: { hkl: plan.platy.hkl, r: plan.platy.r, cell: lib.cell } }),
    };
  });
  const scan = synthesizeScan({ phases, range: [5, 70], step: 0.02, seed, maxCounts: 6000 + (seed % 7) * 800, zeroShift: plan.zeroShift ?? 0 });
  const header = [
    "# SYNTHETIC demo scan (invented data, not a measurement) — Lithodex demo scenario",
    `# sample: ${plan.code}`,
    "# anode: Cu",
    `# instrument: ${INSTRUMENT}`,
    "# kV: 40",
    "# mA: 40",
    "# time per step: 1.0",
  ];
  return `${header.join("\n")}\n${writeXy(scan, { header: false })}`;
}

/**
 * Adds the demo scans to the seeded demo project: files in storage, rows, custody events, processing by the job
 * runner, then the analyst's decisions and sign-offs. Skips when the project already has scans.
 * @returns the number of scans created
 */
export async function seedDemoScans(projectCode = "APR"): Promise<number> {
  const db = getDb();
  const [project] = await db.select({ id: projects.id }).from(projects).where(eq(projects.code, projectCode));
  if (!project) return 0;
  const [existing] = await db.select({ id: scans.id }).from(scans).where(eq(scans.projectId, project.id)).limit(1);
  if (existing) return 0;
  const [lab] = await db.select({ id: user.id, name: user.name }).from(user).where(eq(user.email, "lab@lithodex.example"));
  if (!lab) throw new Error("demo lab analyst missing");
  const codes = DEMO_SCANS.map((p) => p.code);
  const sampleRows = await db.select().from(samples).where(and(eq(samples.projectId, project.id), inArray(samples.code, codes)));
  const byCode = new Map(sampleRows.map((s) => [s.code, s]));
  const storage = getStorage();
  const planned: { plan: DemoScan; scanId: string; runId: string; sampleId: string; at: Date }[] = [];

  for (const [i, plan] of DEMO_SCANS.entries()) {
    const sample = byCode.get(plan.code);
    if (!sample) throw new Error(`demo sample ${plan.code} missing`);
    const text = demoScanText(plan, 1000 + i);
    const bytes = new TextEncoder().encode(text);
    const scanId = crypto.randomUUID();
    const runId = crypto.randomUUID();
    const key = `projects/${project.id}/scans/${scanId}/original.xy`;
    const stored = await storage.put(key, bytes, { overwrite: true });
    if (stored.sha256 !== sha256Hex(bytes)) throw new Error("storage changed the demo file");
    const at = new Date(Date.UTC(2026, 2, 20 + Math.floor(i / 3), 9 + (i % 3) * 2, 15));
    const lines = text.split("\n").filter((l) => /^\d/.test(l));
    await db.transaction(async (tx) => {
      await tx.insert(scans).values({
        id: scanId,
        projectId: project.id,
        sampleId: sample.id,
        fileKey: key,
        originalName: `${plan.code}.xy`,
        sha256: stored.sha256,
        format: "xy",
        anode: "Cu",
        wavelengthA: 1.540598,
        wavelength2A: 1.544426,
        instrument: INSTRUMENT,
        settingsJson: { kV: 40, mA: 40, timePerStep: 1, synthetic: true, sources: { wavelength: "file", instrument: "file", timePerStep: "file" } },
        twoThetaStart: 5,
        twoThetaEnd: 70,
        stepDeg: 0.02,
        pointCount: lines.length,
        status: "uploaded",
        currentRunId: plan.outcome === "queued" ? null : runId,
        analystNote: plan.note ? `${plan.note} (Synthetic demo scan.)` : "Synthetic demo scan.",
        uploadedBy: lab.id,
        createdAt: at,
      });
      // The scan left queued gets its run after the others were processed (below).
      if (plan.outcome !== "queued") {
        await tx.insert(processingRuns).values({ id: runId, scanId, paramsJson: { requested: {} } as unknown as Record<string, unknown>, softwareVersion: PIPELINE_VERSION, status: "queued", createdBy: lab.id, createdAt: at });
      }
      const [viaSubmission] = await tx.select({ submissionId: custodyEvents.submissionId }).from(custodyEvents).where(and(eq(custodyEvents.sampleId, sample.id), eq(custodyEvents.event, "received"))).limit(1);
      await tx.insert(custodyEvents).values({ sampleId: sample.id, submissionId: viaSubmission?.submissionId ?? null, event: "scanned", actorId: lab.id, actorName: lab.name, occurredAt: at.toISOString(), location: "Lab XRD room", note: `XRD scan uploaded: ${plan.code}.xy (synthetic demo)`, statusAfter: STATUS_RANK[sample.status] < STATUS_RANK.scanned ? "scanned" : sample.status });
      if (STATUS_RANK[sample.status] < STATUS_RANK.scanned) {
        await tx.update(samples).set({ status: "scanned", version: sample.version + 1, storageLocation: "Lab store, XRD shelf" }).where(eq(samples.id, sample.id));
      }
      await tx.insert(auditLog).values({ projectId: project.id, actorId: lab.id, action: "upload", entity: "scan", entityId: scanId, afterJson: { originalName: `${plan.code}.xy`, synthetic: true }, createdAt: at });
    });
    planned.push({ plan, scanId, runId, sampleId: sample.id, at });
  }

  await drainProcessingQueue();
  // Second runs (re-processing keeps the first).
  for (const p of planned.filter((x) => x.plan.reprocess)) {
    const [run] = await db
      .insert(processingRuns)
      .values({ scanId: p.scanId, paramsJson: { requested: p.plan.reprocess } as unknown as Record<string, unknown>, softwareVersion: PIPELINE_VERSION, status: "queued", createdBy: lab.id })
      .returning();
    await db.update(scans).set({ currentRunId: run.id, status: "processing" }).where(eq(scans.id, p.scanId));
  }
  await drainProcessingQueue();
  // Processing ran just now; in the scenario each scan was processed minutes after its upload, before any sign-off.
  for (const p of planned.filter((x) => x.plan.outcome !== "queued")) {
    await db
      .update(custodyEvents)
      .set({ occurredAt: new Date(p.at.getTime() + 15 * 60_000).toISOString() })
      .where(and(eq(custodyEvents.sampleId, p.sampleId), eq(custodyEvents.event, "processed")));
  }
  for (const p of planned.filter((x) => x.plan.outcome === "queued")) {
    await db.insert(processingRuns).values({ id: p.runId, scanId: p.scanId, paramsJson: { requested: {} } as unknown as Record<string, unknown>, softwareVersion: PIPELINE_VERSION, status: "queued", createdBy: lab.id, createdAt: p.at });
    await db.update(scans).set({ currentRunId: p.runId }).where(eq(scans.id, p.scanId));
  }

  // The analyst's review: accept the intended phases the whole-pattern fit kept (runs whose fit kept none fall back
  // to the search's mixture and strong candidates); sign off where planned, recording the fit statistics.
  for (const p of planned.filter((x) => x.plan.outcome !== "queued")) {
    const [scan] = await db.select().from(scans).where(eq(scans.id, p.scanId));
    const [run] = await db.select({ profile: processingRuns.profileJson }).from(processingRuns).where(eq(processingRuns.id, scan.currentRunId!));
    const profile = (run?.profile ?? {}) as unknown as RunProfile;
    const mixture = profile.mixture ?? [];
    const intended = new Set(Object.keys(p.plan.mix));
    const decidedAt = new Date(p.at.getTime() + 26 * 3600_000);
    const phaseRows = await db
      .select({
        id: phaseResults.id,
        referencePhaseId: phaseResults.referencePhaseId,
        confident: phaseResults.confident,
        fitted: phaseResults.fitted,
        wtPercent: phaseResults.wtPercent,
        wtSigma: phaseResults.wtSigma,
        source: phaseResults.source,
        mineral: referencePhases.mineral,
      })
      .from(phaseResults)
      .innerJoin(referencePhases, eq(referencePhases.id, phaseResults.referencePhaseId))
      .where(eq(phaseResults.runId, scan.currentRunId!));
    const fittedIntended = phaseRows.filter((r) => r.fitted && intended.has(r.mineral)).map((r) => r.referencePhaseId);
    const accept = fittedIntended.length
      ? fittedIntended
      : [...new Set([...mixture.filter((m) => intended.has(m.mineral)).map((m) => m.referencePhaseId), ...phaseRows.filter((r) => r.confident && intended.has(r.mineral)).map((r) => r.referencePhaseId)])];
    if (p.plan.outcome === "review") continue;
    for (const row of phaseRows) {
      if (!accept.includes(row.referencePhaseId)) continue;
      await db.update(phaseResults).set({ status: "accepted", decidedBy: lab.id, decidedAt }).where(eq(phaseResults.id, row.id));
    }
    if (accept.length === 0) continue;
    const signedAt = new Date(decidedAt.getTime() + 3600_000);
    const fit = profile.fit;
    const record: SignOffRecord = {
      runId: scan.currentRunId!,
      fit: fit ? { ...fit.stats, quantification: fit.quantification.method, semiQuantitative: fit.quantification.semiQuantitative, chosenBy: fit.chosenBy, noConfidentMatch: fit.noConfidentMatch } : null,
      phases: phaseRows
        .filter((r) => accept.includes(r.referencePhaseId))
        .map((r) => ({ phaseResultId: r.id, referencePhaseId: r.referencePhaseId, mineral: r.mineral, wtPercent: r.wtPercent, wtSigma: r.wtSigma, fitted: r.fitted, source: r.source })),
    };
    await db.transaction(async (tx) => {
      record.version = 1;
      await tx.update(scans).set({ status: "signed_off", signedOffBy: lab.id, signedOffAt: signedAt, signOffJson: record as unknown as Record<string, unknown> }).where(eq(scans.id, p.scanId));
      await tx.insert(scanSignOffs).values({ scanId: p.scanId, projectId: project.id, version: 1, runId: record.runId, recordJson: record as unknown as Record<string, unknown>, note: scan.analystNote, signedBy: lab.id, signedAt });
      // The sign-off's review event moves the sample to "confirmed" (the status follows the events).
      await writeSampleEvent(tx, { sampleId: p.sampleId, event: "confirmed", actorId: lab.id, actorName: lab.name, occurredAt: signedAt.toISOString(), scanId: p.scanId, action: "status" });
      await tx.insert(auditLog).values({ projectId: project.id, actorId: lab.id, action: "sign_off", entity: "scan", entityId: p.scanId, afterJson: { status: "signed_off", runId: record.runId, fit: record.fit, confirmed: record.phases }, createdAt: signedAt });
    });
  }
  return planned.length;
}
