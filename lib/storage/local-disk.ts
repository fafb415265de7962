import { createHash, randomUUID } from "node:crypto";
import { createReadStream, createWriteStream } from "node:fs";
import { mkdir, readFile, rename, rm, stat } from "node:fs/promises";
import { dirname, join, resolve, sep } from "node:path";
import { Readable } from "node:stream";
import { pipeline } from "node:stream/promises";
import { assertValidKey } from "./keys";
import { StorageError, type BlobBody, type BlobStorage, type PutOptions, type StoredObject } from "./types";

function toAsyncIterable(body: BlobBody): AsyncIterable<Uint8Array> {
  if (body instanceof Uint8Array) {
    return (async function* () {
      yield body;
    })();
  }
  if (typeof (body as ReadableStream).getReader === "function") return Readable.fromWeb(body as import("node:stream/web").ReadableStream<Uint8Array>);
  return body as AsyncIterable<Uint8Array>;
}

const isMissing = (err: unknown) => (err as NodeJS.ErrnoException)?.code === "ENOENT";

/** Blob storage in a folder on local disk; objects are files named by their key. */
export class LocalDiskStorage implements BlobStorage {
  readonly root: string;

  constructor(root: string) {
    this.root = resolve(root);
  }

  private pathOf(key: string): string {
    assertValidKey(key);
    const p = resolve(join(this.root, key));
    if (!p.startsWith(this.root + sep)) throw new StorageError("invalid_key", `Key "${key}" escapes the storage root.`);
    return p;
  }

  async put(key: string, body: BlobBody, options: PutOptions = {}): Promise<StoredObject> {
    const { overwrite = false, maxBytes = Infinity } = options;
    const path = this.pathOf(key);
    if (!overwrite && (await this.head(key))) throw new StorageError("exists", `An object already exists under "${key}".`);
    await mkdir(dirname(path), { recursive: true });
    const tmp = `${path}.${randomUUID()}.part`;
    const hash = createHash("sha256");
    let size = 0;
    const source = toAsyncIterable(body);
    try {
      await pipeline(
        async function* () {
          for await (const chunk of source) {
            size += chunk.byteLength;
            if (size > maxBytes) throw new StorageError("too_large", `Object is larger than ${maxBytes} bytes.`);
            hash.update(chunk);
            yield chunk;
          }
        },
        createWriteStream(tmp, { flags: "wx" }),
      );
      await rename(tmp, path);
    } catch (err) {
      await rm(tmp, { force: true });
      throw err;
    }
    return { key, size, sha256: hash.digest("hex") };
  }

  async get(key: string): Promise<Buffer> {
    try {
      return await readFile(this.pathOf(key));
    } catch (err) {
      if (isMissing(err)) throw new StorageError("not_found", `No object under "${key}".`);
      throw err;
    }
  }

  async stream(key: string): Promise<ReadableStream<Uint8Array>> {
    const path = this.pathOf(key);
    if (!(await this.head(key))) throw new StorageError("not_found", `No object under "${key}".`);
    return Readable.toWeb(createReadStream(path)) as ReadableStream<Uint8Array>;
  }

  async head(key: string): Promise<{ size: number } | null> {
    try {
      const s = await stat(this.pathOf(key));
      return s.isFile() ? { size: s.size } : null;
    } catch (err) {
      if (isMissing(err)) return null;
      throw err;
    }
  }

  async delete(key: string): Promise<boolean> {
    const path = this.pathOf(key);
    const existed = (await this.head(key)) !== null;
    await rm(path, { force: true });
    return existed;
  }
}
