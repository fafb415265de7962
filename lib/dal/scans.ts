import "server-only";
import { and, asc, count, desc, eq, inArray, sql } from "drizzle-orm";
import { getDb } from "@/db";
import { peaks, phaseResults, processingRuns, referencePhases, samples, scans, user } from "@/db/schema";
import { ensureProcessingWorker, PIPELINE_VERSION, runProgress, type RunParams, type RunProfile, type StoredFit } from "@/lib/jobs";
import { resolveWavelength } from "@/lib/science/anodes";
import { DEFAULT_MAX_BYTES, parseScan, ScanParseError } from "@/lib/science/scan";
import { medianStep } from "@/lib/science/scan/step";
import type { Scan } from "@/lib/science/types";
import { getStorage, StorageError } from "@/lib/storage";
import { STATUS_RANK } from "@/lib/custody";
import {
  matchFilesToSamples,
  processParamsSchema,
  scanListQuerySchema,
  scanPatchSchema,
  kAlpha2Mode,
  scanSettingsSchema,
  scanUploadSchema,
  type ScanSettingsInput,
} from "@/lib/validation/scan";
import { authorize, type Actor, type Recorder } from "./actor";
import { audit } from "./audit";
import { appendCustodyEvent, scanReadinessProblems } from "./custody";
import { AppError, conflict, invalid, notFound } from "./errors";
import { otherHazardsOf } from "./reference-phases";
import { validateInput } from "./validate";

export type ScanRow = typeof scans.$inferSelect;

/** An uploaded file as the route hands it over. */
export interface UploadedFile {
  name: string;
  bytes: Uint8Array;
}

/** Most files in one bulk upload. */
export const MAX_BULK_FILES = 200;

/** `projects/<projectId>/scans/<scanId>/original.<ext>`; the extension is reduced to safe characters. */
export function scanFileKey(projectId: string, scanId: string, fileName: string): string {
  const ext = (/\.([A-Za-z0-9]{1,8})$/.exec(fileName)?.[1] ?? "dat").toLowerCase();
  return `projects/${projectId}/scans/${scanId}/original.${ext}`;
}

// ---------------------------------------------------------------------------------------------------------------
// Reading and checking a file

/** A parsed upload with the settings that will be stored. */
interface ReadScan {
  file: UploadedFile;
  scan: Scan;
  anode: ScanRow["anode"];
  wavelengthA: number;
  wavelength2A: number | null;
  instrument: string | null;
  settings: Record<string, unknown>;
  /** Processing parameters the upload form asks for (the first run's `requested`). */
  requested: RunParams["requested"];
  twoThetaStart: number;
  twoThetaEnd: number;
  stepDeg: number;
  pointCount: number;
}

/** A problem with one file: its name, and the line when the parser knows it. */
export interface FileProblem {
  fileName: string;
  message: string;
  line?: number;
  column?: number;
  code?: string;
  field?: string;
}

/** A copy of an object without one key (keeps internal columns such as file keys out of responses). */
function omit<T extends object, K extends keyof T>(obj: T, key: K): Omit<T, K> {
  const copy = { ...obj };
  delete copy[key];
  return copy;
}

const fmt = (x: number, digits = 4) => String(Math.round(x * 10 ** digits) / 10 ** digits);

/**
 * Decodes and parses one file, then settles its instrument settings: the file's own values where present, else
 * the form's. Never assumes a wavelength. Throws a FileProblem (as an AppError payload) on the first problem.
 */
function readScanFile(file: UploadedFile, form: ScanSettingsInput): ReadScan | FileProblem {
  if (file.bytes.byteLength === 0) return { fileName: file.name, message: "The file is empty.", code: "EMPTY" };
  if (file.bytes.byteLength > DEFAULT_MAX_BYTES) return { fileName: file.name, message: `The file is larger than ${DEFAULT_MAX_BYTES / 1048576} MiB.`, code: "TOO_LARGE" };
  const text = new TextDecoder("utf-8").decode(file.bytes);
  let scan: Scan;
  try {
    // The form's wavelength and time per step serve files that give d instead of 2θ, or counts per second.
    scan = parseScan(text, { wavelength: form.wavelength, anode: form.anode, countingTimeS: form.timePerStepS });
  } catch (err) {
    if (err instanceof ScanParseError) {
      return { fileName: file.name, message: err.message, code: err.code, ...(err.line !== undefined && { line: err.line }), ...(err.column !== undefined && { column: err.column }), ...(err.field && { field: err.field }) };
    }
    throw err;
  }
  const n = scan.twoTheta.length;
  const start = scan.twoTheta[0];
  const end = scan.twoTheta[n - 1];
  const step = medianStep(scan.twoTheta);
  const notes: string[] = [];
  // Range and step come from the data; form values only confirm them.
  const tol = Math.max(step, 0.01);
  if (form.twoThetaStart !== undefined && Math.abs(form.twoThetaStart - start) > tol) {
    return { fileName: file.name, field: "twoThetaStart", message: `The form gives start 2θ ${form.twoThetaStart}°, but the file's data start at ${fmt(start)}°. Check that this is the right file, or clear the field.` };
  }
  if (form.twoThetaEnd !== undefined && Math.abs(form.twoThetaEnd - end) > tol) {
    return { fileName: file.name, field: "twoThetaEnd", message: `The form gives end 2θ ${form.twoThetaEnd}°, but the file's data end at ${fmt(end)}°. Check that this is the right file, or clear the field.` };
  }
  if (form.stepDeg !== undefined && Math.abs(form.stepDeg - step) > Math.max(0.1 * step, 1e-4)) {
    return { fileName: file.name, field: "stepDeg", message: `The form gives a step of ${form.stepDeg}°, but the file's data step by ${fmt(step, 5)}°.` };
  }
  const fileHasWavelength = scan.meta.wavelength !== undefined || scan.meta.anode !== undefined;
  const formHasWavelength = form.wavelength !== undefined || form.anode !== undefined;
  if (!fileHasWavelength && !formHasWavelength) {
    return { fileName: file.name, field: "anode", message: "The file does not say which anode or wavelength was used: choose the anode or type the wavelength." };
  }
  let wl;
  try {
    wl = fileHasWavelength
      ? resolveWavelength({ anode: scan.meta.anode, wavelength: scan.meta.wavelength, wavelength2: scan.meta.wavelength2 ?? form.wavelength2, fallbackAnode: null })
      : resolveWavelength({ anode: form.anode, wavelength: form.wavelength, wavelength2: form.wavelength2, fallbackAnode: null });
  } catch (err) {
    if (err instanceof RangeError) return { fileName: file.name, field: "wavelength", message: err.message };
    throw err;
  }
  if (!(wl.wavelength > 0.1 && wl.wavelength < 5)) return { fileName: file.name, field: "wavelength", message: `Wavelength ${wl.wavelength} Å is outside 0.1–5 Å.` };
  notes.push(...wl.notes);
  if (fileHasWavelength && formHasWavelength) {
    const formWl = form.wavelength ?? (form.anode ? resolveWavelength({ anode: form.anode }).wavelength : undefined);
    if (formWl !== undefined && Math.abs(formWl - wl.wavelength) > 0.0005) {
      notes.push(`The form gave ${form.anode ?? `${form.wavelength} Å`}, but the file says ${wl.anode ?? ""} ${wl.wavelength} Å; the file's value is used.`.replace(/\s+/g, " "));
    }
  }
  notes.push(...(scan.meta.warnings ?? []));
  const fileTime = scan.meta.settings.timePerStep;
  const timePerStepS = typeof fileTime === "number" ? fileTime : form.timePerStepS;
  return {
    file,
    scan,
    anode: (wl.anode ?? null) as ScanRow["anode"],
    wavelengthA: wl.wavelength,
    wavelength2A: wl.wavelength2 ?? null,
    instrument: scan.meta.instrument ?? form.instrument ?? null,
    settings: {
      ...scan.meta.settings,
      ...(timePerStepS !== undefined && { timePerStep: timePerStepS }),
      ...(scan.meta.sampleId && { sampleInFile: scan.meta.sampleId }),
      sources: {
        wavelength: fileHasWavelength ? "file" : "form",
        instrument: scan.meta.instrument ? "file" : form.instrument ? "form" : null,
        timePerStep: typeof fileTime === "number" ? "file" : form.timePerStepS !== undefined ? "form" : null,
      },
      ...(notes.length && { notes }),
    },
    twoThetaStart: start,
    twoThetaEnd: end,
    stepDeg: step,
    pointCount: n,
    requested: form.kAlpha2 && form.kAlpha2 !== "auto" ? { processing: { kAlpha2: { mode: kAlpha2Mode(form.kAlpha2) } } } : {},
  };
}

const isProblem = (r: ReadScan | FileProblem): r is FileProblem => !("scan" in r);

/** 422 for one bad file: the parser's message (with its line) on the form, nothing stored. */
function fileProblemError(p: FileProblem): AppError {
  const where = p.field && !p.line ? p.field : "file";
  return new AppError("validation_failed", `${p.fileName}: ${p.message}`, { [where]: [p.message] }, { problems: [p] });
}

// ---------------------------------------------------------------------------------------------------------------
// Storing

interface SampleRef {
  id: string;
  code: string;
  status: (typeof samples.$inferSelect)["status"];
  version: number;
}

/** Stores the files, then the rows in one transaction; removes the stored files again if the transaction fails. */
async function storeScans(actor: Recorder, projectId: string, items: { read: ReadScan; sample: SampleRef }[]) {
  const db = getDb();
  const storage = getStorage();
  const prepared = items.map(({ read, sample }) => {
    const scanId = crypto.randomUUID();
    return { read, sample, scanId, runId: crypto.randomUUID(), key: scanFileKey(projectId, scanId, read.file.name) };
  });
  // Refuse exact re-uploads (same bytes for the same sample).
  const stored: { key: string; sha256: string }[] = [];
  try {
    for (const p of prepared) {
      const obj = await storage.put(p.key, p.read.file.bytes, { maxBytes: DEFAULT_MAX_BYTES });
      stored.push({ key: p.key, sha256: obj.sha256 });
    }
    const now = new Date();
    const result = await db.transaction(async (tx) => {
      // Custody first: a scan is attached only to a sample the lab holds (checked again here, on fresh statuses).
      const fresh = await tx.select({ id: samples.id, code: samples.code, status: samples.status }).from(samples).where(inArray(samples.id, prepared.map((p) => p.sample.id)));
      const refused = await scanReadinessProblems(tx, projectId, fresh);
      if (refused.size) {
        const messages = [...refused.values()];
        throw new AppError("conflict", messages.length === 1 ? messages[0] : `${messages.length} samples have not been received by the lab; nothing was uploaded.`, { sampleId: messages }, { samples: [...refused.keys()] });
      }
      const out: { scan: ScanRow; runId: string }[] = [];
      for (const [i, p] of prepared.entries()) {
        const sha256 = stored[i].sha256;
        const [dup] = await tx
          .select({ id: scans.id })
          .from(scans)
          .where(and(eq(scans.sampleId, p.sample.id), eq(scans.sha256, sha256)))
          .limit(1);
        if (dup) throw conflict(`${p.read.file.name}: this exact file was already uploaded for ${p.sample.code}.`, { fileName: p.read.file.name, scanId: dup.id });
        const [row] = await tx
          .insert(scans)
          .values({
            id: p.scanId,
            projectId,
            sampleId: p.sample.id,
            fileKey: p.key,
            originalName: p.read.file.name.slice(0, 255),
            sha256,
            format: p.read.scan.meta.format,
            anode: p.read.anode,
            wavelengthA: p.read.wavelengthA,
            wavelength2A: p.read.wavelength2A,
            instrument: p.read.instrument,
            settingsJson: p.read.settings,
            twoThetaStart: p.read.twoThetaStart,
            twoThetaEnd: p.read.twoThetaEnd,
            stepDeg: p.read.stepDeg,
            pointCount: p.read.pointCount,
            status: "uploaded",
            currentRunId: p.runId,
            uploadedBy: actor.userId,
          })
          .returning();
        await tx.insert(processingRuns).values({
          id: p.runId,
          scanId: p.scanId,
          paramsJson: { requested: p.read.requested } satisfies RunParams as unknown as Record<string, unknown>,
          softwareVersion: PIPELINE_VERSION,
          status: "queued",
          createdBy: actor.userId,
        });
        await audit(tx, actor, { projectId, action: "upload", entity: "scan", entityId: p.scanId, after: { ...row, settingsJson: undefined } });
        // Custody: the scan is a lab step; a sample already further along keeps its status.
        const policy = STATUS_RANK[p.sample.status] > STATUS_RANK.scanned ? "keep" : "forward";
        await appendCustodyEvent(tx, actor, { ...p.sample }, {
          projectId,
          submissionId: null,
          event: "scanned",
          occurredAt: now.toISOString(),
          note: `XRD scan uploaded: ${p.read.file.name}`,
          statusPolicy: policy,
        });
        out.push({ scan: row, runId: p.runId });
      }
      return out;
    });
    return result;
  } catch (err) {
    await Promise.all(stored.map((s) => storage.delete(s.key).catch(() => false)));
    throw err;
  }
}

async function sampleRef(projectId: string, sampleId: string): Promise<SampleRef> {
  const [s] = await getDb()
    .select({ id: samples.id, code: samples.code, status: samples.status, version: samples.version })
    .from(samples)
    .where(and(eq(samples.projectId, projectId), eq(samples.id, sampleId)));
  if (!s) throw invalid("Unknown sample.", { sampleId: ["No such sample in this project."] });
  return s;
}

/**
 * Uploads one scan file for a sample and queues its processing. A file the parser rejects is a 422 with the
 * parser's line-level message, and nothing is stored (no file, no row).
 */
export async function uploadScan(actor: Actor, projectId: string, raw: unknown, file: UploadedFile | null) {
  await authorize(actor, projectId, "scan.write");
  return uploadScanFor(actor, projectId, raw, file);
}

/**
 * The upload itself, for a caller whose access was already checked: a member with scan.write (uploadScan) or an
 * outside lab through its lab link (lib/dal/lab-links.ts, which first checks the sample is on its manifest).
 */
export async function uploadScanFor(actor: Recorder, projectId: string, raw: unknown, file: UploadedFile | null) {
  const input = validateInput(scanUploadSchema, raw);
  if (!file) throw invalid("Choose a scan file to upload.", { file: ["Choose a scan file to upload."] });
  const sample = await sampleRef(projectId, input.sampleId);
  const notReceived = (await scanReadinessProblems(getDb(), projectId, [sample])).get(sample.id);
  if (notReceived) throw new AppError("conflict", notReceived, { sampleId: [notReceived] }, { sampleId: sample.id, status: sample.status });
  const read = readScanFile(file, input);
  if (isProblem(read)) throw fileProblemError(read);
  const [stored] = await storeScans(actor, projectId, [{ read, sample }]);
  ensureProcessingWorker();
  return { scan: stored.scan, runId: stored.runId };
}

/** Result of checking a bulk upload. */
export interface BulkPreview {
  matches: { fileName: string; sampleId: string; sampleCode: string; assigned: boolean; pointCount?: number; range?: [number, number]; format?: string; wavelength?: number; notes?: string[] }[];
  unmatched: { fileName: string; reason: string; alternatives?: string[] }[];
  problems: FileProblem[];
}

/** Optional per-file assignments typed by the analyst for names that matched no (or several) samples. */
function parseAssignments(raw: unknown): Record<string, string> {
  if (raw === undefined || raw === null || raw === "") return {};
  let v: unknown = raw;
  if (typeof raw === "string") {
    try {
      v = JSON.parse(raw);
    } catch {
      throw invalid("Assignments must be JSON: {\"file name\": \"sample id\"}.", { assignments: ["Not valid JSON."] });
    }
  }
  if (typeof v !== "object" || v === null || Array.isArray(v) || Object.values(v).some((x) => typeof x !== "string")) {
    throw invalid("Assignments must map file names to sample ids.", { assignments: ["Map file names to sample ids."] });
  }
  return v as Record<string, string>;
}

async function checkBulk(projectId: string, raw: Record<string, unknown>, files: UploadedFile[]) {
  const settings = validateInput(scanSettingsSchema, raw);
  if (files.length === 0) throw invalid("Choose one or more scan files.", { files: ["Choose one or more scan files."] });
  if (files.length > MAX_BULK_FILES) throw invalid(`At most ${MAX_BULK_FILES} files per upload.`, { files: [`At most ${MAX_BULK_FILES} files per upload.`] });
  const names = new Set<string>();
  for (const f of files) {
    if (names.has(f.name)) throw invalid(`Two files are called ${f.name}.`, { files: [`Two files are called ${f.name}; rename one.`] });
    names.add(f.name);
  }
  const assignments = parseAssignments(raw.assignments);
  const db = getDb();
  const sampleList = await db
    .select({ id: samples.id, code: samples.code, status: samples.status, version: samples.version })
    .from(samples)
    .where(eq(samples.projectId, projectId));
  const byId = new Map(sampleList.map((s) => [s.id, s]));
  const byCode = new Map(sampleList.map((s) => [s.code.toUpperCase(), s]));
  // An assignment names the sample by id or by code.
  for (const [file, v] of Object.entries(assignments)) {
    const hit = byCode.get(v.trim().toUpperCase());
    if (!byId.has(v) && hit) assignments[file] = hit.id;
  }
  const matched = matchFilesToSamples(
    files.map((f) => f.name),
    sampleList,
  );
  const preview: BulkPreview = { matches: [], unmatched: [], problems: [] };
  const items: { read: ReadScan; sample: SampleRef }[] = [];
  for (const [i, m] of matched.entries()) {
    const file = files[i];
    const assignedId = assignments[file.name];
    if (assignedId !== undefined && assignedId.trim() === "") delete assignments[file.name];
    else if (assignedId !== undefined && !byId.has(assignedId)) {
      preview.problems.push({ fileName: file.name, field: "assignments", message: `No sample "${assignedId}" in this project.` });
      continue;
    }
    const sampleId = assignments[file.name] ?? m.sampleId;
    const read = readScanFile(file, settings);
    if (isProblem(read)) {
      preview.problems.push(read);
      continue;
    }
    if (!sampleId) {
      preview.unmatched.push({ fileName: file.name, reason: "reason" in m ? m.reason : "No sample.", ...("alternatives" in m && m.alternatives && { alternatives: m.alternatives }) });
      continue;
    }
    const sample = byId.get(sampleId)!;
    const notReceived = (await scanReadinessProblems(db, projectId, [sample])).get(sample.id);
    if (notReceived) {
      preview.problems.push({ fileName: file.name, field: "sampleId", message: notReceived });
      continue;
    }
    preview.matches.push({
      fileName: file.name,
      sampleId,
      sampleCode: sample.code,
      assigned: assignments[file.name] !== undefined,
      pointCount: read.pointCount,
      range: [read.twoThetaStart, read.twoThetaEnd],
      format: read.scan.meta.format,
      wavelength: read.wavelengthA,
      ...(Array.isArray(read.settings.notes) && { notes: read.settings.notes as string[] }),
    });
    items.push({ read, sample });
  }
  return { preview, items, skipUnmatched: raw.skipUnmatched === true || raw.skipUnmatched === "true" };
}

/** Bulk upload, step 1: which file goes to which sample, which match nothing, which cannot be read. Stores nothing. */
export async function previewBulkScans(actor: Actor, projectId: string, raw: Record<string, unknown>, files: UploadedFile[]): Promise<BulkPreview> {
  await authorize(actor, projectId, "scan.write");
  return (await checkBulk(projectId, raw, files)).preview;
}

/**
 * Bulk upload, step 2: stores every matched file and queues its processing, all or nothing. Any unreadable file,
 * or an unmatched one without `skipUnmatched`, is a 422 and nothing is stored.
 */
export async function commitBulkScans(actor: Actor, projectId: string, raw: Record<string, unknown>, files: UploadedFile[]) {
  await authorize(actor, projectId, "scan.write");
  const { preview, items, skipUnmatched } = await checkBulk(projectId, raw, files);
  if (preview.problems.length) {
    const n = preview.problems.length;
    throw new AppError(
      "validation_failed",
      n === 1 ? `${preview.problems[0].fileName}: ${preview.problems[0].message} Nothing was uploaded.` : `${n} files cannot be used; nothing was uploaded.`,
      { files: preview.problems.map((p) => `${p.fileName}: ${p.message}`) },
      { problems: preview.problems, preview },
    );
  }
  if (preview.unmatched.length && !skipUnmatched) {
    throw new AppError(
      "validation_failed",
      `${preview.unmatched.length} file${preview.unmatched.length === 1 ? "" : "s"} match no sample; assign them or choose to skip them. Nothing was uploaded.`,
      { files: preview.unmatched.map((u) => `${u.fileName}: ${u.reason}`) },
      { preview },
    );
  }
  if (items.length === 0) throw invalid("No file matched a sample; nothing was uploaded.", { files: ["No file matched a sample."] });
  const stored = await storeScans(actor, projectId, items);
  ensureProcessingWorker();
  return { uploaded: stored.length, skipped: preview.unmatched.map((u) => u.fileName), scans: stored.map((s) => ({ id: s.scan.id, sampleId: s.scan.sampleId, originalName: s.scan.originalName, runId: s.runId })) };
}

// ---------------------------------------------------------------------------------------------------------------
// Reading

/** Scans of a project with the current run's progress, newest first. */
export async function listScans(actor: Actor, projectId: string, raw: unknown) {
  await authorize(actor, projectId, "project.read");
  ensureProcessingWorker();
  const q = validateInput(scanListQuerySchema, raw);
  const db = getDb();
  const where = and(eq(scans.projectId, projectId), q.sampleId ? eq(scans.sampleId, q.sampleId) : undefined, q.status ? eq(scans.status, q.status) : undefined);
  const [rows, [{ total }]] = await Promise.all([
    db
      .select({
        id: scans.id,
        sampleId: scans.sampleId,
        sampleCode: samples.code,
        suspectedAsbestos: samples.suspectedAsbestos,
        originalName: scans.originalName,
        format: scans.format,
        anode: scans.anode,
        wavelengthA: scans.wavelengthA,
        instrument: scans.instrument,
        twoThetaStart: scans.twoThetaStart,
        twoThetaEnd: scans.twoThetaEnd,
        pointCount: scans.pointCount,
        status: scans.status,
        error: scans.error,
        currentRunId: scans.currentRunId,
        signedOffAt: scans.signedOffAt,
        createdAt: scans.createdAt,
        runStatus: processingRuns.status,
        runCreatedAt: processingRuns.createdAt,
        runDurationMs: processingRuns.durationMs,
      })
      .from(scans)
      .innerJoin(samples, eq(samples.id, scans.sampleId))
      .leftJoin(processingRuns, eq(processingRuns.id, scans.currentRunId))
      .where(where)
      .orderBy(desc(scans.createdAt), asc(samples.code))
      .limit(q.pageSize)
      .offset((q.page - 1) * q.pageSize),
    db.select({ total: count() }).from(scans).where(where),
  ]);
  const runIds = rows.map((r) => r.currentRunId).filter((x): x is string => !!x);
  const progress = await runProgress(rows.filter((r) => r.currentRunId && r.runStatus).map((r) => ({ id: r.currentRunId!, status: r.runStatus!, createdAt: r.runCreatedAt! })));
  // Leading candidate and accepted phases of each current run.
  const phaseRows = runIds.length
    ? await db
        .select({
          runId: phaseResults.runId,
          rank: phaseResults.rank,
          status: phaseResults.status,
          confident: phaseResults.confident,
          fitted: phaseResults.fitted,
          wtPercent: phaseResults.wtPercent,
          mineral: referencePhases.mineral,
          hazard: referencePhases.hazard,
        })
        .from(phaseResults)
        .innerJoin(referencePhases, eq(referencePhases.id, phaseResults.referencePhaseId))
        .where(inArray(phaseResults.runId, runIds))
        .orderBy(asc(phaseResults.rank))
    : [];
  const items = rows.map((r) => {
    const ph = phaseRows.filter((p) => p.runId === r.currentRunId);
    const accepted = ph.filter((p) => p.status === "accepted").map((p) => ({ mineral: p.mineral, hazard: p.hazard }));
    // Leading: the whole-pattern fit's largest phase; runs without a fit fall back to the search's first candidate.
    const fitted = ph.filter((p) => p.fitted && p.status !== "rejected").sort((a, b) => (b.wtPercent ?? -1) - (a.wtPercent ?? -1));
    const leading = fitted[0] ?? (ph.some((p) => p.fitted) ? undefined : ph.find((p) => p.status !== "rejected" && p.rank != null));
    return {
      ...r,
      progress: r.currentRunId ? (progress.get(r.currentRunId) ?? null) : null,
      accepted,
      leading: leading ? { mineral: leading.mineral, hazard: leading.hazard, confident: leading.fitted || leading.confident } : null,
      hazards: [...new Set(ph.filter((p) => p.status !== "rejected" && p.hazard && (p.status === "accepted" || p.fitted || p.rank === 1)).map((p) => p.hazard!))],
    };
  });
  return { items, total, page: q.page, pageSize: q.pageSize };
}

async function scanOrThrow(projectId: string, scanId: string): Promise<ScanRow> {
  const [row] = await getDb().select().from(scans).where(and(eq(scans.id, scanId), eq(scans.projectId, projectId)));
  if (!row) throw notFound("Scan not found.");
  return row;
}

/**
 * Phases of a run with their reference phase: the whole-pattern fit's phases (`fitted`, with wt% ± σ and the fit's
 * evidence), the search's ranked candidates (`rank`) and phases added by hand, best rank first.
 */
export async function runPhases(runId: string) {
  const db = getDb();
  const rows = await db
    .select({
      id: phaseResults.id,
      referencePhaseId: phaseResults.referencePhaseId,
      rank: phaseResults.rank,
      score: phaseResults.score,
      confident: phaseResults.confident,
      wtPercent: phaseResults.wtPercent,
      wtSigma: phaseResults.wtSigma,
      fitted: phaseResults.fitted,
      fit: phaseResults.fitJson,
      matched: phaseResults.matchedJson,
      source: phaseResults.source,
      status: phaseResults.status,
      decidedAt: phaseResults.decidedAt,
      decidedByName: user.name,
      note: phaseResults.note,
      mineral: referencePhases.mineral,
      formula: referencePhases.formula,
      group: referencePhases.mineralGroup,
      hazard: referencePhases.hazard,
      rir: referencePhases.rir,
      builtin: referencePhases.builtin,
    })
    .from(phaseResults)
    .innerJoin(referencePhases, eq(referencePhases.id, phaseResults.referencePhaseId))
    .leftJoin(user, eq(user.id, phaseResults.decidedBy))
    .where(eq(phaseResults.runId, runId))
    .orderBy(sql`${phaseResults.rank} is null`, asc(phaseResults.rank), asc(phaseResults.createdAt));
  return rows.map((r) => ({ ...r, fit: r.fit as StoredFit | null, otherHazards: r.builtin ? otherHazardsOf(r.mineral) : [] }));
}

/**
 * One scan with its runs and, for the selected run (default: the current one), the curves, peaks, candidates and
 * unexplained peaks. `canProcess` / `canReview` tell the page which actions to offer.
 */
export async function getScanOrThrow(actor: Actor, projectId: string, scanId: string, runId?: string | null) {
  const access = await authorize(actor, projectId, "project.read");
  ensureProcessingWorker();
  const db = getDb();
  const scan = await scanOrThrow(projectId, scanId);
  const [sample] = await db.select({ id: samples.id, code: samples.code, status: samples.status, suspectedAsbestos: samples.suspectedAsbestos, lithology: samples.lithology }).from(samples).where(eq(samples.id, scan.sampleId));
  const runs = await db
    .select({ id: processingRuns.id, status: processingRuns.status, error: processingRuns.error, durationMs: processingRuns.durationMs, createdAt: processingRuns.createdAt, createdByName: user.name, params: processingRuns.paramsJson, softwareVersion: processingRuns.softwareVersion })
    .from(processingRuns)
    .leftJoin(user, eq(user.id, processingRuns.createdBy))
    .where(eq(processingRuns.scanId, scanId))
    .orderBy(desc(processingRuns.createdAt));
  const selectedId = runId ?? scan.currentRunId ?? runs[0]?.id ?? null;
  const selected = runs.find((r) => r.id === selectedId);
  if (runId && !selected) throw notFound("Run not found for this scan.");
  const progress = await runProgress(runs.map((r) => ({ id: r.id, status: r.status, createdAt: r.createdAt })));
  let detail = null;
  if (selected) {
    const [full] = await db.select({ profile: processingRuns.profileJson, unexplained: processingRuns.unexplainedJson }).from(processingRuns).where(eq(processingRuns.id, selected.id));
    const peakRows = await db.select().from(peaks).where(eq(peaks.runId, selected.id)).orderBy(asc(peaks.twoTheta));
    detail = {
      id: selected.id,
      status: selected.status,
      error: selected.error,
      params: selected.params as unknown as RunParams,
      progress: progress.get(selected.id) ?? null,
      profile: (full?.profile ?? null) as RunProfile | null,
      unexplained: full?.unexplained ?? [],
      peaks: peakRows.map((p) => omit(p, "runId")),
      phases: await runPhases(selected.id),
    };
  }
  const [signer] = scan.signedOffBy ? await db.select({ name: user.name }).from(user).where(eq(user.id, scan.signedOffBy)) : [];
  const publicScan = omit(scan, "fileKey");
  const isAdmin = actor.isAdmin;
  return {
    scan: { ...publicScan, signedOffByName: signer?.name ?? null },
    sample,
    runs: runs.map((r) => {
      const refit = (r.params as unknown as RunParams | null)?.refit;
      return { ...omit(r, "params"), refit: refit ? { fromRunId: refit.fromRunId, phaseCount: refit.phaseIds.length } : null, progress: progress.get(r.id) ?? null, current: r.id === scan.currentRunId };
    }),
    run: detail,
    canProcess: isAdmin || access.role === "lab_analyst",
    canReview: isAdmin || access.role === "lab_analyst",
  };
}

/** Throws not_found unless the scan exists in a project the actor can read (cheap check for pages). */
export async function assertScanVisible(actor: Actor, projectId: string, scanId: string): Promise<void> {
  await authorize(actor, projectId, "project.read");
  const [row] = await getDb().select({ id: scans.id }).from(scans).where(and(eq(scans.id, scanId), eq(scans.projectId, projectId)));
  if (!row) throw notFound("Scan not found.");
}

/** The original file, byte for byte, for download. */
export async function getScanFile(actor: Actor, projectId: string, scanId: string) {
  await authorize(actor, projectId, "project.read");
  const scan = await scanOrThrow(projectId, scanId);
  try {
    return { name: scan.originalName, sha256: scan.sha256, stream: await getStorage().stream(scan.fileKey) };
  } catch (err) {
    if (err instanceof StorageError && err.code === "not_found") throw notFound("The stored file is missing.");
    throw err;
  }
}

// ---------------------------------------------------------------------------------------------------------------
// Re-processing and run selection

/** Queues a new processing run with the given parameters; earlier runs are kept. */
export async function reprocessScan(actor: Actor, projectId: string, scanId: string, raw: unknown) {
  await authorize(actor, projectId, "scan.write");
  const params = validateInput(processParamsSchema, raw ?? {});
  const db = getDb();
  const run = await db.transaction(async (tx) => {
    const [scan] = await tx.select().from(scans).where(and(eq(scans.id, scanId), eq(scans.projectId, projectId)));
    if (!scan) throw notFound("Scan not found.");
    if (scan.status === "signed_off") throw conflict("This scan is signed off; its results can no longer be changed.");
    const [pending] = await tx.select({ id: processingRuns.id }).from(processingRuns).where(and(eq(processingRuns.scanId, scanId), inArray(processingRuns.status, ["queued", "running"]))).limit(1);
    if (pending) throw conflict("A run of this scan is still queued or running; wait for it to finish.", { runId: pending.id });
    const [created] = await tx
      .insert(processingRuns)
      .values({ scanId, paramsJson: { requested: params } satisfies RunParams as unknown as Record<string, unknown>, softwareVersion: PIPELINE_VERSION, status: "queued", createdBy: actor.userId })
      .returning();
    await tx.update(scans).set({ currentRunId: created.id, status: "processing", error: null }).where(eq(scans.id, scanId));
    await audit(tx, actor, { projectId, action: "process", entity: "scan", entityId: scanId, before: { currentRunId: scan.currentRunId }, after: { currentRunId: created.id, params } });
    return created;
  });
  ensureProcessingWorker();
  return { id: run.id, status: run.status, createdAt: run.createdAt };
}

/** Makes an earlier (finished) run the current one. */
export async function selectScanRun(actor: Actor, projectId: string, scanId: string, raw: unknown) {
  await authorize(actor, projectId, "phase.review");
  const { currentRunId } = validateInput(scanPatchSchema, raw);
  const db = getDb();
  return db.transaction(async (tx) => {
    const [scan] = await tx.select().from(scans).where(and(eq(scans.id, scanId), eq(scans.projectId, projectId)));
    if (!scan) throw notFound("Scan not found.");
    if (scan.status === "signed_off") throw conflict("This scan is signed off; its results can no longer be changed.");
    const [run] = await tx.select().from(processingRuns).where(and(eq(processingRuns.id, currentRunId), eq(processingRuns.scanId, scanId)));
    if (!run) throw invalid("Unknown run.", { currentRunId: ["No such run for this scan."] });
    if (run.status !== "done") throw conflict("Only a finished run can be made current.");
    const [row] = await tx.update(scans).set({ currentRunId, status: "processed", error: null }).where(eq(scans.id, scanId)).returning();
    await audit(tx, actor, { projectId, action: "select_run", entity: "scan", entityId: scanId, before: { currentRunId: scan.currentRunId }, after: { currentRunId } });
    return row;
  });
}
