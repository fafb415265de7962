import "server-only";
import { and, asc, desc, eq, inArray } from "drizzle-orm";
import { getDb } from "@/db";
import { custodyEvents, samples, submissionSamples, submissions } from "@/db/schema";
import { LAB_STEP_EVENTS, custodyBatchSchema, custodyStepSchema, planStatusChange, type CustodyEvent, type StatusPolicy } from "@/lib/validation/custody";
import type { SampleStatus } from "@/lib/vocabulary";
import { authorize, type Actor } from "./actor";
import { audit, type DbOrTx } from "./audit";
import { AppError, conflict, invalid, notFound } from "./errors";
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
export async function appendCustodyEvent(tx: DbOrTx, actor: Actor, sample: CustodySample, w: CustodyWrite) {
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
async function attachToOpenSubmission(tx: DbOrTx, actor: Actor, projectId: string, sampleId: string, event: CustodyEvent): Promise<string | null> {
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
  await authorize(actor, projectId, "project.read");
  const db = getDb();
  const [sample] = await db.select({ id: samples.id, code: samples.code, status: samples.status }).from(samples).where(and(eq(samples.id, sampleId), eq(samples.projectId, projectId)));
  if (!sample) throw notFound("Sample not found.");
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
    events: events.map((e) => ({ ...e.event, submissionCode: e.submissionCode })),
    intakeFlags: intake,
  };
}

const LAB_STATES = ["received", "in_progress", "reported"] as const;

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
