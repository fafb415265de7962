"use client";

import Dexie, { liveQuery, type Table } from "dexie";
import type { DetailedError } from "tus-js-client";
import { uuidv7 } from "uuidv7";

/**
 * Photos taken without signal: kept as blobs in IndexedDB (their own Dexie database) with a device photo id, and sent
 * by the outbox's sync round after their sample's or station's create has reached the server. Sending is resumable
 * (tus 1.0.0 through tus-js-client, in chunks): the session URL is kept with the photo, so after a drop — or a
 * reload — the upload asks the server how much it holds and goes on from there. The server stores a device photo id
 * once, so a send whose answer was lost is harmless.
 */

export type PhotoQueueState = "queued" | "sending" | "failed";

export interface QueuedPhoto {
  clientPhotoId: string;
  projectId: string;
  owner: { kind: "sample" | "station"; id: string };
  /** For the panel, e.g. "Photo of sample FT-0012". */
  label: string;
  name: string;
  type: string;
  size: number;
  blob: Blob;
  state: PhotoQueueState;
  /** The tus session (relative URL) once opened, to resume. */
  uploadUrl: string | null;
  bytesSent: number;
  attempts: number;
  nextAttemptAt: number;
  lastError: string | null;
  createdAt: number;
  userId: string | null;
}

class PhotoQueueDb extends Dexie {
  photos!: Table<QueuedPhoto, string>;
  constructor() {
    super("lithodex-photo-queue");
    this.version(1).stores({ photos: "clientPhotoId, projectId, [owner.kind+owner.id], createdAt" });
  }
}
let db: PhotoQueueDb | null = null;
const pdb = () => (db ??= new PhotoQueueDb());

/** Chunk size of a resumable send: 1 MiB keeps a dropped chunk cheap on a weak link. */
export const PHOTO_CHUNK_BYTES = 1024 * 1024;

export async function queuePhoto(p: { projectId: string; owner: QueuedPhoto["owner"]; label: string; file: Blob & { name?: string }; userId?: string | null }): Promise<QueuedPhoto> {
  const row: QueuedPhoto = {
    clientPhotoId: uuidv7(),
    projectId: p.projectId,
    owner: p.owner,
    label: p.label,
    name: p.file.name || "photo.jpg",
    type: p.file.type,
    size: p.file.size,
    blob: p.file,
    state: "queued",
    uploadUrl: null,
    bytesSent: 0,
    attempts: 0,
    nextAttemptAt: 0,
    lastError: null,
    createdAt: Date.now(),
    userId: p.userId ?? null,
  };
  await pdb().photos.put(row);
  return row;
}

export async function listQueuedPhotos(projectId: string): Promise<QueuedPhoto[]> {
  return pdb().photos.where("projectId").equals(projectId).sortBy("createdAt");
}

/** Live view of a project's queued photos (the sync panel, the badges). */
export function watchPhotoQueue(projectId: string, onChange: (items: QueuedPhoto[]) => void): () => void {
  const sub = liveQuery(() => listQueuedPhotos(projectId)).subscribe({ next: onChange, error: () => undefined });
  return () => sub.unsubscribe();
}

export async function retryPhoto(clientPhotoId: string): Promise<void> {
  await pdb().photos.update(clientPhotoId, { state: "queued", nextAttemptAt: 0, lastError: null });
}
export async function discardPhoto(clientPhotoId: string): Promise<void> {
  await pdb().photos.delete(clientPhotoId);
}

function messageOf(err: unknown): { message: string; status: number } {
  const e = err as DetailedError;
  const status = e?.originalResponse?.getStatus?.() ?? 0;
  let message = "No connection to the server.";
  if (status) {
    try {
      message = JSON.parse(e.originalResponse!.getBody()).error.message;
    } catch {
      message = `The server answered ${status}.`;
    }
  }
  return { message, status };
}

/** Sends one photo, resuming its session when it has one; resolves with what became of it. */
export async function sendPhoto(item: QueuedPhoto): Promise<"done" | "queued" | "failed"> {
  // tus-js-client (about 16 kB gzip) loads with the first photo sent, not with every page that shows the queue.
  let tus: typeof import("tus-js-client");
  try {
    tus = await import("tus-js-client");
  } catch {
    return "queued"; // the chunk could not load (no connection, no service worker yet): try again next round
  }
  const store = pdb();
  return new Promise((resolve) => {
    void store.photos.update(item.clientPhotoId, { state: "sending" });
    const upload = new tus.Upload(item.blob, {
      endpoint: `/api/projects/${item.projectId}/photo-uploads`,
      uploadUrl: item.uploadUrl,
      chunkSize: PHOTO_CHUNK_BYTES,
      retryDelays: [0, 1000, 3000],
      storeFingerprintForResuming: false, // the session URL lives with the photo in IndexedDB
      removeFingerprintOnSuccess: true,
      metadata: { clientPhotoId: item.clientPhotoId, filename: item.name, ...(item.owner.kind === "sample" ? { sampleId: item.owner.id } : { stationId: item.owner.id }) },
      onUploadUrlAvailable: () => {
        void store.photos.update(item.clientPhotoId, { uploadUrl: upload.url });
      },
      onChunkComplete: (_n, sent) => {
        void store.photos.update(item.clientPhotoId, { bytesSent: sent });
      },
      onSuccess: () => {
        void store.photos.delete(item.clientPhotoId).then(() => resolve("done"));
      },
      onError: (err) => {
        const { message, status } = messageOf(err);
        // No answer, a server error, or a session that expired: try again later (a new session if it is gone).
        const retry = status === 0 || status >= 500 || status === 404 || status === 410 || status === 409 || status === 423;
        const parentMissing = status === 404 && !item.uploadUrl;
        void store.photos
          .update(item.clientPhotoId, {
            state: retry || parentMissing ? "queued" : "failed",
            attempts: item.attempts + 1,
            nextAttemptAt: Date.now() + Math.min(60_000, 2000 * 2 ** item.attempts),
            lastError: message,
            ...((status === 404 || status === 410) && { uploadUrl: null, bytesSent: 0 }),
          })
          .then(() => resolve(retry || parentMissing ? "queued" : "failed"));
      },
    });
    upload.start();
  });
}

/**
 * One round: sends the project's due photos whose sample or station is no longer waiting for its own create
 * (`pendingRecordIds`), oldest first. Called by the outbox's sync round after the records. Stops at the first
 * photo that found no connection.
 */
export async function syncPhotos(projectId: string, opts: { pendingRecordIds: Set<string>; userId: string | null; force?: boolean }): Promise<{ sent: number; waiting: number }> {
  let sent = 0;
  let waiting = 0;
  for (const item of await listQueuedPhotos(projectId)) {
    if (item.state === "failed") continue;
    if (item.userId && item.userId !== opts.userId) continue;
    if (opts.pendingRecordIds.has(item.owner.id)) {
      waiting++;
      continue;
    }
    if (!opts.force && item.state === "queued" && item.nextAttemptAt > Date.now()) continue;
    const r = await sendPhoto(item);
    if (r === "done") sent++;
    else waiting++;
    if (r === "queued" && typeof navigator !== "undefined" && !navigator.onLine) break;
  }
  return { sent, waiting };
}
