import sharp from "sharp";
import { describe, expect, test } from "vitest";
import { PhotoError } from "@/lib/photos/errors";
import { processPhoto } from "@/lib/photos/process";
import { sniffImageType } from "@/lib/photos/sniff";
import { jpegOrientation6, jpegWithGps, noise } from "../../helpers/photo-fixtures";

const catchError = async (p: Promise<unknown>) => p.then(() => null, (e: unknown) => e as PhotoError);

describe("processPhoto", () => {
  test("orientation 6: thumbnail and display are rotated (width and height swapped) and carry no EXIF", async () => {
    // Orientation 6 = rotate 90° clockwise to display (CIPA DC-008, Exif 2.32)
    const p = await processPhoto(await jpegOrientation6(), "IMG_0001.JPG", { thumbSize: 100 });
    expect([p.width, p.height]).toEqual([200, 400]);
    expect([p.thumb.width, p.thumb.height]).toEqual([50, 100]);
    expect([p.display.width, p.display.height]).toEqual([200, 400]); // never enlarged
    const thumbMeta = await sharp(p.thumb.bytes).metadata();
    expect(thumbMeta.format).toBe("webp");
    expect(thumbMeta.orientation).toBeUndefined(); // no EXIF left → no double rotation in browsers
    expect(p.metadata.orientation).toBe(6);
  });

  test("the rotation really moves pixels: the stored left half becomes the displayed top half", async () => {
    // 32×16 image: left half red, right half blue. Orientation 6 (rotate 90° clockwise, CIPA DC-008) puts red on top.
    const w = 32, h = 16;
    const raw = Buffer.alloc(w * h * 3);
    for (let y = 0; y < h; y++) for (let x = 0; x < w; x++) raw.set(x < w / 2 ? [255, 0, 0] : [0, 0, 255], (y * w + x) * 3);
    const tagged = await sharp(raw, { raw: { width: w, height: h, channels: 3 } }).withMetadata({ orientation: 6 }).jpeg({ quality: 100 }).toBuffer();
    const p = await processPhoto(tagged, "halves.jpg");
    const { data, info } = await sharp(p.display.bytes).raw().toBuffer({ resolveWithObject: true });
    expect([info.width, info.height]).toEqual([16, 32]);
    const at = (x: number, y: number) => [...data.subarray((y * info.width + x) * info.channels, (y * info.width + x) * info.channels + 3)];
    const [r1, , b1] = at(8, 6);
    const [r2, , b2] = at(8, 26);
    expect(r1).toBeGreaterThan(200);
    expect(b1).toBeLessThan(60);
    expect(b2).toBeGreaterThan(200);
    expect(r2).toBeLessThan(60);
  });

  test("a PNG renamed .jpg is processed as PNG with a notice", async () => {
    const png = await sharp({ create: { width: 30, height: 20, channels: 3, background: "#123456" } }).png().toBuffer();
    const p = await processPhoto(png, "outcrop.jpg");
    expect(p.format).toBe("png");
    expect(p.mime).toBe("image/png");
    expect(p.notices[0]).toMatch(/outcrop\.jpg is named \.jpg but contains a PNG image; it was stored as PNG/);
  });

  test("a text file named .jpg is refused as unsupported, saying it is text", async () => {
    const e = await catchError(processPhoto(Buffer.from("lat,lon\n37.7,-6.6\n"), "notes.jpg"));
    expect(e).toBeInstanceOf(PhotoError);
    expect(e?.code).toBe("unsupported_type");
    expect(e?.message).toMatch(/notes\.jpg is text, not an image/);
  });

  test("a truncated JPEG is refused as corrupt with a clear reason", async () => {
    const full = await sharp(noise(256, 256), { raw: { width: 256, height: 256, channels: 3 } }).jpeg({ quality: 90 }).toBuffer();
    const cut = full.subarray(0, Math.floor(full.length * 0.6));
    const e = await catchError(processPhoto(cut, "cut.jpg"));
    expect(e?.code).toBe("corrupt");
    expect(e?.message).toMatch(/incomplete/);
  });

  test("over the size limit → too_large, before any decoding", async () => {
    const e = await catchError(processPhoto(await jpegWithGps(), "big.jpg", { maxBytes: 100 }));
    expect(e?.code).toBe("too_large");
    expect(e?.message).toMatch(/at most/);
    expect((await catchError(processPhoto(new Uint8Array(0), "zero.jpg")))?.code).toBe("empty");
  });

  test("GPS and time come through processing", async () => {
    const p = await processPhoto(await jpegWithGps(), "gps.jpg");
    expect(p.metadata.gps?.lat).toBeCloseTo(-33.8678, 4); // the photo fixture's GPS position
    expect(p.notices).toEqual([]);
  });

  test("a JPEG with damaged EXIF still processes, with a notice", async () => {
    const buf = Buffer.from(await jpegWithGps());
    const at = buf.indexOf(Buffer.from("Exif\0\0"));
    buf.fill(0xab, at + 10, at + 40);
    const p = await processPhoto(buf, "damaged-exif.jpg");
    expect(p.thumb.bytes.length).toBeGreaterThan(0);
    expect(p.notices.join(" ")).toMatch(/EXIF/);
  });
});

describe("sniffImageType (the file-type package's magic numbers: JPEG FF D8 FF, PNG 89 50 4E 47, RIFF…WEBP, TIFF II*\\0/MM\\0*, ISO-BMFF ftyp brands)", () => {
  test("recognises what sharp writes", async () => {
    const img = sharp({ create: { width: 4, height: 4, channels: 3, background: "#000" } });
    expect(await sniffImageType(await img.clone().jpeg().toBuffer())).toMatchObject({ ok: true, format: "jpeg" });
    expect(await sniffImageType(await img.clone().png().toBuffer())).toMatchObject({ ok: true, format: "png" });
    expect(await sniffImageType(await img.clone().webp().toBuffer())).toMatchObject({ ok: true, format: "webp" });
    expect(await sniffImageType(await img.clone().tiff().toBuffer())).toMatchObject({ ok: true, format: "tiff" });
    expect(await sniffImageType(await img.clone().avif().toBuffer())).toMatchObject({ ok: true, format: "avif" });
  });
  test("names HEIC, PDF and GIF", async () => {
    const heic = Buffer.concat([Buffer.from([0, 0, 0, 24]), Buffer.from("ftypheic"), Buffer.alloc(12)]);
    expect(await sniffImageType(heic)).toMatchObject({ ok: false, label: expect.stringMatching(/HEIC/) });
    expect(await sniffImageType(Buffer.from("%PDF-1.7\n"))).toMatchObject({ ok: false, label: "a PDF document" });
    expect(await sniffImageType(Buffer.from("GIF89a"))).toMatchObject({ ok: false, label: "a GIF" });
  });
});
