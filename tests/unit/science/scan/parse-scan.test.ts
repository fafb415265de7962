import { execFileSync } from "node:child_process";
import { existsSync } from "node:fs";
import { fileURLToPath } from "node:url";
import { describe, expect, test } from "vitest";
import { detectFormat, parseScan, ScanParseError, type ScanParseErrorCode } from "@/lib/science/scan";
import { fixture, xyText } from "./fixtures";

function expectError(text: string, code: ScanParseErrorCode, where: { line?: number; column?: number; field?: string } = {}) {
  let caught: unknown;
  try {
    parseScan(text);
  } catch (e) {
    caught = e;
  }
  expect(caught).toBeInstanceOf(ScanParseError);
  const err = caught as ScanParseError;
  expect(err.code).toBe(code);
  if (where.line !== undefined) expect(err.line).toBe(where.line);
  if (where.column !== undefined) expect(err.column).toBe(where.column);
  if (where.field !== undefined) expect(err.field).toBe(where.field);
  if (where.line !== undefined) expect(err.message).toContain(`line ${where.line}`);
  return err;
}

// The fixtures are synthetic (tests/fixtures/scans/generate.py): 500 points 20.00–29.98° by 0.02°. The first
// and last points are read from the text files by eye: 20.00 → 118 counts, second 20.02 → 127.
describe("format detection from content", () => {
  test.each([
    ["synthetic-cu.xy", "xy"],
    ["synthetic-cu.xye", "xy"],
    ["synthetic-header.csv", "csv"],
    ["synthetic-noheader.csv", "csv"],
    ["synthetic-semicolon.csv", "csv"],
    ["synthetic-loop.cif", "pdcif"],
    ["synthetic-range.cif", "pdcif"],
  ])("%s → %s", (name, format) => {
    expect(detectFormat(fixture(name)).format).toBe(format);
    expect(parseScan(fixture(name)).meta.format).toBe(format);
  });
});

describe("reading the synthetic fixtures", () => {
  const names = [
    "synthetic-cu.xy",
    "synthetic-cu.xye",
    "synthetic-header.csv",
    "synthetic-noheader.csv",
    "synthetic-semicolon.csv",
    "synthetic-loop.cif",
    "synthetic-range.cif",
  ];
  test.each(names)("%s: 500 points, same data in every format", (name) => {
    const s = parseScan(fixture(name));
    expect(s.twoTheta.length).toBe(500);
    expect(s.counts.length).toBe(500);
    expect(s.twoTheta[0]).toBeCloseTo(20, 10);
    expect(s.twoTheta[499]).toBeCloseTo(29.98, 8);
    expect(s.counts[0]).toBe(118);
    expect(s.counts[1]).toBe(127);
  });
  test("XY header comments: anode, wavelength, kV, mA, step, time, instrument (!), sample (;)", () => {
    const s = parseScan(fixture("synthetic-cu.xy"));
    expect(s.meta.anode).toBe("Cu");
    expect(s.meta.wavelength).toBe(1.540598);
    expect(s.meta.settings).toMatchObject({ kV: 40, mA: 40, step: 0.02, timePerStep: 1 });
    expect(s.meta.instrument).toBe("Demo diffractometer A");
    expect(s.meta.sampleId).toBe("DEMO-000123");
    expect(s.esd).toBeUndefined();
  });
  test("XYE: third column is esd; 'lambda = ' header", () => {
    const s = parseScan(fixture("synthetic-cu.xye"));
    expect(s.esd?.length).toBe(500);
    expect(s.esd?.[0]).toBeCloseTo(Math.sqrt(118), 3);
    expect(s.meta.wavelength).toBe(1.5406);
  });
  test("CSV header row with quoted names; 'target' comment gives the anode", () => {
    const s = parseScan(fixture("synthetic-header.csv"));
    expect(s.meta.anode).toBe("Co");
  });
  test("semicolon CSV with decimal commas", () => {
    const s = parseScan(fixture("synthetic-semicolon.csv"));
    expect(s.twoTheta[1]).toBeCloseTo(20.02, 10);
  });
  test("pdCIF loop: wavelength, target, instrument, sample, kV/mA and su → esd", () => {
    const s = parseScan(fixture("synthetic-loop.cif"));
    expect(s.meta).toMatchObject({ wavelength: 1.540598, anode: "Cu", instrument: "Demo diffractometer A", sampleId: "DEMO-000123" });
    expect(s.meta.settings).toMatchObject({ kV: 40, mA: 40 });
    expect(s.esd?.[0]).toBe(11);
  });
  test("pdCIF range form: 2θ from _pd_meas_2theta_range_min/max/inc; anode from _diffrn_radiation_type", () => {
    const s = parseScan(fixture("synthetic-range.cif"));
    expect(s.twoTheta[250]).toBeCloseTo(25, 8);
    expect(s.meta.anode).toBe("Cu");
  });
});

// Independent library: gemmi (Debian python3-gemmi) reads the same pdCIF; its loop must equal ours.
const PY = "/usr/bin/python3";
const hasGemmi = existsSync(PY) && (() => {
  try {
    execFileSync(PY, ["-c", "import gemmi"], { stdio: "ignore" });
    return true;
  } catch {
    return false;
  }
})();
describe.skipIf(!hasGemmi)("pdCIF cross-check with gemmi", () => {
  test("synthetic-loop.cif: 2θ and counts equal gemmi's reading of the loop", () => {
    const file = fileURLToPath(new URL("../../../fixtures/scans/synthetic-loop.cif", import.meta.url));
    const script = [
      "import gemmi, json, sys",
      "b = gemmi.cif.read_file(sys.argv[1]).sole_block()",
      "x = [gemmi.cif.as_number(v) for v in b.find_loop('_pd_meas_2theta_scan')]",
      "y = [gemmi.cif.as_number(v) for v in b.find_loop('_pd_meas_counts_total')]",
      "print(json.dumps({'x': x, 'y': y, 'wl': gemmi.cif.as_number(b.find_value('_diffrn_radiation_wavelength'))}))",
    ].join("\n");
    const ref = JSON.parse(execFileSync(PY, ["-c", script, file], { encoding: "utf8" })) as { x: number[]; y: number[]; wl: number };
    const s = parseScan(fixture("synthetic-loop.cif"));
    expect(Array.from(s.twoTheta)).toEqual(ref.x);
    expect(Array.from(s.counts)).toEqual(ref.y);
    expect(s.meta.wavelength).toBe(ref.wl);
  });
});

describe("more pdCIF forms", () => {
  const rows = (n: number) => Array.from({ length: n }, (_, i) => `${(5 + i * 0.05).toFixed(2)} ${200 + i}`).join("\n");
  test("_pd_meas_angle_2theta + _pd_meas_intensity_total, DDLm dotted tags, text field and comments", () => {
    const text = `data_a\n# comment\n_pd_block_id 'DEMO|scan|x'\n_diffrn_radiation.wavelength 1.78900\n_publ_section_title\n;\nA text field\n_with a line that looks like a tag\n;\nloop_\n_pd_meas.angle_2theta\n_pd_meas.intensity_total\n${rows(60)}\n`;
    const s = parseScan(text);
    expect(s.twoTheta.length).toBe(60);
    expect(s.meta.wavelength).toBe(1.789);
    expect(s.meta.anode).toBeUndefined();
  });
  test("_pd_proc_2theta_corrected + _pd_proc_intensity_total, wavelength loop gives λ1 and λ2", () => {
    const text = `data_b\nloop_\n_diffrn_radiation_wavelength\n_diffrn_radiation_wavelength_wt\n1.540598 1.0\n1.544426 0.5\nloop_\n_pd_proc_2theta_corrected\n_pd_proc_intensity_total\n${rows(60)}\n`;
    const s = parseScan(text);
    expect(s.meta.wavelength).toBe(1.540598);
    expect(s.meta.wavelength2).toBe(1.544426);
  });
  test("range with the wrong number of points is rejected", () => {
    const text = `data_c\n_pd_meas_2theta_range_min 5\n_pd_meas_2theta_range_max 10\n_pd_meas_2theta_range_inc 0.05\nloop_\n_pd_meas_counts_total\n${Array.from({ length: 60 }, () => "5").join("\n")}\n`;
    expectError(text, "CIF_INCONSISTENT");
  });
  test("a loop whose value count is not a multiple of its tags", () => {
    expectError(`data_d\nloop_\n_pd_meas_2theta_scan\n_pd_meas_counts_total\n${rows(60)}\n7.0\n`, "CIF_INCONSISTENT");
  });
  test("non-numeric count in a CIF loop names the line and tag", () => {
    const lines = rows(60).split("\n");
    lines[10] = "5.50 abc";
    expectError(`data_e\nloop_\n_pd_meas_2theta_scan\n_pd_meas_counts_total\n${lines.join("\n")}\n`, "NOT_NUMERIC", {
      line: 15,
      field: "_pd_meas_counts_total",
    });
  });
  test("CIF without powder data", () => {
    expectError("data_f\n_cell_length_a 4.913\nloop_\n_atom_site_label\nSi1\n", "CIF_NO_DATA");
  });
  test("unterminated text field", () => {
    expectError("data_g\n_pd_x\n;\nnever closed\n", "CIF_SYNTAX", { line: 3 });
  });
});

describe("errors: clear code, line and column", () => {
  test("empty or blank file", () => {
    expectError("", "EMPTY");
    expectError("  \n\n \t\n", "EMPTY");
  });
  test("only comments → no data points", () => {
    expectError("# wavelength: 1.54\n# nothing else\n", "EMPTY");
  });
  test("non-numeric cell names line and column", () => {
    const lines = xyText(60).split("\n");
    lines[6] = "10.12 12x3";
    const err = expectError(lines.join("\n"), "NOT_NUMERIC", { line: 7, column: 2, field: "counts" });
    expect(err.message).toContain("12x3");
  });
  test("fewer than 50 points", () => {
    const err = expectError(xyText(49), "TOO_FEW_POINTS");
    expect(err.message).toContain("49");
    expect(parseScan(xyText(50)).twoTheta.length).toBe(50);
  });
  test("decreasing 2θ names the line", () => {
    const lines = xyText(60).split("\n");
    lines[20] = "10.10 5";
    expectError(lines.join("\n"), "NOT_INCREASING", { line: 21, field: "twoTheta" });
  });
  test("duplicated 2θ names the line", () => {
    const lines = xyText(60).split("\n");
    lines[20] = `${(10 + 19 * 0.02).toFixed(2)} 5`;
    const err = expectError(lines.join("\n"), "DUPLICATE_TWO_THETA", { line: 21 });
    expect(err.message).toContain("line 20");
  });
  test.each([
    ["0", 1],
    ["-1.5", 1],
    ["180", 60],
    ["200.5", 60],
  ])("2θ %s outside (0, 180)", (value, line) => {
    const lines = xyText(60).split("\n");
    lines[line - 1] = `${value} 100`;
    expectError(lines.join("\n"), "TWO_THETA_OUT_OF_RANGE", { line });
  });
  test("negative counts", () => {
    const lines = xyText(60).split("\n");
    lines[4] = "10.08 -3";
    expectError(lines.join("\n"), "NEGATIVE_COUNTS", { line: 5, field: "counts" });
  });
  test.each(["NaN", "Infinity", "-inf", "1e999"])("non-finite value %s", (v) => {
    const lines = xyText(60).split("\n");
    lines[4] = `10.08 ${v}`;
    expectError(lines.join("\n"), "NOT_FINITE", { line: 5, column: 2 });
  });
  test("mixed separators: comma line inside a whitespace file", () => {
    const lines = xyText(60).split("\n");
    lines[30] = "10.60,130";
    expectError(lines.join("\n"), "MIXED_SEPARATORS", { line: 31 });
  });
  test("mixed separators: semicolon line inside a comma CSV", () => {
    const lines = xyText(60, { sep: "," }).split("\n");
    lines[30] = "10.60;130";
    expectError(lines.join("\n"), "MIXED_SEPARATORS", { line: 31 });
  });
  test("mixed separators: tab inside a comma CSV", () => {
    const lines = xyText(60, { sep: "," }).split("\n");
    lines[30] = "10.60\t130";
    expectError(lines.join("\n"), "MIXED_SEPARATORS", { line: 31 });
  });
  test("too many columns", () => {
    const lines = xyText(60).split("\n");
    lines[0] = "10.00 100 10 3";
    expectError(lines.join("\n"), "TOO_MANY_COLUMNS", { line: 1 });
    expectError(xyText(60, { sep: "," }).replace("10.00,100", "10.00,100,1,2"), "TOO_MANY_COLUMNS", { line: 1 });
  });
  test("inconsistent column count", () => {
    const lines = xyText(60).split("\n");
    lines[10] = "10.20 110 3";
    expectError(lines.join("\n"), "TOO_MANY_COLUMNS", { line: 11 });
  });
  test("size limits: maxBytes and maxPoints", () => {
    expect(() => parseScan(xyText(100), { maxBytes: 100 })).toThrow(ScanParseError);
    try {
      parseScan(xyText(100), { maxPoints: 80 });
    } catch (e) {
      expect((e as ScanParseError).code).toBe("TOO_MANY_POINTS");
      expect((e as ScanParseError).line).toBe(81);
    }
    expect.assertions(3);
  });
  test("binary content", () => {
    expectError("\u0000\u0001PK\u0003", "UNKNOWN_FORMAT");
  });
});

describe("tolerated variations", () => {
  test("CRLF and CR line breaks, BOM, blank lines, tabs and spaces mixed", () => {
    const base = xyText(60);
    expect(parseScan(base.replace(/\n/g, "\r\n")).twoTheta.length).toBe(60);
    expect(parseScan("\ufeff" + base.replace(/\n/g, "\r")).twoTheta.length).toBe(60);
    expect(parseScan(base.replace(/ /g, " \t ").replace(/\n/g, "\n\n")).twoTheta.length).toBe(60);
  });
  test("uncommented text header line before the data", () => {
    const s = parseScan("2Theta Intensity\nWavelength=1.5406\n" + xyText(60));
    expect(s.meta.wavelength).toBe(1.5406);
  });
  test("scientific notation and signs", () => {
    const lines = xyText(60).split("\n");
    lines[0] = "1.0E+1 1.5e2";
    const s = parseScan(lines.join("\n"));
    expect(s.twoTheta[0]).toBe(10);
    expect(s.counts[0]).toBe(150);
  });
  test("header value in nm is converted to Å", () => {
    expect(parseScan("# wavelength: 0.15406 nm\n" + xyText(60)).meta.wavelength).toBeCloseTo(1.5406, 10);
  });
  test("CSV header with an extra named column picks 2θ and counts by name", () => {
    const rows = Array.from({ length: 60 }, (_, i) => `${i},${(10 + i * 0.02).toFixed(2)},${100 + i}`);
    const s = parseScan("index,2theta,counts\n" + rows.join("\n"));
    expect(s.twoTheta[0]).toBe(10);
    expect(s.counts[0]).toBe(100);
  });
});

describe("large files", () => {
  // Timing is reported by `npm run bench:xrd`, not asserted here (a shared CI machine makes timed tests flaky).
  test("1,000,000 points (~15 MB) parse completely and in order", () => {
    const parts = new Array<string>(1_000_000);
    for (let i = 0; i < parts.length; i++) parts[i] = `${(0.001 + i * 0.00015).toFixed(6)} ${i % 1000}`;
    const s = parseScan(parts.join("\n"));
    expect(s.twoTheta.length).toBe(1_000_000);
    expect(s.twoTheta[999_999]).toBeCloseTo(0.001 + 999_999 * 0.00015, 6);
    expect(s.counts[1234]).toBe(234);
  }, 60_000);
});
