import { createHash } from "node:crypto";
import { existsSync, readdirSync, statSync } from "node:fs";
import { join } from "node:path";
import { count, eq } from "drizzle-orm";
import sharp from "sharp";
import { beforeAll, describe, expect, test, vi } from "vitest";
import { POST as applyRoute } from "@/app/api/projects/[projectId]/photos/[photoId]/apply-location/route";
import { GET as bytesRoute } from "@/app/api/projects/[projectId]/photos/[photoId]/[variant]/route";
import { DELETE as deleteRoute, GET as getPhotoRoute } from "@/app/api/projects/[projectId]/photos/[photoId]/route";
import { GET as listRoute, POST as uploadRoute } from "@/app/api/projects/[projectId]/samples/[sampleId]/photos/route";
import { GET as getSampleRoute } from "@/app/api/projects/[projectId]/samples/[sampleId]/route";
import { POST as createSampleRoute } from "@/app/api/projects/[projectId]/samples/route";
import { GET as stationPhotosRoute, POST as stationUploadRoute } from "@/app/api/projects/[projectId]/stations/[stationId]/photos/route";
import { getDb } from "@/db";
import { photos } from "@/db/schema";
import { getStorage } from "@/lib/storage";
import { call, makeWorld, type World } from "../helpers/app";
import { jpegAt, jpegOrientation6, noise } from "../helpers/photo-fixtures";

let w: World;
let sampleId: string;
beforeAll(async () => {
  w = await makeWorld();
  const s = await call(createSampleRoute, { method: "POST", params: { projectId: w.projectId }, cookie: w.cookies.lead, body: { sampleType: "hand_sample", stationId: w.stationId } });
  sampleId = s.json.id;
});

const dataDir = () => process.env.LITHODEX_DATA_DIR!;
/** Every stored file under the storage root (0 when the folder does not exist yet). */
function storedFiles(): string[] {
  if (!existsSync(dataDir())) return [];
  return (readdirSync(dataDir(), { recursive: true }) as string[]).filter((f) => statSync(join(dataDir(), f)).isFile());
}
const photoRows = async () => (await getDb().select({ n: count() }).from(photos).where(eq(photos.projectId, w.projectId)))[0].n;

function form(...files: { name: string; bytes: Uint8Array; type?: string }[]): FormData {
  const f = new FormData();
  for (const file of files) f.append("files", new File([file.bytes as BlobPart], file.name, { type: file.type ?? "image/jpeg" }));
  return f;
}
const upload = (fd: FormData, who: keyof World["cookies"] = "field_geologist", id = sampleId) =>
  call(uploadRoute, { method: "POST", params: { projectId: w.projectId, sampleId: id }, cookie: w.cookies[who], rawBody: fd });

describe("photo upload, listing, bytes and deletion", () => {
  test("several photos in one multipart request: stored with EXIF GPS, thumbnails rotated, distance to the station", async () => {
    // Station is at 37.7, −6.6. 0.001° of latitude ≈ 111 m (πR/180 per degree, R = 6 371 km, arithmetic).
    const near = await jpegAt(37.701, -6.6);
    const far = await jpegAt(37.71, -6.6);
    const r = await upload(form({ name: "near.jpg", bytes: near }, { name: "far.jpg", bytes: far }, { name: "rotated.jpg", bytes: await jpegOrientation6() }));
    expect(r.status, JSON.stringify(r.json)).toBe(201);
    expect(r.json.items).toHaveLength(3);
    const [a, b, c] = r.json.items;
    expect(a.gps.lat).toBeCloseTo(37.701, 5);
    expect(a.gps.lon).toBeCloseTo(-6.6, 5);
    expect(a.distanceToStationM).toBeGreaterThan(105);
    expect(a.distanceToStationM).toBeLessThan(117);
    expect(a.farFromStation).toBe(false);
    expect(b.distanceToStationM).toBeGreaterThan(1000);
    expect(b.farFromStation).toBe(true); // > 200 m
    expect(a.takenAt).toBe("2026-03-14T10:20:05Z"); // 11:20:05 at +01:00
    expect([c.width, c.height]).toEqual([200, 400]); // orientation 6 swaps the displayed size
    const storedA = await getDb().select().from(photos).where(eq(photos.id, a.id));
    expect(storedA[0].sha256).toBe(createHash("sha256").update(near).digest("hex"));
    expect(await getStorage().head(storedA[0].storageKey)).toEqual({ size: near.length });

    const list = await call(listRoute, { params: { projectId: w.projectId, sampleId }, cookie: w.cookies.consultant });
    expect(list.status).toBe(200);
    expect(list.json.items.map((p: { originalName: string }) => p.originalName).sort()).toEqual(["far.jpg", "near.jpg", "rotated.jpg"]);
  });

  test("bytes: original with its own type and SHA, thumb/display as WebP, private immutable caching, ETag → 304", async () => {
    const bytes = await jpegAt(37.7005, -6.6005);
    const up = await upload(form({ name: "bytes.jpg", bytes }));
    const id = up.json.items[0].id;
    const params = (variant: string) => ({ projectId: w.projectId, photoId: id, variant });
    const res = await bytesRoute(new Request("http://localhost/x", { headers: { cookie: w.cookies.consultant } }), { params: Promise.resolve(params("original")) });
    expect(res.status).toBe(200);
    expect(res.headers.get("content-type")).toBe("image/jpeg");
    expect(res.headers.get("cache-control")).toBe("private, max-age=31536000, immutable");
    const got = Buffer.from(await res.arrayBuffer());
    expect(createHash("sha256").update(got).digest("hex")).toBe(createHash("sha256").update(bytes).digest("hex"));
    const thumb = await bytesRoute(new Request("http://localhost/x", { headers: { cookie: w.cookies.lab_analyst } }), { params: Promise.resolve(params("thumb")) });
    expect(thumb.headers.get("content-type")).toBe("image/webp");
    const thumbBytes = Buffer.from(await thumb.arrayBuffer());
    expect((await sharp(thumbBytes).metadata()).format).toBe("webp"); // decoded independently by libvips
    const etag = thumb.headers.get("etag")!;
    const again = await bytesRoute(new Request("http://localhost/x", { headers: { cookie: w.cookies.lab_analyst, "if-none-match": etag } }), { params: Promise.resolve(params("thumb")) });
    expect(again.status).toBe(304);
    const outsider = await call(bytesRoute, { params: params("display"), cookie: w.cookies.outsider });
    expect(outsider.status).toBe(404);
    const badVariant = await call(bytesRoute, { params: params("huge"), cookie: w.cookies.lead });
    expect(badVariant.status).toBe(404);
  });

  test("a PNG renamed .jpg is stored as PNG with a notice", async () => {
    const png = await sharp({ create: { width: 20, height: 10, channels: 3, background: "#345" } }).png().toBuffer();
    const r = await upload(form({ name: "outcrop.jpg", bytes: png }));
    expect(r.status).toBe(201);
    expect(r.json.items[0].mime).toBe("image/png");
    expect(r.json.notices[0].messages[0]).toMatch(/contains a PNG image/);
  });

  test("a text file named .jpg → 415 with a clear message; nothing stored, no row — even when good photos came with it", async () => {
    const [files, rows] = [storedFiles().length, await photoRows()];
    const r = await upload(form({ name: "good.jpg", bytes: await jpegAt(37.7, -6.6) }, { name: "notes.jpg", bytes: new TextEncoder().encode("sample list\nAPR-1\n") }));
    expect(r.status).toBe(415);
    expect(r.json.error.message).toMatch(/notes\.jpg is text, not an image/);
    expect(r.json.error.details.file).toBe("notes.jpg");
    expect(storedFiles().length).toBe(files);
    expect(await photoRows()).toBe(rows);
  });

  test("a truncated JPEG → 422; over 25 MB → 413; not multipart → 415; no files → 422", async () => {
    const full = await sharp(noise(256, 256), { raw: { width: 256, height: 256, channels: 3 } }).jpeg().toBuffer();
    const cut = await upload(form({ name: "cut.jpg", bytes: full.subarray(0, Math.floor(full.length * 0.6)) }));
    expect(cut.status).toBe(422);
    expect(cut.json.error.message).toMatch(/incomplete/);
    const big = new Uint8Array(25 * 1024 * 1024 + 1);
    big.set([0xff, 0xd8, 0xff, 0xe0]);
    const tooBig = await upload(form({ name: "huge.jpg", bytes: big }));
    expect(tooBig.status).toBe(413);
    expect(tooBig.json.error.message).toMatch(/huge\.jpg is 25\.0 MB; photos may be at most 25\.0 MB/);
    const json = await call(uploadRoute, { method: "POST", params: { projectId: w.projectId, sampleId }, cookie: w.cookies.lead, body: { files: [] } });
    expect(json.status).toBe(415);
    const empty = await upload(new FormData());
    expect(empty.status).toBe(422);
  });

  test("roles: consultant and lab analyst cannot upload (403), outsider 404, unknown sample 404; nothing written", async () => {
    const [files, rows] = [storedFiles().length, await photoRows()];
    const fd = () => form({ name: "x.jpg", bytes: new Uint8Array([0xff, 0xd8, 0xff]) });
    expect((await upload(fd(), "consultant")).status).toBe(403);
    expect((await upload(fd(), "lab_analyst")).status).toBe(403);
    expect((await upload(fd(), "outsider")).status).toBe(404);
    expect((await upload(fd(), "lead", "no-such-sample")).status).toBe(404);
    expect(storedFiles().length).toBe(files);
    expect(await photoRows()).toBe(rows);
  });

  test("storage failing half-way: files already stored are removed and no row is written", async () => {
    const [files, rows] = [storedFiles().length, await photoRows()];
    const storage = getStorage();
    const realPut = storage.put.bind(storage);
    let puts = 0;
    const spy = vi.spyOn(storage, "put").mockImplementation(async (key, body, opts) => {
      if (++puts === 4) throw new Error("disk full (simulated)");
      return realPut(key, body, opts);
    });
    try {
      const r = await upload(form({ name: "one.jpg", bytes: await jpegAt(37.7, -6.6) }, { name: "two.jpg", bytes: await jpegAt(37.7, -6.6) }));
      expect(r.status).toBe(500);
    } finally {
      spy.mockRestore();
    }
    expect(puts).toBe(4);
    expect(storedFiles().length).toBe(files);
    expect(await photoRows()).toBe(rows);
  });

  test("the database failing after the files are stored: the files are removed again", async () => {
    const [files, rows] = [storedFiles().length, await photoRows()];
    const db = getDb();
    const spy = vi.spyOn(db, "transaction").mockRejectedValueOnce(new Error("database is locked (simulated)"));
    try {
      const r = await upload(form({ name: "three.jpg", bytes: await jpegAt(37.7, -6.6) }));
      expect(r.status).toBe(500);
    } finally {
      spy.mockRestore();
    }
    expect(storedFiles().length).toBe(files);
    expect(await photoRows()).toBe(rows);
  });

  test("applying a photo's GPS to its sample when the caller chooses to; a stale version is 409 and changes nothing", async () => {
    // The fixture position (tests/helpers/photo-fixtures.ts), written as EXIF rationals 33°52′4″ S 151°12′26″ E → −33.8678, 151.2072
    const s = await call(createSampleRoute, { method: "POST", params: { projectId: w.projectId }, cookie: w.cookies.lead, body: { sampleType: "float" } });
    const id = s.json.id;
    const up = await upload(form({ name: "sydney.jpg", bytes: await jpegAt(-(33 + 52 / 60 + 4 / 3600), 151 + 12 / 60 + 26 / 3600, { GPSAltitudeRef: "0", GPSAltitude: "58/1" }) }), "field_geologist", id);
    expect(up.status).toBe(201);
    const photoId = up.json.items[0].id;
    expect(up.json.items[0].distanceToStationM).toBeNull(); // sample without station

    const before = await call(getSampleRoute, { params: { projectId: w.projectId, sampleId: id }, cookie: w.cookies.lead });
    expect(before.json.lat).toBeNull(); // uploading alone does not move the sample

    const consultant = await call(applyRoute, { method: "POST", params: { projectId: w.projectId, photoId }, cookie: w.cookies.consultant, body: { version: 1 } });
    expect(consultant.status).toBe(403);

    const applied = await call(applyRoute, { method: "POST", params: { projectId: w.projectId, photoId }, cookie: w.cookies.field_geologist, body: { version: 1, includeElevation: true } });
    expect(applied.status, JSON.stringify(applied.json)).toBe(200);
    expect(applied.json.lat).toBeCloseTo(-33.8678, 4);
    expect(applied.json.lon).toBeCloseTo(151.2072, 4);
    expect(applied.json.locationSource).toBe("photo_exif");
    expect(applied.json.elevationM).toBe(58);
    expect(applied.json.elevationRef).toBe("msl"); // EXIF GPSAltitude is relative to sea level (CIPA DC-008, Exif 2.32)
    expect(applied.json.version).toBe(2);

    const stale = await call(applyRoute, { method: "POST", params: { projectId: w.projectId, photoId }, cookie: w.cookies.lead, body: { version: 1 } });
    expect(stale.status).toBe(409);
    expect(stale.json.error.details.current.version).toBe(2);
  });

  test("a photo without GPS cannot be applied (422)", async () => {
    const png = await sharp({ create: { width: 8, height: 8, channels: 3, background: "#000" } }).png().toBuffer();
    const up = await upload(form({ name: "nogps.png", bytes: png, type: "image/png" }));
    const r = await call(applyRoute, { method: "POST", params: { projectId: w.projectId, photoId: up.json.items[0].id }, cookie: w.cookies.lead, body: { version: 1 } });
    expect(r.status).toBe(422);
    expect(r.json.error.message).toMatch(/no GPS/);
  });

  test("station photos: a field geologist uploads, a lab analyst may not", async () => {
    const fd = () => form({ name: "outcrop.jpg", bytes: new Uint8Array([0]) });
    const denied = await call(stationUploadRoute, { method: "POST", params: { projectId: w.projectId, stationId: w.stationId }, cookie: w.cookies.lab_analyst, rawBody: fd() });
    expect(denied.status).toBe(403);
    const ok = await call(stationUploadRoute, {
      method: "POST",
      params: { projectId: w.projectId, stationId: w.stationId },
      cookie: w.cookies.field_geologist,
      rawBody: form({ name: "outcrop.jpg", bytes: await jpegAt(37.7002, -6.6001) }),
    });
    expect(ok.status).toBe(201);
    expect(ok.json.items[0].stationId).toBe(w.stationId);
    const list = await call(stationPhotosRoute, { params: { projectId: w.projectId, stationId: w.stationId }, cookie: w.cookies.consultant });
    expect(list.json.items).toHaveLength(1);
  });

  test("delete removes the row and its three files; a consultant may not delete", async () => {
    const up = await upload(form({ name: "gone.jpg", bytes: await jpegAt(37.7, -6.6) }));
    const id = up.json.items[0].id;
    const [row] = await getDb().select().from(photos).where(eq(photos.id, id));
    const keys = [row.storageKey, row.thumbKey!, row.displayKey!];
    expect((await call(deleteRoute, { method: "DELETE", params: { projectId: w.projectId, photoId: id }, cookie: w.cookies.consultant })).status).toBe(403);
    const del = await call(deleteRoute, { method: "DELETE", params: { projectId: w.projectId, photoId: id }, cookie: w.cookies.lead });
    expect(del.status).toBe(204);
    for (const k of keys) expect(await getStorage().head(k)).toBeNull();
    expect((await call(getPhotoRoute, { params: { projectId: w.projectId, photoId: id }, cookie: w.cookies.lead })).status).toBe(404);
  });
});
