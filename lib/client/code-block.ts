"use client";

import Dexie, { liveQuery, type Table } from "dexie";
import { uuidv7 } from "uuidv7";
import { CODE_BLOCK_DEFAULT_SIZE, DEVICE_HEADER, nextUnusedCode, needsTopUp, type DeviceBlock } from "@/lib/outbox/code-block-math";

/**
 * Sample codes reserved for this device (lib/dal/code-blocks.ts on the server): while online the device reserves a
 * block of codes; offline, a new sample takes the next unused one (provisional until the server has it), so a label
 * printed in the field keeps its code. Kept in its own IndexedDB store beside the outbox.
 */

interface StoredBlock extends DeviceBlock {
  projectId: string;
  userId: string;
  deviceId: string;
}

class CodeBlockDb extends Dexie {
  blocks!: Table<StoredBlock, string>;
  meta!: Table<{ key: string; value: string }, string>;
  constructor() {
    super("lithodex-code-blocks");
    this.version(1).stores({ blocks: "id, [projectId+userId], createdAt", meta: "key" });
  }
}

let db: CodeBlockDb | null = null;
const store = () => (db ??= new CodeBlockDb());

/** This device's id (made once, kept in IndexedDB). */
export async function getDeviceId(): Promise<string> {
  const d = store();
  return d.transaction("rw", d.meta, async () => {
    const row = await d.meta.get("deviceId");
    if (row) return row.value;
    const value = uuidv7();
    await d.meta.put({ key: "deviceId", value });
    return value;
  });
}

/** The header that names this device to the server. */
export async function deviceHeaders(): Promise<Record<string, string>> {
  return { [DEVICE_HEADER]: await getDeviceId() };
}

/** A plain name for the device, from the browser's user agent. */
export function deviceLabel(): string {
  const ua = typeof navigator === "undefined" ? "" : navigator.userAgent;
  if (/iPhone/.test(ua)) return "iPhone";
  if (/iPad/.test(ua)) return "iPad";
  if (/Android/.test(ua)) return /Mobile/.test(ua) ? "Android phone" : "Android tablet";
  return "Computer browser";
}

let currentUser: string | null = null;
/** The signed-in account (set by the project shell); blocks belong to one account on one device. */
export function setCodeBlockUser(userId: string | null): void {
  currentUser = userId;
}

/**
 * For a sample saved without a connection: the next reserved code and the device header to send with it; empty when
 * the device holds no code (the server then issues one on sync).
 */
export async function reservedCodeForOfflineSample(projectId: string): Promise<{ code: string; headers: Record<string, string> } | null> {
  if (!currentUser) return null;
  const code = await takeReservedCode(projectId, currentUser);
  return code ? { code, headers: await deviceHeaders() } : null;
}

async function blocksOf(projectId: string, userId: string, knownDeviceId?: string): Promise<StoredBlock[]> {
  const deviceId = knownDeviceId ?? (await getDeviceId());
  const rows = await store().blocks.where("[projectId+userId]").equals([projectId, userId]).toArray();
  return rows.filter((b) => b.deviceId === deviceId).sort((a, b) => a.createdAt - b.createdAt);
}

/** The code a sample saved offline now would take, without taking it; null when the device holds none. */
export async function peekReservedCode(projectId: string, userId: string): Promise<string | null> {
  return nextUnusedCode(await blocksOf(projectId, userId))?.code ?? null;
}

/** Takes the next unused reserved code for a new sample; null when the device holds none. */
export async function takeReservedCode(projectId: string, userId: string): Promise<string | null> {
  const d = store();
  return d.transaction("rw", d.blocks, d.meta, async () => {
    const blocks = await blocksOf(projectId, userId);
    const next = nextUnusedCode(blocks);
    if (!next) return null;
    const b = blocks.find((x) => x.id === next.blockId)!;
    await d.blocks.update(b.id, { taken: [...b.taken, next.code] });
    return next.code;
  });
}

let reserving: Promise<void> | null = null;

/** Reserves another block when this device has few codes left (online only); quiet when it cannot. */
export function topUpCodeBlock(projectId: string, userId: string, opts: { fetchImpl?: typeof fetch; force?: boolean; size?: number } = {}): Promise<void> {
  reserving ??= (async () => {
    try {
      const blocks = await blocksOf(projectId, userId);
      if (!opts.force && !needsTopUp(blocks)) return;
      const deviceId = await getDeviceId();
      const res = await (opts.fetchImpl ?? fetch)(`/api/projects/${projectId}/sample-code-blocks`, {
        method: "POST",
        headers: { "content-type": "application/json", "idempotency-key": uuidv7() },
        body: JSON.stringify({ deviceId, deviceLabel: deviceLabel(), size: opts.size ?? CODE_BLOCK_DEFAULT_SIZE }),
        credentials: "same-origin",
      });
      if (res.status !== 201) return;
      const b = (await res.json()) as { id: string; firstCode: string; lastCode: string; codes: string[] };
      await store().blocks.put({ id: b.id, projectId, userId, deviceId, firstCode: b.firstCode, lastCode: b.lastCode, codes: b.codes, taken: [], createdAt: Date.now() });
    } catch {
      // offline or refused: the next round tries again
    } finally {
      reserving = null;
    }
  })();
  return reserving;
}

/** Live view of this device's blocks in a project, for the sync page. */
export function watchCodeBlocks(projectId: string, userId: string, onChange: (blocks: DeviceBlock[]) => void): () => void {
  let stop = false;
  let unsubscribe = () => {
    stop = true;
  };
  // The device id is read (or made) first: a live query may only read.
  void getDeviceId().then((deviceId) => {
    if (stop) return;
    const sub = liveQuery(() => blocksOf(projectId, userId, deviceId)).subscribe({ next: onChange, error: () => undefined });
    unsubscribe = () => sub.unsubscribe();
  });
  return () => unsubscribe();
}
