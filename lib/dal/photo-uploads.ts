import "server-only";
import { and, eq } from "drizzle-orm";
import { getDb } from "@/db";
import { photos, samples, stations } from "@/db/schema";
import { photoUploadMetaSchema, type PhotoUploadMeta } from "@/lib/validation/photo";
import { authorize, type Actor } from "./actor";
import { AppError, conflict, notFound } from "./errors";
import { getPhotoOrThrow, uploadPhotos, type PhotoOwner, type PhotoView } from "./photos";
import { validateInput } from "./validate";

/**
 * Resumable (chunked) photo uploads: the access and record side. The bytes travel by the tus protocol
 * (lib/photos/resumable.ts); every request of an upload session comes through here first.
 */

export const ownerOf = (m: PhotoUploadMeta): PhotoOwner => (m.sampleId ? { sampleId: m.sampleId } : { stationId: m.stationId! });
const permissionOf = (m: PhotoUploadMeta) => (m.sampleId ? ("sample.write" as const) : ("station.write" as const));

/**
 * Opening an upload session: the caller may add photos to that sample or station (sample.write / station.write),
 * the record is in this project, and the device's photo id is not another record's. Returns the checked metadata
 * and, for a replay of a photo that already arrived, that photo (the device can stop there).
 */
export async function openPhotoUpload(actor: Actor, projectId: string, raw: unknown): Promise<{ meta: PhotoUploadMeta; existing: PhotoView | null }> {
  await authorize(actor, projectId, "project.read");
  const meta = validateInput(photoUploadMetaSchema, raw);
  await authorize(actor, projectId, permissionOf(meta));
  const db = getDb();
  if (meta.sampleId) {
    const [row] = await db.select({ id: samples.id }).from(samples).where(and(eq(samples.id, meta.sampleId), eq(samples.projectId, projectId)));
    if (!row) throw notFound("Sample not found: it may not have reached the server yet.");
  } else {
    const [row] = await db.select({ id: stations.id }).from(stations).where(and(eq(stations.id, meta.stationId!), eq(stations.projectId, projectId)));
    if (!row) throw notFound("Station not found: it may not have reached the server yet.");
  }
  return { meta, existing: await existingPhoto(actor, projectId, meta) };
}

/**
 * A request on an open session (offset query, chunk, cancel): only the account that opened it, in the project it
 * was opened in, with the permission it needs now (a role changed since is refused). Others get 404.
 */
export async function authorizePhotoUploadSession(actor: Actor, projectId: string, session: { projectId?: string; userId?: string; meta: unknown }): Promise<PhotoUploadMeta> {
  await authorize(actor, projectId, "project.read");
  if (session.projectId !== projectId || session.userId !== actor.userId) throw notFound("No such upload (it may have expired).");
  const meta = validateInput(photoUploadMetaSchema, session.meta);
  await authorize(actor, projectId, permissionOf(meta));
  return meta;
}

/** The photo with the device's id, when it already arrived (a replay); a clash with another owner is a conflict. */
async function existingPhoto(actor: Actor, projectId: string, meta: PhotoUploadMeta): Promise<PhotoView | null> {
  const [row] = await getDb().select({ id: photos.id, projectId: photos.projectId, sampleId: photos.sampleId, stationId: photos.stationId }).from(photos).where(eq(photos.id, meta.clientPhotoId));
  if (!row) return null;
  const sameOwner = row.projectId === projectId && (meta.sampleId ? row.sampleId === meta.sampleId : row.stationId === meta.stationId && row.sampleId === null);
  if (!sameOwner) throw conflict("This photo id is already used by another photo; the device should make a new one.");
  return getPhotoOrThrow(actor, projectId, row.id);
}

/**
 * The whole file arrived: the same checks and processing as a direct upload (type sniffing, EXIF, renditions,
 * SHA-256) and one transaction for the row, with the device's photo id as the row id. A replay — the same photo id
 * finished twice, or finished after its answer was lost — returns the photo already stored and writes nothing.
 */
export async function finishPhotoUpload(actor: Actor, projectId: string, meta: PhotoUploadMeta, bytes: Uint8Array): Promise<{ photo: PhotoView; replay: boolean; notices: string[] }> {
  await authorize(actor, projectId, permissionOf(meta));
  const before = await existingPhoto(actor, projectId, meta);
  if (before) return { photo: before, replay: true, notices: [] };
  try {
    const out = await uploadPhotos(actor, projectId, ownerOf(meta), async () => [{ name: meta.filename, bytes }], { ids: [meta.clientPhotoId] });
    return { photo: out.items[0], replay: false, notices: out.notices.flatMap((n) => n.messages) };
  } catch (err) {
    // Two sessions of the same photo finishing at once: the loser finds the winner's row.
    if (!(err instanceof AppError) && /UNIQUE|PRIMARY KEY|SQLITE_CONSTRAINT/i.test(String((err as Error)?.message ?? err) + String((err as { cause?: Error })?.cause?.message ?? ""))) {
      const again = await existingPhoto(actor, projectId, meta);
      if (again) return { photo: again, replay: true, notices: [] };
    }
    throw err;
  }
}
