/**
 * Preferred-orientation factor of March (1932) and Dollase (1986, J. Appl. Cryst. 19, 267):
 * `P(α) = (r²·cos²α + sin²α / r)^(−3/2)`, α = angle between the diffraction vector of a line and the preferred
 * direction (both as reciprocal-lattice vectors); r < 1 for platy crystals lying on the preferred plane (its lines
 * gain), r > 1 for needles. Angles use the reciprocal metric G* = G⁻¹ of the cell.
 */

/** Unit cell: lengths in Å, angles in degrees. */
export interface UnitCell {
  a: number;
  b: number;
  c: number;
  alpha: number;
  beta: number;
  gamma: number;
}

const DEG = Math.PI / 180;

/** Reciprocal metric tensor G* (Å⁻²) as a row-major 3×3 array. */
export function reciprocalMetric(cell: UnitCell): number[] {
  const { a, b, c } = cell;
  const ca = Math.cos(cell.alpha * DEG);
  const cb = Math.cos(cell.beta * DEG);
  const cg = Math.cos(cell.gamma * DEG);
  const g = [a * a, a * b * cg, a * c * cb, a * b * cg, b * b, b * c * ca, a * c * cb, b * c * ca, c * c];
  const det =
    g[0] * (g[4] * g[8] - g[5] * g[7]) - g[1] * (g[3] * g[8] - g[5] * g[6]) + g[2] * (g[3] * g[7] - g[4] * g[6]);
  if (!(det > 0)) throw new RangeError("cell has no volume (check lengths and angles)");
  return [
    (g[4] * g[8] - g[5] * g[7]) / det,
    (g[2] * g[7] - g[1] * g[8]) / det,
    (g[1] * g[5] - g[2] * g[4]) / det,
    (g[5] * g[6] - g[3] * g[8]) / det,
    (g[0] * g[8] - g[2] * g[6]) / det,
    (g[2] * g[3] - g[0] * g[5]) / det,
    (g[3] * g[7] - g[4] * g[6]) / det,
    (g[1] * g[6] - g[0] * g[7]) / det,
    (g[0] * g[4] - g[1] * g[3]) / det,
  ];
}

function dot(gs: number[], u: readonly number[], v: readonly number[]): number {
  let s = 0;
  for (let i = 0; i < 3; i++) for (let j = 0; j < 3; j++) s += u[i] * gs[3 * i + j] * v[j];
  return s;
}

/**
 * March–Dollase factor for one line.
 * @param hkl - the line's indices
 * @param preferred - indices of the preferred plane (e.g. [0, 0, 1] for basal cleavage)
 * @param r - March parameter (1 = random; 0.5–0.8 typical for clays and micas)
 * @param gStar - reciprocal metric from {@link reciprocalMetric}
 */
export function marchDollase(hkl: readonly number[], preferred: readonly number[], r: number, gStar: number[]): number {
  if (!(r > 0)) throw new RangeError("March parameter r must be > 0");
  const hh = dot(gStar, hkl, hkl);
  const pp = dot(gStar, preferred, preferred);
  if (!(hh > 0 && pp > 0)) return 1;
  const c2 = Math.min(1, dot(gStar, hkl, preferred) ** 2 / (hh * pp));
  return (r * r * c2 + (1 - c2) / r) ** -1.5;
}
