/** Element recognition for CIF atom sites: type symbols like "Fe3+", "O2-", "D", "SI", labels like "O1", "Si1m". */
import { atomicNumber } from "./scattering-factors";

export interface ElementGuess {
  element: string;
  /** Formal charge written in the symbol ("Fe3+" → 3, "O2-" → −2), 0 when none. */
  charge: number;
  /** True for deuterium ("D"), which scatters X-rays as H. */
  deuterium: boolean;
}

const LEAD = /^([A-Za-z]{1,2})/;

/**
 * Element of a CIF type symbol or label: leading letters, two-letter symbols first (case-insensitive),
 * then one letter; an oxidation state such as "3+" / "2-" / "+3" is read as the charge; "D" maps to H.
 * Returns undefined when no element matches.
 */
export function elementFromSymbol(symbol: string): ElementGuess | undefined {
  const s = symbol.trim();
  const m = LEAD.exec(s);
  if (!m) return undefined;
  const letters = m[1];
  let element: string | undefined;
  let deuterium = false;
  if (letters.length === 2) {
    const two = letters[0].toUpperCase() + letters[1].toLowerCase();
    if (atomicNumber(two) !== undefined && two !== "D") element = two;
  }
  if (!element) {
    const one = letters[0].toUpperCase();
    if (one === "D") {
      element = "H";
      deuterium = true;
    } else if (atomicNumber(one) !== undefined) {
      element = one;
    }
  }
  if (!element) return undefined;
  const q = /(\d*)([+-])(\d*)$/.exec(s.slice(element.length === 2 ? 2 : 1));
  let charge = 0;
  if (q && !(q[1] && q[3])) {
    const mag = Number(q[1] || q[3] || "1");
    charge = q[2] === "-" ? -mag : mag;
  }
  return { element, charge, deuterium };
}
