/** Reads the files of a multipart photo upload from a web Request, refusing oversize bodies before buffering them. */
import { cleanFileName } from "@/lib/storage/file-name";
import { MAX_PHOTO_BYTES, PhotoError } from "./errors";

export interface UploadedFile {
  name: string;
  bytes: Uint8Array;
}

export interface ReadUploadOptions {
  /** Largest single file, bytes. @default MAX_PHOTO_BYTES */
  maxFileBytes?: number;
  /** Most files in one request. @default 20 */
  maxFiles?: number;
  /** Form field names holding files. @default ["files", "file"] */
  fields?: string[];
}

/** Thrown for a request that is not a usable multipart upload (wrong content type, unreadable body). */
export class UploadRequestError extends Error {
  constructor(
    readonly status: 400 | 413 | 415,
    message: string,
  ) {
    super(message);
    this.name = "UploadRequestError";
  }
}

/**
 * Parses `multipart/form-data` and returns its files. A Content-Length beyond what the allowed files
 * could need is refused (413) before the body is read; each file over the limit is a PhotoError("too_large").
 */
export async function readUploadFiles(req: Request, options: ReadUploadOptions = {}): Promise<UploadedFile[]> {
  const { maxFileBytes = MAX_PHOTO_BYTES, maxFiles = 20, fields = ["files", "file"] } = options;
  const type = req.headers.get("content-type") ?? "";
  if (!type.toLowerCase().startsWith("multipart/form-data")) {
    throw new UploadRequestError(415, "Send photos as multipart/form-data (a form with one or more files in the field \"files\").");
  }
  const length = Number(req.headers.get("content-length") ?? NaN);
  const limit = maxFiles * maxFileBytes + 1024 * 1024;
  if (Number.isFinite(length) && length > limit) {
    throw new UploadRequestError(413, `The upload is ${(length / 1024 / 1024).toFixed(0)} MB; at most ${maxFiles} photos of ${(maxFileBytes / 1024 / 1024).toFixed(0)} MB each fit in one upload.`);
  }
  let form: FormData;
  try {
    form = await req.formData();
  } catch (err) {
    // The route's byte counter stops a body past its limit while it streams in (chunked bodies included).
    const cause = (err as { cause?: { code?: string; message?: string } })?.cause;
    if (cause?.code === "payload_too_large" || (err as { code?: string })?.code === "payload_too_large") {
      throw new UploadRequestError(413, cause?.message ?? (err as Error).message);
    }
    throw new UploadRequestError(400, "The upload could not be read as a form; try again.");
  }
  const files: UploadedFile[] = [];
  for (const field of fields) {
    for (const entry of form.getAll(field)) {
      if (typeof entry === "string") continue;
      const name = cleanFileName(entry.name || "photo", "photo");
      if (entry.size > maxFileBytes) {
        throw new PhotoError("too_large", `${name} is ${(entry.size / 1024 / 1024).toFixed(1)} MB; photos may be at most ${(maxFileBytes / 1024 / 1024).toFixed(1)} MB. Export a smaller JPEG and try again.`);
      }
      files.push({ name, bytes: new Uint8Array(await entry.arrayBuffer()) });
    }
  }
  return files;
}
