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
  const top: { d: number; i: number }[] = [];
  for (let r = 0; r < n; r++) {
    const lines = library[r].lines;
    top.length = 0;
    for (const line of lines) {
      if (!(line.d >= dMin && line.d <= dMax)) continue;
      top.push({ d: line.d, i: line.intensity });
    }
    top.sort((a, b) => b.i - a.i || b.d - a.d);
    for (let s = 0; s < K && s < top.length; s++) {
      const d = top[s].d;
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

/** A d window to look up, Å (inclusive). */
export interface DWindow {
  dLow: number;
  dHigh: number;
}

/**
 * References sharing strong lines with the observed windows.
 * @param index - strong-line index
 * @param windows - one d window per strong observed peak (position ± tolerance ± zero shift)
 * @param minShared - required number of distinct shared indexed lines (lowered to the number of the reference's
 *   indexed lines inside `dRange` when it has fewer)
 * @param dRange - d range covered by the scan [dLow, dHigh], Å
 * @returns reference indices, ascending
 */
export function lookupStrongLines(index: StrongLineIndex, windows: readonly DWindow[], minShared: number, dRange: [number, number]): number[] {
  const { binStart, entries, entryLnD, binWidth, lnDMin, linesPerReference: K, lineD } = index;
  const bins = binStart.length - 1;
  const hits = new Map<number, number>(); // reference → bit mask of shared slots
  for (const w of windows) {
    if (!(w.dHigh > w.dLow && w.dLow > 0)) continue;
    const lo = Math.log(w.dLow);
    const hi = Math.log(w.dHigh);
    const b0 = Math.max(0, Math.floor((lo - lnDMin) / binWidth));
    const b1 = Math.min(bins - 1, Math.floor((hi - lnDMin) / binWidth));
    for (let b = b0; b <= b1; b++) {
      for (let at = binStart[b]; at < binStart[b + 1]; at++) {
        const v = entryLnD[at];
        if (v < lo || v > hi) continue;
        const e = entries[at];
        const r = (e / K) | 0;
        hits.set(r, (hits.get(r) ?? 0) | (1 << (e - r * K)));
      }
    }
  }
  const out: number[] = [];
  for (const [r, mask] of hits) {
    let shared = 0;
    for (let m = mask; m; m &= m - 1) shared++;
    if (shared >= minShared) {
      out.push(r);
      continue;
    }
    let inRange = 0;
    for (let s = 0; s < K; s++) {
      const d = lineD[r * K + s];
      if (d >= dRange[0] && d <= dRange[1]) inRange++;
    }
    if (shared >= Math.min(minShared, inRange)) out.push(r);
  }
  return out.sort((a, b) => a - b);
}
