/** Strict number reading for scan files: decimal notation only, no hex/binary, no thousands separators. */

/** Result of reading one cell. */
export const CellKind = { Number: 0, NonFinite: 1, NotNumeric: 2 } as const;
/** One of the {@link CellKind} values. */
export type CellKind = (typeof CellKind)[keyof typeof CellKind];

const NON_FINITE = new Set(["nan", "+nan", "-nan", "inf", "+inf", "-inf", "infinity", "+infinity", "-infinity", "1.#inf", "-1.#inf", "1.#qnan", "-1.#ind"]);

/**
 * Check that `s` is a plain decimal number: optional sign, digits with at most one `.` (or `,` when
 * `decimalComma`), optional exponent. Linear in the length of `s`; no allocation on the happy path.
 */
function isDecimal(s: string, decimalComma: boolean): boolean {
  const n = s.length;
  let i = 0;
  let c = s.charCodeAt(0);
  if (c === 43 || c === 45) i++; // + -
  let digits = 0;
  let dot = false;
  for (; i < n; i++) {
    c = s.charCodeAt(i);
    if (c >= 48 && c <= 57) digits++;
    else if (!dot && (c === 46 || (decimalComma && c === 44))) dot = true;
    else break;
  }
  if (digits === 0) return false;
  if (i === n) return true;
  if (c !== 101 && c !== 69) return false; // e E
  i++;
  c = s.charCodeAt(i);
  if (c === 43 || c === 45) i++;
  const start = i;
  for (; i < n; i++) {
    c = s.charCodeAt(i);
    if (c < 48 || c > 57) return false;
  }
  return i > start;
}

/** Exact powers of ten 10⁰…10²² (every one is a double). */
const POW10 = Array.from({ length: 23 }, (_, i) => 10 ** i);

/**
 * Fast path for the usual cell, `[±]digits[.digits][e±digits]`: read in one pass. With at most 15 significant digits
 * and no exponent the digits are an exact integer (below 2⁵³) divided by an exact power of ten — one correctly
 * rounded operation, so the result equals `Number(s)`; longer cells are handed to `Number` once checked. Anything
 * that is not such a decimal returns NaN and goes the general way (`readCell`).
 */
export function plainDecimal(s: string, decimalComma = false): number {
  return plainDecimalIn(s, 0, s.length, decimalComma);
}

/** {@link plainDecimal} on the characters [a, b) of `s`, without cutting them out first. */
export function plainDecimalIn(s: string, a: number, b: number, decimalComma = false): number {
  if (b <= a) return NaN;
  let i = a;
  let neg = false;
  let c = s.charCodeAt(a);
  if (c === 45) {
    neg = true;
    i++;
  } else if (c === 43) i++;
  let mant = 0;
  let digits = 0;
  let frac = -1;
  for (; i < b; i++) {
    c = s.charCodeAt(i);
    if (c >= 48 && c <= 57) {
      mant = mant * 10 + (c - 48);
      digits++;
    } else if (frac < 0 && (c === 46 || (decimalComma && c === 44))) frac = digits;
    else break;
  }
  if (digits === 0) return NaN;
  if (i === b && digits <= 15) {
    const scale = frac < 0 ? 0 : digits - frac;
    const v = scale === 0 ? mant : mant / POW10[scale];
    return neg ? -v : v;
  }
  if (i < b) {
    // Exponent: e or E, optional sign, at least one digit, then the end.
    if (c !== 101 && c !== 69) return NaN;
    i++;
    c = s.charCodeAt(i);
    if (i < b && (c === 43 || c === 45)) i++;
    const start = i;
    for (; i < b; i++) {
      c = s.charCodeAt(i);
      if (c < 48 || c > 57) return NaN;
    }
    if (i === start) return NaN;
  }
  const text = a === 0 && b === s.length ? s : s.slice(a, b);
  const v = Number(decimalComma ? text.replace(",", ".") : text);
  return Number.isFinite(v) ? v : NaN;
}

/**
 * Read one trimmed cell.
 * @param s - cell text (already trimmed)
 * @param decimalComma - accept `,` as the decimal mark
 * @returns `[kind, value]`; `value` is NaN unless kind is Number
 */
export function readCell(s: string, decimalComma = false): [CellKind, number] {
  const fast = plainDecimal(s, decimalComma);
  if (fast === fast) return [CellKind.Number, fast]; // not NaN
  if (s.length > 0 && isDecimal(s, decimalComma)) {
    const v = Number(decimalComma ? s.replace(",", ".") : s);
    return Number.isFinite(v) ? [CellKind.Number, v] : [CellKind.NonFinite, v];
  }
  if (NON_FINITE.has(s.toLowerCase())) return [CellKind.NonFinite, NaN];
  return [CellKind.NotNumeric, NaN];
}

/**
 * Read a CIF numeric value that may carry a standard uncertainty in parentheses, e.g. `1234(35)` or `12.5(3)`.
 * @returns `[kind, value, su]` where su is the uncertainty in the units of the value (NaN when absent)
 */
export function readCifNumber(s: string): [CellKind, number, number] {
  const open = s.indexOf("(");
  if (open < 0) {
    const [k, v] = readCell(s);
    return [k, v, NaN];
  }
  if (!s.endsWith(")")) return [CellKind.NotNumeric, NaN, NaN];
  const mant = s.slice(0, open);
  const suDigits = s.slice(open + 1, -1);
  const [k, v] = readCell(mant);
  if (k !== CellKind.Number) return [k, v, NaN];
  if (!/^\d+$/.test(suDigits)) return [CellKind.NotNumeric, NaN, NaN];
  // The su applies to the last digit of the mantissa (before any exponent).
  const e = mant.search(/[eE]/);
  const base = e < 0 ? mant : mant.slice(0, e);
  const exp = e < 0 ? 0 : Number(mant.slice(e + 1));
  const dot = base.indexOf(".");
  const decimals = dot < 0 ? 0 : base.length - dot - 1;
  return [CellKind.Number, v, Number(suDigits) * 10 ** (exp - decimals)];
}
