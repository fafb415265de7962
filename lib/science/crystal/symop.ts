/**
 * Symmetry operators in the "xyz" notation of CIF (`_space_group_symop_operation_xyz`,
 * `_symmetry_equiv_pos_as_xyz`): x′ = R·x + t in fractional coordinates, e.g. `'1/2-x,y,1/2+z'`,
 * `'-x+y,-x,z+1/3'`, `'x-y,x,-z'`, `'x+0.5,y,z'`.
 */

/** A symmetry operator x′ = R·x + t acting on fractional coordinates. */
export interface SymOp {
  /** Row-major 3×3 integer rotation part R (R[3·i + j]). */
  rotation: number[];
  /** Translation part t, fractions of the cell edges, wrapped into [0, 1). */
  translation: [number, number, number];
  /** The text it was parsed from. */
  text: string;
}

/** Thrown by {@link parseSymop}; the CIF layer adds line and field. */
export class SymopSyntaxError extends Error {}

const AXIS: Record<string, number> = { x: 0, y: 1, z: 2 };

function parseComponent(src: string, full: string): { row: number[]; t: number } {
  const s = src.replace(/\s+/g, "").toLowerCase();
  if (s === "") throw new SymopSyntaxError(`empty component in '${full}'`);
  const row = [0, 0, 0];
  let t = 0;
  let i = 0;
  while (i < s.length) {
    let sign = 1;
    if (s[i] === "+" || s[i] === "-") {
      sign = s[i] === "-" ? -1 : 1;
      i++;
    } else if (i > 0) {
      throw new SymopSyntaxError(`expected + or - at '${s.slice(i)}' in '${full}'`);
    }
    // optional number (integer, decimal or fraction)
    const m = /^(\d+(?:\.\d*)?|\.\d+)(?:\/(\d+(?:\.\d*)?))?/.exec(s.slice(i));
    let coef: number | null = null;
    if (m) {
      coef = Number(m[1]) / (m[2] !== undefined ? Number(m[2]) : 1);
      if (!Number.isFinite(coef)) throw new SymopSyntaxError(`bad number '${m[0]}' in '${full}'`);
      i += m[0].length;
      if (s[i] === "*") i++;
    }
    const axis = AXIS[s[i]];
    if (axis !== undefined) {
      i++;
      let c = coef ?? 1;
      // forms like x/2 or x*2 are not crystallographic; reject below via the integer check
      if (s[i] === "*" || s[i] === "/") {
        const m2 = /^[*/](\d+(?:\.\d*)?)/.exec(s.slice(i));
        if (!m2) throw new SymopSyntaxError(`bad factor after '${s[i - 1]}' in '${full}'`);
        c = s[i] === "*" ? c * Number(m2[1]) : c / Number(m2[1]);
        i += m2[0].length;
      }
      row[axis] += sign * c;
    } else if (coef !== null) {
      t += sign * coef;
    } else {
      throw new SymopSyntaxError(`unexpected '${s[i] ?? "end"}' in '${full}'`);
    }
  }
  return { row, t };
}

function det3(r: number[]): number {
  return (
    r[0] * (r[4] * r[8] - r[5] * r[7]) - r[1] * (r[3] * r[8] - r[5] * r[6]) + r[2] * (r[3] * r[7] - r[4] * r[6])
  );
}

/** Wrap a fraction into [0, 1), snapping values within 1e-9 of an integer. */
export function wrapFraction(v: number): number {
  let w = v - Math.floor(v);
  if (w > 1 - 1e-9 || w < 1e-9) w = 0;
  return w;
}

/**
 * Parse one operator in xyz notation. The rotation part must be integer with determinant ±1.
 * @throws SymopSyntaxError with a message naming the offending part.
 */
export function parseSymop(text: string): SymOp {
  const parts = text.trim().split(",");
  if (parts.length !== 3) throw new SymopSyntaxError(`'${text}' needs three comma-separated components`);
  const rotation: number[] = [];
  const translation: [number, number, number] = [0, 0, 0];
  parts.forEach((p, i) => {
    const { row, t } = parseComponent(p, text);
    for (const v of row) {
      if (Math.abs(v - Math.round(v)) > 1e-9) {
        throw new SymopSyntaxError(`non-integer rotation coefficient in '${text}'`);
      }
      rotation.push(Math.round(v) + 0); // + 0 turns -0 into 0
    }
    translation[i] = wrapFraction(t);
  });
  const d = det3(rotation);
  if (d !== 1 && d !== -1) throw new SymopSyntaxError(`rotation part of '${text}' has determinant ${d}, not ±1`);
  return { rotation, translation, text: text.trim() };
}

/** The identity operator x, y, z. */
export const IDENTITY_OP: SymOp = { rotation: [1, 0, 0, 0, 1, 0, 0, 0, 1], translation: [0, 0, 0], text: "x,y,z" };
