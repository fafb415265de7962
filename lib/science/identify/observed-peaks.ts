/**
 * Observed peak list prepared for matching: sorted by 2θ, intensities on a 0–100 scale (strongest = 100), broad
 * non-crystalline features and optional Kα2 satellites set aside.
 */
import type { Peak } from "@/lib/science/types";

/** Observed peaks ready for matching (ascending 2θ). */
export interface ObservedPeaks {
  twoTheta: Float64Array;
  d: Float64Array;
  /** Intensity, % of the strongest matched peak. */
  intensity: Float64Array;
  /** Index of each peak in the caller's list. */
  source: Int32Array;
  length: number;
  /** Caller indices of peaks broader than the FWHM limit. */
  broad: number[];
  /** Caller indices of peaks taken as Kα2 satellites of a stronger peak. */
  satellites: number[];
  /** Measure actually used. */
  measure: "area" | "height";
}

/** Options of {@link prepareObservedPeaks}. */
export interface PrepareObservedOptions {
  intensityFrom: "area" | "height";
  maxPeakFwhm: number;
  /** Kα1 wavelength, Å. */
  wavelength: number;
  /** Kα2 satellite detection (optional). */
  kAlpha2?: { wavelength: number; ratio?: number };
  /** Window for satellite positions, ° 2θ. */
  satelliteTolerance: number;
}

const DEG = Math.PI / 180;

/**
 * Validate and prepare a peak list.
 * @throws TypeError naming the peak and field when a position is not a finite positive number
 */
export function prepareObservedPeaks(peaks: readonly Peak[], options: PrepareObservedOptions): ObservedPeaks {
  const { intensityFrom, maxPeakFwhm, wavelength, kAlpha2, satelliteTolerance } = options;
  peaks.forEach((p, i) => {
    if (!(Number.isFinite(p.twoTheta) && p.twoTheta > 0 && p.twoTheta < 180))
      throw new TypeError(`peaks[${i}].twoTheta must be a finite angle in (0, 180)°, got ${p.twoTheta}`);
    if (!(Number.isFinite(p.height) || Number.isFinite(p.area) || Number.isFinite(p.intensity)))
      throw new TypeError(`peaks[${i}] has no finite height, area or intensity`);
  });
  const broad: number[] = [];
  const keep: number[] = [];
  peaks.forEach((p, i) => (Number.isFinite(p.fwhm) && p.fwhm > maxPeakFwhm ? broad : keep).push(i));
  const useArea = intensityFrom === "area" && keep.every((i) => Number.isFinite(peaks[i].area) && peaks[i].area > 0);
  const raw = (i: number): number => {
    const p = peaks[i];
    const v = useArea ? p.area : Number.isFinite(p.height) ? p.height : p.intensity;
    return Number.isFinite(v) && v > 0 ? v : 0;
  };
  keep.sort((a, b) => peaks[a].twoTheta - peaks[b].twoTheta);
  const satellites: number[] = [];
  let kept = keep;
  if (kAlpha2 && kAlpha2.wavelength > wavelength) {
    const ratio = kAlpha2.ratio ?? 0.5;
    const isSatellite = new Set<number>();
    for (const k of keep) {
      const s2 = (kAlpha2.wavelength / wavelength) * Math.sin((peaks[k].twoTheta * DEG) / 2);
      if (!(s2 < 1)) continue;
      const tt2 = (2 * Math.asin(s2)) / DEG;
      for (const j of keep) {
        if (j === k || isSatellite.has(j)) continue;
        if (Math.abs(peaks[j].twoTheta - tt2) > satelliteTolerance) continue;
        const r = raw(j) / (raw(k) || Infinity);
        if (r >= ratio * 0.4 && r <= ratio * 1.6) isSatellite.add(j);
      }
    }
    kept = keep.filter((j) => !isSatellite.has(j));
    satellites.push(...isSatellite);
  }
  const n = kept.length;
  let max = 0;
  for (const i of kept) max = Math.max(max, raw(i));
  const twoTheta = new Float64Array(n);
  const d = new Float64Array(n);
  const intensity = new Float64Array(n);
  const source = new Int32Array(n);
  kept.forEach((i, j) => {
    const p = peaks[i];
    twoTheta[j] = p.twoTheta;
    d[j] = Number.isFinite(p.d) && p.d > 0 ? p.d : wavelength / (2 * Math.sin((p.twoTheta * DEG) / 2));
    intensity[j] = max > 0 ? (100 * raw(i)) / max : 0;
    source[j] = i;
  });
  return { twoTheta, d, intensity, source, length: n, broad, satellites, measure: useArea ? "area" : "height" };
}

/**
 * Index of the observed peak nearest to a 2θ (binary search), or -1 for an empty list.
 */
export function nearestPeak(twoTheta: Float64Array, n: number, x: number): number {
  if (n === 0) return -1;
  let lo = 0;
  let hi = n - 1;
  while (hi - lo > 1) {
    const mid = (lo + hi) >> 1;
    if (twoTheta[mid] < x) lo = mid;
    else hi = mid;
  }
  return Math.abs(twoTheta[lo] - x) <= Math.abs(twoTheta[hi] - x) ? lo : hi;
}
