import { LocalDiskStorage } from "./local-disk";
import type { BlobStorage } from "./types";

export * from "./hash";
export * from "./keys";
export * from "./local-disk";
export * from "./types";

/** Folder of the local-disk store: env LITHODEX_DATA_DIR, default ./data/files. */
export function storageRoot(): string {
  return process.env.LITHODEX_DATA_DIR || "./data/files";
}

const cache = globalThis as unknown as { __lithodexStorage?: { root: string; storage: BlobStorage } };

/** The process-wide blob store (re-created when LITHODEX_DATA_DIR changes, e.g. between test files). */
export function getStorage(): BlobStorage {
  const root = storageRoot();
  if (cache.__lithodexStorage?.root !== root) cache.__lithodexStorage = { root, storage: new LocalDiskStorage(root) };
  return cache.__lithodexStorage.storage;
}
