/** Photo fixtures made inside the tests (sharp writes them; exiftool, when installed, tags and reads them independently). */
import { execFileSync } from "node:child_process";
import { existsSync, mkdtempSync, readFileSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import sharp from "sharp";

export const EXIFTOOL = ["/usr/bin/exiftool", "/usr/local/bin/exiftool"].find((p) => existsSync(p)) ?? null;

/** A noisy RGB image (noise makes the JPEG big enough that truncation cuts into the scan data). */
export function noise(width: number, height: number, seed = 7): Buffer {
  const px = Buffer.alloc(width * height * 3);
  let s = seed;
  for (let i = 0; i < px.length; i++) {
    s = (s * 1103515245 + 12345) & 0x7fffffff;
    px[i] = s >>> 23;
  }
  return px;
}

/** A JPEG with GPS −33.8678, 151.2072 written by sharp's withExif (GPS IFD as EXIF rationals, CIPA DC-008 Exif 2.32) plus time and direction. */
export async function jpegWithGps(): Promise<Buffer> {
  return sharp({ create: { width: 64, height: 48, channels: 3, background: "#a0522d" } })
    .jpeg()
    .withExif({
      IFD0: { Make: "FixtureCam", Model: "One" },
      IFD2: { DateTimeOriginal: "2026:03:14 10:05:22", OffsetTimeOriginal: "+11:00" },
      IFD3: {
        GPSLatitudeRef: "S",
        GPSLatitude: "33/1 52/1 4/1",
        GPSLongitudeRef: "E",
        GPSLongitude: "151/1 12/1 26/1",
        GPSAltitudeRef: "0",
        GPSAltitude: "58/1",
        GPSImgDirectionRef: "T",
        GPSImgDirection: "2255/10",
      },
    })
    .toBuffer();
}

/** A 400×200 (stored) JPEG tagged Orientation 6: it displays as 200×400. */
export async function jpegOrientation6(): Promise<Buffer> {
  return sharp(noise(400, 200), { raw: { width: 400, height: 200, channels: 3 } }).jpeg().withMetadata({ orientation: 6 }).toBuffer();
}

/** Runs exiftool on a buffer: writes tags (args like "-GPSLatitude=46.5197") and returns the new bytes. */
export function exiftoolWrite(bytes: Buffer, args: string[]): Buffer {
  const dir = mkdtempSync(join(tmpdir(), "lithodex-exif-"));
  const file = join(dir, "f.jpg");
  writeFileSync(file, bytes);
  execFileSync(EXIFTOOL!, ["-q", "-overwrite_original", ...args, file]);
  return readFileSync(file);
}

/** Reads tags with exiftool (-n: numbers, not formatted text). */
export function exiftoolRead(bytes: Buffer, tags: string[]): Record<string, unknown> {
  const dir = mkdtempSync(join(tmpdir(), "lithodex-exif-"));
  const file = join(dir, "f.bin");
  writeFileSync(file, bytes);
  const out = execFileSync(EXIFTOOL!, ["-j", "-n", ...tags.map((t) => `-${t}`), file]).toString();
  return JSON.parse(out)[0];
}

/** "37/1 42/1 36/10"-style EXIF rationals for a decimal angle (seconds to 0.01″). */
export function exifDms(deg: number): string {
  const a = Math.abs(deg);
  const d = Math.floor(a);
  const m = Math.floor((a - d) * 60);
  const s = Math.round(((a - d) * 60 - m) * 60 * 100);
  return `${d}/1 ${m}/1 ${s}/100`;
}

/** A small JPEG with the given GPS position (and optional horizontal error) written by sharp. */
export async function jpegAt(lat: number, lon: number, extra: Record<string, string> = {}): Promise<Buffer> {
  return sharp({ create: { width: 48, height: 32, channels: 3, background: "#6b8e23" } })
    .jpeg()
    .withExif({
      IFD2: { DateTimeOriginal: "2026:03:14 11:20:05", OffsetTimeOriginal: "+01:00" },
      IFD3: { GPSLatitudeRef: lat < 0 ? "S" : "N", GPSLatitude: exifDms(lat), GPSLongitudeRef: lon < 0 ? "W" : "E", GPSLongitude: exifDms(lon), ...extra },
    })
    .toBuffer();
}
