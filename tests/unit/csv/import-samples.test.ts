import { describe, expect, test } from "vitest";
import { guessColumnMapping, parseSampleCsv, sampleCsvHeaderLine, sampleCsvLines } from "@/lib/csv";

describe("column mapping", () => {
  test("export headers, field names and common alternatives are recognised", () => {
    expect(guessColumnMapping(["Sample ID", "Latitude", "Long", "Type", "Rock type", "Notes", "pH"])).toEqual({
      "Sample ID": "code",
      Latitude: "lat",
      Long: "lon",
      Type: "sampleType",
      "Rock type": "lithology",
      Notes: "description",
      pH: null,
    });
  });

  test("a field is not mapped twice by guessing", () => {
    expect(guessColumnMapping(["lat", "latitude"])).toEqual({ lat: "lat", latitude: null });
  });
});

describe("parseSampleCsv", () => {
  test("a semicolon file with decimal commas (auto-detected)", () => {
    const csv = "code;sample_type;lat;lon;collected_at\nAPR-000101;soil;37,712345;-6,612345;2026-03-14T10:05:00Z\n";
    const r = parseSampleCsv(csv);
    expect(r.delimiter).toBe(";");
    expect(r.decimalComma).toBe(true);
    expect(r.errors).toEqual([]);
    expect(r.rows[0].sample).toMatchObject({ code: "APR-000101", sampleType: "soil", lat: 37.712345, lon: -6.612345 });
  });

  test("errors name the file line and the column; multi-line quoted cells keep line numbers right", () => {
    const csv = [
      "code,Type,Lat,Lon,description", // line 1
      'A-001,soil,37.7,-6.6,"two', // line 2
      'lines"', // line 3 (same record)
      "A-002,boulder,91,-6.6,x", // line 4
      "", // line 5, skipped
      "A-001,soil,37.7,-6.6,dup", // line 6
      "A-004,soil,37.7,,only lat", // line 7
    ].join("\n");
    const r = parseSampleCsv(csv);
    expect(r.rowCount).toBe(4);
    expect(r.rows.map((x) => x.line)).toEqual([2]);
    expect(r.errors).toEqual([
      { line: 4, column: "Type", field: "sampleType", message: expect.stringMatching(/"boulder" is not one of/) },
      { line: 4, column: "Lat", field: "lat", message: "Latitude must be between −90 and 90." },
      { line: 6, column: "code", field: "code", message: "Code A-001 is already used on line 2 of this file." },
      { line: 7, column: "Lon", field: "lon", message: "Give both latitude and longitude, or neither." },
    ]);
  });

  test("a user mapping overrides the guess and is checked", () => {
    const csv = "id,kind,rock\nX-01,soil,granite\n";
    const r = parseSampleCsv(csv, { mapping: { id: "code", kind: "sampleType" } });
    expect(r.errors).toEqual([]);
    expect(r.rows[0].sample).toMatchObject({ code: "X-01", sampleType: "soil", lithology: "granite" });
    const twice = parseSampleCsv(csv, { mapping: { id: "sampleType", kind: "sampleType" } });
    expect(twice.errors[0].message).toMatch(/both mapped to sampleType/);
  });

  test("file-level problems: empty file, no sample type column, ragged rows", () => {
    expect(parseSampleCsv("").errors[0].message).toMatch(/empty/);
    expect(parseSampleCsv("code,lat\nA-1,1\n").errors[0].message).toMatch(/sample type/);
    const ragged = parseSampleCsv("code,sample_type\nA-1,soil,extra\n");
    expect(ragged.errors).toEqual([{ line: 2, column: null, field: null, message: "This row has 3 cells but the header has 2 columns." }]);
  });

  test("export → import round trip keeps values, including formula-looking text", () => {
    const records = [
      { code: "APR-000001", sampleType: "hand_sample", lat: 37.712345, lon: -6.612345, description: "=HYPERLINK(x)", suspectedAsbestos: true, stationCode: "APR-ST-001", collectedAt: "2026-03-14T09:05:00Z", collectedTz: "Europe/Madrid" },
      { code: "APR-000002", sampleType: "soil", lat: null, lon: null, description: "-80 mesh, B horizon", suspectedAsbestos: false },
    ];
    const text = sampleCsvHeaderLine() + sampleCsvLines(records);
    // OWASP CSV injection guidance: the formula-looking cell is written with a leading apostrophe.
    expect(text).toContain("'=HYPERLINK(x)");
    expect(text).toContain("-6.612345"); // numbers are not escaped
    const r = parseSampleCsv(text);
    expect(r.errors).toEqual([]);
    expect(r.rows[0].sample).toMatchObject({ description: "=HYPERLINK(x)", suspectedAsbestos: true, lat: 37.712345, collectedTz: "Europe/Madrid" });
    expect(r.rows[0].stationCode).toBe("APR-ST-001");
    expect(r.rows[1].sample).toMatchObject({ description: "-80 mesh, B horizon", suspectedAsbestos: false });
  });
});

describe("default time zone chosen by the importer", () => {
  test("local times without a zone use it (and store it); rows with their own zone keep theirs", () => {
    const csv = "code,sample_type,collected_at,collected_tz\nT-1,soil,2026-07-10 12:00,\nT-2,soil,2026-07-10 12:00,UTC\nT-3,soil,,\n";
    const r = parseSampleCsv(csv, { defaultTimeZone: "Europe/Madrid" });
    expect(r.errors).toEqual([]);
    // Madrid is UTC+2 in July (EU summer time).
    expect(r.rows[0].sample).toMatchObject({ collectedAt: "2026-07-10T10:00:00Z", collectedTz: "Europe/Madrid" });
    expect(r.rows[1].sample).toMatchObject({ collectedAt: "2026-07-10T12:00:00Z", collectedTz: "UTC" });
    expect(r.rows[2].sample.collectedTz).toBeUndefined();
  });

  test("an unknown default zone is a file error", () => {
    expect(parseSampleCsv("sample_type\nsoil\n", { defaultTimeZone: "Mars/Olympus" }).errors[0].message).toMatch(/not an IANA time zone/);
  });
});

test("a one-column file (nothing to detect a delimiter from) imports", () => {
  const r = parseSampleCsv("sample_type\nsoil\nfloat\n");
  expect(r.errors).toEqual([]);
  expect(r.rows.map((x) => x.sample.sampleType)).toEqual(["soil", "float"]);
});
