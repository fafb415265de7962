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
  const raw: { tt: number; i: number; k: number; d: number }[] = [];
  pattern.lines.forEach((line, k) => {
    const s = wavelength / (2 * line.d);
    if (!(s > 0 && s < 1) || !(line.intensity > 0)) return;
    const tt = (2 * Math.asin(s)) / DEG;
    if (tt < window[0] || tt > window[1]) return;
    raw.push({ tt, i: line.intensity, k, d: line.d });
  });
  raw.sort((a, b) => a.tt - b.tt);
  const tt: number[] = [];
  const inten: number[] = [];
  const refIndex: number[] = [];
  const dd: number[] = [];
  let g = 0;
  while (g < raw.length) {
    let sum = raw[g].i;
    let moment = raw[g].i * raw[g].tt;
    let best = g;
    let h = g + 1;
    while (h < raw.length && raw[h].tt - raw[h - 1].tt < mergeWidth) {
      sum += raw[h].i;
      moment += raw[h].i * raw[h].tt;
      if (raw[h].i > raw[best].i) best = h;
      h++;
    }
    tt.push(moment / sum);
    inten.push(sum);
    refIndex.push(raw[best].k);
    dd.push(raw[best].d);
    g = h;
  }
  const n = tt.length;
  const tolerance = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    const fromD = ((2 * Math.tan((tt[i] * DEG) / 2) * toleranceDRelative) / DEG);
    tolerance[i] = Math.max(toleranceTwoTheta, fromD);
  }
  return {
    twoTheta: Float64Array.from(tt),
    intensity: Float64Array.from(inten),
    refIndex: Int32Array.from(refIndex),
    d: Float64Array.from(dd),
    tolerance,
    length: n,
  };
}
