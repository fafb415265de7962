import fc from "fast-check";
import { describe, expect, test } from "vitest";
import type { Scan } from "@/lib/science/types";
import { parseScan, ScanParseError, writeCsv, writePdCif, writeXy } from "@/lib/science/scan";

/** The invariants every successful parse must satisfy (parseScan's contract). */
function checkInvariants(s: Scan): void {
  const n = s.twoTheta.length;
  expect(s.twoTheta).toBeInstanceOf(Float64Array);
  expect(s.counts).toBeInstanceOf(Float64Array);
  expect(s.counts.length).toBe(n);
  expect(n).toBeGreaterThanOrEqual(50);
  if (s.esd) expect(s.esd.length).toBe(n);
  for (let i = 0; i < n; i++) {
    const x = s.twoTheta[i];
    if (!(Number.isFinite(x) && x > 0 && x < 180)) throw new Error(`2θ[${i}] = ${x}`);
    if (i > 0 && !(x > s.twoTheta[i - 1])) throw new Error(`2θ not increasing at ${i}`);
    const y = s.counts[i];
    if (!(Number.isFinite(y) && y >= 0)) throw new Error(`counts[${i}] = ${y}`);
    if (s.esd && !(Number.isFinite(s.esd[i]) && s.esd[i] >= 0)) throw new Error(`esd[${i}] = ${s.esd[i]}`);
  }
  expect(["xy", "csv", "pdcif"]).toContain(s.meta.format);
}

/** parseScan either returns a valid scan or throws a ScanParseError — nothing else. */
function parseOrScanError(text: string): void {
  let scan: Scan | undefined;
  try {
    scan = parseScan(text);
  } catch (e) {
    if (!(e instanceof ScanParseError)) throw e;
    expect(typeof e.code).toBe("string");
    expect(e.message.length).toBeGreaterThan(0);
    if (e.line !== undefined) expect(Number.isInteger(e.line) && e.line >= 1).toBe(true);
    return;
  }
  checkInvariants(scan);
}

/** Arbitrary valid scan: strictly increasing 2θ in (0, 180), counts ≥ 0, optional esd. */
const scanArb = fc
  .record({
    n: fc.integer({ min: 50, max: 300 }),
    start: fc.double({ min: 0.5, max: 60, noNaN: true }),
    step: fc.double({ min: 0.001, max: 0.3, noNaN: true }),
    seed: fc.integer(),
    withEsd: fc.boolean(),
    integers: fc.boolean(),
  })
  .map(({ n, start, step, seed, withEsd, integers }) => {
    let a = seed >>> 0;
    const rand = () => {
      a = (Math.imul(a ^ (a >>> 15), 2246822507) + 0x9e3779b9) >>> 0;
      return a / 4294967296;
    };
    const x = new Float64Array(n);
    const y = new Float64Array(n);
    const e = new Float64Array(n);
    for (let i = 0; i < n; i++) {
      x[i] = start + i * step;
      y[i] = integers ? Math.floor(rand() * 1e5) : rand() * 1e4;
      e[i] = Math.sqrt(y[i]);
    }
    const scan: Scan = { twoTheta: x, counts: y, meta: { format: "xy", settings: {}, wavelength: 1.540598, anode: "Cu" } };
    if (withEsd) scan.esd = e;
    return scan;
  })
  .filter((s) => s.twoTheta[s.twoTheta.length - 1] < 180);

const writers = [
  (s: Scan) => writeXy(s),
  (s: Scan) => writeXy(s, { header: false }),
  (s: Scan) => writeCsv(s),
  (s: Scan) => writeCsv(s, { separator: ";" }),
  (s: Scan) => writePdCif(s),
];

// Mutations a damaged or hand-edited file might have.
const mutation = fc.oneof(
  fc.record({ kind: fc.constant("insert" as const), at: fc.nat(), text: fc.constantFrom(",", ";", "\t", " ", "\n", "-", ".", "e", "x", "NaN", "1e999", "#", "'", '"', "_pd_", "data_", "loop_", "\r", "\u0000", "٣") }),
  fc.record({ kind: fc.constant("delete" as const), at: fc.nat(), len: fc.integer({ min: 1, max: 20 }) }),
  fc.record({ kind: fc.constant("swapLines" as const), a: fc.nat(), b: fc.nat() }),
  fc.record({ kind: fc.constant("dupLine" as const), a: fc.nat() }),
  fc.record({ kind: fc.constant("truncate" as const), at: fc.nat() }),
);
type Mutation = typeof mutation extends fc.Arbitrary<infer T> ? T : never;

function mutate(text: string, m: Mutation): string {
  switch (m.kind) {
    case "insert": {
      const i = m.at % (text.length + 1);
      return text.slice(0, i) + m.text + text.slice(i);
    }
    case "delete": {
      const i = m.at % (text.length + 1);
      return text.slice(0, i) + text.slice(i + m.len);
    }
    case "truncate":
      return text.slice(0, m.at % (text.length + 1));
    case "swapLines":
    case "dupLine": {
      const lines = text.split("\n");
      const a = m.a % lines.length;
      if (m.kind === "dupLine") lines.splice(a, 0, lines[a]);
      else {
        const b = m.b % lines.length;
        [lines[a], lines[b]] = [lines[b], lines[a]];
      }
      return lines.join("\n");
    }
  }
}

describe("property: parseScan throws only ScanParseError and every success satisfies the invariants", () => {
  test("random text (any UTF-16)", () => {
    fc.assert(fc.property(fc.string({ unit: "binary", maxLength: 3000 }), (t) => parseOrScanError(t)), { numRuns: 400, seed: 42 });
  });
  test("random lines of numbers and separators", () => {
    const cell = fc.oneof(fc.double({ noNaN: false }).map(String), fc.integer().map(String), fc.constantFrom("", "x", "1,5", "-0", "Infinity", "?"));
    const line = fc.tuple(cell, fc.constantFrom(" ", "\t", ",", ";", "  "), cell, fc.option(cell)).map(([a, s, b, c]) => (c === null ? `${a}${s}${b}` : `${a}${s}${b}${s}${c}`));
    fc.assert(fc.property(fc.array(line, { minLength: 0, maxLength: 150 }), (ls) => parseOrScanError(ls.join("\n"))), { numRuns: 300, seed: 7 });
  });
  test("valid files in every format, then mutated", () => {
    fc.assert(
      fc.property(scanArb, fc.integer({ min: 0, max: writers.length - 1 }), fc.array(mutation, { minLength: 1, maxLength: 4 }), (scan, w, ms) => {
        let text = writers[w](scan);
        for (const m of ms) text = mutate(text, m);
        parseOrScanError(text);
      }),
      { numRuns: 500, seed: 2024 },
    );
  });
  test("random pdCIF-like token soup", () => {
    const tok = fc.constantFrom("data_x", "loop_", "_pd_meas_2theta_scan", "_pd_meas_counts_total", "_pd_meas_intensity_total", "_pd_meas_2theta_range_min", "_pd_meas_2theta_range_inc", "_pd_meas_2theta_range_max", "1", "2.5", "10(2)", "?", ".", "'a b'", "\n;\ntext\n;\n", "#c\n", "-1", "1e3", "0.02");
    fc.assert(fc.property(fc.array(tok, { maxLength: 400 }), (ts) => parseOrScanError(ts.join(" "))), { numRuns: 300, seed: 11 });
  });
});

describe("property: round trip write → parse returns the scan", () => {
  test.each([
    ["XY", 0],
    ["XY without header", 1],
    ["CSV ,", 2],
    ["CSV ; (decimal comma)", 3],
    ["pdCIF", 4],
  ])("%s", (_name, w) => {
    fc.assert(
      fc.property(scanArb, (scan) => {
        const back = parseScan(writers[w as number](scan));
        expect(Array.from(back.twoTheta)).toEqual(Array.from(scan.twoTheta));
        expect(Array.from(back.counts)).toEqual(Array.from(scan.counts));
        if (scan.esd) expect(Array.from(back.esd ?? [])).toEqual(Array.from(scan.esd));
        else expect(back.esd).toBeUndefined();
        if (w !== 1) {
          expect(back.meta.wavelength).toBe(1.540598);
          expect(back.meta.anode).toBe("Cu");
        }
      }),
      { numRuns: 60, seed: 99 },
    );
  });
});

describe("property: each parser, forced by the format option, throws only ScanParseError", () => {
  test.each(["xy", "csv", "pdcif"] as const)("%s", (format) => {
    fc.assert(
      fc.property(scanArb, fc.integer({ min: 0, max: writers.length - 1 }), fc.array(mutation, { maxLength: 3 }), (scan, w, ms) => {
        let text = writers[w](scan);
        for (const m of ms) text = mutate(text, m);
        try {
          checkInvariants(parseScan(text, { format }));
        } catch (e) {
          if (!(e instanceof ScanParseError)) throw e;
        }
      }),
      { numRuns: 200, seed: 5 },
    );
  });
});
