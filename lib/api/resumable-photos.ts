import "server-only";
import { readFile } from "node:fs/promises";
import { join } from "node:path";
import { FileStore } from "@tus/file-store";
import { ERRORS, MemoryLocker, Server, type Upload } from "@tus/server";
import type { Actor } from "@/lib/dal/actor";
import { notFound } from "@/lib/dal/errors";
import { authorizePhotoUploadSession, finishPhotoUpload, openPhotoUpload } from "@/lib/dal/photo-uploads";
import { MAX_PHOTO_BYTES } from "@/lib/photos/errors";
import { storageRoot } from "@/lib/storage";
import { errorResponse } from "./handler";

/**
 * Resumable photo uploads over the open tus protocol, version 1.0.0 (tus.io, "Resumable upload protocol"):
 * POST opens a session (Upload-Length, Upload-Metadata with clientPhotoId, sampleId or stationId, filename),
 * HEAD tells how many bytes the server holds (Upload-Offset), PATCH appends a chunk at exactly that offset,
 * DELETE cancels. @tus/server does the protocol and @tus/file-store keeps the partial file under
 * LITHODEX_DATA_DIR/uploads/photos; the access checks, the processing and the row are ours (lib/dal/photo-uploads).
 * Sessions expire after {@link UPLOAD_EXPIRY_MS} and are swept when new sessions open.
 */

/** An unfinished session is kept this long after it was opened (a day in the field without signal, and a margin). */
export const UPLOAD_EXPIRY_MS = 48 * 3600 * 1000;
/** At most one sweep of expired sessions in this interval. */
const SWEEP_EVERY_MS = 10 * 60 * 1000;
/** @tus/server names sessions with 16 random bytes in hex; anything else is not one of ours (and never a path). */
const UPLOAD_ID = /^[0-9a-f]{32}$/;

export const photoUploadDir = () => join(storageRoot(), "uploads", "photos");

interface Shared {
  dir: string;
  store: FileStore;
  locker: MemoryLocker;
  lastSweep: number;
}
const g = globalThis as unknown as { __lithodexPhotoUploads?: Shared };
function shared(): Shared {
  const dir = photoUploadDir();
  if (g.__lithodexPhotoUploads?.dir !== dir) {
    g.__lithodexPhotoUploads = { dir, store: new FileStore({ directory: dir, expirationPeriodInMilliseconds: UPLOAD_EXPIRY_MS }), locker: new MemoryLocker(), lastSweep: 0 };
  }
  return g.__lithodexPhotoUploads;
}

/** Removes expired unfinished sessions (their partial files and metadata); returns how many. */
export async function sweepExpiredPhotoUploads(): Promise<number> {
  const s = shared();
  s.lastSweep = Date.now();
  return s.store.deleteExpired();
}

const metaOf = (m: Upload["metadata"]) => ({
  clientPhotoId: m?.clientPhotoId ?? undefined,
  sampleId: m?.sampleId || null,
  stationId: m?.stationId || null,
  filename: m?.filename ?? m?.name ?? undefined,
});

/** tus errors carry {status_code, body}; ours become the usual JSON error with the same status. */
async function tusError(err: unknown): Promise<{ status_code: number; body: string }> {
  const res = errorResponse(err);
  return { status_code: res.status, body: await res.text() };
}

function jsonError(status: number, code: string, message: string, details?: Record<string, unknown>) {
  return { status_code: status, body: JSON.stringify({ error: { code, message, ...(details && { details }) } }) };
}

/**
 * Handles one tus request of a project's photo uploads after the route wrapper checked the session, Origin and
 * role, and put the body limit on PATCH. `uploadId` is null for POST (open a session).
 */
export async function handlePhotoUpload(req: Request, actor: Actor, projectId: string, uploadId: string | null): Promise<Response> {
  const s = shared();
  if (uploadId !== null) {
    if (!UPLOAD_ID.test(uploadId)) throw notFound("No such upload.");
    let upload: Upload;
    try {
      upload = await s.store.getUpload(uploadId);
    } catch {
      throw notFound("No such upload: it finished, expired or was cancelled. Open a new one (POST) to send the photo again.");
    }
    await authorizePhotoUploadSession(actor, projectId, { projectId: upload.metadata?.projectId ?? undefined, userId: upload.metadata?.userId ?? undefined, meta: metaOf(upload.metadata) });
  } else if (Date.now() - s.lastSweep > SWEEP_EVERY_MS) {
    void sweepExpiredPhotoUploads().catch(() => undefined);
  }

  const server = new Server({
    path: `/api/projects/${projectId}/photo-uploads`,
    datastore: s.store,
    locker: s.locker,
    maxSize: MAX_PHOTO_BYTES,
    relativeLocation: true,
    allowedOrigins: () => false, // same origin only; the wrapper already refused other sites
    getFileIdFromRequest: () => uploadId ?? undefined,
    onUploadCreate: async (_req, upload) => {
      try {
        const { meta } = await openPhotoUpload(actor, projectId, metaOf(upload.metadata));
        return {
          metadata: {
            clientPhotoId: meta.clientPhotoId,
            sampleId: meta.sampleId ?? null,
            stationId: meta.stationId ?? null,
            filename: meta.filename,
            projectId,
            userId: actor.userId,
          },
        };
      } catch (err) {
        throw await tusError(err);
      }
    },
    onUploadFinish: async (_req, upload) => {
      try {
        const meta = await authorizePhotoUploadSession(actor, projectId, { projectId: upload.metadata?.projectId ?? undefined, userId: upload.metadata?.userId ?? undefined, meta: metaOf(upload.metadata) });
        const bytes = new Uint8Array(await readFile(join(s.dir, upload.id)));
        const out = await finishPhotoUpload(actor, projectId, meta, bytes);
        return { status_code: 200, headers: { "content-type": "application/json" }, body: JSON.stringify(out) };
      } catch (err) {
        throw await tusError(err);
      } finally {
        // Finished either way: a stored photo needs no partial file, and a refused one (not an image, damaged) will
        // not get better by sending the same bytes again.
        await s.store.remove(upload.id).catch(() => undefined);
      }
    },
    onResponseError: async (_req, err) => {
      const e = err as { status_code?: number; body?: string };
      if (e.body?.startsWith("{")) return undefined; // already ours
      if (e.status_code === ERRORS.INVALID_OFFSET.status_code && e.body === ERRORS.INVALID_OFFSET.body && uploadId) {
        const held = await s.store.getUpload(uploadId).then((u) => u.offset).catch(() => null);
        const sent = req.headers.get("upload-offset");
        return jsonError(409, "offset_mismatch", `This chunk starts at byte ${sent} but the server holds ${held} bytes of this upload. Ask for the offset (HEAD) and send from byte ${held}.`, { offset: held });
      }
      if (e.status_code === ERRORS.ERR_MAX_SIZE_EXCEEDED.status_code) {
        return jsonError(413, "payload_too_large", `A photo may be at most ${MAX_PHOTO_BYTES / 1024 / 1024} MiB (the limit of a direct upload too).`, { limitBytes: MAX_PHOTO_BYTES });
      }
      if (e.status_code === ERRORS.FILE_NO_LONGER_EXISTS.status_code) {
        return jsonError(410, "gone", "This upload expired; open a new one to send the photo again.");
      }
      if (e.status_code && e.status_code >= 400 && e.status_code < 500) {
        return jsonError(e.status_code, "bad_request", `Resumable upload refused: ${(e.body ?? "").trim() || "bad request"}.`);
      }
      return undefined;
    },
  });

  const res = await server.handleWeb(req as Parameters<Server["handleWeb"]>[0]);
  if (res.status >= 400 || res.headers.get("content-type") === null) {
    // tus writes bodies without a media type; ours are JSON.
    const text = await res.text();
    const headers = new Headers(res.headers);
    if (text.startsWith("{")) headers.set("content-type", "application/json");
    return new Response(res.status === 204 || res.status === 304 || req.method === "HEAD" ? null : text, { status: res.status, headers });
  }
  return res;
}
