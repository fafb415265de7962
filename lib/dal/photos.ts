import "server-only";
import { and, asc, eq } from "drizzle-orm";
import { getDb } from "@/db";
import { photos, samples, stations } from "@/db/schema";
import { greatCircleDistanceM } from "@/lib/geo";
import { PhotoError, UploadRequestError, processPhoto, type ProcessedPhoto } from "@/lib/photos";
import { getStorage, photoKey, type PhotoVariant } from "@/lib/storage";
import { PHOTO_STATION_WARN_M, photoApplyLocationSchema, photoPatchSchema, type PhotoVariantName } from "@/lib/validation/photo";
import { authorize, type Actor } from "./actor";
import { audit } from "./audit";
import { AppError, invalid, notFound } from "./errors";
import { updateSample, type SampleRow } from "./samples";
import { validateInput } from "./validate";

export type PhotoRow = typeof photos.$inferSelect;
export type PhotoOwner = { sampleId: string } | { stationId: string };

/** Most files in one upload request. */
export const MAX_PHOTOS_PER_UPLOAD = 20;

export interface UploadFile {
  name: string;
  bytes: Uint8Array;
}

/** A photo as the API returns it: metadata, where its bytes are, and how far it was taken from the station. */
export interface PhotoView {
  id: string;
  sampleId: string | null;
  stationId: string | null;
  originalName: string;
  mime: string;
  sizeBytes: number;
  sha256: string;
  width: number | null;
  height: number | null;
  takenAt: string | null;
  takenLocal: string | null;
  takenOffset: string | null;
  gps: { lat: number; lon: number; altitudeM: number | null; horizontalErrorM: number | null } | null;
  imgDirection: number | null;
  imgDirectionRef: string | null;
  orientation: number | null;
  caption: string | null;
  createdAt: string;
  urls: { thumb: string; display: string; original: string };
  /** Distance from the photo's EXIF position to the station, metres (null without both positions). */
  distanceToStationM: number | null;
  /** True beyond {@link PHOTO_STATION_WARN_M}. */
  farFromStation: boolean;
}

function view(projectId: string, p: PhotoRow, station: { lat: number; lon: number } | null): PhotoView {
  const gps = p.gpsLat != null && p.gpsLon != null ? { lat: p.gpsLat, lon: p.gpsLon, altitudeM: p.gpsAltitudeM, horizontalErrorM: p.gpsHErrorM } : null;
  const distance = gps && station ? greatCircleDistanceM(gps, station) : null;
  const base = `/api/projects/${projectId}/photos/${p.id}`;
  return {
    id: p.id,
    sampleId: p.sampleId,
    stationId: p.stationId,
    originalName: p.originalName,
    mime: p.mime,
    sizeBytes: p.sizeBytes,
    sha256: p.sha256,
    width: p.width,
    height: p.height,
    takenAt: p.takenAt,
    takenLocal: p.takenLocal,
    takenOffset: p.takenOffset,
    gps,
    imgDirection: p.imgDirection,
    imgDirectionRef: p.imgDirectionRef,
    orientation: p.orientation,
    caption: p.caption,
    createdAt: p.createdAt.toISOString(),
    urls: { thumb: `${base}/thumb`, display: `${base}/display`, original: `${base}/original` },
    distanceToStationM: distance,
    farFromStation: distance !== null && distance > PHOTO_STATION_WARN_M,
  };
}

/** The owner's project check and the station position the photos are compared with. */
async function resolveOwner(projectId: string, owner: PhotoOwner): Promise<{ station: { lat: number; lon: number } | null }> {
  const db = getDb();
  if ("sampleId" in owner) {
    const [row] = await db
      .select({ id: samples.id, stLat: stations.lat, stLon: stations.lon })
      .from(samples)
      .leftJoin(stations, eq(stations.id, samples.stationId))
      .where(and(eq(samples.id, owner.sampleId), eq(samples.projectId, projectId)));
    if (!row) throw notFound("Sample not found.");
    return { station: row.stLat != null && row.stLon != null ? { lat: row.stLat, lon: row.stLon } : null };
  }
  const [st] = await db.select({ lat: stations.lat, lon: stations.lon }).from(stations).where(and(eq(stations.id, owner.stationId), eq(stations.projectId, projectId)));
  if (!st) throw notFound("Station not found.");
  return { station: st };
}

function photoErrorToApp(err: PhotoError, fileName: string): AppError {
  const code = err.code === "too_large" ? "payload_too_large" : err.code === "unsupported_type" ? "unsupported_media_type" : "validation_failed";
  return new AppError(code, err.message, { files: [err.message] }, fileName ? { file: fileName } : undefined);
}

/**
 * Uploads photos of a sample (sample.write) or a station (station.write). All or nothing: every file
 * is checked and processed first; then originals and renditions are stored and the rows inserted in
 * one transaction — if anything fails, stored files are removed again and no row remains.
 * `readFiles` runs only after the access check, so a refused caller's upload is never parsed.
 */
export async function uploadPhotos(actor: Actor, projectId: string, owner: PhotoOwner, readFiles: () => Promise<UploadFile[]>, opts: { ids?: string[] } = {}) {
  await authorize(actor, projectId, "sampleId" in owner ? "sample.write" : "station.write");
  const { station } = await resolveOwner(projectId, owner);
  let files: UploadFile[];
  try {
    files = await readFiles();
  } catch (err) {
    if (err instanceof PhotoError) throw photoErrorToApp(err, "");
    if (err instanceof UploadRequestError) {
      throw new AppError(err.status === 413 ? "payload_too_large" : err.status === 415 ? "unsupported_media_type" : "bad_request", err.message, { files: [err.message] });
    }
    throw err;
  }
  if (files.length === 0) throw invalid("Choose at least one photo.", { files: ["Choose at least one photo."] });
  if (files.length > MAX_PHOTOS_PER_UPLOAD) throw invalid(`At most ${MAX_PHOTOS_PER_UPLOAD} photos per upload.`, { files: [`At most ${MAX_PHOTOS_PER_UPLOAD} photos per upload.`] });

  const processed: { file: UploadFile; p: ProcessedPhoto }[] = [];
  for (const file of files) {
    try {
      processed.push({ file, p: await processPhoto(file.bytes, file.name) }); // one at a time: 2 cores, big images
    } catch (err) {
      if (err instanceof PhotoError) throw photoErrorToApp(err, file.name);
      throw err;
    }
  }

  const storage = getStorage();
  const stored: string[] = [];
  const put = async (key: string, bytes: Uint8Array) => {
    const r = await storage.put(key, bytes);
    stored.push(key);
    return r;
  };
  try {
    const values: (typeof photos.$inferInsert)[] = [];
    for (const [i, { file, p }] of processed.entries()) {
      const id = opts.ids?.[i] ?? crypto.randomUUID(); // a resumable upload keeps the device's photo id (replays find it)
      const original = await put(photoKey(projectId, id, "original", p.ext), file.bytes);
      const thumbKey = photoKey(projectId, id, "thumb", "webp");
      const displayKey = photoKey(projectId, id, "display", "webp");
      await put(thumbKey, p.thumb.bytes);
      await put(displayKey, p.display.bytes);
      const g = p.metadata.gps;
      values.push({
        id,
        projectId,
        sampleId: "sampleId" in owner ? owner.sampleId : null,
        stationId: "stationId" in owner ? owner.stationId : null,
        storageKey: original.key,
        thumbKey,
        displayKey,
        originalName: file.name.slice(0, 255),
        mime: p.mime,
        sizeBytes: original.size,
        sha256: original.sha256,
        width: p.width,
        height: p.height,
        takenAt: p.metadata.takenAt,
        takenLocal: p.metadata.takenLocal,
        takenOffset: p.metadata.takenOffset,
        gpsLat: g?.lat ?? null,
        gpsLon: g?.lon ?? null,
        gpsAltitudeM: g?.altitudeM ?? null,
        gpsHErrorM: g?.horizontalErrorM ?? null,
        imgDirection: g?.imgDirection ?? null,
        imgDirectionRef: g?.imgDirectionRef ?? null,
        orientation: p.metadata.orientation,
        uploadedBy: actor.userId,
      });
    }
    const rows = await getDb().transaction(async (tx) => {
      const inserted = await tx.insert(photos).values(values).returning();
      for (const row of inserted) await audit(tx, actor, { projectId, action: "upload", entity: "photo", entityId: row.id, after: row });
      return inserted;
    });
    return {
      items: rows.map((r) => view(projectId, r, station)),
      notices: processed.map(({ file, p }) => ({ file: file.name, messages: p.notices })).filter((n) => n.messages.length > 0),
    };
  } catch (err) {
    await Promise.allSettled(stored.map((k) => storage.delete(k)));
    throw err;
  }
}

/** Photos of a sample or a station, oldest first, with distance to the station. */
export async function listPhotos(actor: Actor, projectId: string, owner: PhotoOwner): Promise<{ items: PhotoView[] }> {
  await authorize(actor, projectId, "project.read");
  const { station } = await resolveOwner(projectId, owner);
  const where = "sampleId" in owner ? eq(photos.sampleId, owner.sampleId) : eq(photos.stationId, owner.stationId);
  const rows = await getDb().select().from(photos).where(and(eq(photos.projectId, projectId), where)).orderBy(asc(photos.createdAt), asc(photos.originalName));
  return { items: rows.map((r) => view(projectId, r, station)) };
}

async function photoRow(projectId: string, photoId: string): Promise<PhotoRow> {
  const [row] = await getDb().select().from(photos).where(and(eq(photos.id, photoId), eq(photos.projectId, projectId)));
  if (!row) throw notFound("Photo not found.");
  return row;
}

export async function getPhotoOrThrow(actor: Actor, projectId: string, photoId: string): Promise<PhotoView> {
  await authorize(actor, projectId, "project.read");
  const row = await photoRow(projectId, photoId);
  const { station } = await resolveOwner(projectId, row.sampleId ? { sampleId: row.sampleId } : { stationId: row.stationId! });
  return view(projectId, row, station);
}

/** The bytes of one rendition (original, thumb or display) with what a response needs. */
export async function readPhotoVariant(actor: Actor, projectId: string, photoId: string, variant: PhotoVariantName) {
  await authorize(actor, projectId, "project.read");
  const row = await photoRow(projectId, photoId);
  const key = variant === "original" ? row.storageKey : variant === "thumb" ? row.thumbKey : row.displayKey;
  if (!key) throw notFound("This photo has no such rendition.");
  const storage = getStorage();
  const head = await storage.head(key);
  if (!head) throw notFound("The photo's file is missing from storage.");
  return {
    open: () => storage.stream(key),
    size: head.size,
    mime: variant === "original" ? row.mime : "image/webp",
    etag: `"${row.sha256.slice(0, 32)}-${variant as PhotoVariant}"`,
    fileName: variant === "original" ? row.originalName : `${row.originalName.replace(/\.[^.]*$/, "")}-${variant}.webp`,
  };
}

/** Edits the caption and the azimuth the camera faced with its reference (sample.write); fields left out keep their value. */
export async function updatePhoto(actor: Actor, projectId: string, photoId: string, raw: unknown): Promise<PhotoView> {
  await authorize(actor, projectId, "sample.write");
  const patch = validateInput(photoPatchSchema, raw);
  const before = await photoRow(projectId, photoId);
  const [row] = await getDb().transaction(async (tx) => {
    const changes: Partial<typeof photos.$inferInsert> = {};
    if (patch.caption !== undefined) changes.caption = patch.caption ?? null;
    if (patch.imgDirection !== undefined) {
      changes.imgDirection = patch.imgDirection === 360 ? 0 : patch.imgDirection; // 360° is north again
      // an azimuth without a stated reference keeps the photo's, or true north (EXIF's default for GPSImgDirectionRef is "T", CIPA DC-008-2012; from memory)
      changes.imgDirectionRef = patch.imgDirection === null ? null : (patch.imgDirectionRef ?? before.imgDirectionRef ?? "T");
    } else if (patch.imgDirectionRef !== undefined) changes.imgDirectionRef = patch.imgDirectionRef;
    if (Object.keys(changes).length === 0) return [before];
    const out = await tx.update(photos).set(changes).where(eq(photos.id, photoId)).returning();
    await audit(tx, actor, { projectId, action: "update", entity: "photo", entityId: photoId, before, after: out[0] });
    return out;
  });
  const { station } = await resolveOwner(projectId, row.sampleId ? { sampleId: row.sampleId } : { stationId: row.stationId! });
  return view(projectId, row, station);
}

/** Deletes a photo: the row first (in a transaction with the audit entry), then its files. */
export async function deletePhoto(actor: Actor, projectId: string, photoId: string): Promise<void> {
  await authorize(actor, projectId, "sample.write");
  const before = await photoRow(projectId, photoId);
  await getDb().transaction(async (tx) => {
    await tx.delete(photos).where(eq(photos.id, photoId));
    await audit(tx, actor, { projectId, action: "delete", entity: "photo", entityId: photoId, before });
  });
  const storage = getStorage();
  // A file left behind is harmless (nothing points to it); a row without its file would not be.
  await Promise.allSettled([before.storageKey, before.thumbKey, before.displayKey].filter((k): k is string => !!k).map((k) => storage.delete(k)));
}

/**
 * Copies the photo's EXIF position onto its sample, when the caller chooses to. Goes through
 * updateSample, so the sample's version must be current (409 otherwise) and the edit is audited.
 */
export async function applyPhotoLocation(actor: Actor, projectId: string, photoId: string, raw: unknown): Promise<SampleRow> {
  await authorize(actor, projectId, "sample.write");
  const input = validateInput(photoApplyLocationSchema, raw);
  const row = await photoRow(projectId, photoId);
  if (!row.sampleId) throw invalid("This photo belongs to a station, not a sample.");
  if (row.gpsLat == null || row.gpsLon == null) throw invalid("This photo has no GPS position in its EXIF.", { photo: ["No GPS position in the photo."] });
  return updateSample(actor, projectId, row.sampleId, {
    version: input.version,
    lat: row.gpsLat,
    lon: row.gpsLon,
    locationSource: "photo_exif",
    horizontalAccuracyM: row.gpsHErrorM ?? null,
    ...(row.takenAt && { locationFixedAt: row.takenAt }),
    ...(input.includeElevation && row.gpsAltitudeM != null && { elevationM: row.gpsAltitudeM, elevationRef: "msl" as const }),
  });
}
