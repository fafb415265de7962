/** Why a photo cannot be accepted. `too_large` → HTTP 413, `unsupported_type` → 415, `corrupt` → 422. */
export type PhotoErrorCode = "too_large" | "unsupported_type" | "corrupt" | "empty";

export class PhotoError extends Error {
  constructor(
    readonly code: PhotoErrorCode,
    message: string,
  ) {
    super(message);
    this.name = "PhotoError";
  }
}

/** Largest photo accepted, bytes (25 MiB: a full-resolution phone or camera JPEG is 3–15 MB). */
export const MAX_PHOTO_BYTES = 25 * 1024 * 1024;
