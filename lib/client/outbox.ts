"use client";

import Dexie, { liveQuery, type Table } from "dexie";
import { uuidv7 } from "uuidv7";
import { backoffDelay, classifyResponse } from "@/lib/outbox/backoff";
import { syncPhotos } from "./photo-queue";

/**
 * The offline outbox: station and sample creates and edits saved on the device (IndexedDB through Dexie) and
 * sent when the connection returns. Creates carry a client id (UUIDv7) and an Idempotency-Key, so a send whose
 * answer was lost is replayed safely (the server returns the first response). Edits carry the version they were
 * made against; a 409 becomes a conflict for a person to resolve, never an overwrite.
 */

export type OutboxKind = "station" | "sample" | "structure";
export type OutboxState = "queued" | "sending" | "failed" | "conflict";

export interface OutboxItem {
  /** Idempotency key of the send (UUIDv7). */
  opId: string;
  projectId: string;
  kind: OutboxKind;
  action: "create" | "update";
  /** The record's id (client-made for creates). */
  recordId: string;
  /** A label for the panel, e.g. "Sample (tag FT-0012)". */
  label: string;
  body: Record<string, unknown>;
  state: OutboxState;
  attempts: number;
  nextAttemptAt: number;
  lastError: string | null;
  /** The server's record when an edit met a newer version (409). */
  serverRecord: Record<string, unknown> | null;
  createdAt: number;
  /** The account that saved it on this device; only that account's session sends it. */
  userId: string | null;
  /** Extra request headers, e.g. the device id a reserved sample code belongs to (lib/client/code-block.ts). */
  headers?: Record<string, string>;
  /** The endpoint, for records nested under another (a station's structural measurements). */
  url?: string;
}

interface SyncMeta {
  projectId: string;
  lastSyncAt: number | null;
  lastResult: string | null;
}

class OutboxDb extends Dexie {
  items!: Table<OutboxItem, string>;
  meta!: Table<SyncMeta, string>;
  constructor() {
    super("lithodex-outbox");
    this.version(1).stores({ items: "opId, projectId, [projectId+state], recordId, createdAt", meta: "projectId" });
  }
}

let db: OutboxDb | null = null;
function outboxDb(): OutboxDb {
  db ??= new OutboxDb();
  return db;
}

export { isNetworkFailure, newClientId } from "./offline-save";

let currentUserId: string | null = null;

/** The signed-in account (set by the project shell); items saved by another account on this device are not sent with this session. */
export function setOutboxUser(userId: string | null): void {
  currentUserId = userId;
}

/** The account whose work this device sends now (photos queued offline are stamped with it). */
export const outboxUser = (): string | null => currentUserId;

const path = (item: Pick<OutboxItem, "projectId" | "kind" | "action" | "recordId" | "url">) =>
  item.url ??
  `/api/projects/${item.projectId}/${item.kind === "station" ? "stations" : "samples"}${item.action === "update" ? `/${item.recordId}` : ""}`;

/** Puts a create or edit in the outbox. An edit of a record still queued for creation is folded into that create. */
export async function enqueue(item: Pick<OutboxItem, "projectId" | "kind" | "action" | "recordId" | "label" | "body" | "headers" | "url"> & { opId?: string }): Promise<OutboxItem> {
  const d = outboxDb();
  return d.transaction("rw", d.items, async () => {
    if (item.action === "update") {
      const pendingCreate = await d.items.where("recordId").equals(item.recordId).and((i) => i.action === "create" && i.state !== "sending").first();
      if (pendingCreate) {
        const { version: _v, ...changes } = item.body; // eslint-disable-line @typescript-eslint/no-unused-vars
        const merged = { ...pendingCreate, body: { ...pendingCreate.body, ...changes }, label: item.label, state: "queued" as const, lastError: null };
        await d.items.put(merged);
        return merged;
      }
    }
    const row: OutboxItem = {
      opId: item.opId ?? uuidv7(),
      projectId: item.projectId,
      kind: item.kind,
      action: item.action,
      recordId: item.recordId,
      label: item.label,
      body: item.action === "create" ? { ...item.body, id: item.recordId } : item.body,
      state: "queued",
      attempts: 0,
      nextAttemptAt: 0,
      lastError: null,
      serverRecord: null,
      createdAt: Date.now(),
      userId: currentUserId,
      ...(item.headers && { headers: item.headers }),
      ...(item.url && { url: item.url }),
    };
    await d.items.put(row);
    return row;
  });
}

export async function listOutbox(projectId: string): Promise<OutboxItem[]> {
  return outboxDb().items.where("projectId").equals(projectId).sortBy("createdAt");
}

/** Live view of a project's outbox and its last sync, for the panel and badges. */
export function watchOutbox(projectId: string, onChange: (v: { items: OutboxItem[]; meta: SyncMeta | null }) => void): () => void {
  const sub = liveQuery(async () => ({ items: await listOutbox(projectId), meta: (await outboxDb().meta.get(projectId)) ?? null })).subscribe({ next: onChange, error: () => undefined });
  return () => sub.unsubscribe();
}

/** Sends one item now; returns the outcome it was given. */
export async function sendItem(item: OutboxItem, fetchImpl: typeof fetch = fetch): Promise<OutboxState | "done"> {
  const d = outboxDb();
  await d.items.update(item.opId, { state: "sending" });
  let status = 0;
  let body: unknown = null;
  try {
    const res = await fetchImpl(path(item), {
      method: item.action === "create" ? "POST" : "PATCH",
      headers: { ...item.headers, "content-type": "application/json", "idempotency-key": item.opId },
      body: JSON.stringify(item.body),
      credentials: "same-origin",
    });
    status = res.status;
    const text = await res.text();
    try {
      body = text ? JSON.parse(text) : null;
    } catch {
      body = null;
    }
  } catch {
    status = 0; // no answer: offline or the connection dropped
  }
  const out = status === 0 ? ({ kind: "retry", message: "No connection to the server." } as const) : classifyResponse(status, body);
  switch (out.kind) {
    case "done":
      await d.items.delete(item.opId);
      return "done";
    case "conflict":
      await d.items.update(item.opId, { state: "conflict", serverRecord: out.current, lastError: out.message });
      return "conflict";
    case "retry":
      await d.items.update(item.opId, { state: "queued", attempts: item.attempts + 1, nextAttemptAt: Date.now() + backoffDelay(item.attempts), lastError: out.message });
      return "queued";
    case "failed":
      await d.items.update(item.opId, { state: "failed", attempts: item.attempts + 1, lastError: out.message });
      return "failed";
  }
}

let running: Promise<void> | null = null;

/** Sends what is due (all queued items when `force`), oldest first, so a station goes before its samples. */
export function syncProject(projectId: string, opts: { force?: boolean; fetchImpl?: typeof fetch } = {}): Promise<void> {
  running ??= (async () => {
    try {
      const d = outboxDb();
      const items = await listOutbox(projectId);
      let sent = 0;
      let problems = 0;
      for (const item of items) {
        if (item.state === "conflict" || item.state === "failed") continue;
        if (item.userId && item.userId !== currentUserId) continue; // another account's work waits for that account
        if (item.state === "queued" && !opts.force && item.nextAttemptAt > Date.now()) continue;
        const r = await sendItem(item, opts.fetchImpl);
        if (r === "done") sent++;
        else problems++;
        if (r === "queued") break; // the connection is gone; later items wait for the next round
      }
      // Photos go after their records: one whose sample or station is still waiting here waits too.
      const pendingRecordIds = new Set((await listOutbox(projectId)).filter((i) => i.action === "create").map((i) => i.recordId));
      const photos = await syncPhotos(projectId, { pendingRecordIds, userId: currentUserId, force: opts.force });
      sent += photos.sent;
      problems += photos.waiting;
      if (sent > 0 || problems === 0) {
        await d.meta.put({ projectId, lastSyncAt: problems === 0 ? Date.now() : ((await d.meta.get(projectId))?.lastSyncAt ?? null), lastResult: `${sent} sent${problems ? `, ${problems} waiting` : ""}` });
      }
    } finally {
      running = null;
    }
  })();
  return running;
}

/** Retry a failed item after the person fixed the cause (or to try again). */
export async function requeue(opId: string, body?: Record<string, unknown>): Promise<void> {
  const changes: Partial<OutboxItem> = { state: "queued", nextAttemptAt: 0, lastError: null, serverRecord: null };
  if (body) changes.body = body;
  await outboxDb().items.update(opId, changes);
}

/** Conflict: keep my values, sent against their version (a new edit, with a new key). */
export async function keepMine(item: OutboxItem): Promise<void> {
  const version = Number(item.serverRecord?.version);
  await outboxDb().transaction("rw", outboxDb().items, async () => {
    await outboxDb().items.delete(item.opId);
    await outboxDb().items.put({ ...item, opId: uuidv7(), body: { ...item.body, version }, state: "queued", nextAttemptAt: 0, lastError: null, serverRecord: null });
  });
}

/** Conflict: drop my edit and keep theirs. */
export async function discard(opId: string): Promise<void> {
  await outboxDb().items.delete(opId);
}
