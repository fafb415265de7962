/**
 * Chemistry filter for reference patterns (step 1 of a multiphase search–match: restrict the reference set to the
 * elements known from the field description or from XRF; common practice).
 */
import type { ReferencePattern } from "@/lib/science/types";
import type { ElementFilter } from "./types";

const SYMBOL = /^[A-Z][a-z]?$/;

/**
 * Check and normalise an element filter ("si" → "Si").
 * @throws TypeError naming the offending entry when a symbol is not a one- or two-letter element symbol
 */
export function normalizeElementFilter(filter: ElementFilter): ElementFilter {
  const clean = (list: string[] | undefined, field: string): string[] | undefined => {
    if (list === undefined) return undefined;
    if (!Array.isArray(list)) throw new TypeError(`elements.${field} must be an array of element symbols`);
    return list.map((raw, i) => {
      const s = String(raw).trim();
      const sym = s.charAt(0).toUpperCase() + s.slice(1).toLowerCase();
      if (!SYMBOL.test(sym)) throw new TypeError(`elements.${field}[${i}] "${raw}" is not an element symbol`);
      return sym;
    });
  };
  return { required: clean(filter.required, "required"), allowed: clean(filter.allowed, "allowed"), excluded: clean(filter.excluded, "excluded") };
}

/**
 * True when a reference passes the filter: it contains every `required` element, only `allowed` elements (when that
 * list is given) and no `excluded` element.
 * @param pattern - reference pattern (its `elements` are compared)
 * @param filter - normalised filter (see {@link normalizeElementFilter})
 */
export function passesElementFilter(pattern: Pick<ReferencePattern, "elements">, filter: ElementFilter): boolean {
  const { required, allowed, excluded } = filter;
  const have = pattern.elements;
  if (required) for (const e of required) if (!have.includes(e)) return false;
  if (allowed) for (const e of have) if (!allowed.includes(e)) return false;
  if (excluded) for (const e of have) if (excluded.includes(e)) return false;
  return true;
}
