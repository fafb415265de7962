/**
 * A reference pattern prepared for profile calculation at a scan's wavelength: d-spacings, relative intensities
 * re-weighted from the library's Cu Kα1 Lorentz–polarisation factor to the scan's (structure factors and
 * Debye–Waller factors depend on d only, so only Lp changes with λ), and the cosine of each reflection's angle to
 * the phase's texture direction (for the March–Dollase factor, Dollase 1986).
 */
import { reciprocalMetricTensor, inverseDSquared } from "@/lib/science/crystal/cell";
import { lorentzPolarisation } from "@/lib/science/crystal/lorentz-polarisation";
import type { ReferencePattern } from "@/lib/science/types";

const DEG = 180 / Math.PI;
/** Wavelength the shipped and imported patterns are computed for (Cu Kα1, Å). */
export const LIBRARY_WAVELENGTH = 1.540593;

export interface PhaseLines {
  ref: ReferencePattern;
  /** Lines kept, in reference order. */
  count: number;
  d: Float64Array;
  /** Relative intensity at the scan wavelength, on the library's 0–100 scale of its Cu Kα1 pattern. */
  intensity: Float64Array;
  /** cos α to the texture direction, or null when the phase has no texture axis or no cell. */
  cosAlpha: Float64Array | null;
  /** h, k, l of each line (3 per line). */
  hkl: Int16Array;
}

function twoThetaDeg(d: number, wavelength: number): number {
  const s = wavelength / (2 * d);
  return s < 1 ? 2 * Math.asin(s) * DEG : NaN;
}

/**
 * Lines of `ref` whose Kα1 position can fall inside [lo, hi] ° 2θ for any cell scale within ±`cellMargin`.
 */
export function phaseLines(ref: ReferencePattern, wavelength: number, range: [number, number], cellMargin = 0.02): PhaseLines {
  const keep: number[] = [];
  for (let i = 0; i < ref.lines.length; i++) {
    const line = ref.lines[i];
    const hiTT = twoThetaDeg(line.d * (1 - cellMargin), wavelength);
    const loTT = twoThetaDeg(line.d * (1 + cellMargin), wavelength);
    if (!Number.isFinite(loTT)) continue;
    if ((Number.isFinite(hiTT) ? hiTT : 180) < range[0] - 1 || loTT > range[1] + 1) continue;
    keep.push(i);
  }
  const n = keep.length;
  const d = new Float64Array(n);
  const intensity = new Float64Array(n);
  const hkl = new Int16Array(3 * n);
  const gs = ref.texture && ref.cell ? reciprocalMetricTensor(ref.cell) : null;
  const cosAlpha = gs ? new Float64Array(n) : null;
  const t = ref.texture;
  const tt = gs && t ? Math.sqrt(inverseDSquared(gs, t[0], t[1], t[2])) : 1;
  for (let j = 0; j < n; j++) {
    const line = ref.lines[keep[j]];
    d[j] = line.d;
    const ttScan = twoThetaDeg(line.d, wavelength);
    const ttLib = twoThetaDeg(line.d, LIBRARY_WAVELENGTH);
    // The library stores lines to 2θ ≤ 100° for Cu Kα1; a line beyond the Cu range keeps its stored weight.
    const lpRatio = Number.isFinite(ttLib) && Number.isFinite(ttScan) ? lorentzPolarisation(ttScan) / lorentzPolarisation(ttLib) : 1;
    intensity[j] = line.intensity * lpRatio;
    hkl[3 * j] = line.h;
    hkl[3 * j + 1] = line.k;
    hkl[3 * j + 2] = line.l;
    if (gs && t && cosAlpha) {
      const hh = 1 / line.d;
      // h·G*·t / (|h*|·|t*|)
      const dot =
        line.h * (gs[0] * t[0] + gs[1] * t[1] + gs[2] * t[2]) +
        line.k * (gs[3] * t[0] + gs[4] * t[1] + gs[5] * t[2]) +
        line.l * (gs[6] * t[0] + gs[7] * t[1] + gs[8] * t[2]);
      cosAlpha[j] = Math.max(-1, Math.min(1, dot / (hh * tt)));
    }
  }
  return { ref, count: n, d, intensity, cosAlpha, hkl };
}
