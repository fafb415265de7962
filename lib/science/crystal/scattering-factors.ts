/**
 * X-ray atomic scattering factors of neutral atoms from International Tables for Crystallography Vol. C,
 * Table 6.1.1.4 (the "IT92" four-Gaussian fit, Cromer–Mann form):
 * f(s) = Σ_{i=1..4} a_i·exp(−b_i·s²) + c with s = sinθ/λ (Å⁻¹), valid for s < 2 Å⁻¹.
 * The coefficients were taken through gemmi (scripts/gemmi/export_it92.py writes data/it92.json).
 * Ions are treated as neutral atoms (the table gemmi ships has neutral atoms only); the difference matters
 * mainly at low angle and is small for powder intensities.
 */
import it92 from "./data/it92.json";

type Row = [number, number, number, number, number, number, number, number, number, number];
const TABLE = it92.elements as unknown as Record<string, Row>;

/** Element symbols by atomic number (index 0 unused), H…Cf. */
export const ELEMENT_SYMBOLS: readonly string[] = (() => {
  const out: string[] = [""];
  for (const [sym, row] of Object.entries(TABLE)) out[row[0]] = sym;
  return out;
})();

const Z_BY_SYMBOL = new Map(ELEMENT_SYMBOLS.map((s, z) => [s, z] as const).filter(([s]) => s !== ""));

/** Atomic number of an element symbol with standard capitalisation ("Si"), or undefined. */
export function atomicNumber(symbol: string): number | undefined {
  return Z_BY_SYMBOL.get(symbol);
}

/** The nine coefficients a1..a4, b1..b4, c of an element (neutral atom). */
export function it92Coefficients(symbol: string): Float64Array {
  const row = TABLE[symbol];
  if (!row) throw new RangeError(`no IT92 scattering factor for '${symbol}'`);
  return Float64Array.from(row.slice(1));
}

/**
 * Scattering factor f (electrons) of a neutral atom.
 * @param symbol - element symbol, e.g. "Si"
 * @param s2 - (sinθ/λ)² in Å⁻²
 */
export function scatteringFactor(symbol: string, s2: number): number {
  const c = it92Coefficients(symbol);
  return (
    c[0] * Math.exp(-c[4] * s2) + c[1] * Math.exp(-c[5] * s2) + c[2] * Math.exp(-c[6] * s2) + c[3] * Math.exp(-c[7] * s2) + c[8]
  );
}
