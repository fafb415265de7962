/** A small, generic blob store: put/get/stream/head/delete by key. Local disk today; an S3 adapter fits the same shape. */

/** What was stored. */
export interface StoredObject {
  key: string;
  /** bytes */
  size: number;
  /** lower-case hex SHA-256 of the stored bytes */
  sha256: string;
}

/** Bytes to store: a buffer, a web stream or any async iterable of chunks. */
export type BlobBody = Uint8Array | ReadableStream<Uint8Array> | AsyncIterable<Uint8Array>;

export interface PutOptions {
  /** Replace an existing object under the key. @default false (a second put under the same key fails) */
  overwrite?: boolean;
  /** Refuse (and store nothing) when the body grows beyond this many bytes. @default no limit */
  maxBytes?: number;
}

export interface BlobStorage {
  /** Stores the body under `key` atomically: readers see either nothing or the whole object. */
  put(key: string, body: BlobBody, options?: PutOptions): Promise<StoredObject>;
  /** The whole object; throws StorageError("not_found") when absent. */
  get(key: string): Promise<Buffer>;
  /** The object as a web stream (for Response bodies); throws StorageError("not_found") when absent. */
  stream(key: string): Promise<ReadableStream<Uint8Array>>;
  /** Size of the object, or null when absent. */
  head(key: string): Promise<{ size: number } | null>;
  /** Removes the object; true when something was removed. */
  delete(key: string): Promise<boolean>;
}

export type StorageErrorCode = "invalid_key" | "not_found" | "exists" | "too_large";

export class StorageError extends Error {
  constructor(
    readonly code: StorageErrorCode,
    message: string,
  ) {
    super(message);
    this.name = "StorageError";
  }
}
