/**
 * Strong-line index of a reference library in the spirit of Hanawalt, Rinn & Frevel (1938, Ind. Eng. Chem. Anal.
 * Ed. 10, 457): each reference is filed under the d-spacings of its few strongest lines (here in ln-d bins); an
 * unknown is looked up by its strongest observed lines, and only references sharing enough of them are scored.
 * Intensity order is unreliable (preferred orientation), so any shared strong line counts, whatever its rank.
 * Look-up cost grows with the number of references per bin, not with the library size.
 */
import type { ReferencePattern } from "@/lib/science/types";
import type { StrongLineIndex } from "./types";

/** Options of {@link buildStrongLineIndex}. */
export interface StrongLineIndexOptions {
  /** Strongest lines filed per reference (at most 8). @default 5 */
  linesPerReference?: number;
  /** Bin width in ln(d) (0.002 ≈ 0.2 % in d). @default 0.002 */
  binWidth?: number;
  /** Shortest d filed, Å. @default 0.5 */
  dMin?: number;
  /** Longest d filed, Å. @default 60 */
  dMax?: number;
}

/**
 * Build the strong-line index of a library. O(library lines); build once and pass it as `options.index`.
 * @param library - reference patterns (their order defines the reference indices)
 */
export function buildStrongLineIndex(library: readonly ReferencePattern[], options: StrongLineIndexOptions = {}): StrongLineIndex {
  const { linesPerReference = 5, binWidth = 0.002, dMin = 0.5, dMax = 60 } = options;
  if (!(linesPerReference >= 1 && linesPerReference <= 8)) throw new RangeError("linesPerReference must be 1–8");
  if (!(binWidth > 0)) throw new RangeError("binWidth must be > 0");
  const K = linesPerReference;
  const n = library.length;
  const lnDMin = Math.log(dMin);
  const bins = Math.ceil((Math.log(dMax) - lnDMin) / binWidth) + 1;
  const lineD = new Float64Array(n * K).fill(NaN);
  const counts = new Int32Array(bins + 1);
  const binOf = new Int32Array(n * K).fill(-1);
  const topI = new Float64Array(K);
  const topD = new Float64Array(K);
  for (let r = 0; r < n; r++) {
    const lines = library[r].lines;
    // Keep the K strongest lines (insertion into a short sorted list; ties → larger d first).
    let filled = 0;
    for (const line of lines) {
      const d = line.d;
      const inten = line.intensity;
      if (!(d >= dMin && d <= dMax) || !(inten > 0)) continue;
      if (filled === K && !(inten > topI[K - 1] || (inten === topI[K - 1] && d > topD[K - 1]))) continue;
      let at = filled < K ? filled++ : K - 1;
      while (at > 0 && (topI[at - 1] < inten || (topI[at - 1] === inten && topD[at - 1] < d))) {
        topI[at] = topI[at - 1];
        topD[at] = topD[at - 1];
        at--;
      }
      topI[at] = inten;
      topD[at] = d;
    }
    for (let s = 0; s < filled; s++) {
      const d = topD[s];
      lineD[r * K + s] = d;
      const b = Math.floor((Math.log(d) - lnDMin) / binWidth);
      binOf[r * K + s] = b;
      counts[b + 1]++;
    }
  }
  const binStart = new Int32Array(bins + 1);
  for (let b = 0; b < bins; b++) binStart[b + 1] = binStart[b] + counts[b + 1];
  const fill = binStart.slice(0, bins);
  const entries = new Int32Array(binStart[bins]);
  const entryLnD = new Float64Array(binStart[bins]);
  for (let e = 0; e < n * K; e++) {
    const b = binOf[e];
    if (b < 0) continue;
    const at = fill[b]++;
    entries[at] = e;
    entryLnD[at] = Math.log(lineD[e]);
  }
  return { size: n, linesPerReference: K, binWidth, lnDMin, binStart, entries, entryLnD, lineD };
}

/** Settings of {@link lookupStrongLines}. */
export interface StrongLineLookup {
  /** Positions of the strong observed peaks, ° 2θ. */
  twoTheta: readonly number[];
  /** Wavelength, Å. */
  wavelength: number;
  /** Position window (half-width) for each peak, ° 2θ (same order as twoTheta). */
  tolerance: readonly number[];
  /** Largest common zero shift, ° 2θ. */
  maxZeroShift: number;
  /** Distinct indexed lines a reference must share (lowered to the number of its indexed lines inside dRange). */
  minShared: number;
  /** d range covered by the scan [dLow, dHigh], Å. */
  dRange: [number, number];
}

const DEG = Math.PI / 180;

/**
 * References sharing strong lines with the observed strong peaks at one common zero shift: a reference qualifies
 * when at least `minShared` of its indexed lines fall within the windows of as many distinct peaks and their implied
 * shifts (observed − reference 2θ) agree to within the tolerance.
 * @returns reference indices, ascending
 */
export function lookupStrongLines(index: StrongLineIndex, lookup: StrongLineLookup): number[] {
  const { binStart, entries, entryLnD, binWidth, lnDMin, linesPerReference: K, lineD } = index;
  const { twoTheta, wavelength, tolerance, maxZeroShift, minShared, dRange } = lookup;
  const bins = binStart.length - 1;
  const hits = new Map<number, number[]>(); // reference → [slot, shift, tol, peak, slot, shift, tol, peak, ...]
  twoTheta.forEach((t, p) => {
    const w = tolerance[p] + maxZeroShift;
    const dLow = wavelength / (2 * Math.sin((Math.min(t + w, 179.9) * DEG) / 2));
    const dHigh = wavelength / (2 * Math.sin((Math.max(t - w, 0.01) * DEG) / 2));
    const lo = Math.log(dLow);
    const hi = Math.log(dHigh);
    const b0 = Math.max(0, Math.floor((lo - lnDMin) / binWidth));
    const b1 = Math.min(bins - 1, Math.floor((hi - lnDMin) / binWidth));
    for (let b = b0; b <= b1; b++) {
      for (let at = binStart[b]; at < binStart[b + 1]; at++) {
        const v = entryLnD[at];
        if (v < lo || v > hi) continue;
        const e = entries[at];
        const r = (e / K) | 0;
        const ref2t = (2 * Math.asin(Math.min(1, wavelength / (2 * Math.exp(v))))) / DEG;
        let list = hits.get(r);
        if (!list) hits.set(r, (list = []));
        list.push(e - r * K, t - ref2t, tolerance[p], p);
      }
    }
  });
  const out: number[] = [];
  for (const [r, list] of hits) {
    let need = minShared;
    if (list.length / 4 < need || need > 1) {
      let inRange = 0;
      for (let s = 0; s < K; s++) {
        const d = lineD[r * K + s];
        if (d >= dRange[0] && d <= dRange[1]) inRange++;
      }
      need = Math.max(1, Math.min(need, inRange));
    }
    if (list.length / 4 < need) continue;
    if (need <= 1 || consistentSlots(list) >= need) out.push(r);
  }
  return out.sort((a, b) => a - b);
}

/**
 * Largest number of shared lines at one common shift: hits whose implied shifts agree within the larger of their
 * tolerances, counted as min(distinct reference lines, distinct observed peaks).
 */
function consistentSlots(list: number[]): number {
  const n = list.length / 4;
  let best = 0;
  for (let a = 0; a < n; a++) {
    let slots = 0;
    const peaks = new Set<number>();
    const sa = list[4 * a + 1];
    for (let b = 0; b < n; b++) {
      if (Math.abs(list[4 * b + 1] - sa) <= Math.max(list[4 * a + 2], list[4 * b + 2])) {
        slots |= 1 << list[4 * b];
        peaks.add(list[4 * b + 3]);
      }
    }
    let c = 0;
    for (let m = slots; m; m &= m - 1) c++;
    best = Math.max(best, Math.min(c, peaks.size));
  }
  return best;
}
