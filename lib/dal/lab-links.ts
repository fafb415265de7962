import "server-only";
import { createHash, randomBytes } from "node:crypto";
import { and, desc, eq, gt, inArray, isNull } from "drizzle-orm";
import { z } from "zod";
import { getDb } from "@/db";
import { labLinks, projectMembers, projects, scans, submissions, user } from "@/db/schema";
import { formatDateTime } from "@/lib/dates";
import { manifestPdf } from "@/lib/export/manifest-pdf";
import { SAMPLE_TYPE_LABELS } from "@/lib/format";
import { submissionReceiveSchema } from "@/lib/validation/submission";
import { authorize, type Actor, type Recorder } from "./actor";
import { audit } from "./audit";
import { AppError, notFound } from "./errors";
import { roleAllows } from "./permissions";
import { uploadScanFor, type UploadedFile } from "./scans";
import { loadSubmission, recordIntake, sendReceipt, type SubmissionDetail } from "./submissions";
import { validateInput } from "./validate";

/**
 * Lab links (issue 11 §3): an outside lab without an account opens one submission through a link from the dispatch
 * e-mail, records the intake and uploads scans — for exactly the samples on that manifest, nothing else. The token
 * is 256 random bits (base64url), stored only as its SHA-256 like share links; links expire and can be revoked (410).
 */

/** Days a lab link works after it is e-mailed. */
export const LAB_LINK_DAYS = 30;
const TOKEN_RE = /^[A-Za-z0-9_-]{43}$/;

export function hashLabToken(token: string): string {
  return createHash("sha256").update(token, "utf8").digest("hex");
}

export type LabLinkState = "active" | "expired" | "revoked";
const stateOf = (l: { revokedAt: Date | null; expiresAt: Date }, now = Date.now()): LabLinkState => (l.revokedAt ? "revoked" : l.expiresAt.getTime() <= now ? "expired" : "active");

/**
 * The project member whose e-mail is the lab's address and who may record intake (lab.intake): such a lab uses its
 * account and role, and gets no lab link. Null for an outside lab.
 */
export async function labMemberFor(projectId: string, email: string | null): Promise<{ userId: string; name: string } | null> {
  if (!email) return null;
  const [m] = await getDb()
    .select({ userId: user.id, name: user.name, role: projectMembers.role, banned: user.banned })
    .from(projectMembers)
    .innerJoin(user, eq(user.id, projectMembers.userId))
    .where(and(eq(projectMembers.projectId, projectId), eq(user.email, email.toLowerCase())));
  return m && !m.banned && roleAllows(m.role, "lab.intake") ? { userId: m.userId, name: m.name } : null;
}

/**
 * Issues a new lab link for a submission that was sent, revoking the earlier active ones (a resend replaces the
 * link). Returns the token once; only its hash is stored. Audited.
 */
export async function issueLabLink(actor: Actor, projectId: string, submissionId: string, sentTo: string): Promise<{ token: string; expiresAt: Date; id: string }> {
  const token = randomBytes(32).toString("base64url");
  const expiresAt = new Date(Date.now() + LAB_LINK_DAYS * 86_400_000);
  return getDb().transaction(async (tx) => {
    const now = new Date();
    const replaced = await tx
      .update(labLinks)
      .set({ revokedAt: now, revokedBy: actor.userId })
      .where(and(eq(labLinks.submissionId, submissionId), isNull(labLinks.revokedAt), gt(labLinks.expiresAt, now)))
      .returning({ id: labLinks.id });
    const [row] = await tx.insert(labLinks).values({ projectId, submissionId, tokenHash: hashLabToken(token), sentTo, expiresAt, createdBy: actor.userId }).returning();
    await audit(tx, actor, { projectId, action: "issue", entity: "lab_link", entityId: row.id, after: { submissionId, sentTo, expiresAt, replaced: replaced.map((r) => r.id) } });
    return { token, expiresAt, id: row.id };
  });
}

/** The manifest of a submission as a PDF (for the dispatch e-mail, the lab page and members). */
export async function manifestPdfFor(d: SubmissionDetail): Promise<Buffer> {
  const listed = d.samples.filter((s) => s.intakeCondition !== "extra");
  const zone = d.project.timeZone;
  return manifestPdf({
    project: d.project,
    submission: {
      code: d.code,
      requestedAnalysis: d.requestedAnalysis,
      priority: d.priority,
      hazards: d.hazards,
      qaqcNote: d.qaqcNote,
      notes: d.notes,
      labEmail: d.labEmail,
      labAddress: d.project.labAddress ?? null,
      waybill: d.waybill,
      sentAt: d.sentAt ? formatDateTime(d.sentAt, zone) : null,
      preparedBy: d.createdByName,
    },
    samples: listed.map((s) => ({ code: s.code, sampleType: SAMPLE_TYPE_LABELS[s.sampleType], stationCode: s.stationCode, weightKg: s.weightKg, suspectedAsbestos: s.suspectedAsbestos })),
    seals: [...new Set(d.events.filter((e) => e.event === "dispatched" && e.sealNumber).map((e) => e.sealNumber!))],
    cautions: MANIFEST_CAUTIONS,
    printedAt: formatDateTime(new Date(), zone),
  });
}

/** Safety notes printed on the manifest (advisory; they defer to local regulations and accredited practice). */
export const MANIFEST_CAUTIONS = [
  "Suspected asbestos (flagged bags): handle as potentially hazardous before and during preparation, follow site rules and local regulations, and confirm asbestiform habit by accredited methods (e.g. polarized light or electron microscopy). XRD alone cannot establish it.",
  "Crushing, milling and sieving rock creates respirable crystalline silica dust: use enclosed or wet methods, local exhaust ventilation and respiratory protection as local limits require.",
  "Diffractometers are operated under your jurisdiction's radiation-safety regulations; Lithodex does not control instruments.",
];

/** The manifest PDF for a member (project.read). */
export async function memberManifestPdf(actor: Actor, projectId: string, submissionId: string) {
  await authorize(actor, projectId, "project.read");
  const d = await loadSubmission(projectId, submissionId);
  return { fileName: `${d.code}-manifest.pdf`, bytes: await manifestPdfFor(d) };
}

/**
 * The link behind a token: unknown or malformed → 404; revoked or expired → 410 with the reason (details.reason).
 * Records when the link was last used.
 */
export async function resolveLabToken(token: string) {
  if (!TOKEN_RE.test(token)) throw notFound("This lab link does not exist.");
  const db = getDb();
  const [link] = await db.select().from(labLinks).where(eq(labLinks.tokenHash, hashLabToken(token)));
  if (!link) throw notFound("This lab link does not exist.");
  const state = stateOf(link);
  if (state === "revoked") throw new AppError("gone", "This lab link was withdrawn by the project team (a newer e-mail may carry a new link).", undefined, { reason: "revoked" });
  if (state === "expired") throw new AppError("gone", `This lab link expired on ${link.expiresAt.toISOString().slice(0, 10)}.`, undefined, { reason: "expired", expiredAt: link.expiresAt.toISOString() });
  await db.update(labLinks).set({ lastUsedAt: new Date() }).where(eq(labLinks.id, link.id));
  return link;
}

/** Who the lab's writes are recorded for: the name the lab person gives, marked as the outside lab's link. */
function labRecorder(name: string, sentTo: string): Recorder {
  return { userId: null, name: `${name} (outside lab, ${sentTo})` };
}

const labName = (what: string) => z.string({ error: `Give your name: it is recorded with the ${what}.` }).trim().min(2, `Give your name: it is recorded with the ${what}.`).max(120, "At most 120 characters.");

/** What the lab page shows: the manifest, each sample's intake and scans, and what the lab may do now. */
export async function getLabView(token: string) {
  const link = await resolveLabToken(token);
  const d = await loadSubmission(link.projectId, link.submissionId);
  const onManifest = d.samples.filter((s) => s.intakeCondition !== "extra");
  const scanRows = onManifest.length
    ? await getDb()
        .select({ sampleId: scans.sampleId, originalName: scans.originalName, status: scans.status, createdAt: scans.createdAt })
        .from(scans)
        .where(and(eq(scans.projectId, link.projectId), inArray(scans.sampleId, onManifest.map((s) => s.id))))
        .orderBy(desc(scans.createdAt))
    : [];
  const atLab = ["received", "in_progress", "reported"].includes(d.status);
  return {
    link: { expiresAt: link.expiresAt, sentTo: link.sentTo },
    project: { name: d.project.name, code: d.project.code, timeZone: d.project.timeZone },
    submission: {
      code: d.code,
      status: d.status,
      requestedAnalysis: d.requestedAnalysis,
      priority: d.priority,
      hazards: d.hazards,
      qaqcNote: d.qaqcNote,
      notes: d.notes,
      waybill: d.waybill,
      sentAt: d.sentAt,
      receivedAt: d.receivedAt,
      labReference: d.labReference,
      createdByName: d.createdByName,
    },
    samples: onManifest.map((s) => ({
      id: s.id,
      code: s.code,
      sampleType: s.sampleType,
      weightKg: s.weightKg,
      suspectedAsbestos: s.suspectedAsbestos,
      intakeCondition: s.intakeCondition,
      status: s.status,
      scans: scanRows.filter((x) => x.sampleId === s.id).map(({ sampleId: _s, ...x }) => (void _s, x)),
      canUpload: atLab && !!s.intakeCondition && s.intakeCondition !== "missing",
    })),
    canReceive: d.status === "sent",
    canUpload: atLab,
  };
}

/**
 * The outside lab records the intake through its link: the condition of every bag on the manifest (no "extra" bags),
 * and the name of the person recording it. Same rules and receipt e-mail as a member's intake. 404/410 for a bad link.
 */
export async function labReceive(token: string, raw: unknown) {
  const link = await resolveLabToken(token);
  const body = (raw ?? {}) as Record<string, unknown>;
  const name = validateInput(z.object({ receivedBy: labName("intake") }), { receivedBy: body.receivedBy });
  const { receivedBy: _ignored, ...rest } = body;
  void _ignored;
  const input = validateInput(submissionReceiveSchema, rest);
  const who = labRecorder(name.receivedBy, link.sentTo);
  await recordIntake(who, link.projectId, link.submissionId, input, { allowExtra: false });
  await getDb().transaction((tx) => audit(tx, null, { projectId: link.projectId, action: "use", entity: "lab_link", entityId: link.id, after: { did: "intake", by: name.receivedBy } }));
  const d = await loadSubmission(link.projectId, link.submissionId);
  const mail = await sendReceipt(link.projectId, d, who.name, input);
  return { received: true, status: d.status, mail: { sent: mail.sent } };
}

/**
 * The outside lab uploads one scan through its link, for a sample on that manifest only (any other sample id is a
 * 404, as if it did not exist), after the intake recorded it as received or damaged.
 */
export async function labUploadScan(token: string, fields: Record<string, string>, file: UploadedFile | null) {
  const link = await resolveLabToken(token);
  const { sampleId, uploadedBy, ...rest } = fields;
  const name = validateInput(z.object({ uploadedBy: labName("scan") }), { uploadedBy });
  const d = await loadSubmission(link.projectId, link.submissionId);
  const s = d.samples.find((x) => x.id === sampleId && x.intakeCondition !== "extra");
  if (!s) throw notFound("This sample is not on the manifest of this link.");
  if (!["received", "in_progress", "reported"].includes(d.status)) throw new AppError("conflict", `Record the intake of ${d.code} first; scans are attached to samples the lab has received.`);
  if (s.intakeCondition === "missing") throw new AppError("conflict", `${s.code} was missing at intake: ask the project team to record its late arrival first.`);
  const out = await uploadScanFor(labRecorder(name.uploadedBy, link.sentTo), link.projectId, { ...rest, sampleId }, file);
  return { scan: { id: out.scan.id, originalName: out.scan.originalName, status: out.scan.status, sampleCode: s.code } };
}

/** The manifest PDF through a lab link. */
export async function labManifestPdf(token: string) {
  const link = await resolveLabToken(token);
  const d = await loadSubmission(link.projectId, link.submissionId);
  return { fileName: `${d.code}-manifest.pdf`, bytes: await manifestPdfFor(d) };
}

/** The lab links of a submission with their state (those who may send it: lead, field geologist, admin). */
export async function listLabLinks(actor: Actor, projectId: string, submissionId: string) {
  await authorize(actor, projectId, "submission.write");
  const rows = await getDb()
    .select({ id: labLinks.id, sentTo: labLinks.sentTo, expiresAt: labLinks.expiresAt, revokedAt: labLinks.revokedAt, lastUsedAt: labLinks.lastUsedAt, createdAt: labLinks.createdAt })
    .from(labLinks)
    .where(and(eq(labLinks.projectId, projectId), eq(labLinks.submissionId, submissionId)))
    .orderBy(desc(labLinks.createdAt));
  const now = Date.now();
  return rows.map((r) => ({ ...r, state: stateOf(r, now) }));
}

/** Withdraws the submission's active lab link at once (lead, field geologist, admin): the lab then gets 410. Audited. */
export async function revokeLabLinks(actor: Actor, projectId: string, submissionId: string) {
  await authorize(actor, projectId, "submission.write");
  const db = getDb();
  return db.transaction(async (tx) => {
    const [sub] = await tx.select({ id: submissions.id, code: submissions.code }).from(submissions).where(and(eq(submissions.id, submissionId), eq(submissions.projectId, projectId)));
    if (!sub) throw notFound("Submission not found.");
    const now = new Date();
    const rows = await tx
      .update(labLinks)
      .set({ revokedAt: now, revokedBy: actor.userId })
      .where(and(eq(labLinks.submissionId, submissionId), isNull(labLinks.revokedAt), gt(labLinks.expiresAt, now)))
      .returning({ id: labLinks.id });
    for (const r of rows) await audit(tx, actor, { projectId, action: "revoke", entity: "lab_link", entityId: r.id, before: { revokedAt: null }, after: { revokedAt: now, submissionId } });
    return { revoked: rows.length };
  });
}

/** The project of a lab link's token, for pages that redirect members to their own view. */
export async function labLinkProject(token: string): Promise<string | null> {
  if (!TOKEN_RE.test(token)) return null;
  const [row] = await getDb().select({ projectId: labLinks.projectId, submissionId: labLinks.submissionId }).from(labLinks).innerJoin(projects, eq(projects.id, labLinks.projectId)).where(eq(labLinks.tokenHash, hashLabToken(token)));
  return row ? `/projects/${row.projectId}/submissions/${row.submissionId}` : null;
}
