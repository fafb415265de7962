"use client";

import { uuidv7 } from "uuidv7";
import type { OutboxItem } from "./outbox";
import type { QueuedPhoto } from "./photo-queue";

/**
 * What a form needs to save on the device when the connection is gone, without loading the device stores up front:
 * the outbox, the reserved sample codes and the photo queue (IndexedDB through Dexie, resumable uploads through
 * tus-js-client) load only when a save actually has to wait, so the field forms stay light on first load.
 */

export const newClientId = (): string => uuidv7();

/** True when fetch failed without an answer (offline, DNS, dropped connection). */
export function isNetworkFailure(e: unknown): boolean {
  return e instanceof TypeError || (typeof navigator !== "undefined" && navigator.onLine === false);
}

/** Puts a create or edit in the outbox (lib/client/outbox.ts). */
export async function enqueue(item: Parameters<typeof import("./outbox").enqueue>[0]): Promise<OutboxItem> {
  return (await import("./outbox")).enqueue(item);
}

/** The next code of this device's reserved block for a sample saved offline, or null (lib/client/code-block.ts). */
export async function reservedCodeForOfflineSample(projectId: string): Promise<{ code: string; headers: Record<string, string> } | null> {
  return (await import("./code-block")).reservedCodeForOfflineSample(projectId);
}

/** The reserved code an offline sample would take now, without taking it (for the form to show before saving). */
export async function peekReservedCode(projectId: string, userId: string): Promise<string | null> {
  return (await import("./code-block")).peekReservedCode(projectId, userId);
}

/** Keeps a photo on the device until its record is on the server, stamped with the account now signed in. */
export async function queuePhoto(p: { projectId: string; owner: QueuedPhoto["owner"]; label: string; file: Blob & { name?: string } }): Promise<QueuedPhoto> {
  const [{ queuePhoto: queue }, { outboxUser }] = await Promise.all([import("./photo-queue"), import("./outbox")]);
  return queue({ ...p, userId: outboxUser() });
}
