/** Tells the real image type from the first bytes (magic numbers), whatever the file is named. Pure. */

export type PhotoFormat = "jpeg" | "png" | "webp" | "tiff" | "avif";

export type SniffResult =
  | { ok: true; format: PhotoFormat; mime: string; ext: string; label: string }
  | { ok: false; label: string; hint?: string };

const INFO: Record<PhotoFormat, { mime: string; ext: string; label: string }> = {
  jpeg: { mime: "image/jpeg", ext: "jpg", label: "JPEG" },
  png: { mime: "image/png", ext: "png", label: "PNG" },
  webp: { mime: "image/webp", ext: "webp", label: "WebP" },
  tiff: { mime: "image/tiff", ext: "tif", label: "TIFF" },
  avif: { mime: "image/avif", ext: "avif", label: "AVIF" },
};

const ascii = (b: Uint8Array, from: number, to: number) => String.fromCharCode(...b.subarray(from, to));
const startsWith = (b: Uint8Array, sig: number[], at = 0) => sig.every((v, i) => b[at + i] === v);

/** True when the bytes look like text (UTF-8/ASCII without control characters other than tab/CR/LF). */
function looksLikeText(b: Uint8Array): boolean {
  const n = Math.min(b.length, 1024);
  if (n === 0) return false;
  for (let i = 0; i < n; i++) {
    const c = b[i];
    if (c < 9 || (c > 13 && c < 32 && c !== 27) || c === 127) return false;
  }
  return true;
}

/** Recognises JPEG, PNG, WebP, TIFF and AVIF; names common non-photo contents so the message can say what it is. */
export function sniffImageType(bytes: Uint8Array): SniffResult {
  const b = bytes;
  if (startsWith(b, [0xff, 0xd8, 0xff])) return { ok: true, format: "jpeg", ...INFO.jpeg };
  if (startsWith(b, [0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a])) return { ok: true, format: "png", ...INFO.png };
  if (b.length >= 12 && ascii(b, 0, 4) === "RIFF" && ascii(b, 8, 12) === "WEBP") return { ok: true, format: "webp", ...INFO.webp };
  if (startsWith(b, [0x49, 0x49, 0x2a, 0x00]) || startsWith(b, [0x4d, 0x4d, 0x00, 0x2a])) return { ok: true, format: "tiff", ...INFO.tiff };
  if (b.length >= 12 && ascii(b, 4, 8) === "ftyp") {
    const brand = ascii(b, 8, 12);
    if (brand === "avif" || brand === "avis") return { ok: true, format: "avif", ...INFO.avif };
    if (["heic", "heix", "hevc", "hevx", "mif1", "msf1"].includes(brand)) {
      return { ok: false, label: "a HEIC/HEIF image", hint: "Export it as JPEG first (phones can be set to save photos as JPEG / \"most compatible\")." };
    }
    return { ok: false, label: "a video or ISO media file" };
  }
  if (startsWith(b, [0x47, 0x49, 0x46, 0x38])) return { ok: false, label: "a GIF", hint: "Upload photos as JPEG, PNG, WebP, TIFF or AVIF." };
  if (ascii(b, 0, 5) === "%PDF-") return { ok: false, label: "a PDF document" };
  if (startsWith(b, [0x50, 0x4b, 0x03, 0x04])) return { ok: false, label: "a ZIP archive or office document" };
  if (looksLikeText(b)) return { ok: false, label: "text, not an image" };
  return { ok: false, label: "not an image we recognise" };
}

/** The extensions a format is usually named with (lower case, no dot). */
const EXTENSIONS: Record<PhotoFormat, string[]> = {
  jpeg: ["jpg", "jpeg", "jpe", "jfif"],
  png: ["png"],
  webp: ["webp"],
  tiff: ["tif", "tiff"],
  avif: ["avif"],
};

/** A notice when the file name's extension disagrees with the content, e.g. a PNG named photo.jpg; null when they agree. */
export function extensionMismatch(fileName: string, format: PhotoFormat): string | null {
  const m = /\.([A-Za-z0-9]+)$/.exec(fileName);
  if (!m) return null;
  const ext = m[1].toLowerCase();
  if (EXTENSIONS[format].includes(ext)) return null;
  return `${fileName} is named .${ext} but contains a ${INFO[format].label} image; it was stored as ${INFO[format].label}.`;
}
