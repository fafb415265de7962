import { eq } from "drizzle-orm";
import type { Db } from "@/db";
import { auditLog, custodyEvents, samples, user } from "@/db/schema";
import { planStatusChange, STATUS_RANK, type CustodyEvent, type StatusPolicy } from "@/lib/custody";
import type { SampleStatus } from "@/lib/vocabulary";

type Tx = Parameters<Parameters<Db["transaction"]>[0]>[0];

/** Lab steps a scan moves a sample through, in lifecycle order. */
export type LabStatus = Extract<SampleStatus, "scanned" | "processed" | "confirmed">;

/** Name shown for events written by the app itself (processing finished, submission reported). */
export const SYSTEM_ACTOR_NAME = "Lithodex (automatic)";

export interface SampleEventWrite {
  sampleId: string;
  event: CustodyEvent;
  actorId: string | null;
  /** Defaults to the actor's account name, or SYSTEM_ACTOR_NAME without an actor. */
  actorName?: string | null;
  occurredAt?: string;
  submissionId?: string | null;
  scanId?: string | null;
  note?: string | null;
  /** "forward" (default) never moves the status back; "reset" does on purpose (reopening); "keep" records only. */
  policy?: StatusPolicy;
  /** Audit action; defaults to `custody.<event>`. */
  action?: string;
}

/**
 * Records one review or custody event of a sample and moves its status as the event implies — the only way the
 * status changes (it is derived from the events: each event stores the status it leaves, samples.status caches the
 * latest). A "forward" event that would move the status back is recorded without changing it. Writes an audit
 * entry, inside the caller's transaction.
 * @returns the status before and after, and whether it changed
 */
export async function writeSampleEvent(tx: Tx | Db, w: SampleEventWrite): Promise<{ from: SampleStatus; to: SampleStatus; changed: boolean; eventId: string } | null> {
  const [before] = await tx.select({ id: samples.id, projectId: samples.projectId, status: samples.status, version: samples.version }).from(samples).where(eq(samples.id, w.sampleId));
  if (!before) return null;
  const plan = planStatusChange(before.status, w.event, w.policy ?? "forward");
  const next = plan.ok ? plan.next : before.status;
  let name = w.actorName ?? null;
  if (!name && w.actorId) {
    const [u] = await tx.select({ name: user.name }).from(user).where(eq(user.id, w.actorId));
    name = u?.name ?? null;
  }
  const [row] = await tx
    .insert(custodyEvents)
    .values({
      sampleId: w.sampleId,
      submissionId: w.submissionId ?? null,
      scanId: w.scanId ?? null,
      event: w.event,
      actorId: w.actorId,
      actorName: name ?? SYSTEM_ACTOR_NAME,
      occurredAt: w.occurredAt ?? new Date().toISOString(),
      note: w.note ?? null,
      statusAfter: next,
    })
    .returning({ id: custodyEvents.id });
  const changed = next !== before.status;
  if (changed) await tx.update(samples).set({ status: next, version: before.version + 1 }).where(eq(samples.id, w.sampleId));
  await tx.insert(auditLog).values({
    projectId: before.projectId,
    actorId: w.actorId,
    action: w.action ?? `custody.${w.event}`,
    entity: "sample",
    entityId: w.sampleId,
    beforeJson: { status: before.status, version: before.version },
    afterJson: { status: next, version: changed ? before.version + 1 : before.version, custodyEventId: row.id, ...(w.scanId && { scanId: w.scanId }) },
  });
  return { from: before.status, to: next, changed, eventId: row.id };
}

/**
 * Moves a sample forward to a lab status through a review event ("processed" when a scan's candidates are ready,
 * "confirmed" at sign-off); never backwards (a sample already reported, stored or returned keeps its status). The
 * "processed" event is written only when it moves the status (re-processing does not repeat it); a sign-off is
 * always recorded. Inside the caller's transaction.
 * @returns true when the status changed
 */
export async function advanceSampleStatus(tx: Tx | Db, sampleId: string, target: LabStatus, actorId: string | null, opts: { scanId?: string | null; note?: string | null } = {}): Promise<boolean> {
  const [before] = await tx.select({ status: samples.status }).from(samples).where(eq(samples.id, sampleId));
  if (!before) return false;
  const moves = STATUS_RANK[before.status] < STATUS_RANK[target];
  if (!moves && target !== "confirmed") return false;
  const r = await writeSampleEvent(tx, { sampleId, event: target, actorId, scanId: opts.scanId ?? null, note: opts.note ?? null, policy: moves ? "forward" : "keep", action: "status" });
  return !!r?.changed;
}
