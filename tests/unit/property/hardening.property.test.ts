/**
 * Property-based tests of untrusted-input readers (issue 12): CIF, sample CSV import, MBTiles files and multipart
 * uploads. Each asks for 10 000 cases and is time-boxed (fast-check interruptAfterTimeLimit) so a slow shared
 * machine ends the run early instead of failing it; the number of cases actually run is printed. The property is
 * always the same: a reader either returns a well-formed result within its limits or throws its own error type with a
 * message — never another exception, never more than its limits allow.
 */
import { mkdtempSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import fc from "fast-check";
import { describe, expect, test, vi } from "vitest";
import { CIF_LIMITS, CifError, computePatternDetailed, parseCif } from "@/lib/science/crystal";
import { parseSampleCsv } from "@/lib/csv";
import { MbtilesError, inspectMbtilesFile } from "@/lib/mbtiles";
import { cellVolume } from "@/lib/science/crystal/cell";
import { limitBody } from "@/lib/api/body";
import { AppError } from "@/lib/dal/errors";

vi.mock("server-only", () => ({}));

const RUNS = 10_000;
const BOX_MS = 12_000;

/** Runs a property with 10 000 cases, stopping (not failing) at the time box; returns how many ran. */
async function boxed<T>(arb: fc.Arbitrary<T>, check: (v: T) => void | Promise<void>, seed: number): Promise<number> {
  let ran = 0;
  const prop = fc.asyncProperty(arb, async (v) => {
    ran++;
    await check(v);
  });
  await fc.assert(prop, { numRuns: RUNS, seed, interruptAfterTimeLimit: BOX_MS, markInterruptAsFailure: false });
  return ran;
}

// ---------- CIF ----------
const num = fc.oneof(fc.double({ min: -5, max: 80, noNaN: true }).map((n) => n.toFixed(4)), fc.constantFrom("?", ".", "1(2)", "90", "0.5", "1e9", "-0"));
const cifLine = fc.oneof(
  fc.constantFrom("data_x", "loop_", "_atom_site_label", "_atom_site_type_symbol", "_atom_site_fract_x", "_atom_site_fract_y", "_atom_site_fract_z", "_space_group_symop_operation_xyz", ";", "'x,y,z'", "'-x,-y,z+1/2'", "'y,x,-z'"),
  fc.tuple(fc.constantFrom("_cell_length_a", "_cell_length_b", "_cell_length_c", "_cell_angle_alpha", "_cell_angle_beta", "_cell_angle_gamma", "_symmetry_int_tables_number"), num).map(([k, v]) => `${k} ${v}`),
  fc.tuple(fc.constantFrom("Si1 Si", "O1 O", "Ca Ca2+", "Xx1 Xx", "C1"), num, num, num).map((p) => p.join(" ")),
  fc.string({ maxLength: 40 }),
);
const cifText = fc.array(cifLine, { maxLength: 60 }).map((ls) => ls.join("\n"));

describe("property: CIF reader", () => {
  test("parseCif returns a structure within the CIF limits or throws CifError; the pattern stays within its limits", async () => {
    let patterns = 0;
    const ran = await boxed(
      cifText,
      (t) => {
        let s;
        try {
          s = parseCif(t);
        } catch (e) {
          if (!(e instanceof CifError)) throw e;
          expect(e.message).toMatch(/^CIF /);
          return;
        }
        expect(s.sites.length).toBeLessThanOrEqual(CIF_LIMITS.maxSites);
        expect(s.symops.length).toBeLessThanOrEqual(CIF_LIMITS.maxSymops);
        expect(cellVolume(s.cell)).toBeLessThanOrEqual(CIF_LIMITS.maxCellVolume);
        if (patterns < 300) {
          patterns++;
          try {
            const r = computePatternDetailed(s, { wavelength: 1.540593, twoThetaMax: 60 });
            for (const l of r.lines) expect(Number.isFinite(l.intensity) && l.d > 0).toBe(true);
          } catch (e) {
            if (!(e instanceof CifError || e instanceof RangeError)) throw e;
          }
        }
      },
      1201,
    );
    console.log(`CIF property: ${ran} cases`);
    expect(ran).toBeGreaterThan(100);
  }, 60_000);
});

// ---------- CSV import ----------
const cell = fc.oneof(fc.constantFrom("hand_sample", "soil", "core", "37.1", "-6.2", "2026-03-09 10:00", "yes", "", "\"q,uoted\"", "1,5", "ST-001", "10.58052/ABC"), fc.string({ maxLength: 12 }));
const header = fc.shuffledSubarray(["sample type", "lat", "lon", "code", "igsn", "station", "collected at", "description", "depth from", "weight kg", "junk"], { minLength: 1 });
const csvText = fc.tuple(header, fc.array(fc.array(cell, { maxLength: 12 }), { maxLength: 40 }), fc.constantFrom(",", ";", "\t"), fc.constantFrom("\n", "\r\n")).map(([h, rows, d, nl]) => [h.join(d), ...rows.map((r) => r.join(d))].join(nl));

describe("property: sample CSV import", () => {
  test("parseSampleCsv never throws; every error names a line within the file; rows and errors do not share a line", async () => {
    const ran = await boxed(
      csvText,
      (t) => {
        const p = parseSampleCsv(t, { maxRows: 1000 });
        const lines = t.split(/\r?\n/).length;
        for (const e of p.errors) {
          expect(e.line).toBeGreaterThanOrEqual(0);
          expect(e.line).toBeLessThanOrEqual(lines + 1);
          expect(typeof e.message).toBe("string");
        }
        const rowLines = new Set(p.rows.map((r) => r.line));
        expect(rowLines.size).toBe(p.rows.length);
        for (const e of p.errors) if (e.line > 1) expect(rowLines.has(e.line)).toBe(false);
      },
      2202,
    );
    console.log(`CSV property: ${ran} cases`);
    expect(ran).toBeGreaterThan(100);
  }, 60_000);
});

// ---------- MBTiles ----------
const dir = mkdtempSync(join(tmpdir(), "mbtiles-prop-"));
const SQLITE_HEADER = new TextEncoder().encode("SQLite format 3\u0000");
const mbtilesBytes = fc.oneof(
  fc.uint8Array({ maxLength: 4096 }),
  fc.uint8Array({ minLength: 84, maxLength: 8192 }).map((b) => {
    const out = new Uint8Array(b);
    out.set(SQLITE_HEADER, 0);
    out[16] = 0x10; // page size 4096
    out[17] = 0x00;
    return out;
  }),
);

describe("property: MBTiles reader", () => {
  test("arbitrary bytes (also behind a valid SQLite header) are refused with MbtilesError, quickly", async () => {
    let i = 0;
    const ran = await boxed(
      mbtilesBytes,
      async (bytes) => {
        const path = join(dir, `f${i++}.mbtiles`);
        writeFileSync(path, bytes);
        const started = performance.now();
        const err = await inspectMbtilesFile(path).then(
          () => null,
          (e: unknown) => e,
        );
        expect(err).toBeInstanceOf(MbtilesError);
        expect(performance.now() - started).toBeLessThan(2000);
      },
      3303,
    );
    console.log(`MBTiles property: ${ran} cases`);
    expect(ran).toBeGreaterThan(50);
  }, 60_000);
});

// ---------- multipart ----------
const part = fc.record({ name: fc.constantFrom("file", "files", "sampleId", "x"), filename: fc.option(fc.string({ maxLength: 20 })), body: fc.uint8Array({ maxLength: 3000 }) });
const multipart = fc.record({ boundary: fc.stringMatching(/^[A-Za-z0-9'()+_,./:=?-]{1,40}$/), parts: fc.array(part, { maxLength: 5 }), garble: fc.nat(40), chunked: fc.boolean(), limit: fc.integer({ min: 100, max: 20_000 }) });

describe("property: multipart bodies through the route's byte counter", () => {
  test("form parsing either succeeds within the byte limit or fails with 400/413 — nothing else, and never past the limit", async () => {
    const enc = new TextEncoder();
    const ran = await boxed(
      multipart,
      async ({ boundary, parts, garble, chunked, limit }) => {
        const chunks: Uint8Array[] = [];
        for (const p of parts) {
          const disp = `form-data; name="${p.name}"${p.filename !== null ? `; filename="${p.filename.replace(/["\r\n]/g, "")}"` : ""}`;
          chunks.push(enc.encode(`--${boundary}\r\nContent-Disposition: ${disp}\r\n\r\n`), p.body, enc.encode("\r\n"));
        }
        chunks.push(enc.encode(`--${boundary}--\r\n`));
        let body = new Uint8Array(chunks.reduce((a, c) => a + c.byteLength, 0));
        let o = 0;
        for (const c of chunks) body.set(c, (o += c.byteLength) - c.byteLength);
        if (garble) body = body.slice(0, Math.max(0, body.byteLength - garble));
        const headers: Record<string, string> = { "content-type": `multipart/form-data; boundary=${boundary}` };
        if (!chunked) headers["content-length"] = String(body.byteLength);
        const stream = new ReadableStream<Uint8Array>({ start: (c) => (c.enqueue(body), c.close()) });
        const req = new Request("http://localhost/x", { method: "POST", headers, body: stream, duplex: "half" } as RequestInit);
        let limited: Request;
        try {
          limited = limitBody(req, { kind: "multipart", maxBytes: limit });
        } catch (e) {
          expect(e).toBeInstanceOf(AppError);
          expect((e as AppError).status).toBe(413);
          expect(body.byteLength).toBeGreaterThan(limit);
          return;
        }
        try {
          await limited.formData();
          expect(body.byteLength).toBeLessThanOrEqual(limit);
        } catch (e) {
          const cause = (e as { cause?: unknown }).cause;
          if (cause instanceof AppError || e instanceof AppError) {
            expect(((cause ?? e) as AppError).status).toBe(413);
            expect(body.byteLength).toBeGreaterThan(limit);
          } else {
            expect(e).toBeInstanceOf(TypeError); // undici's "could not parse content as FormData" → the route's 400
          }
        }
      },
      4404,
    );
    console.log(`multipart property: ${ran} cases`);
    expect(ran).toBeGreaterThan(100);
  }, 60_000);
});
