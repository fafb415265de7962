/**
 * Bridges libraries that write to a Node stream (exceljs, pdfkit) to the async-iterable chunks the export
 * response streams: the producer writes into a PassThrough and waits for it to drain between pages, so a
 * slow download holds the producer back instead of piling bytes up in memory.
 */
import { once } from "node:events";
import { PassThrough } from "node:stream";

/** High-water mark of the bridge, bytes. */
const HIGH_WATER = 1 << 20;

/** Waits until the stream has room again (backpressure). */
export async function drained(out: PassThrough): Promise<void> {
  if (out.writableLength > HIGH_WATER || out.writableNeedDrain) await Promise.race([once(out, "drain"), once(out, "close")]);
}

/**
 * Runs `produce(out)` and yields what it writes. The producer must end `out` (or let the library end it);
 * an error in the producer ends the iteration with that error.
 */
export async function* fromNodeStream(produce: (out: PassThrough) => Promise<void>): AsyncGenerator<Uint8Array> {
  const out = new PassThrough({ highWaterMark: HIGH_WATER });
  let failure: unknown = null;
  produce(out).catch((err) => {
    failure = err;
    out.destroy(err instanceof Error ? err : new Error(String(err)));
  });
  try {
    for await (const chunk of out) yield chunk as Uint8Array;
  } catch (err) {
    throw failure ?? err;
  } finally {
    if (!out.destroyed) out.destroy();
  }
  if (failure) throw failure;
}
