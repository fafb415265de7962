/**
 * Scan files as labs export them: column names in any case and with units, unknown names read by position with a
 * warning, counts per second, per-point counting times and d instead of 2θ. The data rows are generated here
 * (invented values); the checks are against Bragg's law computed in the test and against handbook values named
 * beside each check.
 */
import { describe, expect, test } from "vitest";
import { classifyColumnName, parseScan, ScanParseError, type ScanParseErrorCode } from "@/lib/science/scan";

const DEG = Math.PI / 180;
const N = 60;

/** Rows of 2θ = 10.00 + 0.02·i and counts = 100 + i, joined by `sep` (decimal comma with ";"). */
function rows(sep: string, { extra }: { extra?: (i: number) => string[] } = {}): string[] {
  const out: string[] = [];
  for (let i = 0; i < N; i++) {
    const cells = [(10 + i * 0.02).toFixed(2), String(100 + i), ...(extra ? extra(i) : [])];
    out.push(cells.map((c) => (sep === ";" ? c.replace(".", ",") : c)).join(sep));
  }
  return out;
}

function expectError(text: string, code: ScanParseErrorCode, where: { line?: number; column?: number } = {}, options = {}): ScanParseError {
  let caught: unknown;
  try {
    parseScan(text, options);
  } catch (e) {
    caught = e;
  }
  expect(caught).toBeInstanceOf(ScanParseError);
  const err = caught as ScanParseError;
  expect(err.code).toBe(code);
  if (where.line !== undefined) {
    expect(err.line).toBe(where.line);
    expect(err.message).toContain(`line ${where.line}`);
  }
  if (where.column !== undefined) expect(err.column).toBe(where.column);
  return err;
}

describe("2θ column names as instruments and spreadsheets write them (common practice)", () => {
  const names = ["2theta", "2Theta", "2-theta", "2-Theta", "two_theta", "Two Theta", "2θ", "2 θ", "°2θ", "2θ (°)", "angle", "Angle", "pos", "Pos. [°2Th.]", "2Theta (deg)", "2THETA[deg]", "2theta/deg", "TwoTheta"];
  test.each(names)('CSV "%s,counts"', (name) => {
    const s = parseScan(`${name},counts\n${rows(",").join("\n")}\n`);
    expect(s.twoTheta[0]).toBe(10);
    expect(s.counts[N - 1]).toBe(100 + N - 1);
    expect(s.meta.warnings).toBeUndefined();
  });
  test.each(names)('semicolon CSV with decimal commas "%s;Intensity"', (name) => {
    const s = parseScan(`${name};Intensity\n${rows(";").join("\n")}\n`);
    expect(s.twoTheta[1]).toBeCloseTo(10.02, 12);
    expect(s.meta.warnings).toBeUndefined();
  });
  test('quoted header cells "\\"2Theta (deg)\\",\\"Counts\\""', () => {
    const s = parseScan(`"2Theta (deg)","Counts"\n${rows(",").join("\n")}\n`);
    expect(s.twoTheta[0]).toBe(10);
    expect(s.meta.warnings).toBeUndefined();
  });
});

describe("intensity and uncertainty column names", () => {
  test.each(["intensity", "Intensity", "INTENSITY", "counts", "Counts", "count", "cts", "I", "i", "y_obs", "yobs", "Iobs", "I(obs)", "Intensity (counts)", "Intensity [a.u.]"])('"2theta,%s" reads counts', (name) => {
    const s = parseScan(`2theta,${name}\n${rows(",").join("\n")}\n`);
    expect(s.counts[0]).toBe(100);
    expect(s.meta.intensityUnit === undefined || s.meta.intensityUnit === "counts").toBe(true);
    expect(s.meta.warnings).toBeUndefined();
  });
  test.each(["esd", "ESD", "sigma", "σ", "sigma(I)", "error", "err", "s.u.", "uncertainty", "e"])('"2theta,counts,%s": third column is the esd', (name) => {
    const s = parseScan(`2theta,counts,${name}\n${rows(",", { extra: (i) => [String(Math.sqrt(100 + i))] }).join("\n")}\n`);
    expect(s.esd?.[0]).toBe(10);
  });
  test("columns in another order are taken by name: counts, esd, 2θ", () => {
    const lines = rows(",").map((r, i) => {
      const [x, y] = r.split(",");
      return `${y},${Math.sqrt(100 + i)},${x}`;
    });
    const s = parseScan(`Intensity,sigma,2Theta\n${lines.join("\n")}\n`);
    expect(s.twoTheta[0]).toBe(10);
    expect(s.counts[0]).toBe(100);
    expect(s.esd?.[0]).toBe(10);
  });
  test("classifyColumnName reads the unit: cps in the name or its brackets", () => {
    expect(classifyColumnName("cps")).toMatchObject({ role: "intensity", unit: "cps" });
    expect(classifyColumnName("Intensity [cps]")).toMatchObject({ role: "intensity", unit: "cps" });
    expect(classifyColumnName("Intensity/cps")).toMatchObject({ role: "intensity", unit: "cps" });
    expect(classifyColumnName("counts/s")).toMatchObject({ role: "intensity", unit: "cps" });
    expect(classifyColumnName("Intensity (counts)")).toMatchObject({ role: "intensity", unit: "counts" });
    expect(classifyColumnName("d (Å)")).toMatchObject({ role: "d", unit: "A" });
    expect(classifyColumnName("d-spacing [nm]")).toMatchObject({ role: "d", unit: "nm" });
    expect(classifyColumnName("time (s)")).toMatchObject({ role: "time" });
    expect(classifyColumnName("theta")).toBeNull(); // θ or 2θ? not guessed from the name
    expect(classifyColumnName("sample 7")).toBeNull();
  });
});

describe("unrecognised header over two or three numeric columns: read by position, with a warning", () => {
  test("CSV 'foo,bar': 2θ and intensity by position; the warning names the line and the columns", () => {
    const s = parseScan(`# a scan\nfoo,bar\n${rows(",").join("\n")}\n`);
    expect(s.twoTheta[0]).toBe(10);
    expect(s.counts[0]).toBe(100);
    expect(s.meta.warnings).toHaveLength(1);
    expect(s.meta.warnings?.[0]).toMatch(/line 2/);
    expect(s.meta.warnings?.[0]).toMatch(/"foo" as 2θ, "bar" as intensity/);
  });
  test("semicolon CSV with three unknown names: the third is the esd", () => {
    const s = parseScan(`theta;reading;spread\n${rows(";", { extra: (i) => [String(Math.sqrt(100 + i)).replace(".", ",")] }).join("\n")}\n`);
    expect(s.esd?.[0]).toBe(10);
    expect(s.meta.warnings?.[0]).toMatch(/"theta" as 2θ, "reading" as intensity, "spread" as esd/);
  });
  test("only one name unknown: that column alone is guessed", () => {
    const s = parseScan(`2theta,reading\n${rows(",").join("\n")}\n`);
    expect(s.counts[0]).toBe(100);
    expect(s.meta.warnings?.[0]).toMatch(/"reading" as intensity/);
    expect(s.meta.warnings?.[0]).not.toMatch(/as 2θ/);
  });
  test("XY with a header line of as many unknown names as data columns", () => {
    const s = parseScan(`x-axis y-axis\n${rows(" ").join("\n")}\n`);
    expect(s.twoTheta[0]).toBe(10);
    expect(s.meta.warnings?.[0]).toMatch(/line 1/);
  });
  test("XY title line (word count differs from the data) stays a title, no warning", () => {
    const s = parseScan(`Quartz standard run of the day\n${rows(" ").join("\n")}\n`);
    expect(s.twoTheta[0]).toBe(10);
    expect(s.meta.warnings).toBeUndefined();
  });
  test("four unknown names cannot be read by position: error on the header line", () => {
    const err = expectError(`a,b,c,d\n${rows(",", { extra: () => ["1", "2"] }).join("\n")}\n`, "TOO_FEW_COLUMNS", { line: 1 });
    expect(err.message).toMatch(/"a", "b", "c", "d"/);
  });
  test("a bad row after a recognised header still fails on its own line and column", () => {
    const lines = rows(",");
    lines[5] = "10.10,12x";
    expectError(`two_theta,counts\n${lines.join("\n")}\n`, "NOT_NUMERIC", { line: 7, column: 2 });
  });
  test("extra named columns (calculated, background) next to named 2θ and intensity are ignored", () => {
    const s = parseScan(`2theta,y_obs,y_calc,background\n${rows(",", { extra: () => ["1", "2"] }).join("\n")}\n`);
    expect(s.counts[0]).toBe(100);
    expect(s.esd).toBeUndefined();
  });
});

describe("XY headers and comment headers of instrument exports", () => {
  test('"# Columns: 2Theta(deg)  Intensity(counts)" and several key: value pairs on one line', () => {
    const head = [
      "# Powder diffraction scan export",
      "# Anode: Cu   K-Alpha1: 1.540562 A   K-Alpha2: 1.544390 A",
      "# Columns: 2Theta(deg)  Intensity(counts)",
    ];
    const s = parseScan(`${head.join("\n")}\n${rows(" ").join("\n")}\n`);
    expect(s.meta.anode).toBe("Cu");
    expect(s.meta.wavelength).toBe(1.540562);
    expect(s.meta.wavelength2).toBe(1.54439);
    expect(s.meta.intensityUnit).toBe("counts");
    expect(s.counts[0]).toBe(100);
  });
  test('uncommented XY header "2 Theta  Intensity (cps)" with a tab-separated body', () => {
    const s = parseScan(`# time per step: 2 s\n2 Theta  Intensity (cps)\n${rows("\t").join("\n")}\n`);
    expect(s.counts[0]).toBe(200);
  });
});

describe("scans written from high to low angle", () => {
  test("a file whose 2θ decreases throughout is put in increasing order, with a warning", () => {
    const s = parseScan(`${[...rows(" ")].reverse().join("\n")}\n`);
    expect(s.twoTheta[0]).toBe(10);
    expect(s.counts[0]).toBe(100);
    expect(s.meta.warnings?.[0]).toMatch(/high to low angle/);
  });
  test("one point out of order is still an error on its line", () => {
    const lines = [...rows(" ")].reverse();
    [lines[10], lines[11]] = [lines[11], lines[10]];
    expectError(`${lines.join("\n")}\n`, "NOT_INCREASING", { line: 12 });
  });
});

describe("counts per second", () => {
  test("header cps and '# Time per step (s): 2' → counts = cps × 2 s (N = rate·t, counting statistics: common practice)", () => {
    const s = parseScan(`# Time per step (s): 2\n2theta,cps\n${rows(",").join("\n")}\n`);
    expect(s.counts[0]).toBe(200);
    expect(s.counts[N - 1]).toBe(2 * (100 + N - 1));
    expect(s.meta.intensityUnit).toBe("counts");
    expect(s.meta.warnings?.join(" ")).toMatch(/counts per second multiplied by the counting time \(2 s/);
  });
  test("the counting time may come from the caller (upload form) when the file has none", () => {
    const s = parseScan(`2theta;Intensity [counts/s]\n${rows(";").join("\n")}\n`, { countingTimeS: 0.5 });
    expect(s.counts[0]).toBe(50);
    expect(s.meta.intensityUnit).toBe("counts");
  });
  test("cps with an esd column: the esd scales with the time too", () => {
    const s = parseScan(`# step time: 4\n2theta,cps,esd\n${rows(",", { extra: () => ["5"] }).join("\n")}\n`);
    expect(s.esd?.[0]).toBe(20);
  });
  test("cps without any counting time: kept as cps, flagged, and the warning says the noise model is approximate", () => {
    const s = parseScan(`2theta,cps\n${rows(",").join("\n")}\n`);
    expect(s.counts[0]).toBe(100);
    expect(s.meta.intensityUnit).toBe("cps");
    expect(s.meta.warnings?.join(" ")).toMatch(/no counting time.*noise model is approximate/);
  });
  test("'# Intensity unit: cps' in an XY header marks the column as counts per second", () => {
    const s = parseScan(`# Intensity unit: cps\n# time per step: 3\n${rows(" ").join("\n")}\n`);
    expect(s.counts[0]).toBe(300);
  });
  test("per-point counting time (variable counting time): intensities on the median time, σ = √N·t_ref/t (Poisson)", () => {
    // Points 0–29 counted 1 s, 30–59 counted 4 s; counts in the file are the raw counts N.
    const t = (i: number) => (i < 30 ? 1 : 4);
    const lines: string[] = [];
    for (let i = 0; i < N; i++) lines.push(`${(10 + i * 0.02).toFixed(2)},${100 * t(i)},${t(i)}`);
    const s = parseScan(`2theta,counts,time (s)\n${lines.join("\n")}\n`);
    // Median of the times (30 × 1 s, 30 × 4 s) is the upper middle value, 4 s: every rate of 100 cps → 400.
    expect(s.counts[0]).toBe(400);
    expect(s.counts[N - 1]).toBe(400);
    // σ = √N · t_ref/t: √100 · 4/1 = 40 for the 1 s points, √400 · 4/4 = 20 for the 4 s points.
    expect(s.esd?.[0]).toBeCloseTo(40, 12);
    expect(s.esd?.[N - 1]).toBeCloseTo(20, 12);
    expect(s.meta.warnings?.join(" ")).toMatch(/counting time varies from 1 to 4 s/);
  });
  test("a non-positive counting time names its line", () => {
    const lines = rows(",", { extra: () => ["1"] });
    lines[9] = "10.18,109,0";
    expectError(`2theta,counts,time\n${lines.join("\n")}\n`, "NOT_NUMERIC", { line: 11 });
  });
});

describe("d instead of 2θ (Bragg's law nλ = 2d·sinθ, n = 1)", () => {
  /** d rows from 4.0 Å down by 0.01 Å; counts 100 + i. */
  const dRows = (sep: string, ascending = false) =>
    Array.from({ length: N }, (_, i) => {
      const k = ascending ? N - 1 - i : i;
      return `${(4 - k * 0.01).toFixed(2)}${sep}${100 + k}`;
    });
  const bragg = (d: number, lambda: number) => (2 * Math.asin(lambda / (2 * d))) / DEG;

  test.each(["d", "D", "d-spacing", "d_spacing", "d (Å)", "d(A)", "d [Å]", "dspacing"])('"%s" with the file\'s wavelength', (name) => {
    const s = parseScan(`# wavelength: 1.540598\n${name},counts\n${dRows(",").join("\n")}\n`);
    expect(s.twoTheta[0]).toBeCloseTo(bragg(4, 1.540598), 12);
    expect(s.twoTheta[N - 1]).toBeCloseTo(bragg(4 - (N - 1) * 0.01, 1.540598), 12);
    expect(s.counts[0]).toBe(100);
    expect(s.meta.warnings?.join(" ")).toMatch(/d-spacings: converted to 2θ with λ = 1\.540598 Å/);
  });
  test("handbook check: Si 111, d = a/√3 with a = 5.4311 Å (NIST SRM 640 series, value from memory) → 2θ ≈ 28.44° with Cu Kα1", () => {
    const d111 = 5.4311 / Math.sqrt(3);
    const lines = Array.from({ length: N }, (_, i) => `${(d111 + 0.3 - i * 0.01).toFixed(6)} ${100 + i}`);
    lines[30] = `${d111.toFixed(6)} 5000`;
    const s = parseScan(`# anode: Cu\nd(A) I\n${lines.join("\n")}\n`);
    const i = Array.from(s.counts).indexOf(5000);
    expect(s.twoTheta[i]).toBeCloseTo(28.44, 2);
  });
  test("d listed increasing is reversed so that 2θ increases", () => {
    const s = parseScan(`# wavelength: 1.540598\nd,counts\n${dRows(",", true).join("\n")}\n`);
    expect(s.twoTheta[0]).toBeCloseTo(bragg(4, 1.540598), 12);
    expect(s.counts[0]).toBe(100);
    for (let i = 1; i < N; i++) expect(s.twoTheta[i]).toBeGreaterThan(s.twoTheta[i - 1]);
  });
  test("d in nm is converted to Å first", () => {
    const lines = Array.from({ length: N }, (_, i) => `${(0.4 - i * 0.001).toFixed(3)},${100 + i}`);
    const s = parseScan(`# wavelength: 1.540598\nd (nm),counts\n${lines.join("\n")}\n`);
    expect(s.twoTheta[0]).toBeCloseTo(bragg(4, 1.540598), 10);
  });
  test("the anode or wavelength given by the caller converts d when the file has none (Co Kα1 from the anode table)", () => {
    const s = parseScan(`d;counts\n${dRows(";").join("\n")}\n`, { anode: "Co" });
    expect(s.twoTheta[0]).toBeCloseTo(bragg(4, 1.788965), 10);
    const w = parseScan(`d;counts\n${dRows(";").join("\n")}\n`, { wavelength: 0.7093 });
    expect(w.twoTheta[0]).toBeCloseTo(bragg(4, 0.7093), 10);
  });
  test("no wavelength anywhere: refused, naming the header line, the column and what is needed", () => {
    const err = expectError(`d (Å),counts\n${dRows(",").join("\n")}\n`, "NEEDS_WAVELENGTH", { line: 1, column: 1 });
    expect(err.message).toMatch(/needs the wavelength/);
    expect(err.field).toBe("d (Å)");
  });
  test("a d at or below λ/2 has no diffraction angle: refused on its line", () => {
    const lines = dRows(",");
    lines[N - 1] = "0.70,5";
    const err = expectError(`# wavelength: 1.540598\nd,counts\n${lines.join("\n")}\n`, "D_OUT_OF_RANGE", { line: N + 2 });
    expect(err.message).toMatch(/λ\/2 = 0\.770299 Å/);
  });
  test("pdCIF _pd_proc_d_spacing (pdCIF core dictionary) with _diffrn_radiation_wavelength", () => {
    const loop = Array.from({ length: N }, (_, i) => `${(4 - i * 0.01).toFixed(2)} ${100 + i}`).join("\n");
    const s = parseScan(`data_d\n_diffrn_radiation_wavelength 1.540598\nloop_\n_pd_proc_d_spacing\n_pd_proc_intensity_total\n${loop}\n`);
    expect(s.meta.format).toBe("pdcif");
    expect(s.twoTheta[0]).toBeCloseTo(bragg(4, 1.540598), 12);
  });
  test("d going back and forth is refused on the line where the order breaks", () => {
    const lines = dRows(",");
    lines[20] = "3.95,5";
    expectError(`# wavelength: 1.540598\nd,counts\n${lines.join("\n")}\n`, "NOT_INCREASING", { line: 23 });
  });
});
