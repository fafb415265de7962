/**
 * Reference lines as seen by a scan: d → 2θ for the scan's wavelength (Bragg's law, n = 1), restricted to a 2θ
 * window, with lines closer than the resolution merged into one (intensities summed), as a peak finder sees them.
 */
import type { ReferencePattern } from "@/lib/science/types";

/** Reference lines on the 2θ axis of one scan, ascending 2θ. */
export interface ScanReferenceLines {
  twoTheta: Float64Array;
  /** Summed intensity of the merged group (0–100 scale of the reference). */
  intensity: Float64Array;
  /** Index of the strongest line of the group in `pattern.lines`. */
  refIndex: Int32Array;
  /** d of that line, Å. */
  d: Float64Array;
  /** Position tolerance for each line, ° 2θ. */
  tolerance: Float64Array;
  length: number;
}

/** Options of {@link scanReferenceLines}. */
export interface ScanReferenceLinesOptions {
  /** Wavelength, Å. */
  wavelength: number;
  /** Keep lines with 2θ inside [start, end], °. */
  window: [number, number];
  /** Merge lines closer than this, ° 2θ. @default 0.04 */
  mergeWidth?: number;
  /** Position window, ° 2θ. @default 0.1 */
  toleranceTwoTheta?: number;
  /** Position window as relative d error (the wider of the two is used). @default 0 */
  toleranceDRelative?: number;
}

const DEG = Math.PI / 180;

/**
 * Convert and merge the lines of a reference pattern for one scan.
 * @param pattern - reference pattern (d-based)
 */
export function scanReferenceLines(pattern: ReferencePattern, options: ScanReferenceLinesOptions): ScanReferenceLines {
  const { wavelength, window, mergeWidth = 0.04, toleranceTwoTheta = 0.1, toleranceDRelative = 0 } = options;
  const src = pattern.lines;
  const m = src.length;
  // Positions of the usable lines, then their order by 2θ (the contract says d descending; do not rely on it).
  const rawTT = new Float64Array(m);
  const order: number[] = [];
  let sorted = true;
  for (let k = 0; k < m; k++) {
    const line = src[k];
    const s = wavelength / (2 * line.d);
    if (!(s > 0 && s < 1) || !(line.intensity > 0)) continue;
    const tt = (2 * Math.asin(s)) / DEG;
    if (tt < window[0] || tt > window[1]) continue;
    rawTT[k] = tt;
    if (order.length > 0 && tt < rawTT[order[order.length - 1]]) sorted = false;
    order.push(k);
  }
  if (!sorted) order.sort((a, b) => rawTT[a] - rawTT[b]);
  const n0 = order.length;
  const twoTheta = new Float64Array(n0);
  const intensity = new Float64Array(n0);
  const refIndex = new Int32Array(n0);
  const d = new Float64Array(n0);
  let n = 0;
  let g = 0;
  while (g < n0) {
    const first = order[g];
    let sum = src[first].intensity;
    let moment = sum * rawTT[first];
    let best = first;
    let h = g + 1;
    while (h < n0 && rawTT[order[h]] - rawTT[order[h - 1]] < mergeWidth) {
      const k = order[h];
      sum += src[k].intensity;
      moment += src[k].intensity * rawTT[k];
      if (src[k].intensity > src[best].intensity) best = k;
      h++;
    }
    twoTheta[n] = moment / sum;
    intensity[n] = sum;
    refIndex[n] = best;
    d[n] = src[best].d;
    n++;
    g = h;
  }
  const tolerance = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    const fromD = (2 * Math.tan((twoTheta[i] * DEG) / 2) * toleranceDRelative) / DEG;
    tolerance[i] = Math.max(toleranceTwoTheta, fromD);
  }
  return {
    twoTheta: twoTheta.subarray(0, n),
    intensity: intensity.subarray(0, n),
    refIndex: refIndex.subarray(0, n),
    d: d.subarray(0, n),
    tolerance,
    length: n,
  };
}
