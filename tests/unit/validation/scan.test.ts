import { describe, expect, test } from "vitest";
import { LIBRARY_PHASES } from "@/lib/science/minerals";
import { codeTokens, hazardFromName, kAlpha2Mode, matchFilesToSamples, processParamsSchema, scanSettingsSchema, stripExtension } from "@/lib/validation/scan";

const SAMPLES = [
  { id: "s12", code: "APR-000012" },
  { id: "s12d", code: "APR-000012-D" },
  { id: "s13", code: "APR-000013" },
  { id: "s120", code: "APR-000120" },
  { id: "imp", code: "IMP-00007" },
];

describe("file name → sample code matching (bulk upload)", () => {
  // The naming examples come from the lab's request (e.g. APR-000012.xy, apr-000012_bulk.csv); zero-padding and
  // separator variants are common practice in instrument exports.
  test("case, separators, extension and zero padding are ignored", () => {
    const names = ["APR-000012.xy", "apr-000012_bulk.csv", "APR000013.xye", "APR-13 run2.xy", "2026-03-14 APR_000120 clay-glycol.cif", "imp-7.xy"];
    expect(matchFilesToSamples(names, SAMPLES).map((m) => m.sampleCode)).toEqual(["APR-000012", "APR-000012", "APR-000013", "APR-000013", "APR-000120", "IMP-00007"]);
  });

  test("the longest code wins: a duplicate's file goes to the duplicate, not its parent", () => {
    const [m] = matchFilesToSamples(["APR-000012-D.xy"], SAMPLES);
    expect(m.sampleCode).toBe("APR-000012-D");
  });

  test("a different number is not a match (APR-000012 is not APR-000120 nor APR-0000121)", () => {
    const res = matchFilesToSamples(["APR-0000121.xy", "APR-1200.xy"], SAMPLES);
    expect(res.map((m) => m.sampleId)).toEqual([null, null]);
  });

  test("files naming no code, or two codes of the same length, are reported with a reason", () => {
    const [none, two] = matchFilesToSamples(["unlabelled.xy", "APR-000012 vs APR-000013.xy"], SAMPLES);
    expect(none).toMatchObject({ sampleId: null, reason: "No sample code of this project found in the file name." });
    expect(two).toMatchObject({ sampleId: null, alternatives: ["APR-000012", "APR-000013"] });
  });

  test("5,000 samples × 200 files all match the right codes", () => {
    const many = Array.from({ length: 5000 }, (_, i) => ({ id: `id${i}`, code: `APR-${String(i + 1).padStart(6, "0")}` }));
    const files = Array.from({ length: 200 }, (_, i) => `apr-${String(i * 25 + 1).padStart(6, "0")}_bulk.xy`);
    const res = matchFilesToSamples(files, many);
    expect(res.every((m, i) => m.sampleCode === `APR-${String(i * 25 + 1).padStart(6, "0")}`)).toBe(true);
  });

  test("tokens and extensions", () => {
    expect(codeTokens("apr-000012_bulk.xy")).toEqual(["APR", "12", "BULK", "XY"]);
    expect(codeTokens("APR-000000")).toEqual(["APR", "0"]);
    expect(stripExtension("dir/a.b.xy")).toBe("a.b");
    expect(stripExtension(".hidden")).toBe(".hidden");
  });
});

describe("upload settings and processing parameters", () => {
  test("blank form fields are 'not given'; numbers are checked with the field named", () => {
    expect(scanSettingsSchema.parse({ anode: "", wavelength: " ", instrument: "" })).toEqual({});
    const bad = scanSettingsSchema.safeParse({ wavelength: "1,54", anode: "Tungsten" });
    expect(bad.success).toBe(false);
    const paths = bad.error!.issues.map((i) => i.path.join("."));
    expect(paths).toEqual(expect.arrayContaining(["wavelength", "anode"]));
    expect(scanSettingsSchema.parse({ wavelength: "1.78897", timePerStepS: "2" })).toEqual({ wavelength: 1.78897, timePerStepS: 2 });
  });

  test("Kα2 on the upload form: auto / present / absent, blank = auto; processing mode auto / yes / no", () => {
    expect(scanSettingsSchema.parse({ kAlpha2: "" })).toEqual({});
    for (const c of ["auto", "present", "absent"] as const) expect(scanSettingsSchema.parse({ kAlpha2: c })).toEqual({ kAlpha2: c });
    expect(scanSettingsSchema.safeParse({ kAlpha2: "yes" }).success).toBe(false);
    expect([kAlpha2Mode("present"), kAlpha2Mode("absent"), kAlpha2Mode("auto"), kAlpha2Mode(undefined)]).toEqual(["yes", "no", "auto", "auto"]);
    expect(processParamsSchema.parse({ processing: { kAlpha2: { mode: "no" } } }).processing!.kAlpha2).toEqual({ mode: "no" });
    expect(processParamsSchema.safeParse({ processing: { kAlpha2: { mode: "absent" } } }).success).toBe(false);
  });

  test("processing parameters: odd smoothing window, element symbols normalised, unknown keys refused", () => {
    // Savitzky–Golay windows are odd (a centre point plus equal sides; Savitzky & Golay 1964).
    expect(processParamsSchema.safeParse({ processing: { smoothing: { windowSize: 8 } } }).success).toBe(false);
    expect(processParamsSchema.parse({ identify: { elements: { allowed: ["si", "O"] } } }).identify!.elements!.allowed).toEqual(["Si", "O"]);
    expect(processParamsSchema.safeParse({ processing: { magic: true } }).success).toBe(false);
  });
});

describe("hazard classes (common practice)", () => {
  test("asbestos-group species and crystalline silica by name", () => {
    for (const m of ["chrysotile", "riebeckite", "grunerite", "anthophyllite", "tremolite", "actinolite", "erionite-Na", "Crocidolite"]) expect(hazardFromName(m), m).toBe("asbestos");
    for (const m of ["quartz", "Cristobalite", "quartz (low)"]) expect(hazardFromName(m), m).toBe("crystalline_silica");
    for (const m of ["lizardite", "calcite", "magnesio-hornblende", "quartzite"]) expect(hazardFromName(m), m).toBeNull();
  });

  test("agrees with the hazard tags of the shipped library", () => {
    for (const p of LIBRARY_PHASES) {
      const tagged = p.hazards.find((h) => h === "asbestos" || h === "crystalline_silica") ?? null;
      expect(hazardFromName(p.mineral), p.mineral).toBe(tagged);
    }
  });
});
