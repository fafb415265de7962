/** Tells the real image type from the first bytes (magic numbers), whatever the file is named. */

import { fileTypeFromBuffer } from "file-type";

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

const BY_MIME: Record<string, PhotoFormat> = { "image/jpeg": "jpeg", "image/png": "png", "image/webp": "webp", "image/tiff": "tiff", "image/avif": "avif" };

/** What a refused file is, in words, with a hint where there is an easy way out. */
const REFUSED: Record<string, { label: string; hint?: string }> = {
  heic: { label: "a HEIC/HEIF image", hint: 'Export it as JPEG first (phones can be set to save photos as JPEG / "most compatible").' },
  gif: { label: "a GIF", hint: "Upload photos as JPEG, PNG, WebP, TIFF or AVIF." },
  pdf: { label: "a PDF document" },
  zip: { label: "a ZIP archive or office document" },
  docx: { label: "a ZIP archive or office document" },
  xlsx: { label: "a ZIP archive or office document" },
  pptx: { label: "a ZIP archive or office document" },
  mp4: { label: "a video or ISO media file" },
  mov: { label: "a video or ISO media file" },
};

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

/**
 * Recognises JPEG, PNG, WebP, TIFF and AVIF by their magic numbers (the `file-type` package reads them); names common
 * non-photo contents so the message can say what the file is.
 */
export async function sniffImageType(bytes: Uint8Array): Promise<SniffResult> {
  const found = await fileTypeFromBuffer(bytes);
  const format = found && BY_MIME[found.mime];
  if (format) return { ok: true, format, ...INFO[format] };
  if (found) {
    const key = found.mime === "image/heic" || found.mime === "image/heif" || found.mime.startsWith("image/heic") || found.mime.startsWith("image/heif") ? "heic" : found.ext;
    return { ok: false, ...(REFUSED[key] ?? { label: `a ${found.ext.toUpperCase()} file (${found.mime})` }) };
  }
  if (looksLikeText(bytes)) return { ok: false, label: "text, not an image" };
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
