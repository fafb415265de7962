/**
 * Resumable photo uploads (tus 1.0.0, tus.io "Resumable upload protocol": creation, HEAD offset, PATCH at offset)
 * against a real SQLite file: resume from the server's offset, a wrong offset refused with a clear error, roles,
 * a replay of the same device photo id stored once, the 25 MiB limit, expiry. The SHA-256 of the stored photo is
 * compared with node:crypto's hash of the bytes sent (an independent implementation of FIPS 180-4).
 */
import { createHash, randomUUID } from "node:crypto";
import { existsSync, readdirSync, utimesSync } from "node:fs";
import { join } from "node:path";
import { count, eq } from "drizzle-orm";
import sharp from "sharp";
import { beforeAll, describe, expect, test } from "vitest";
import { POST as createRoute } from "@/app/api/projects/[projectId]/photo-uploads/route";
import { DELETE as cancelRoute, HEAD as headRoute, PATCH as patchRoute } from "@/app/api/projects/[projectId]/photo-uploads/[uploadId]/route";
import { POST as createSampleRoute } from "@/app/api/projects/[projectId]/samples/route";
import { getDb } from "@/db";
import { photos } from "@/db/schema";
import { photoUploadDir, sweepExpiredPhotoUploads, UPLOAD_EXPIRY_MS } from "@/lib/api/resumable-photos";
import { call, makeWorld, type World } from "../helpers/app";
import { jpegAt, noise } from "../helpers/photo-fixtures";

let w: World;
let sampleId: string;
let photo: Buffer;
let gpsPhoto: Buffer;
beforeAll(async () => {
  w = await makeWorld();
  const s = await call(createSampleRoute, { method: "POST", params: { projectId: w.projectId }, cookie: w.cookies.lead, body: { sampleType: "hand_sample", stationId: w.stationId } });
  sampleId = s.json.id;
  gpsPhoto = await jpegAt(37.701, -6.6);
  // A camera-sized JPEG (noise does not compress: about 2 MB), sent in chunks.
  photo = await sharp(noise(1600, 1200), { raw: { width: 1600, height: 1200, channels: 3 } }).jpeg({ quality: 92 }).toBuffer();
});

const ORIGIN = "http://localhost:3000";
const b64 = (s: string) => Buffer.from(s, "utf8").toString("base64");
const metadata = (m: Record<string, string>) =>
  Object.entries(m)
    .map(([k, v]) => `${k} ${b64(v)}`)
    .join(",");
const sha = (b: Uint8Array) => createHash("sha256").update(b).digest("hex");
const photoRows = async (id?: string) => (await getDb().select({ n: count() }).from(photos).where(id ? eq(photos.id, id) : eq(photos.projectId, w.projectId)))[0].n;

async function open(who: keyof World["cookies"], length: number, meta: Record<string, string>) {
  return call(createRoute, {
    method: "POST",
    params: { projectId: w.projectId },
    cookie: w.cookies[who],
    headers: { "tus-resumable": "1.0.0", "upload-length": String(length), "upload-metadata": metadata(meta), origin: ORIGIN },
  });
}
const idOf = (location: string | null) => location!.split("/").pop()!;
const head = (uploadId: string, who: keyof World["cookies"] = "field_geologist") =>
  call(headRoute, { method: "HEAD", params: { projectId: w.projectId, uploadId }, cookie: w.cookies[who], headers: { "tus-resumable": "1.0.0" } });
const patch = (uploadId: string, offset: number, bytes: Uint8Array, who: keyof World["cookies"] = "field_geologist") =>
  call(patchRoute, {
    method: "PATCH",
    params: { projectId: w.projectId, uploadId },
    cookie: w.cookies[who],
    rawBody: bytes as BodyInit,
    headers: { "tus-resumable": "1.0.0", "upload-offset": String(offset), "content-type": "application/offset+octet-stream", "content-length": String(bytes.byteLength), origin: ORIGIN },
  });

describe("resumable photo upload (tus)", () => {
  test("chunks, a drop, HEAD gives the offset, the rest from there: one photo with the sent bytes' SHA-256", async () => {
    const clientPhotoId = randomUUID();
    const created = await open("field_geologist", photo.byteLength, { clientPhotoId, sampleId, filename: "outcrop.jpg" });
    expect(created.status, JSON.stringify(created.json)).toBe(201);
    const uploadId = idOf(created.headers.get("location"));
    expect(created.headers.get("location")).toBe(`/api/projects/${w.projectId}/photo-uploads/${uploadId}`);
    const third = Math.floor(photo.byteLength / 3);
    const first = await patch(uploadId, 0, photo.subarray(0, third));
    expect(first.status).toBe(204);
    expect(first.headers.get("upload-offset")).toBe(String(third));
    // The connection drops: the device asks where to resume.
    const h = await head(uploadId);
    expect(h.status).toBe(200);
    expect(h.headers.get("upload-offset")).toBe(String(third));
    expect(h.headers.get("upload-length")).toBe(String(photo.byteLength));
    expect(await photoRows(clientPhotoId)).toBe(0);
    const second = await patch(uploadId, third, photo.subarray(third));
    expect(second.status, JSON.stringify(second.json)).toBe(200);
    expect(second.json.replay).toBe(false);
    expect(second.json.photo).toMatchObject({ id: clientPhotoId, sampleId, originalName: "outcrop.jpg", sizeBytes: photo.byteLength, sha256: sha(photo) });
    const [row] = await getDb().select().from(photos).where(eq(photos.id, clientPhotoId));
    expect(row.sha256).toBe(sha(photo));
    expect([row.width, row.height]).toEqual([1600, 1200]);
    expect(row.thumbKey).toBeTruthy();
    // The finished session is gone: nothing partial stays on disk.
    expect((await head(uploadId)).status).toBe(404);
    expect(existsSync(join(photoUploadDir(), uploadId))).toBe(false);
  });

  test("EXIF is read as for a direct upload (GPS of a geotagged JPEG in one chunk)", async () => {
    const c = await open("field_geologist", gpsPhoto.byteLength, { clientPhotoId: randomUUID(), stationId: w.stationId, filename: "geotagged.jpg" });
    expect(c.status, JSON.stringify(c.json)).toBe(201);
    const r = await patch(idOf(c.headers.get("location")), 0, gpsPhoto);
    expect(r.status, JSON.stringify(r.json)).toBe(200);
    expect(r.json.photo).toMatchObject({ stationId: w.stationId, sampleId: null, sha256: sha(gpsPhoto) });
    expect(r.json.photo.gps.lat).toBeCloseTo(37.701, 5);
    // 0.001° of latitude ≈ 111 m (πR/180 per degree, R = 6 371 km, arithmetic)
    expect(r.json.photo.distanceToStationM).toBeCloseTo(111.2, 0);
  });

  test("a chunk at the wrong offset is refused with 409 and the offset to resume from; nothing is written", async () => {
    const created = await open("lead", photo.byteLength, { clientPhotoId: randomUUID(), sampleId, filename: "a.jpg" });
    const uploadId = idOf(created.headers.get("location"));
    await patch(uploadId, 0, photo.subarray(0, 1000), "lead");
    const wrong = await patch(uploadId, 500, photo.subarray(500, 1500), "lead");
    expect(wrong.status).toBe(409);
    expect(wrong.json.error.code).toBe("offset_mismatch");
    expect(wrong.json.error.message).toMatch(/starts at byte 500 but the server holds 1000 bytes.*send from byte 1000/);
    expect((await head(uploadId, "lead")).headers.get("upload-offset")).toBe("1000");
    expect((await call(cancelRoute, { method: "DELETE", params: { projectId: w.projectId, uploadId }, cookie: w.cookies.lead, headers: { "tus-resumable": "1.0.0", origin: ORIGIN } })).status).toBe(204);
    expect((await head(uploadId, "lead")).status).toBe(404);
  });

  test("roles: a lab analyst or consultant cannot open one (403), an outsider sees nothing (404), another member cannot touch my session (404)", async () => {
    const meta = { clientPhotoId: randomUUID(), sampleId, filename: "x.jpg" };
    expect((await open("lab_analyst", 100, meta)).status).toBe(403);
    expect((await open("consultant", 100, meta)).status).toBe(403);
    expect((await open("outsider", 100, meta)).status).toBe(404);
    const mine = await open("field_geologist", photo.byteLength, meta);
    const uploadId = idOf(mine.headers.get("location"));
    expect((await head(uploadId, "consultant")).status).toBe(403);
    expect((await patch(uploadId, 0, photo.subarray(0, 10), "lab_analyst")).status).toBe(403);
    expect((await patch(uploadId, 0, photo.subarray(0, 10), "lead")).status).toBe(404); // the lead did not open it
    expect((await head(uploadId, "field_geologist")).headers.get("upload-offset")).toBe("0");
    // A sample of another project, or one that has not arrived yet: 404 with a reason.
    const missing = await open("field_geologist", 100, { ...meta, clientPhotoId: randomUUID(), sampleId: randomUUID() });
    expect(missing.status).toBe(404);
    expect(missing.json.error.message).toMatch(/not have reached the server yet/);
    // Metadata checked: no owner, or both.
    const bad = await open("field_geologist", 100, { clientPhotoId: "not-a-uuid", filename: "x.jpg" });
    expect(bad.status).toBe(422);
    expect(Object.keys(bad.json.error.fields)).toEqual(expect.arrayContaining(["clientPhotoId", "sampleId"]));
  });

  test("a replay of the same device photo id (answer lost, sent again) stores the photo once and answers with it", async () => {
    const clientPhotoId = randomUUID();
    const before = await photoRows();
    const send = async () => {
      const c = await open("field_geologist", photo.byteLength, { clientPhotoId, sampleId, filename: "replay.jpg" });
      return patch(idOf(c.headers.get("location")), 0, photo);
    };
    const a = await send();
    const b = await send();
    expect([a.status, b.status]).toEqual([200, 200]);
    expect([a.json.replay, b.json.replay]).toEqual([false, true]);
    expect(b.json.photo.id).toBe(a.json.photo.id);
    expect(b.json.photo.sha256).toBe(sha(photo));
    expect(await photoRows()).toBe(before + 1);
    expect(await photoRows(clientPhotoId)).toBe(1);
  });

  test("size: a declared length over 25 MiB is refused at opening (413); a damaged image is refused at the end and leaves no row", async () => {
    const big = await open("field_geologist", 25 * 1024 * 1024 + 1, { clientPhotoId: randomUUID(), sampleId, filename: "huge.jpg" });
    expect(big.status).toBe(413);
    expect(big.json.error.message).toMatch(/at most 25 MiB/);
    const clientPhotoId = randomUUID();
    const png = await sharp(noise(64, 64), { raw: { width: 64, height: 64, channels: 3 } }).png().toBuffer();
    const cut = png.subarray(0, Math.floor(png.byteLength * 0.6));
    const c = await open("field_geologist", cut.byteLength, { clientPhotoId, sampleId, filename: "cut.png" });
    const r = await patch(idOf(c.headers.get("location")), 0, cut);
    expect(r.status).toBe(422);
    expect(r.json.error.message).toMatch(/cut\.png/);
    expect(await photoRows(clientPhotoId)).toBe(0);
  });

  test("a chunk past the declared length is refused (413) and the held offset stays", async () => {
    const c = await open("field_geologist", 1000, { clientPhotoId: randomUUID(), sampleId, filename: "small.jpg" });
    const uploadId = idOf(c.headers.get("location"));
    const r = await patch(uploadId, 0, photo.subarray(0, 2000));
    expect(r.status).toBe(413);
    expect(Number((await head(uploadId)).headers.get("upload-offset"))).toBeLessThanOrEqual(1000);
  });

  test("unfinished sessions expire and are swept with their partial files", async () => {
    const c = await open("field_geologist", photo.byteLength, { clientPhotoId: randomUUID(), sampleId, filename: "old.jpg" });
    const uploadId = idOf(c.headers.get("location"));
    await patch(uploadId, 0, photo.subarray(0, 100));
    // Age the session past the expiry: @tus/file-store keeps its creation date in the .json beside the file.
    const { FileConfigstore } = await import("@tus/file-store");
    const cfg = new FileConfigstore(photoUploadDir());
    const up = (await cfg.get(uploadId))!;
    up.creation_date = new Date(Date.now() - UPLOAD_EXPIRY_MS - 60_000).toISOString();
    await cfg.set(uploadId, up);
    utimesSync(join(photoUploadDir(), uploadId), new Date(), new Date());
    const gone = await patch(uploadId, 100, photo.subarray(100, 200));
    expect(gone.status).toBe(410);
    expect(await sweepExpiredPhotoUploads()).toBeGreaterThanOrEqual(1);
    expect(readdirSync(photoUploadDir()).filter((f) => f.startsWith(uploadId))).toEqual([]);
  });
});

describe("gallery edits: caption and azimuth", () => {
  test("azimuth 0–360 (EXIF GPSImgDirection range, CIPA DC-008-2012) is stored with its reference; outside it a clear 422; caption kept when not sent", async () => {
    const { PATCH: patchPhoto } = await import("@/app/api/projects/[projectId]/photos/[photoId]/route");
    const c = await open("field_geologist", gpsPhoto.byteLength, { clientPhotoId: randomUUID(), sampleId, filename: "edit.jpg" });
    const done = await patch(idOf(c.headers.get("location")), 0, gpsPhoto);
    const photoId = done.json.photo.id;
    const edit = (body: unknown, who: keyof World["cookies"] = "field_geologist") =>
      call(patchPhoto, { method: "PATCH", params: { projectId: w.projectId, photoId }, cookie: w.cookies[who], body, headers: { origin: ORIGIN } });
    const a = await edit({ caption: "Gossan face, looking NE", imgDirection: 47.5, imgDirectionRef: "M" });
    expect(a.status, JSON.stringify(a.json)).toBe(200);
    expect(a.json).toMatchObject({ caption: "Gossan face, looking NE", imgDirection: 47.5, imgDirectionRef: "M" });
    const b = await edit({ imgDirection: 360 });
    expect(b.json).toMatchObject({ caption: "Gossan face, looking NE", imgDirection: 0, imgDirectionRef: "M" }); // 360° = 0°, north
    for (const bad of [-1, 360.5, 725]) {
      const r = await edit({ imgDirection: bad });
      expect(r.status).toBe(422);
      expect(r.json.error.fields.imgDirection[0]).toMatch(/between 0 and 360 degrees/);
    }
    expect((await edit({ imgDirectionRef: "X" })).json.error.fields.imgDirectionRef[0]).toMatch(/T \(true north\) or M/);
    expect((await edit({ caption: "x" }, "consultant")).status).toBe(403);
    const cleared = await edit({ imgDirection: null });
    expect(cleared.json).toMatchObject({ imgDirection: null, imgDirectionRef: null });
  });
});
