import "server-only";
import { and, asc, desc, eq, inArray, isNull, sql } from "drizzle-orm";
import { getDb } from "@/db";
import { custodyEvents, projectMembers, projects, samples, stations, submissionSamples, submissions, user } from "@/db/schema";
import { appBaseUrl, appLink, labLinkPath, sendMail, submissionDispatchedMail, submissionReceivedMail, type MailAttachment, type MailContent } from "@/lib/mail";
import {
  formatSubmissionCode,
  submissionCreateSchema,
  submissionListQuerySchema,
  submissionReceiveSchema,
  submissionSendSchema,
  type SubmissionReceiveInput,
} from "@/lib/validation/submission";
import type { IntakeCondition, SampleStatus } from "@/lib/vocabulary";
import { authorize, type Actor, type Recorder } from "./actor";
import { audit } from "./audit";
import { appendCustodyEvent, assertNotSender, assertStatusPlans } from "./custody";
import { conflict, invalid, notFound, tooMany } from "./errors";
import { issueLabLink, labMemberFor, manifestPdfFor } from "./lab-links";
import { validateInput } from "./validate";

export type SubmissionRow = typeof submissions.$inferSelect;

/** Submissions still moving (a sample can be on only one of these at a time). */
const OPEN_STATES = ["draft", "sent", "received", "in_progress"] as const;
/** Sample states from which a new submission can take a sample. */
const SUBMITTABLE: readonly SampleStatus[] = ["collected", "stored", "returned"];

/** Result of an e-mail attempt made after a write committed: the write stands even if the mail failed. */
export interface MailOutcome {
  sent: boolean;
  to: string[];
  error?: string;
}

async function trySend(to: string[], cc: string[], content: MailContent & { attachments?: MailAttachment[] }): Promise<MailOutcome> {
  if (to.length === 0) return { sent: false, to, error: "No recipient." };
  try {
    await sendMail({ to, cc, ...content });
    return { sent: true, to };
  } catch (err) {
    console.error("mail:", (err as Error).message);
    return { sent: false, to, error: (err as Error).message };
  }
}

/** The project's submissions, newest first, with sample counts. */
export async function listSubmissions(actor: Actor, projectId: string, rawQuery: unknown = {}) {
  await authorize(actor, projectId, "project.read");
  const q = validateInput(submissionListQuerySchema, rawQuery);
  const db = getDb();
  return db
    .select({
      id: submissions.id,
      code: submissions.code,
      status: submissions.status,
      priority: submissions.priority,
      requestedAnalysis: submissions.requestedAnalysis,
      labEmail: submissions.labEmail,
      labReference: submissions.labReference,
      sentAt: submissions.sentAt,
      receivedAt: submissions.receivedAt,
      reportedAt: submissions.reportedAt,
      createdAt: submissions.createdAt,
      createdByName: user.name,
      // Qualified by hand: drizzle leaves column names bare inside sql`` subqueries.
      sampleCount: sql<number>`(select count(*) from "submission_samples" ss where ss."submission_id" = "submissions"."id")`,
      hazardCount: sql<number>`(select count(*) from "submission_samples" ss join "samples" sa on sa."id" = ss."sample_id" where ss."submission_id" = "submissions"."id" and sa."suspected_asbestos" = 1)`,
    })
    .from(submissions)
    .leftJoin(user, eq(user.id, submissions.createdBy))
    .where(and(eq(submissions.projectId, projectId), q.status ? eq(submissions.status, q.status) : undefined))
    .orderBy(desc(submissions.createdAt), desc(submissions.code));
}

/** One submission with its samples (manifest order: by code) and the custody events recorded under it. */
export async function getSubmissionOrThrow(actor: Actor, projectId: string, submissionId: string) {
  const access = await authorize(actor, projectId, "project.read");
  return { ...(await loadSubmission(projectId, submissionId)), role: access.role };
}

/** The submission detail without an access check: only for callers that checked access themselves (a lab link). */
export async function loadSubmission(projectId: string, submissionId: string) {
  const db = getDb();
  const [row] = await db
    .select({
      submission: submissions,
      createdByName: user.name,
      createdByEmail: user.email,
      project: { id: projects.id, code: projects.code, name: projects.name, labEmail: projects.labEmail, labAddress: projects.labAddress, timeZone: projects.timeZone },
    })
    .from(submissions)
    .innerJoin(projects, eq(projects.id, submissions.projectId))
    .leftJoin(user, eq(user.id, submissions.createdBy))
    .where(and(eq(submissions.id, submissionId), eq(submissions.projectId, projectId)));
  if (!row) throw notFound("Submission not found.");
  const [items, events] = await Promise.all([
    db
      .select({
        id: samples.id,
        code: samples.code,
        sampleType: samples.sampleType,
        lithology: samples.lithology,
        weightKg: samples.weightKg,
        suspectedAsbestos: samples.suspectedAsbestos,
        status: samples.status,
        storageLocation: samples.storageLocation,
        stationCode: stations.code,
        intakeCondition: submissionSamples.intakeCondition,
      })
      .from(submissionSamples)
      .innerJoin(samples, eq(samples.id, submissionSamples.sampleId))
      .leftJoin(stations, eq(stations.id, samples.stationId))
      .where(eq(submissionSamples.submissionId, submissionId))
      .orderBy(asc(samples.code)),
    db.select().from(custodyEvents).where(eq(custodyEvents.submissionId, submissionId)).orderBy(asc(custodyEvents.occurredAt), asc(custodyEvents.createdAt)),
  ]);
  return { ...row.submission, project: row.project, createdByName: row.createdByName, createdByEmail: row.createdByEmail, samples: items, events };
}

export type SubmissionDetail = Awaited<ReturnType<typeof loadSubmission>>;

/** Auto-added hazard line for flagged samples. */
export function asbestosHazardLine(codes: string[]): string | null {
  return codes.length ? `Suspected asbestos (flagged at collection): ${codes.join(", ")}` : null;
}

/**
 * Creates a draft submission from selected samples (lead, field geologist). Every sample must be in the project,
 * collected (or back from storage) and on no other open submission; otherwise 422 naming each sample, nothing written.
 */
export async function createSubmission(actor: Actor, projectId: string, raw: unknown): Promise<SubmissionRow> {
  const access = await authorize(actor, projectId, "submission.write");
  const input = validateInput(submissionCreateSchema, raw);
  const db = getDb();
  return db.transaction(async (tx) => {
    const found = await tx
      .select({ id: samples.id, code: samples.code, status: samples.status, suspectedAsbestos: samples.suspectedAsbestos })
      .from(samples)
      .where(and(eq(samples.projectId, projectId), inArray(samples.id, input.sampleIds)));
    const byId = new Map(found.map((s) => [s.id, s]));
    const problems: string[] = input.sampleIds.filter((id) => !byId.has(id)).map((id) => `No sample with id ${id} in this project.`);
    for (const s of found) {
      if (!SUBMITTABLE.includes(s.status)) problems.push(`${s.code} is "${s.status}"; only collected or stored/returned samples can be submitted.`);
    }
    const busy = await tx
      .select({ code: samples.code, submissionCode: submissions.code, status: submissions.status })
      .from(submissionSamples)
      .innerJoin(submissions, eq(submissions.id, submissionSamples.submissionId))
      .innerJoin(samples, eq(samples.id, submissionSamples.sampleId))
      .where(and(inArray(submissionSamples.sampleId, input.sampleIds), inArray(submissions.status, OPEN_STATES)));
    for (const b of busy) problems.push(`${b.code} is already on submission ${b.submissionCode} (${b.status}).`);
    if (problems.length) throw invalid(problems.length === 1 ? problems[0] : `${problems.length} of the selected samples cannot be submitted.`, { sampleIds: problems });

    const [project] = await tx
      .update(projects)
      .set({ submissionSeq: sql`${projects.submissionSeq} + 1` })
      .where(eq(projects.id, projectId))
      .returning({ seq: projects.submissionSeq, labEmail: projects.labEmail });
    const flagged = input.sampleIds.map((id) => byId.get(id)!).filter((s) => s.suspectedAsbestos).map((s) => s.code).sort();
    const hazards = [input.hazards, asbestosHazardLine(flagged)].filter(Boolean).join("\n") || null;
    const [row] = await tx
      .insert(submissions)
      .values({
        projectId,
        code: formatSubmissionCode(access.projectCode, project.seq),
        requestedAnalysis: input.requestedAnalysis.join("; "),
        priority: input.priority,
        hazards,
        qaqcNote: input.qaqcNote ?? null,
        notes: input.notes ?? null,
        labEmail: input.labEmail ?? project.labEmail ?? null,
        createdBy: actor.userId,
      })
      .returning();
    await tx.insert(submissionSamples).values(input.sampleIds.map((sampleId) => ({ submissionId: row.id, sampleId })));
    await audit(tx, actor, { projectId, action: "create", entity: "submission", entityId: row.id, after: { ...row, sampleIds: input.sampleIds } });
    return row;
  });
}

/** The e-mail to the lab may be sent again at most every RESEND_INTERVAL_MS, and RESEND_MAX times in all. */
export const RESEND_INTERVAL_MS = 10 * 60_000;
export const RESEND_MAX = 5;

/**
 * Claims one resend of the submission e-mail (throttled: one per 10 minutes, 5 in all), atomically, so two clicks
 * cannot both send. 429 with Retry-After when it is too soon; 429 without a wait once the limit is used up.
 */
async function claimResend(actor: Actor, projectId: string, d: SubmissionDetail): Promise<void> {
  const now = Date.now();
  const resends = Math.max(0, (d.mailCount ?? 0) - 1);
  if (resends >= RESEND_MAX) throw tooMany(`The e-mail for ${d.code} was already sent again ${RESEND_MAX} times; contact the lab directly.`, 24 * 3600);
  const last = d.lastMailedAt?.getTime() ?? 0;
  const wait = last + RESEND_INTERVAL_MS - now;
  if (wait > 0) throw tooMany(`The e-mail for ${d.code} was sent ${Math.max(1, Math.round((now - last) / 60_000))} min ago; you can send it again in ${Math.ceil(wait / 60_000)} min.`, Math.ceil(wait / 1000));
  await getDb().transaction(async (tx) => {
    const [row] = await tx
      .update(submissions)
      .set({ lastMailedAt: new Date(now), mailCount: sql`${submissions.mailCount} + 1` })
      .where(and(eq(submissions.id, d.id), d.lastMailedAt ? eq(submissions.lastMailedAt, d.lastMailedAt) : isNull(submissions.lastMailedAt)))
      .returning({ id: submissions.id });
    if (!row) throw tooMany(`The e-mail for ${d.code} was just sent again by someone else.`, Math.ceil(RESEND_INTERVAL_MS / 1000));
    await audit(tx, actor, { projectId, action: "resend", entity: "submission", entityId: d.id, after: { to: d.labEmail, resend: resends + 1 } });
  });
}

/** Who recorded the dispatch of a submission sent before sent_by existed (its dispatched custody events). */
async function dispatcherOf(tx: Pick<ReturnType<typeof getDb>, "select">, submissionId: string): Promise<string | null> {
  const [e] = await tx.select({ actorId: custodyEvents.actorId }).from(custodyEvents).where(and(eq(custodyEvents.submissionId, submissionId), eq(custodyEvents.event, "dispatched"))).limit(1);
  return e?.actorId ?? null;
}

async function dispatchMail(actor: Actor, d: SubmissionDetail): Promise<MailOutcome> {
  // An outside lab gets a lab link (no account needed); a lab address that belongs to a member with lab.intake does
  // not: that lab signs in and uses its role.
  const member = await labMemberFor(d.projectId, d.labEmail);
  const link = d.labEmail && !member ? await issueLabLink(actor, d.projectId, d.id, d.labEmail) : null;
  const content = submissionDispatchedMail({
    baseUrl: appBaseUrl(),
    project: d.project,
    submission: { ...d, courier: d.events.find((e) => e.event === "dispatched")?.handedTo ?? null },
    samples: d.samples.map((s) => ({ code: s.code, sampleType: s.sampleType, weightKg: s.weightKg, suspectedAsbestos: s.suspectedAsbestos })),
    sender: { name: actor.name, email: actor.email },
    labLink: link ? { url: appLink(appBaseUrl(), labLinkPath(link.token)), expiresAt: link.expiresAt } : null,
    manifestAttached: true,
  });
  const pdf = await manifestPdfFor(d);
  return trySend(d.labEmail ? [d.labEmail] : [], [actor.email], { ...content, attachments: [{ filename: `${d.code}-manifest.pdf`, contentType: "application/pdf", content: pdf }] });
}

/**
 * Dispatches a draft (lead, field geologist): records a "dispatched" custody event per sample with the waybill,
 * moves the samples to "dispatched", then e-mails the lab the manifest link (copy to the sender).
 * `{resendEmail: true}` on a submission already sent only sends the e-mail again.
 */
export async function sendSubmission(actor: Actor, projectId: string, submissionId: string, raw: unknown) {
  await authorize(actor, projectId, "submission.write");
  const body = (raw ?? {}) as { resendEmail?: unknown };
  const db = getDb();
  if (body.resendEmail === true && Object.keys(body).length === 1) {
    const d = await getSubmissionOrThrow(actor, projectId, submissionId);
    if (d.status === "draft") throw conflict(`Submission ${d.code} has not been sent yet.`);
    await claimResend(actor, projectId, d);
    const mail = await dispatchMail(actor, d);
    return { submission: await getSubmissionOrThrow(actor, projectId, submissionId), mail };
  }
  const input = validateInput(submissionSendSchema, raw);
  const occurredAt = input.occurredAt ?? new Date().toISOString();
  await db.transaction(async (tx) => {
    const [sub] = await tx.select().from(submissions).where(and(eq(submissions.id, submissionId), eq(submissions.projectId, projectId)));
    if (!sub) throw notFound("Submission not found.");
    if (sub.status !== "draft") throw conflict(`Submission ${sub.code} was already sent${sub.sentAt ? ` on ${sub.sentAt.toISOString().slice(0, 10)}` : ""}.`, { status: sub.status });
    if (!sub.labEmail) throw invalid("This submission has no lab e-mail address.", { labEmail: ["Set the lab's e-mail on the submission or the project."] });
    const list = await tx
      .select({ id: samples.id, code: samples.code, status: samples.status, version: samples.version })
      .from(submissionSamples)
      .innerJoin(samples, eq(samples.id, submissionSamples.sampleId))
      .where(eq(submissionSamples.submissionId, submissionId));
    // A sample back from storage starts a new cycle: its status is reset to "dispatched" on purpose (audited).
    const policyOf = (st: SampleStatus) => (st === "stored" || st === "returned" ? ("reset" as const) : ("forward" as const));
    assertStatusPlans(list.filter((s) => policyOf(s.status) === "forward"), "dispatched");
    for (const s of list) {
      await appendCustodyEvent(tx, actor, s, {
        statusPolicy: policyOf(s.status),
        projectId,
        submissionId,
        event: "dispatched",
        occurredAt,
        location: input.location,
        sealNumber: input.sealNumber,
        note: input.note,
        waybill: input.waybill,
        handedTo: input.courier,
      });
    }
    const [updated] = await tx
      .update(submissions)
      .set({ status: "sent", waybill: input.waybill, sentAt: new Date(occurredAt), sentBy: actor.userId, lastMailedAt: new Date(), mailCount: 1 })
      .where(and(eq(submissions.id, submissionId), eq(submissions.status, "draft")))
      .returning();
    if (!updated) throw conflict(`Submission ${sub.code} was sent by someone else just now.`);
    await audit(tx, actor, { projectId, action: "send", entity: "submission", entityId: submissionId, before: { status: "draft" }, after: { status: "sent", waybill: input.waybill } });
  });
  const d = await getSubmissionOrThrow(actor, projectId, submissionId);
  const mail = await dispatchMail(actor, d);
  return { submission: d, mail };
}

/**
 * Lab intake (lead, lab analyst): the condition of every bag on the manifest (received / missing / damaged), plus
 * bags that arrived but were not listed ("extra", project samples only). Writes "received" custody events (not for
 * missing bags), moves the samples to "received" and e-mails a receipt to the sender and the leads.
 */
export async function receiveSubmission(actor: Actor, projectId: string, submissionId: string, raw: unknown) {
  await authorize(actor, projectId, "lab.intake");
  const input = validateInput(submissionReceiveSchema, raw);
  await recordIntake(actor, projectId, submissionId, input);
  const d = await getSubmissionOrThrow(actor, projectId, submissionId);
  const mail = await sendReceipt(projectId, d, actor.name, input);
  return { submission: d, mail };
}

/**
 * The intake itself, for a caller whose access was checked: a member with lab.intake, or an outside lab through its
 * lab link (which may not add "extra" bags: the link reaches only the manifest's samples). All or nothing.
 */
export async function recordIntake(actor: Recorder, projectId: string, submissionId: string, input: SubmissionReceiveInput, opts: { allowExtra?: boolean } = {}): Promise<void> {
  if (opts.allowExtra === false) {
    const fields: Record<string, string[]> = {};
    input.items.forEach((it, i) => {
      if (it.condition === "extra") fields[`items.${i}.condition`] = ["Bags that are not on the manifest cannot be added through the lab link: describe them in the note, and the project team will add them."];
    });
    if (Object.keys(fields).length) throw invalid("The intake lists a bag that is not on the manifest.", fields);
  }
  const db = getDb();
  const receivedAt = input.receivedAt ?? new Date().toISOString();
  await db.transaction(async (tx) => {
    const [sub] = await tx.select().from(submissions).where(and(eq(submissions.id, submissionId), eq(submissions.projectId, projectId)));
    if (!sub) throw notFound("Submission not found.");
    assertNotSender(actor, { code: sub.code, sentBy: sub.sentBy ?? (await dispatcherOf(tx, submissionId)) });
    if (sub.status === "draft") throw conflict(`Submission ${sub.code} has not been sent yet.`, { status: sub.status });
    if (sub.status !== "sent") throw conflict(`Submission ${sub.code} was already received${sub.receivedAt ? ` on ${sub.receivedAt.toISOString().slice(0, 10)}` : ""}.`, { status: sub.status });
    const listed = await tx
      .select({ id: samples.id, code: samples.code, status: samples.status, version: samples.version })
      .from(submissionSamples)
      .innerJoin(samples, eq(samples.id, submissionSamples.sampleId))
      .where(eq(submissionSamples.submissionId, submissionId));
    const onManifest = new Map(listed.map((s) => [s.id, s]));
    const extraIds = input.items.filter((i) => i.condition === "extra").map((i) => i.sampleId);
    const extras = extraIds.length
      ? await tx.select({ id: samples.id, code: samples.code, status: samples.status, version: samples.version }).from(samples).where(and(eq(samples.projectId, projectId), inArray(samples.id, extraIds)))
      : [];
    const extraById = new Map(extras.map((s) => [s.id, s]));
    const fields: Record<string, string[]> = {};
    input.items.forEach((item, i) => {
      if (item.condition === "extra") {
        if (onManifest.has(item.sampleId)) fields[`items.${i}.condition`] = [`${onManifest.get(item.sampleId)!.code} is on the manifest; "extra" is for bags that were not listed.`];
        else if (!extraById.has(item.sampleId)) fields[`items.${i}.sampleId`] = [`No sample with id ${item.sampleId} in this project.`];
      } else if (!onManifest.has(item.sampleId)) {
        fields[`items.${i}.sampleId`] = [`No sample with id ${item.sampleId} on submission ${sub.code}; mark unlisted bags as "extra".`];
      }
    });
    const given = new Set(input.items.map((i) => i.sampleId));
    const forgotten = listed.filter((s) => !given.has(s.id)).map((s) => `${s.code} is on the manifest but has no intake condition (received, damaged or missing).`);
    if (forgotten.length) fields.items = forgotten;
    if (Object.keys(fields).length) throw invalid("The intake does not match the manifest.", fields);

    const arriving = input.items.filter((i) => i.condition !== "missing").map((i) => onManifest.get(i.sampleId) ?? extraById.get(i.sampleId)!);
    assertStatusPlans(arriving, "received");
    for (const item of input.items) {
      const s = onManifest.get(item.sampleId) ?? extraById.get(item.sampleId)!;
      if (item.condition === "extra") await tx.insert(submissionSamples).values({ submissionId, sampleId: s.id, intakeCondition: "extra" });
      else await tx.update(submissionSamples).set({ intakeCondition: item.condition }).where(and(eq(submissionSamples.submissionId, submissionId), eq(submissionSamples.sampleId, s.id)));
      if (item.condition === "missing") {
        await audit(tx, actor, { projectId, action: "custody.missing", entity: "sample", entityId: s.id, after: { submissionId, note: item.note ?? null } });
        continue;
      }
      await appendCustodyEvent(tx, actor, s, {
        projectId,
        submissionId,
        event: "received",
        occurredAt: receivedAt,
        location: item.location ?? input.location,
        sealNumber: input.sealNumber,
        condition: item.condition,
        weightKg: item.weightKg,
        note: [item.note, input.note].filter(Boolean).join(" — ") || null,
        handedTo: null,
      });
    }
    const [updated] = await tx
      .update(submissions)
      .set({ status: "received", receivedAt: new Date(receivedAt), labReference: input.labReference ?? null })
      .where(and(eq(submissions.id, submissionId), eq(submissions.status, "sent")))
      .returning();
    if (!updated) throw conflict(`Submission ${sub.code} was received by someone else just now.`);
    await audit(tx, actor, { projectId, action: "receive", entity: "submission", entityId: submissionId, before: { status: "sent" }, after: { status: "received", labReference: input.labReference ?? null } });
  });
}

/** The receipt e-mail to the sender and the leads after an intake (a mail failure does not undo the intake). */
export async function sendReceipt(projectId: string, d: SubmissionDetail, receivedBy: string, input: SubmissionReceiveInput): Promise<MailOutcome> {
  const counts: Record<IntakeCondition, number> = { received: 0, damaged: 0, missing: 0, extra: 0 };
  for (const s of d.samples) if (s.intakeCondition) counts[s.intakeCondition as IntakeCondition]++;
  const notes = new Map(input.items.map((i) => [i.sampleId, i.note ?? null]));
  const leads = await projectLeadEmails(projectId);
  const to = [...new Set([d.createdByEmail, ...leads].filter((e): e is string => !!e))];
  const mail = await trySend(
    to,
    [],
    submissionReceivedMail({
      baseUrl: appBaseUrl(),
      project: d.project,
      submission: d,
      receivedAt: d.receivedAt?.toISOString() ?? new Date().toISOString(),
      receivedBy,
      counts,
      discrepancies: d.samples.filter((s) => s.intakeCondition && s.intakeCondition !== "received").map((s) => ({ code: s.code, condition: s.intakeCondition!, note: notes.get(s.id) ?? null })),
    }),
  );
  return mail;
}

/** E-mail addresses of the project's leads. */
export async function projectLeadEmails(projectId: string): Promise<string[]> {
  const rows = await getDb()
    .select({ email: user.email })
    .from(projectMembers)
    .innerJoin(user, eq(user.id, projectMembers.userId))
    .where(and(eq(projectMembers.projectId, projectId), eq(projectMembers.role, "lead")));
  return rows.map((r) => r.email);
}


/** Samples picked for a new submission (e.g. from the register's selection), in code order; unknown ids are dropped. */
export async function getSamplesForPicker(actor: Actor, projectId: string, ids: string[]) {
  await authorize(actor, projectId, "project.read");
  if (ids.length === 0) return [];
  return getDb()
    .select({ id: samples.id, code: samples.code, sampleType: samples.sampleType, status: samples.status, suspectedAsbestos: samples.suspectedAsbestos, weightKg: samples.weightKg })
    .from(samples)
    .where(and(eq(samples.projectId, projectId), inArray(samples.id, ids.slice(0, 500))))
    .orderBy(asc(samples.code));
}
