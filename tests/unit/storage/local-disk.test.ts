import { createHash } from "node:crypto";
import { mkdtempSync, readdirSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { describe, expect, test } from "vitest";
import { LocalDiskStorage, StorageError, assertValidKey, photoKey } from "@/lib/storage";

const store = () => new LocalDiskStorage(mkdtempSync(join(tmpdir(), "lithodex-store-")));
// Independent reference: Node's own SHA-256; plus the published digest of "abc" (FIPS 180-2, appendix B.1).
const ABC_SHA256 = "ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad";

describe("LocalDiskStorage", () => {
  test("put/get/head/delete with SHA-256 of the bytes", async () => {
    const s = store();
    const put = await s.put("a/b/abc.txt", new TextEncoder().encode("abc"));
    expect(put).toEqual({ key: "a/b/abc.txt", size: 3, sha256: ABC_SHA256 });
    expect((await s.get("a/b/abc.txt")).toString()).toBe("abc");
    expect(await s.head("a/b/abc.txt")).toEqual({ size: 3 });
    expect(await s.delete("a/b/abc.txt")).toBe(true);
    expect(await s.head("a/b/abc.txt")).toBeNull();
    expect(await s.delete("a/b/abc.txt")).toBe(false);
  });

  test("stores a web stream in chunks and streams it back byte-exact", async () => {
    const s = store();
    const data = new Uint8Array(300_000).map((_, i) => (i * 31) % 251);
    const body = new ReadableStream<Uint8Array>({
      start(c) {
        for (let i = 0; i < data.length; i += 65_536) c.enqueue(data.subarray(i, i + 65_536));
        c.close();
      },
    });
    const put = await s.put("big.bin", body);
    expect(put.sha256).toBe(createHash("sha256").update(data).digest("hex"));
    const back = Buffer.from(await new Response(await s.stream("big.bin")).arrayBuffer());
    expect(back.equals(Buffer.from(data))).toBe(true);
  });

  test("refuses to overwrite unless asked, and leaves no partial file when a limit is hit", async () => {
    const s = store();
    await s.put("x.bin", new Uint8Array([1]));
    await expect(s.put("x.bin", new Uint8Array([2]))).rejects.toMatchObject({ code: "exists" });
    await s.put("x.bin", new Uint8Array([2, 3]), { overwrite: true });
    expect([...(await s.get("x.bin"))]).toEqual([2, 3]);
    await expect(s.put("y.bin", new Uint8Array(10), { maxBytes: 5 })).rejects.toMatchObject({ code: "too_large" });
    expect(readdirSync(s.root)).toEqual(["x.bin"]);
  });

  test("missing objects are not_found", async () => {
    const s = store();
    await expect(s.get("nope")).rejects.toBeInstanceOf(StorageError);
    await expect(s.stream("nope")).rejects.toMatchObject({ code: "not_found" });
  });

  test("keys cannot escape the root", () => {
    for (const bad of ["../etc/passwd", "/abs", "a//b", "a/./b", "", "a/b c", "a\\b"]) {
      expect(() => assertValidKey(bad), bad).toThrow(StorageError);
    }
    expect(photoKey("p1", "ph1", "thumb", "webp")).toBe("projects/p1/photos/ph1/thumb.webp");
  });
});
