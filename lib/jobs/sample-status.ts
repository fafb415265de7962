import { eq, sql } from "drizzle-orm";
import type { Db } from "@/db";
import { auditLog, samples } from "@/db/schema";
import { STATUS_RANK } from "@/lib/validation/custody";
import type { SampleStatus } from "@/lib/vocabulary";

type Tx = Parameters<Parameters<Db["transaction"]>[0]>[0];

/** Lab steps a scan moves a sample through, in lifecycle order. */
export type LabStatus = Extract<SampleStatus, "scanned" | "processed" | "confirmed">;

/**
 * Moves a sample forward to a lab status; never backwards (a sample already reported, stored or returned keeps its
 * status). Bumps the record version and writes an audit entry, inside the caller's transaction.
 * @returns true when the status changed
 */
export async function advanceSampleStatus(tx: Tx | Db, sampleId: string, target: LabStatus, actorId: string | null): Promise<boolean> {
  const [before] = await tx.select({ id: samples.id, projectId: samples.projectId, status: samples.status, version: samples.version }).from(samples).where(eq(samples.id, sampleId));
  if (!before) return false;
  if (STATUS_RANK[before.status] >= STATUS_RANK[target]) return false;
  await tx
    .update(samples)
    .set({ status: target, version: sql`${samples.version} + 1` })
    .where(eq(samples.id, sampleId));
  await tx.insert(auditLog).values({
    projectId: before.projectId,
    actorId,
    action: "status",
    entity: "sample",
    entityId: sampleId,
    beforeJson: { status: before.status, version: before.version },
    afterJson: { status: target, version: before.version + 1 },
  });
  return true;
}
