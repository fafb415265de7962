import { StorageError } from "./types";

const SEGMENT = /^[A-Za-z0-9][A-Za-z0-9._-]{0,127}$/;

/**
 * Checks a storage key: slash-separated segments of letters, digits, dot, underscore and hyphen, no
 * empty, "." or ".." segments, at most 512 characters. Keys never come from user file names.
 */
export function assertValidKey(key: string): void {
  if (typeof key !== "string" || key.length === 0 || key.length > 512) throw new StorageError("invalid_key", "Storage key must be 1–512 characters.");
  for (const seg of key.split("/")) {
    if (!SEGMENT.test(seg) || seg === "." || seg === "..") throw new StorageError("invalid_key", `Invalid storage key segment "${seg}" in "${key}".`);
  }
}

export type PhotoVariant = "original" | "thumb" | "display";

/** `projects/<projectId>/photos/<photoId>/<variant>.<ext>` */
export function photoKey(projectId: string, photoId: string, variant: PhotoVariant, ext: string): string {
  const key = `projects/${projectId}/photos/${photoId}/${variant}.${ext}`;
  assertValidKey(key);
  return key;
}
