import "server-only";
import type { Db } from "@/db";
import { auditLog } from "@/db/schema";
import type { Recorder } from "./actor";

type Tx = Parameters<Parameters<Db["transaction"]>[0]>[0];
export type DbOrTx = Db | Tx;

/** Appends one audit entry, inside the caller's transaction. */
export async function audit(
  tx: DbOrTx,
  actor: Pick<Recorder, "userId"> | null,
  entry: { projectId: string | null; action: string; entity: string; entityId: string; before?: unknown; after?: unknown },
): Promise<void> {
  await tx.insert(auditLog).values({
    projectId: entry.projectId,
    actorId: actor?.userId ?? null,
    action: entry.action,
    entity: entry.entity,
    entityId: entry.entityId,
    beforeJson: entry.before ?? null,
    afterJson: entry.after ?? null,
  });
}
