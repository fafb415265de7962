/** Matching a file's headers to register fields. Pure. */
import { SAMPLE_CSV_COLUMNS, type SampleCsvField } from "./sample-columns";

/** header (as in the file) → field, or null to ignore the column */
export type ColumnMapping = Record<string, SampleCsvField | null>;

/** Lower case, accents and punctuation removed: "Sample Code" and "sample_code" compare equal. */
export function normalizeHeader(h: string): string {
  return h
    .normalize("NFD")
    .replace(/[\u0300-\u036f]/g, "")
    .toLowerCase()
    .replace(/\(.*?\)/g, "")
    .replace(/[^a-z0-9]/g, "");
}

const LOOKUP = new Map<string, SampleCsvField>();
for (const c of SAMPLE_CSV_COLUMNS) {
  for (const name of [c.header, c.field, ...c.aliases]) LOOKUP.set(normalizeHeader(name), c.field);
}

/**
 * Proposes a mapping: each header that names a field (export header, field name or a known alias)
 * maps to it; a field already taken by an earlier column is not mapped twice.
 */
export function guessColumnMapping(headers: readonly string[]): ColumnMapping {
  const used = new Set<SampleCsvField>();
  const out: ColumnMapping = {};
  for (const h of headers) {
    const f = LOOKUP.get(normalizeHeader(h)) ?? null;
    if (f && !used.has(f)) {
      out[h] = f;
      used.add(f);
    } else out[h] = null;
  }
  return out;
}

/** Problems with a mapping given by the user: unknown headers, unknown fields, a field mapped twice. */
export function mappingProblems(headers: readonly string[], mapping: ColumnMapping): string[] {
  const problems: string[] = [];
  const fields = new Set(SAMPLE_CSV_COLUMNS.map((c) => c.field));
  const seen = new Map<string, string>();
  for (const [h, f] of Object.entries(mapping)) {
    if (!headers.includes(h)) problems.push(`The mapping names a column "${h}" that the file does not have.`);
    if (f === null) continue;
    if (!fields.has(f)) problems.push(`Column "${h}" is mapped to unknown field "${f}".`);
    else if (seen.has(f)) problems.push(`Columns "${seen.get(f)}" and "${h}" are both mapped to ${f}; map each field once.`);
    else seen.set(f, h);
  }
  return problems;
}
