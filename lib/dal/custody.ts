import "server-only";
import { and, asc, desc, eq, inArray } from "drizzle-orm";
import { getDb } from "@/db";
import { custodyEvents, projects, samples, submissionSamples, submissions } from "@/db/schema";
import { SAMPLE_STATUS_LABELS } from "@/lib/format";
import { LAB_STEP_EVENTS, isAtLab, planStatusChange, type CustodyEvent, type StatusPolicy } from "@/lib/custody";
import { custodyBatchSchema, custodyStepSchema, sampleEventSchema } from "@/lib/validation/custody";
import type { SampleStatus } from "@/lib/vocabulary";
import { authorize, type Actor, type Recorder } from "./actor";
import { audit, type DbOrTx } from "./audit";
import { AppError, conflict, forbidden, invalid, notFound } from "./errors";
import { roleAllows, type Permission } from "./permissions";
import { validateInput } from "./validate";

export type CustodyEventRow = typeof custodyEvents.$inferSelect;

/** The sample fields a custody write needs. */
export interface CustodySample {
  id: string;
  code: string;
  status: SampleStatus;
  version: number;
}

export interface CustodyWrite {
  projectId: string;
  submissionId: string | null;
  event: CustodyEvent;
  occurredAt: string;
  location?: string | null;
  sealNumber?: string | null;
  condition?: string | null;
  weightKg?: number | null;
  note?: string | null;
  waybill?: string | null;
  handedTo?: string | null;
  /** Name of whoever handled the material; defaults to the actor. */
  handledBy?: string | null;
  statusPolicy?: StatusPolicy;
}

/** Refuses the whole batch when any sample's status would move back; messages name each sample. */
export function assertStatusPlans(list: CustodySample[], event: CustodyEvent, policy: StatusPolicy = "forward"): void {
  const problems = list.flatMap((s) => {
    const plan = planStatusChange(s.status, event, policy);
    return plan.ok ? [] : [{ sampleId: s.id, code: s.code, status: s.status, message: `${s.code}: ${plan.reason}` }];
  });
  if (problems.length) {
    throw new AppError("conflict", problems.length === 1 ? problems[0].message : `${problems.length} samples would move back in their lifecycle.`, { sampleIds: problems.map((p) => p.message) }, { samples: problems });
  }
}

/**
 * Appends one custody event inside the caller's transaction and moves the sample's status along the lifecycle
 * (forward only unless the policy says otherwise; see planStatusChange). Other DAL modules (e.g. scans) may call it.
 */
export async function appendCustodyEvent(tx: DbOrTx, actor: Recorder, sample: CustodySample, w: CustodyWrite) {
  const plan = planStatusChange(sample.status, w.event, w.statusPolicy);
  if (!plan.ok) throw conflict(`${sample.code}: ${plan.reason}`, { sampleId: sample.id, status: sample.status, event: w.event });
  const submissionId = w.submissionId ?? (await attachToOpenSubmission(tx, actor, w.projectId, sample.id, w.event));
  const [row] = await tx
    .insert(custodyEvents)
    .values({
      sampleId: sample.id,
      submissionId,
      event: w.event,
      actorId: actor.userId,
      actorName: w.handledBy || actor.name,
      occurredAt: w.occurredAt,
      location: w.location ?? null,
      sealNumber: w.sealNumber ?? null,
      condition: w.condition ?? null,
      weightKg: w.weightKg ?? null,
      note: w.note ?? null,
      waybill: w.waybill ?? null,
      handedTo: w.handedTo ?? null,
      statusAfter: plan.next,
    })
    .returning();
  // Where the bag is now: in transit after a dispatch, else the event's place (a discard keeps the last place).
  const where = w.event === "dispatched" ? `In transit${w.waybill ? ` (waybill ${w.waybill})` : ""}` : w.event !== "discarded" ? w.location : null;
  if (plan.next !== sample.status || where) {
    await tx
      .update(samples)
      .set({ status: plan.next, ...(where && { storageLocation: where }), ...(w.weightKg != null && w.event === "received" && { weightKg: w.weightKg }), version: sample.version + 1 })
      .where(eq(samples.id, sample.id));
    sample.version += 1;
  }
  await audit(tx, actor, {
    projectId: w.projectId,
    action: `custody.${w.event}`,
    entity: "sample",
    entityId: sample.id,
    before: { status: sample.status },
    after: { status: plan.next, change: plan.change, custodyEventId: row.id },
  });
  const from = sample.status;
  sample.status = plan.next;
  return { event: row, from, to: plan.next, change: plan.change };
}

/**
 * A lab step recorded without a submission (e.g. a scan upload) belongs to the sample's submission at the lab,
 * if any; its first preparation or scan moves that submission to "in_progress".
 */
async function attachToOpenSubmission(tx: DbOrTx, actor: Recorder, projectId: string, sampleId: string, event: CustodyEvent): Promise<string | null> {
  if (!(LAB_STEP_EVENTS as readonly string[]).includes(event)) return null;
  const [open] = await tx
    .select({ id: submissions.id, status: submissions.status })
    .from(submissionSamples)
    .innerJoin(submissions, eq(submissions.id, submissionSamples.submissionId))
    .where(and(eq(submissionSamples.sampleId, sampleId), inArray(submissions.status, ["received", "in_progress"])))
    .orderBy(desc(submissions.createdAt))
    .limit(1);
  if (!open) return null;
  if (open.status === "received" && (event === "prepared" || event === "scanned")) {
    await tx.update(submissions).set({ status: "in_progress" }).where(and(eq(submissions.id, open.id), eq(submissions.status, "received")));
    await audit(tx, actor, { projectId, action: "status", entity: "submission", entityId: open.id, before: { status: "received" }, after: { status: "in_progress" } });
  }
  return open.id;
}

/** Custody history of one sample, oldest first, with intake discrepancies recorded on submissions. */
export async function listSampleCustody(actor: Actor, projectId: string, sampleId: string) {
  const access = await authorize(actor, projectId, "project.read");
  const db = getDb();
  const [sample] = await db.select({ id: samples.id, code: samples.code, status: samples.status }).from(samples).where(and(eq(samples.id, sampleId), eq(samples.projectId, projectId)));
  if (!sample) throw notFound("Sample not found.");
  const [project] = await db.select({ labInHouse: projects.labInHouse, timeZone: projects.timeZone }).from(projects).where(eq(projects.id, projectId));
  const can = (p: Permission) => actor.isAdmin || roleAllows(access.role, p);
  /** What the viewer may record on this sample outside a submission. */
  const actions = {
    collect: sample.status === "planned" && can("sample.write"),
    receiveDirectly: !!project?.labInHouse && can("lab.intake") && ["collected", "returned"].includes(sample.status),
  };
  const [events, intake] = await Promise.all([
    db
      .select({ event: custodyEvents, submissionCode: submissions.code })
      .from(custodyEvents)
      .leftJoin(submissions, eq(submissions.id, custodyEvents.submissionId))
      .where(eq(custodyEvents.sampleId, sampleId))
      .orderBy(asc(custodyEvents.occurredAt), asc(custodyEvents.createdAt)),
    db
      .select({ submissionId: submissions.id, submissionCode: submissions.code, condition: submissionSamples.intakeCondition, receivedAt: submissions.receivedAt })
      .from(submissionSamples)
      .innerJoin(submissions, eq(submissions.id, submissionSamples.submissionId))
      .where(and(eq(submissionSamples.sampleId, sampleId), inArray(submissionSamples.intakeCondition, ["missing", "damaged", "extra"]))),
  ]);
  return {
    sample,
    actions,
    timeZone: project?.timeZone ?? null,
    events: events.map((e) => ({ ...e.event, submissionCode: e.submissionCode })),
    intakeFlags: intake,
  };
}

const LAB_STATES = ["received", "in_progress", "reported"] as const;

/** Separation of duties: whoever recorded a submission's dispatch may not confirm its receipt (leads and admins too). */
export function assertNotSender(actor: Recorder, sub: { code: string; sentBy: string | null }): void {
  if (sub.sentBy && sub.sentBy === actor.userId) {
    throw forbidden(`You recorded the dispatch of ${sub.code}, so you cannot also confirm its receipt: someone at the lab records the intake.`);
  }
}

/**
 * Whether each sample may get a scan: the lab must hold it (intake recorded through a submission, or an in-house
 * lab's "received directly"). Returns one message per sample that may not, naming what to do instead.
 */
export async function scanReadinessProblems(tx: DbOrTx, projectId: string, list: { id: string; code: string; status: SampleStatus }[]): Promise<Map<string, string>> {
  const out = new Map<string, string>();
  const waiting = list.filter((s) => !isAtLab(s.status));
  if (waiting.length === 0) return out;
  const [project] = await tx.select({ labInHouse: projects.labInHouse }).from(projects).where(eq(projects.id, projectId));
  const open = await tx
    .select({ sampleId: submissionSamples.sampleId, code: submissions.code, status: submissions.status })
    .from(submissionSamples)
    .innerJoin(submissions, eq(submissions.id, submissionSamples.submissionId))
    .where(and(inArray(submissionSamples.sampleId, waiting.map((s) => s.id)), inArray(submissions.status, ["draft", "sent"])));
  const subOf = new Map(open.map((o) => [o.sampleId, o]));
  for (const s of waiting) {
    const sub = subOf.get(s.id);
    const where = `${s.code} is "${SAMPLE_STATUS_LABELS[s.status]}": the lab has not recorded its intake, so a scan cannot be attached yet.`;
    const todo = sub
      ? sub.status === "sent"
        ? ` Record the intake of submission ${sub.code} first.`
        : ` It is on draft submission ${sub.code}: dispatch it, then record its intake at the lab.`
      : project?.labInHouse
        ? ` Record "received directly" on the sample (who took it and why), or send it on a submission.`
        : ` Send it to the lab on a submission and record the intake there.`;
    out.set(s.id, where + todo);
  }
  return out;
}

/**
 * Records an event on one sample outside a submission: the collection of a planned sample (sample.write), or an
 * in-house lab taking a sample directly, without a submission (lab.intake; the project must say its lab is
 * in-house, and the note says why). The status follows the event. Audited.
 */
export async function recordSampleEvent(actor: Actor, projectId: string, sampleId: string, raw: unknown) {
  await authorize(actor, projectId, "custody.write");
  const input = validateInput(sampleEventSchema, raw);
  await authorize(actor, projectId, input.event === "collected" ? "sample.write" : "lab.intake");
  const db = getDb();
  return db.transaction(async (tx) => {
    const [s] = await tx.select({ id: samples.id, code: samples.code, status: samples.status, version: samples.version }).from(samples).where(and(eq(samples.id, sampleId), eq(samples.projectId, projectId)));
    if (!s) throw notFound("Sample not found.");
    if (input.event === "collected" && s.status !== "planned") throw conflict(`${s.code} is already "${SAMPLE_STATUS_LABELS[s.status]}"; its collection is recorded.`, { status: s.status });
    if (input.event === "received_directly") {
      const [p] = await tx.select({ labInHouse: projects.labInHouse }).from(projects).where(eq(projects.id, projectId));
      if (!p?.labInHouse) throw conflict("This project's lab is not in-house: samples reach the lab on a submission, and the lab records their intake there. A lead can change this in the project settings.");
      if (isAtLab(s.status)) throw conflict(`${s.code} is already at the lab ("${SAMPLE_STATUS_LABELS[s.status]}").`, { status: s.status });
      if (s.status === "planned") throw conflict(`${s.code} is only planned: record its collection first.`, { status: s.status });
      if (s.status === "discarded") throw conflict(`${s.code} was discarded.`, { status: s.status });
      const [onSub] = await tx
        .select({ code: submissions.code })
        .from(submissionSamples)
        .innerJoin(submissions, eq(submissions.id, submissionSamples.submissionId))
        .where(and(eq(submissionSamples.sampleId, s.id), inArray(submissions.status, ["sent"])))
        .limit(1);
      if (onSub) throw conflict(`${s.code} is on submission ${onSub.code}, sent to the lab: record its intake there.`);
    }
    const r = await appendCustodyEvent(tx, actor, s, {
      projectId,
      submissionId: null,
      event: input.event,
      occurredAt: input.occurredAt ?? new Date().toISOString(),
      location: input.location,
      note: input.note,
      handledBy: input.handledBy,
      // A sample back from storage or returned starts a new cycle at the lab.
      statusPolicy: input.event === "received_directly" && (s.status === "stored" || s.status === "returned") ? "reset" : "forward",
    });
    return { sampleId: s.id, eventId: r.event.id, from: r.from, to: r.to };
  });
}

/**
 * Records one custody step (prepared, scanned, stored, returned, discarded; a late "received" for a bag that was
 * missing at intake; or a hand-over "transferred") for samples of a submission. All or nothing.
 * Lab steps need lab.intake (lead, lab analyst); a hand-over needs custody.write.
 */
export async function recordCustodySteps(actor: Actor, projectId: string, submissionId: string, raw: unknown, oneSampleId?: string) {
  await authorize(actor, projectId, "custody.write");
  const input = oneSampleId
    ? { ...validateInput(custodyStepSchema, raw), sampleIds: [oneSampleId] }
    : validateInput(custodyBatchSchema, raw);
  if (input.event !== "transferred") await authorize(actor, projectId, "lab.intake");
  const db = getDb();
  const occurredAt = input.occurredAt ?? new Date().toISOString();
  return db.transaction(async (tx) => {
    const [sub] = await tx.select().from(submissions).where(and(eq(submissions.id, submissionId), eq(submissions.projectId, projectId)));
    if (!sub) throw notFound("Submission not found.");
    if (input.event === "received") assertNotSender(actor, sub);
    if (input.event !== "transferred" && !(LAB_STATES as readonly string[]).includes(sub.status)) {
      throw conflict(`Submission ${sub.code} is "${sub.status}": record its intake at the lab before lab steps.`, { status: sub.status });
    }
    const rows = await tx
      .select({ id: samples.id, code: samples.code, status: samples.status, version: samples.version, intakeCondition: submissionSamples.intakeCondition })
      .from(submissionSamples)
      .innerJoin(samples, eq(samples.id, submissionSamples.sampleId))
      .where(and(eq(submissionSamples.submissionId, submissionId), inArray(submissionSamples.sampleId, input.sampleIds)));
    const byId = new Map(rows.map((r) => [r.id, r]));
    const unknown = input.sampleIds.filter((id) => !byId.has(id));
    if (unknown.length) {
      if (oneSampleId) throw notFound(`Sample is not on submission ${sub.code}.`);
      throw invalid("Some samples are not on this submission.", { sampleIds: unknown.map((id) => `No sample ${id} on submission ${sub.code}.`) });
    }
    const list = input.sampleIds.map((id) => byId.get(id)!);
    const intakeProblems = list.flatMap((s) => {
      if (input.event === "received") return s.intakeCondition === "missing" ? [] : [`${s.code} was already received at intake (${s.intakeCondition ?? "not yet recorded"}); use the submission's intake for a first receipt.`];
      if (input.event !== "transferred" && s.intakeCondition === "missing") return [`${s.code} was missing at intake: record its late arrival (received) first.`];
      return [];
    });
    if (intakeProblems.length) throw new AppError("conflict", intakeProblems[0], { sampleIds: intakeProblems });
    assertStatusPlans(list, input.event, input.statusPolicy);
    const results = [];
    for (const s of list) {
      results.push(
        await appendCustodyEvent(tx, actor, s, {
          projectId,
          submissionId,
          event: input.event,
          occurredAt,
          location: input.location,
          sealNumber: input.sealNumber,
          note: input.note,
          handledBy: input.handledBy,
          handedTo: input.handedTo,
          weightKg: input.weightKg,
          statusPolicy: input.statusPolicy,
          condition: input.event === "received" ? "received (late)" : null,
        }),
      );
      if (input.event === "received") {
        await tx.update(submissionSamples).set({ intakeCondition: "received" }).where(and(eq(submissionSamples.submissionId, submissionId), eq(submissionSamples.sampleId, s.id)));
      }
    }
    if ((input.event === "prepared" || input.event === "scanned") && sub.status === "received") {
      await tx.update(submissions).set({ status: "in_progress" }).where(eq(submissions.id, submissionId));
      await audit(tx, actor, { projectId, action: "status", entity: "submission", entityId: submissionId, before: { status: "received" }, after: { status: "in_progress" } });
    }
    return {
      submissionId,
      event: input.event,
      results: results.map((r) => ({ sampleId: r.event.sampleId, eventId: r.event.id, from: r.from, to: r.to, change: r.change })),
    };
  });
}
