/** Unit-cell geometry: metric tensors, volume and d-spacings for a general (triclinic) cell. */
import type { CellParameters } from "./types";

const RAD = Math.PI / 180;

/** Direct metric tensor G (row-major 3×3, Å²): G_ij = a_i·a_j. */
export function metricTensor(cell: CellParameters): Float64Array {
  const { a, b, c } = cell;
  const ca = Math.cos(cell.alpha * RAD);
  const cb = Math.cos(cell.beta * RAD);
  const cg = Math.cos(cell.gamma * RAD);
  return Float64Array.of(a * a, a * b * cg, a * c * cb, a * b * cg, b * b, b * c * ca, a * c * cb, b * c * ca, c * c);
}

/** Cell volume (Å³): V = abc·√(1 − cos²α − cos²β − cos²γ + 2cosα·cosβ·cosγ). */
export function cellVolume(cell: CellParameters): number {
  const ca = Math.cos(cell.alpha * RAD);
  const cb = Math.cos(cell.beta * RAD);
  const cg = Math.cos(cell.gamma * RAD);
  const q = 1 - ca * ca - cb * cb - cg * cg + 2 * ca * cb * cg;
  if (!(q > 0)) throw new RangeError("cell angles do not form a valid cell");
  return cell.a * cell.b * cell.c * Math.sqrt(q);
}

/** Inverse of a 3×3 row-major matrix. */
function invert3(m: Float64Array): Float64Array {
  const [a, b, c, d, e, f, g, h, i] = m;
  const A = e * i - f * h;
  const B = -(d * i - f * g);
  const C = d * h - e * g;
  const det = a * A + b * B + c * C;
  return Float64Array.of(
    A / det, -(b * i - c * h) / det, (b * f - c * e) / det,
    B / det, (a * i - c * g) / det, -(a * f - c * d) / det,
    C / det, -(a * h - b * g) / det, (a * e - b * d) / det,
  );
}

/** Reciprocal metric tensor G* = G⁻¹ (Å⁻²), so that 1/d² = hᵀ·G*·h. */
export function reciprocalMetricTensor(cell: CellParameters): Float64Array {
  return invert3(metricTensor(cell));
}

/** 1/d² (Å⁻²) of reflection hkl from a reciprocal metric tensor. */
export function inverseDSquared(gs: Float64Array, h: number, k: number, l: number): number {
  return (
    h * h * gs[0] + k * k * gs[4] + l * l * gs[8] + 2 * (h * k * gs[1] + h * l * gs[2] + k * l * gs[5])
  );
}

/** d-spacing (Å) of hkl in a cell. */
export function dSpacing(cell: CellParameters, h: number, k: number, l: number): number {
  return 1 / Math.sqrt(inverseDSquared(reciprocalMetricTensor(cell), h, k, l));
}

/**
 * Equivalent isotropic U (Å²) of an anisotropic U^ij tensor given in the CIF convention (Fischer & Tillmanns 1988,
 * Acta Cryst. C44, 775): U_eq = ⅓ Σ_i Σ_j U^ij·a*_i·a*_j·(a_i·a_j).
 * @param u - [U11, U22, U33, U12, U13, U23]
 */
export function uEquivalent(cell: CellParameters, u: readonly number[]): number {
  const g = metricTensor(cell);
  const gs = reciprocalMetricTensor(cell);
  const astar = [Math.sqrt(gs[0]), Math.sqrt(gs[4]), Math.sqrt(gs[8])];
  const U = [u[0], u[3], u[4], u[3], u[1], u[5], u[4], u[5], u[2]];
  let sum = 0;
  for (let i = 0; i < 3; i++) for (let j = 0; j < 3; j++) sum += U[3 * i + j] * astar[i] * astar[j] * g[3 * i + j];
  return sum / 3;
}
