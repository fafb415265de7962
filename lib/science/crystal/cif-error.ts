/** Why a CIF could not be used. Stable strings, safe to switch on. */
export type CifErrorCode =
  | "syntax"
  | "no-data-block"
  | "block-not-found"
  | "duplicate-name"
  | "loop-shape"
  | "missing-cell"
  | "bad-cell"
  | "no-atoms"
  | "no-symmetry"
  | "bad-symop"
  | "unknown-element"
  | "not-numeric"
  | "limit";

/**
 * A CIF that cannot be read or cannot be turned into a structure model.
 * `line` is 1-based (0 when no single line is to blame); `field` is the CIF data name concerned, if any.
 */
export class CifError extends Error {
  readonly code: CifErrorCode;
  readonly line: number;
  readonly field?: string;

  constructor(code: CifErrorCode, message: string, line: number, field?: string) {
    const where = line > 0 ? `line ${line}` : "file";
    super(`CIF ${where}${field ? ` (${field})` : ""}: ${message}`);
    this.name = "CifError";
    this.code = code;
    this.line = line;
    this.field = field;
  }
}
