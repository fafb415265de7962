import Papa from "papaparse";
import { describe, expect, test } from "vitest";
import { auditCsvHeader, auditCsvLines, diffEntry, showValue } from "@/lib/audit/diff";

describe("diffEntry", () => {
  test("lists only the fields that changed, bookkeeping (version, updatedAt) left out", () => {
    const before = { code: "A-1", lithology: "gossan", version: 1, updatedAt: "2026-01-01", typeDetails: { kind: "core", holeId: "DH1" } };
    const after = { code: "A-1", lithology: "rhyolite", version: 2, updatedAt: "2026-01-02", typeDetails: { kind: "core", holeId: "DH2" } };
    expect(diffEntry(before, after)).toEqual([
      { field: "lithology", before: "gossan", after: "rhyolite" },
      { field: "typeDetails", before: { kind: "core", holeId: "DH1" }, after: { kind: "core", holeId: "DH2" } },
    ]);
  });
  test("a creation lists what it set, a removal what it had; bookkeeping alone is still shown", () => {
    expect(diffEntry(null, { role: "lead" })).toEqual([{ field: "role", before: null, after: "lead" }]);
    expect(diffEntry({ role: "lead" }, null)).toEqual([{ field: "role", before: "lead", after: null }]);
    expect(diffEntry({ version: 1 }, { version: 2 })).toEqual([{ field: "version", before: 1, after: 2 }]);
    expect(diffEntry(null, null)).toEqual([]);
  });
  test("values for display are shortened, null shown as a dash", () => {
    expect(showValue(null)).toBe("—");
    expect(showValue("x".repeat(200), 10)).toBe(`${"x".repeat(9)}…`);
    expect(showValue({ a: 1 })).toBe('{"a":1}');
  });
});

describe("audit CSV (RFC 4180)", () => {
  test("quotes commas and quotes, defuses a cell that a spreadsheet would run as a formula (OWASP CSV injection)", () => {
    const text = auditCsvHeader() + auditCsvLines([{ at: "2026-03-20T09:00:00.000Z", actorName: "=cmd", actorEmail: "a@b.c", action: "update", entity: "sample", entityId: "id-1", record: "A, B", before: { n: 'a "q"' }, after: { n: "b" } }]);
    const [row] = Papa.parse<Record<string, string>>(text, { header: true, skipEmptyLines: true }).data;
    expect(row.person).toBe("'=cmd");
    expect(row.record).toBe("A, B");
    expect(row.changed_fields).toBe("n");
    expect(JSON.parse(row.before_json)).toEqual({ n: 'a "q"' });
    expect(text.split("\r\n")).toHaveLength(3);
  });
});
