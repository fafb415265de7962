/**
 * Turns an uploaded file into what the register stores: the checked original, a thumbnail and a
 * display-size WebP with the EXIF orientation applied, and the EXIF facts. Uses sharp (libvips).
 */
import sharp, { type Metadata } from "sharp";
import { PhotoError, MAX_PHOTO_BYTES } from "./errors";
import { readPhotoMetadata, type PhotoMetadata } from "./exif";
import { extensionMismatch, sniffImageType, type PhotoFormat } from "./sniff";

export interface Rendition {
  bytes: Buffer;
  width: number;
  height: number;
  mime: "image/webp";
}

export interface ProcessedPhoto {
  format: PhotoFormat;
  /** MIME type of the original, from its content (not its name) */
  mime: string;
  /** usual extension of that type */
  ext: string;
  /** Width/height as displayed (after applying EXIF orientation), pixels. */
  width: number;
  height: number;
  metadata: PhotoMetadata;
  thumb: Rendition;
  display: Rendition;
  /** Things the uploader should know (renamed type, damaged EXIF, …); the upload still succeeded. */
  notices: string[];
}

export interface ProcessPhotoOptions {
  /** Largest accepted file, bytes. @default MAX_PHOTO_BYTES (25 MiB) */
  maxBytes?: number;
  /** Longest side of the thumbnail, pixels. @default 320 */
  thumbSize?: number;
  /** Longest side of the display image, pixels (never enlarged). @default 1600 */
  displaySize?: number;
  /** WebP quality of thumbnail and display image, 1–100. @default 80 */
  quality?: number;
}

const mb = (n: number) => `${(n / 1024 / 1024).toFixed(1)} MB`;

/**
 * Checks and processes one photo. Throws PhotoError: `too_large` (over the limit), `unsupported_type`
 * (content is not JPEG/PNG/WebP/TIFF/AVIF, whatever the name says), `corrupt` (truncated or undecodable
 * image data). Damaged EXIF is not an error: it becomes a notice.
 */
export async function processPhoto(bytes: Uint8Array, fileName: string, options: ProcessPhotoOptions = {}): Promise<ProcessedPhoto> {
  const { maxBytes = MAX_PHOTO_BYTES, thumbSize = 320, displaySize = 1600, quality = 80 } = options;
  if (bytes.byteLength === 0) throw new PhotoError("empty", `${fileName} is empty (0 bytes).`);
  if (bytes.byteLength > maxBytes) {
    throw new PhotoError("too_large", `${fileName} is ${mb(bytes.byteLength)}; photos may be at most ${mb(maxBytes)}. Export a smaller JPEG and try again.`);
  }
  const sniff = await sniffImageType(bytes);
  if (!sniff.ok) {
    throw new PhotoError("unsupported_type", `${fileName} is ${sniff.label}. Upload photos as JPEG, PNG, WebP, TIFF or AVIF.${sniff.hint ? ` ${sniff.hint}` : ""}`);
  }
  const notices: string[] = [];
  const mismatch = extensionMismatch(fileName, sniff.format);
  if (mismatch) notices.push(mismatch);

  // failOn "truncated": an interrupted copy is refused, minor encoder quirks are tolerated.
  const input = sharp(bytes, { failOn: "truncated", sequentialRead: true });
  let info: Metadata;
  try {
    info = await input.metadata();
  } catch (err) {
    throw corrupt(fileName, sniff.label, err);
  }
  if (!info.width || !info.height) throw new PhotoError("corrupt", `${fileName}: the ${sniff.label} has no image size; the file is damaged.`);
  const width = info.autoOrient?.width ?? info.width;
  const height = info.autoOrient?.height ?? info.height;

  const render = async (size: number): Promise<Rendition> => {
    const out = await input
      .clone()
      .rotate() // applies EXIF orientation; output carries no EXIF, so no double rotation and no GPS leak
      .resize(size, size, { fit: "inside", withoutEnlargement: true })
      .webp({ quality })
      .toBuffer({ resolveWithObject: true });
    return { bytes: out.data, width: out.info.width, height: out.info.height, mime: "image/webp" };
  };
  let thumb: Rendition;
  let display: Rendition;
  try {
    [thumb, display] = await Promise.all([render(thumbSize), render(displaySize)]);
  } catch (err) {
    throw corrupt(fileName, sniff.label, err);
  }

  const metadata = await readPhotoMetadata(bytes);
  notices.push(...metadata.warnings);
  return { format: sniff.format, mime: sniff.mime, ext: sniff.ext, width, height, metadata, thumb, display, notices };
}

function corrupt(fileName: string, label: string, err: unknown): PhotoError {
  const msg = String((err as Error)?.message ?? err);
  if (/premature end|truncated|unexpected end|short read|end of (file|stream)/i.test(msg)) {
    return new PhotoError("corrupt", `${fileName}: the ${label} data is incomplete (the file was cut short, e.g. an interrupted copy). Copy it from the camera again and re-upload.`);
  }
  return new PhotoError("corrupt", `${fileName}: the ${label} could not be decoded (${msg.split("\n")[0]}). The file is damaged.`);
}
