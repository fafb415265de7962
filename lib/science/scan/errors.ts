/** Machine-readable reasons a scan file was rejected. */
export type ScanParseErrorCode =
  | "EMPTY"
  | "TOO_LARGE"
  | "TOO_MANY_POINTS"
  | "TOO_FEW_POINTS"
  | "NOT_NUMERIC"
  | "NOT_FINITE"
  | "TOO_MANY_COLUMNS"
  | "TOO_FEW_COLUMNS"
  | "MIXED_SEPARATORS"
  | "NOT_INCREASING"
  | "DUPLICATE_TWO_THETA"
  | "TWO_THETA_OUT_OF_RANGE"
  | "NEGATIVE_COUNTS"
  | "NEGATIVE_ESD"
  | "UNKNOWN_FORMAT"
  | "CIF_SYNTAX"
  | "CIF_NO_DATA"
  | "CIF_INCONSISTENT"
  | "NEEDS_WAVELENGTH"
  | "D_OUT_OF_RANGE";

/** Details attached to a {@link ScanParseError}. */
export interface ScanParseErrorDetails {
  /** 1-based line of the offending text, when known. */
  line?: number;
  /** 1-based column (field index) within the line, when known. */
  column?: number;
  /** Name of the field: "twoTheta", "counts", "esd", a CIF tag, or a header name. */
  field?: string;
}

/** The only error `parseScan` throws: says what is wrong, and where. */
export class ScanParseError extends Error {
  readonly code: ScanParseErrorCode;
  readonly line?: number;
  readonly column?: number;
  readonly field?: string;

  constructor(code: ScanParseErrorCode, message: string, details: ScanParseErrorDetails = {}) {
    const where = [
      details.line !== undefined ? `line ${details.line}` : "",
      details.column !== undefined ? `column ${details.column}` : "",
      details.field ? `(${details.field})` : "",
    ]
      .filter(Boolean)
      .join(" ");
    super(where ? `${where}: ${message}` : message);
    this.name = "ScanParseError";
    this.code = code;
    this.line = details.line;
    this.column = details.column;
    this.field = details.field;
  }
}
