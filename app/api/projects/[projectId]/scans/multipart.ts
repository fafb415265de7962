import "server-only";
import { readError } from "@/lib/api/body";
import { AppError } from "@/lib/dal/errors";
import { cleanFileName } from "@/lib/storage/file-name";
import type { UploadedFile } from "@/lib/dal/scans";

/** Text fields and files of a multipart/form-data request (files under any field name, in order). */
export async function readMultipart(req: Request, fileFields: readonly string[] = ["file", "files"]): Promise<{ fields: Record<string, string>; files: UploadedFile[] }> {
  const type = req.headers.get("content-type") ?? "";
  if (!type.toLowerCase().startsWith("multipart/form-data")) {
    throw new AppError("unsupported_media_type", "Send the files as multipart/form-data (a file upload form).");
  }
  let form: FormData;
  try {
    form = await req.formData();
  } catch (err) {
    // A body past the route's limit (counted while it streams in) is a 413, anything else a 400.
    throw readError(req, err, new AppError("bad_request", "The upload could not be read as multipart/form-data."));
  }
  const fields: Record<string, string> = {};
  const files: UploadedFile[] = [];
  for (const [name, value] of form.entries()) {
    if (typeof value === "string") {
      fields[name] = value;
    } else if (fileFields.includes(name)) {
      // Browsers send an empty, nameless part when no file was chosen.
      if (value.size === 0 && !value.name) continue;
      // Stored and shown names are cleaned of control and bidi characters (U+202E would disguise an extension).
      files.push({ name: cleanFileName(value.name || "upload", "upload"), bytes: new Uint8Array(await value.arrayBuffer()) });
    }
  }
  return { fields, files };
}
