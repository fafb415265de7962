/**
 * Before/after of an audit entry, field by field, and its CSV form. Pure (no I/O), so the page, the API and the
 * CSV export show the same changes.
 */
import Papa from "papaparse";

export interface FieldChange {
  field: string;
  before: unknown;
  after: unknown;
}

/** Bookkeeping fields (timestamps, version counters, the id of the custody row written) that say nothing about the change itself. */
const NOISE = new Set(["updatedAt", "version", "custodyEventId"]);

const isObject = (v: unknown): v is Record<string, unknown> => typeof v === "object" && v !== null && !Array.isArray(v);

/**
 * The fields that differ between `before` and `after` (top level; nested values compared as JSON), in the order they
 * first appear. A creation lists every field it set; a removal every field it had. Timestamps and version counters are
 * left out unless they are all that changed.
 */
export function diffEntry(before: unknown, after: unknown): FieldChange[] {
  if (!isObject(before) && !isObject(after)) return before === after || (before == null && after == null) ? [] : [{ field: "value", before: before ?? null, after: after ?? null }];
  const b = isObject(before) ? before : {};
  const a = isObject(after) ? after : {};
  const keys = [...new Set([...Object.keys(b), ...Object.keys(a)])];
  const changes = keys
    .filter((k) => JSON.stringify(b[k] ?? null) !== JSON.stringify(a[k] ?? null))
    .map((k) => ({ field: k, before: k in b ? b[k] : null, after: k in a ? a[k] : null }));
  const meaningful = changes.filter((c) => !NOISE.has(c.field));
  return meaningful.length ? meaningful : changes;
}

/** One value for display: strings as they are, null as "—", the rest as compact JSON (long values shortened). */
export function showValue(v: unknown, max = 160): string {
  if (v === null || v === undefined) return "—";
  const s = typeof v === "string" ? v : JSON.stringify(v);
  return s.length > max ? `${s.slice(0, max - 1)}…` : s;
}

export interface AuditCsvRow {
  /** ISO 8601 UTC. */
  at: string;
  actorName: string | null;
  actorEmail: string | null;
  action: string;
  entity: string;
  entityId: string;
  record: string | null;
  before: unknown;
  after: unknown;
}

export const AUDIT_CSV_HEADERS = ["time_utc", "person", "email", "action", "record_type", "record_id", "record", "changed_fields", "before_json", "after_json"] as const;

/** Cells a spreadsheet would run as a formula get a leading "'" (OWASP CSV injection), as in the register export. */
const FORMULA_START = /^[=+\-@\t\r]/;

/** CSV header line (CRLF). */
export function auditCsvHeader(): string {
  return Papa.unparse([[...AUDIT_CSV_HEADERS]], { newline: "\r\n" }) + "\r\n";
}

/** CSV data lines (CRLF-terminated; "" for none): RFC 4180, dates ISO 8601 UTC, before/after as JSON. */
export function auditCsvLines(rows: readonly AuditCsvRow[]): string {
  if (rows.length === 0) return "";
  const data = rows.map((r) => [
    r.at,
    r.actorName ?? "",
    r.actorEmail ?? "",
    r.action,
    r.entity,
    r.entityId,
    r.record ?? "",
    diffEntry(r.before, r.after)
      .map((c) => c.field)
      .join("; "),
    r.before == null ? "" : JSON.stringify(r.before),
    r.after == null ? "" : JSON.stringify(r.after),
  ]);
  return Papa.unparse(data, { newline: "\r\n", escapeFormulae: FORMULA_START }) + "\r\n";
}
