import sharp from "sharp";
import { describe, expect, test } from "vitest";
import { exifLocalDateTime, localToUtc, readPhotoMetadata } from "@/lib/photos/exif";
import { EXIFTOOL, exiftoolRead, exiftoolWrite, jpegOrientation6, jpegWithGps } from "../../helpers/photo-fixtures";

describe("readPhotoMetadata", () => {
  test("GPS written by sharp .withExif reads back as −33.8678, 151.2072 (CIPA DC-008 GPS tags)", async () => {
    const meta = await readPhotoMetadata(await jpegWithGps());
    // 33°52′04″ S = −(33 + 52/60 + 4/3600) = −33.86778; 151°12′26″ E = 151.20722 (three rationals D, M, S; CIPA DC-008, Exif 2.32)
    expect(meta.gps?.lat).toBeCloseTo(-33.8678, 4);
    expect(meta.gps?.lon).toBeCloseTo(151.2072, 4);
    expect(meta.gps?.altitudeM).toBe(58);
    expect(meta.gps?.imgDirection).toBeCloseTo(225.5, 6);
    expect(meta.gps?.imgDirectionRef).toBe("T");
    expect(meta.camera).toBe("FixtureCam One");
    expect(meta.warnings).toEqual([]);
  });

  test.skipIf(!EXIFTOOL)("exiftool independently reads the same position from that fixture", async () => {
    const tags = exiftoolRead(await jpegWithGps(), ["GPSLatitude", "GPSLongitude"]);
    // exiftool -n prints signed decimal degrees (its composite tags apply the Ref)
    expect(tags.GPSLatitude as number).toBeCloseTo(-33.8678, 4);
    expect(tags.GPSLongitude as number).toBeCloseTo(151.2072, 4);
  });

  test.skipIf(!EXIFTOOL)("a photo tagged by exiftool (46.5197 N, 6.6323 E, 372 m, magnetic 80°) reads back", async () => {
    // The same tags written with exiftool (an independent EXIF writer)
    const base = await sharp({ create: { width: 32, height: 32, channels: 3, background: "#777" } }).jpeg().toBuffer();
    const tagged = exiftoolWrite(base, [
      "-GPSLatitude=46.5197",
      "-GPSLatitudeRef=N",
      "-GPSLongitude=6.6323",
      "-GPSLongitudeRef=E",
      "-GPSAltitude=372",
      "-GPSAltitudeRef=0",
      "-GPSImgDirection=80",
      "-GPSImgDirectionRef=M",
      "-GPSDateStamp=2026:03:14",
      "-GPSTimeStamp=09:05:22",
      "-GPSHPositioningError=4.5",
    ]);
    const meta = await readPhotoMetadata(tagged);
    expect(meta.gps?.lat).toBeCloseTo(46.5197, 6);
    expect(meta.gps?.lon).toBeCloseTo(6.6323, 6);
    expect(meta.gps?.altitudeM).toBeCloseTo(372, 6);
    expect(meta.gps?.imgDirectionRef).toBe("M");
    expect(meta.gps?.horizontalErrorM).toBeCloseTo(4.5, 6);
    expect(meta.gps?.fixAt).toBe("2026-03-14T09:05:22.000Z"); // GPSDateStamp/GPSTimeStamp are UTC (CIPA DC-008, Exif 2.32)
  });

  test.skipIf(!EXIFTOOL)("below sea level: GPSAltitudeRef 1 negates the altitude (CIPA DC-008, Exif 2.32)", async () => {
    const base = await sharp({ create: { width: 16, height: 16, channels: 3, background: "#777" } }).jpeg().toBuffer();
    const tagged = exiftoolWrite(base, ["-GPSLatitude=31.5", "-GPSLatitudeRef=N", "-GPSLongitude=35.5", "-GPSLongitudeRef=E", "-GPSAltitude=430", "-GPSAltitudeRef#=1"]);
    expect((await readPhotoMetadata(tagged)).gps?.altitudeM).toBeCloseTo(-430, 6);
  });

  test("time taken: DateTimeOriginal + OffsetTimeOriginal → UTC instant; the server's zone plays no part (CIPA DC-008 Exif 2.32, OffsetTimeOriginal)", async () => {
    const meta = await readPhotoMetadata(await jpegWithGps());
    expect(meta.takenLocal).toBe("2026-03-14T10:05:22");
    expect(meta.takenOffset).toBe("+11:00");
    // 10:05:22 at UTC+11 is 23:05:22 UTC the day before (OffsetTimeOriginal since Exif 2.31; CIPA DC-008, Exif 2.32, 2019)
    expect(meta.takenAt).toBe("2026-03-13T23:05:22Z");
  });

  test("without an offset the local time is kept and no instant is invented", async () => {
    const buf = await sharp({ create: { width: 8, height: 8, channels: 3, background: "#000" } })
      .jpeg()
      .withExif({ IFD2: { DateTimeOriginal: "2025:12:31 23:59:59" } })
      .toBuffer();
    const meta = await readPhotoMetadata(buf);
    expect(meta.takenLocal).toBe("2025-12-31T23:59:59");
    expect(meta.takenAt).toBeNull();
  });

  test("orientation 6 is reported (exiftool agrees when installed)", async () => {
    const buf = await jpegOrientation6();
    expect((await readPhotoMetadata(buf)).orientation).toBe(6);
    if (EXIFTOOL) expect(exiftoolRead(buf, ["Orientation"]).Orientation).toBe(6);
  });

  test("a photo without EXIF gives empty metadata and no warning", async () => {
    const png = await sharp({ create: { width: 8, height: 8, channels: 3, background: "#fff" } }).png().toBuffer();
    const meta = await readPhotoMetadata(png);
    expect(meta).toMatchObject({ takenAt: null, gps: null, orientation: null, warnings: [] });
  });

  test("damaged EXIF does not throw: it becomes a warning", async () => {
    const buf = Buffer.from(await jpegWithGps());
    const at = buf.indexOf(Buffer.from("Exif\0\0"));
    buf.fill(0xab, at + 10, at + 40); // overwrite the IFD0 offset and first entries
    const meta = await readPhotoMetadata(buf);
    expect(meta.gps).toBeNull();
    expect(meta.warnings.length).toBeGreaterThan(0);
  });

  test("EXIF 0°,0° (no fix) is ignored with a warning", async () => {
    const buf = await sharp({ create: { width: 8, height: 8, channels: 3, background: "#000" } })
      .jpeg()
      .withExif({ IFD3: { GPSLatitudeRef: "N", GPSLatitude: "0/1 0/1 0/1", GPSLongitudeRef: "E", GPSLongitude: "0/1 0/1 0/1" } })
      .toBuffer();
    const meta = await readPhotoMetadata(buf);
    expect(meta.gps).toBeNull();
    expect(meta.warnings[0]).toMatch(/no fix/);
  });
});

describe("EXIF date helpers", () => {
  test("EXIF 'YYYY:MM:DD HH:MM:SS' (Exif 2.3 §4.6.5, from memory)", () => {
    expect(exifLocalDateTime("2026:03:14 10:05:22")).toBe("2026-03-14T10:05:22");
    expect(exifLocalDateTime("0000:00:00 00:00:00")).toBeNull();
    expect(exifLocalDateTime("garbage")).toBeNull();
  });
  test("offset −03:00 adds three hours (RFC 3339 offsets)", () => {
    expect(localToUtc("2026-03-14T21:30:00", "-03:00")).toBe("2026-03-15T00:30:00Z");
  });
});
