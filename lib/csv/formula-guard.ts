/**
 * Which CSV cells a spreadsheet would evaluate, and the one way we neutralise them. Pure.
 *
 * A spreadsheet opening a CSV reads a cell as a formula when it starts with "=" (Excel, LibreOffice Calc,
 * Google Sheets), with "@" (Excel's legacy function prefix, e.g. "@SUM(A1)"), or with "+" / "-" followed by
 * an expression (Excel turns "+A1", "-2+3" or "-1+1|cmd…" into formulas). OWASP's "CSV Injection" page lists
 * those leading characters plus tab and carriage return (which some readers strip before evaluating).
 *
 * Our rule (documented here, used by every CSV writer and undone by the import):
 * - "=", "@", tab or CR first → guarded;
 * - "+" or "-" first → guarded only when the rest looks like an expression: it contains an operator or call
 *   character (= + - * / ^ & ( ) ! | % ; :) or is a cell reference ("+A1", "-$B$2"). Ordinary text such as
 *   "-5 shelf" or "+ north wall" and plain numbers ("-5.2") stay as written;
 * - everything else stays as written.
 * The guard is a leading apostrophe (OWASP's recommendation; spreadsheets show it as text). XLSX does not need it:
 * a text cell there is never evaluated, so the workbook writer stores the value unchanged.
 */

/** Cells that a spreadsheet would evaluate as a formula (see the rule above). */
export const SPREADSHEET_FORMULA = /^(?:[=@\t\r]|[+-](?:.*[=+\-*/^&()!|%;:]|\$?[A-Za-z]{1,3}\$?\d+\b))/s;

/** True when a spreadsheet would evaluate `text` as a formula. */
export function wouldEvaluate(text: string): boolean {
  return SPREADSHEET_FORMULA.test(text);
}

/** The text with a leading apostrophe when a spreadsheet would evaluate it. */
export function guardFormula(text: string): string {
  return wouldEvaluate(text) ? `'${text}` : text;
}

/** Undo {@link guardFormula}: strips the apostrophe only when what follows would be evaluated. */
export function unguardFormula(text: string): string {
  return text.startsWith("'") && wouldEvaluate(text.slice(1)) ? text.slice(1) : text;
}

/**
 * One format for every instant in a CSV column: ISO 8601 UTC to the second, "2026-03-14T10:05:00Z" (RFC 3339
 * §5.6 profile). Collection times are entered to the minute; stored values may carry ".000" milliseconds or
 * not, which otherwise gave two formats in one column. Unparseable text is returned unchanged.
 */
export function isoInstantSeconds(iso: string): string {
  const d = new Date(iso);
  return Number.isNaN(d.getTime()) ? iso : d.toISOString().replace(/\.\d{3}Z$/, "Z");
}
