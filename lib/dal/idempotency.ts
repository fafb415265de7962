import "server-only";
import { createHash } from "node:crypto";
import { and, eq } from "drizzle-orm";
import { idempotencyKeys } from "@/db/schema";
import type { Actor } from "./actor";
import type { DbOrTx } from "./audit";
import { conflict, invalid } from "./errors";
import { isUniqueViolation } from "./samples";

/**
 * Replay-safe creates for clients that queue work offline and resend it when the answer was lost.
 * Semantics after the IETF HTTPAPI draft "The Idempotency-Key HTTP Header Field" (Jena & Dalal): the
 * same key with the same request returns the first response; the same key with a different request is
 * refused (422). A client-generated record id (UUIDv7, RFC 9562) alone also works as the key.
 */

/** Printable ASCII without spaces, 8–200 characters (a UUID fits). */
export const IDEMPOTENCY_KEY_RE = /^[\x21-\x7e]{8,200}$/;

export type Idempotency = { key: string; scope: string; projectId: string; hash: string };

const KEY_MESSAGE = "Idempotency-Key must be 8–200 printable characters without spaces (a UUID works).";
const REUSED_MESSAGE = "This idempotency key was already used for a different request; send a new key with a new request.";

/** JSON with object keys sorted, so equal requests hash equally whatever the key order. */
export function canonicalJson(v: unknown): string {
  if (Array.isArray(v)) return `[${v.map(canonicalJson).join(",")}]`;
  if (v && typeof v === "object") {
    const o = v as Record<string, unknown>;
    return `{${Object.keys(o)
      .filter((k) => o[k] !== undefined)
      .sort()
      .map((k) => `${JSON.stringify(k)}:${canonicalJson(o[k])}`)
      .join(",")}}`;
  }
  return JSON.stringify(v ?? null);
}

/** The idempotency of one create: the header key, else the client id; null when the client sent neither. */
export function idempotencyFor(projectId: string, scope: string, headerKey: string | null | undefined, clientId: string | null | undefined, input: unknown): Idempotency | null {
  if (headerKey != null && !IDEMPOTENCY_KEY_RE.test(headerKey)) throw invalid(KEY_MESSAGE, { idempotencyKey: [KEY_MESSAGE] });
  const key = headerKey ?? (clientId ? `id:${clientId}` : null);
  if (!key) return null;
  const hash = createHash("sha256").update(canonicalJson({ scope, projectId, input })).digest("hex");
  return { key, scope, projectId, hash };
}

const TIMESTAMP_FIELDS = ["createdAt", "updatedAt"];

/** The first response for this key, with its timestamps as Dates again (they went out as ISO strings); null when new. */
export async function findReplay<T>(db: DbOrTx, actor: Actor, idem: Idempotency): Promise<T | null> {
  const [row] = await db
    .select()
    .from(idempotencyKeys)
    .where(and(eq(idempotencyKeys.userId, actor.userId), eq(idempotencyKeys.key, idem.key)));
  if (!row) return null;
  if (row.scope !== idem.scope || row.projectId !== idem.projectId || row.requestHash !== idem.hash) {
    throw invalid(REUSED_MESSAGE, { idempotencyKey: [REUSED_MESSAGE] });
  }
  const body = JSON.parse(row.response) as Record<string, unknown>;
  for (const f of TIMESTAMP_FIELDS) if (typeof body[f] === "string") body[f] = new Date(body[f] as string);
  return body as T;
}

/** Stores the response inside the create's transaction, so record and key are written together or not at all. */
export async function rememberResponse(tx: DbOrTx, actor: Actor, idem: Idempotency, entityId: string, body: unknown, status = 201): Promise<void> {
  await tx.insert(idempotencyKeys).values({
    userId: actor.userId,
    key: idem.key,
    projectId: idem.projectId,
    scope: idem.scope,
    requestHash: idem.hash,
    entityId,
    status,
    response: JSON.stringify(body),
  });
}

/**
 * Runs a create once per key: a replay (also one racing the first request) gets the stored response; a
 * client id already taken by another request is a 409.
 */
export async function createOnce<T>(
  db: DbOrTx,
  actor: Actor,
  idem: Idempotency | null,
  idColumn: string,
  what: string,
  run: (remember: (tx: DbOrTx, row: T & { id: string }) => Promise<void>) => Promise<T>,
): Promise<T> {
  if (idem) {
    const prior = await findReplay<T>(db, actor, idem);
    if (prior) return prior;
  }
  const remember = async (tx: DbOrTx, row: T & { id: string }) => {
    if (idem) await rememberResponse(tx, actor, idem, row.id, row);
  };
  try {
    return await run(remember);
  } catch (err) {
    const raced = isUniqueViolation(err, "idempotency_keys.") || isUniqueViolation(err, idColumn);
    if (idem && raced) {
      const prior = await findReplay<T>(db, actor, idem);
      if (prior) return prior;
    }
    if (isUniqueViolation(err, idColumn)) throw conflict(`A ${what} with this id already exists; a new record needs a new id.`, { field: "id" });
    throw err;
  }
}
