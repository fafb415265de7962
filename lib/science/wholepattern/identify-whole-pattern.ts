/**
 * Whole-pattern phase analysis of a processed powder scan.
 *
 * 1. Shortlist: the strong-line index (Hanawalt, Rinn & Frevel 1938) proposes references sharing strong lines with
 *    the observed peaks; each is aligned (cell scale) and ranked by how much of its intensity sits on signal.
 * 2. Selection: the observed net profile is fitted by non-negative least squares (Lawson & Hanson 1974) with the
 *    candidates' calculated profiles; phases are added one at a time (forward selection) while the Bayesian
 *    information criterion (Schwarz 1978) improves by more than `minDeltaBic`, counting one observation per
 *    resolution element (a FWHM), since neighbouring points of one peak are not independent. Kass & Raftery (1995)
 *    call ΔBIC > 10 very strong evidence; the default 30 is stricter because misfit of imperfect structure models
 *    leaves correlated residuals that a phase can absorb (on synthetic assemblages, true 5 wt% phases score > 200).
 * 3. Refinement of the selected phases (Levenberg–Marquardt, see ./refine), a second forward pass on what is left,
 *    then backward removal of any phase whose removal does not worsen the BIC by `minDeltaBic`.
 * 4. Evidence (lines that stand alone, share of the profile), phases a pattern cannot tell apart, unexplained
 *    peaks, Rwp/Rexp/χ², and weight fractions by Hill & Howard (1987).
 *
 * A fitted phase is a statistically supported candidate, not a confirmed identification.
 */
import { countingVariance } from "@/lib/science/signal/noise";
import type { ProcessedScan } from "@/lib/science/signal";
import { normalizeElementFilter, passesElementFilter } from "@/lib/science/identify/element-filter";
import { buildStrongLineIndex, lookupStrongLines } from "@/lib/science/identify/strong-line-index";
import type { StrongLineIndex } from "@/lib/science/identify/types";
import type { ReferencePattern } from "@/lib/science/types";
import { alignCandidate, signalMap } from "./align";
import { fitCaglioti } from "./caglioti";
import { gramSystem, nnlsFromGram, type ProductCache } from "./nnls";
import { phaseLines, type PhaseLines } from "./phase-lines";
import { cagliotiFwhm, linePosition, lowerBound, renderPhase } from "./profile";
import { hillHoward, internalStandard, type QuantPhase } from "./quantify";
import { commonSeries, seriesOf } from "./series";
import { evaluateFit, fitData, refineFit, scaleSigmas, type FitData, type FitEvaluation, type FitPhase } from "./refine";
import type { EvidenceLine, FittedPhase, GlobalProfile, PhaseProfileParams, RejectedCandidate, UnexplainedPeak, WholePatternOptions, WholePatternResult } from "./types";

const RAD = Math.PI / 180;
const indexCache = new WeakMap<readonly ReferencePattern[], StrongLineIndex>();
/** March r of the "textured" selection column (a moderately strong platy texture). */
const TEXTURE_R = 0.6;
/** Width multiple of the "broad" selection column. */
const BROAD = 2.2;
/** Lines of its own a phase must show (a line where it carries most of the calculated profile, on an observed peak). */
const MIN_ALONE_LINES = 2;
/** A phase without lines of its own stays only with ΔBIC ≥ this (or 3× the threshold) and this profile share. */
const STRONG_DELTA_BIC = 100;
const STRONG_SHARE = 0.05;
/** Marker in the rejected list: significant by BIC but without lines of its own. */
const NO_OWN_LINES = -1e9;
/** Selected phases whose unit profiles correlate above this are one phase to a pattern (merged in the report). */
const LOOKALIKE_COSINE = 0.8;
/** Look-alike phases refitted in place of each selected phase, at most. */
const MAX_LOOKALIKES = 4;
/** A look-alike whose unrefined fit is worse by more than this many times the ΔBIC threshold is not refined. */
const LOOKALIKE_PRESCREEN = 10;
/** Prior standard deviation of the cell scale (relative), used only to choose between equally good look-alikes. */
const CELL_PRIOR = 0.005;
/** Candidates tried again in the second forward pass (those explaining most of the remainder). */
const SECOND_PASS_TRIES = 10;
/** Groups tried exactly (NNLS) at each forward step, after the single-column prescreen. */
const EXACT_TRIES = 8;
/** Number of background-correction columns (Chebyshev T0…T3, each with both signs). */
const BACKGROUND_TERMS = 4;

interface Candidate {
  index: number;
  ref: ReferencePattern;
  lines: PhaseLines;
  params: PhaseProfileParams;
  coverage: number;
  z: number;
  projection: number;
}

function cachedIndex(library: readonly ReferencePattern[]): StrongLineIndex {
  let index = indexCache.get(library);
  if (!index || index.size !== library.length) {
    index = buildStrongLineIndex(library);
    indexCache.set(library, index);
  }
  return index;
}

function chebyshevColumns(x: Float64Array, terms: number): Float64Array[] {
  const lo = x[0];
  const span = x[x.length - 1] - lo || 1;
  const cols: Float64Array[] = [];
  for (let k = 0; k < terms; k++) cols.push(new Float64Array(x.length));
  for (let i = 0; i < x.length; i++) {
    const t = (2 * (x[i] - lo)) / span - 1;
    let a = 1;
    let b = t;
    for (let k = 0; k < terms; k++) {
      const v = k === 0 ? 1 : k === 1 ? t : 2 * t * b - a;
      if (k >= 2) {
        a = b;
        b = v;
      }
      cols[k][i] = v;
    }
  }
  return cols;
}

/** Observations counted by the BIC: resolution elements (one per FWHM) across the scan. */
function resolutionElements(x: Float64Array, g: GlobalProfile): number {
  let n = 0;
  for (let i = 1; i < x.length; i++) n += (x[i] - x[i - 1]) / cagliotiFwhm(g.caglioti, (x[i] / 2) * RAD);
  return Math.max(n, 10);
}

/** Profile tails of the selection columns, in FWHM (short tails keep the columns sparse; the refinement uses full ones). */
const SELECTION_TAIL = 5;

function render(x: Float64Array, c: { lines: PhaseLines; params: PhaseProfileParams }, g: GlobalProfile): Float64Array {
  const out = new Float64Array(x.length);
  renderPhase(x, c.lines, g, c.params, out, 1, SELECTION_TAIL);
  return out;
}

/** Selection columns of a candidate: random as aligned, broadened, and (platy/prismatic phases) textured. */
function selectionColumns(x: Float64Array, c: Candidate, g: GlobalProfile): Float64Array[] {
  const cols = [render(x, c, g), render(x, { lines: c.lines, params: { ...c.params, widthFactor: c.params.widthFactor * BROAD } }, g)];
  if (c.lines.cosAlpha) cols.push(render(x, { lines: c.lines, params: { ...c.params, marchR: TEXTURE_R } }, g));
  return cols;
}

interface Selection {
  chosen: number[];
  steps: { candidate: number; deltaBic: number }[];
  /** Best ΔBIC of each candidate at the step it was last tried (for the rejected list). */
  lastTried: Map<number, number>;
}

/**
 * Forward selection over candidate column groups on top of fixed columns (background correction and already
 * accepted phases).
 */
function forwardSelect(
  fixed: readonly Float64Array[],
  groups: Float64Array[][],
  y: Float64Array,
  w: Float64Array,
  nEff: number,
  minDeltaBic: number,
  maxAdd: number,
  cache?: ProductCache,
): Selection {
  const cols = [...fixed, ...groups.flat()];
  const { G, b, yty } = gramSystem(cols, y, w, cache);
  const n = cols.length;
  const groupCols: number[][] = [];
  let at = fixed.length;
  for (const g of groups) {
    groupCols.push(g.map((_, i) => at + i));
    at += g.length;
  }
  const base = fixed.map((_, i) => i);
  let current = nnlsFromGram(G, n, b, yty, base).chi2;
  const chosen: number[] = [];
  const steps: Selection["steps"] = [];
  const lastTried = new Map<number, number>();
  const lnN = Math.log(nEff);
  let x = nnlsFromGram(G, n, b, yty, base).x;
  let activeNow = base;
  while (chosen.length < maxAdd) {
    let best = -1;
    let bestChi = Infinity;
    const active = base.concat(...chosen.map((c) => groupCols[c]));
    // Prescreen: the best single column of each group against the current residual, gᵢ = bᵢ − (G·x)ᵢ, gives the
    // χ² drop max(0, gᵢ)²/Gᵢᵢ; only the most promising groups get the exact NNLS.
    const gain = (i: number) => {
      let g = b[i];
      activeNow.forEach((j, k) => (g -= G[i * n + j] * x[k]));
      return g > 0 ? (g * g) / Math.max(G[i * n + i], 1e-300) : 0;
    };
    const ranked = groups
      .map((_, c) => c)
      .filter((c) => !chosen.includes(c))
      .map((c) => ({ c, drop: Math.max(...groupCols[c].map(gain)) }))
      .sort((p, q) => q.drop - p.drop);
    for (const { c } of ranked.slice(0, EXACT_TRIES)) {
      const chi2 = nnlsFromGram(G, n, b, yty, active.concat(groupCols[c])).chi2;
      const k = groupCols[c].length + 1;
      lastTried.set(c, nEff * Math.log(current / Math.max(chi2, 1e-300)) - k * lnN);
      if (chi2 < bestChi) {
        bestChi = chi2;
        best = c;
      }
    }
    if (best < 0) break;
    const delta = lastTried.get(best)!;
    if (!(delta > minDeltaBic)) break;
    chosen.push(best);
    steps.push({ candidate: best, deltaBic: delta });
    current = bestChi;
    activeNow = base.concat(...chosen.map((c) => groupCols[c]));
    x = nnlsFromGram(G, n, b, yty, activeNow).x;
  }
  return { chosen, steps, lastTried };
}

/** ΔBIC of removing each phase from a fit (refits the linear part only). */
function removalDeltaBic(data: FitData, ev: FitEvaluation, nEff: number): number[] {
  const lnN = Math.log(nEff);
  const perPhaseParams = (k: number) => 3 + (ev.phases[k].lines.cosAlpha && ev.phases[k].params.marchR !== null ? 1 : 0);
  const cols = [...ev.renders.map((r) => r.value), ...data.backgroundPairs];
  const { G, b, yty } = gramSystem(cols, data.y, data.w, data.cache);
  const all = cols.map((_, i) => i);
  const full = nnlsFromGram(G, cols.length, b, yty, all).chi2;
  return ev.phases.map((_, k) => {
    const without = nnlsFromGram(G, cols.length, b, yty, all.filter((i) => i !== k)).chi2;
    return nEff * Math.log(without / Math.max(full, 1e-300)) - perPhaseParams(k) * lnN;
  });
}

function smoothNet(y: Float64Array, half: number): Float64Array {
  const n = y.length;
  const out = new Float64Array(n);
  let s = 0;
  let lo = 0;
  let hi = -1;
  for (let i = 0; i < n; i++) {
    const a = Math.max(0, i - half);
    const b = Math.min(n - 1, i + half);
    while (hi < b) s += y[++hi];
    while (lo < a) s -= y[lo++];
    out[i] = s / (hi - lo + 1);
  }
  return out;
}

/**
 * Identify and quantify the crystalline phases of a processed scan by fitting the whole profile.
 * @param processed - output of processScan (raw counts, background, peaks, wavelength and Kα2 settings)
 * @param library - reference patterns to search (the shipped library and imported structures)
 * @throws RangeError for unknown `phaseIds` or impossible options
 */
export function identifyWholePattern(processed: ProcessedScan, library: readonly ReferencePattern[], options: WholePatternOptions = {}): WholePatternResult {
  const started = performance.now();
  const { maxPhases = 8, maxCandidates = 40, minDeltaBic = 30, maxIterations = 25 } = options;
  const x = processed.twoTheta;
  const n = x.length;
  if (n < 20) throw new RangeError("a whole-pattern fit needs at least 20 points");
  const range: [number, number] = [x[0], x[n - 1]];
  const background = processed.background;
  const y = new Float64Array(n);
  for (let i = 0; i < n; i++) y[i] = processed.raw[i] - background[i];
  const noise = countingVariance(processed.raw, processed.smoothed, undefined, { model: processed.params.noise.model });
  const w = new Float64Array(n);
  const sigma = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    w[i] = 1 / Math.max(noise.variance[i], 1e-12);
    sigma[i] = Math.sqrt(Math.max(noise.variance[i], 1e-12));
  }

  const cag = fitCaglioti(processed.peaks, range);
  const k2 = processed.params.kAlpha2;
  const global: GlobalProfile = {
    wavelength: processed.wavelength,
    wavelength2: k2.enabled && processed.params.wavelength2 ? processed.params.wavelength2 : null,
    ka2Ratio: k2.ratio,
    caglioti: { U: cag.U, V: cag.V, W: cag.W },
    eta: cag.eta,
    zeroShift: 0,
    displacementMm: 0,
    radiusMm: processed.params.correction.radiusMm,
  };
  const nEff = resolutionElements(x, global);
  const data = fitData(x, y, w, chebyshevColumns(x, BACKGROUND_TERMS));
  const bgColumns = data.backgroundPairs;

  const elements = options.elements ? normalizeElementFilter(options.elements) : null;
  const usable = (r: ReferencePattern) => !elements || passesElementFilter(r, elements);
  const initialParams = (ref: ReferencePattern): PhaseProfileParams => ({ cellScale: 1, widthFactor: ref.broadening ?? 1, marchR: null });

  // 1. Shortlist.
  const smooth = smoothNet(y, Math.max(1, Math.round(0.25 * cagliotiFwhm(global.caglioti, (x[n >> 1] / 2) * RAD) / ((x[n - 1] - x[0]) / (n - 1)))));
  const map = signalMap(x, smooth, sigma);
  const candidate = (index: number): Candidate => {
    const ref = library[index];
    const lines = phaseLines(ref, global.wavelength, range);
    const a = alignCandidate(map, lines, global);
    return { index, ref, lines, params: { ...initialParams(ref), cellScale: a.cellScale }, coverage: a.coverage, z: a.z, projection: a.projection };
  };
  // References sharing strong lines with the strongest observed peaks (within the cell freedom), aligned.
  const lookupPool = (): Candidate[] => {
    const strongest = processed.peaks
      .map((p, i) => ({ i, h: p.height }))
      .sort((a, b) => b.h - a.h)
      .slice(0, 30)
      .map((p) => processed.peaks[p.i].twoTheta);
    const dRange: [number, number] = [global.wavelength / (2 * Math.sin((range[1] / 2) * RAD)), global.wavelength / (2 * Math.sin((range[0] / 2) * RAD))];
    const found = strongest.length
      ? lookupStrongLines(cachedIndex(library), {
          twoTheta: strongest,
          wavelength: global.wavelength,
          tolerance: strongest.map((t) => Math.max(0.1, (2 * Math.tan((t / 2) * RAD) * 0.015) / RAD)),
          maxZeroShift: 0.15,
          minShared: 2,
          dRange,
        })
      : [];
    return found
      .filter((r) => usable(library[r]))
      .map(candidate)
  };
  let shortlist: Candidate[];
  /** Where look-alikes are sought: the shortlist, or for the analyst's own phases the look-up's candidates. */
  let alikePool: Candidate[];
  const forced = options.phaseIds;
  if (forced) {
    shortlist = forced.map((id) => {
      const index = library.findIndex((r) => r.id === id);
      if (index < 0) throw new RangeError(`unknown reference phase "${id}"`);
      return candidate(index);
    });
    alikePool = lookupPool();
  } else {
    const aligned = lookupPool();
    // Two rankings for recall: lines on signal beyond chance (many-line phases) and explained signal (major
    // phases with few lines).
    const byZ = aligned.slice().sort((a, b) => b.z - a.z);
    const byProjection = aligned.slice().sort((a, b) => b.projection - a.projection);
    const picked = new Set<Candidate>();
    for (let k = 0; picked.size < Math.min(maxCandidates, aligned.length); k++) {
      if (byZ[k]) picked.add(byZ[k]);
      if (byProjection[k] && picked.size < maxCandidates) picked.add(byProjection[k]);
    }
    shortlist = [...picked];
    // A declared internal standard is always a candidate.
    const std = options.internalStandard?.referenceId;
    const stdIndex = std ? library.findIndex((r) => r.id === std) : -1;
    if (stdIndex >= 0 && !shortlist.some((c) => c.index === stdIndex)) shortlist.push(candidate(stdIndex));
    alikePool = shortlist;
  }

  // 2. Forward selection (or the analyst's phases).
  let chosen: Candidate[];
  let firstColumns: Float64Array[][] = [];
  const tried = new Map<number, number>();
  if (forced) chosen = shortlist;
  else {
    firstColumns = shortlist.map((c) => selectionColumns(x, c, global));
    const groups = firstColumns;
    const sel = forwardSelect(bgColumns, groups, y, w, nEff, minDeltaBic, maxPhases, data.cache);
    sel.lastTried.forEach((d, c) => tried.set(shortlist[c].index, d));
    chosen = sel.chosen.map((c) => shortlist[c]);
  }
  const toFit = (c: Candidate): FitPhase => ({ lines: c.lines, params: { ...c.params, marchR: c.lines.cosAlpha ? 1 : null } });
  let fit: FitEvaluation = refineFit(data, chosen.map(toFit), global, { maxIterations });

  if (!forced) {
    // 3. Second pass on the remainder with the refined profile, then backward removal.
    const resid = new Float64Array(n);
    for (let i = 0; i < n; i++) resid[i] = y[i] - fit.calc[i];
    const residMap = signalMap(x, smoothNet(resid, 1), sigma);
    const inFit = new Set(chosen.map((c) => c.index));
    // Only the candidates whose first-pass column explains most of the remainder are realigned and tried again.
    const drop = (col: Float64Array) => {
      let cr = 0;
      let cc = 0;
      for (let i = 0; i < n; i++) {
        const v = col[i];
        if (v === 0) continue;
        cr += w[i] * v * resid[i];
        cc += w[i] * v * v;
      }
      return cr > 0 && cc > 0 ? (cr * cr) / cc : 0;
    };
    const rest = shortlist
      .map((c, k) => ({ c, k }))
      .filter(({ c }) => !inFit.has(c.index))
      .map(({ c, k }) => ({ c, gain: Math.max(...firstColumns[k].map(drop)) }))
      .sort((a, b) => b.gain - a.gain)
      .slice(0, SECOND_PASS_TRIES)
      .map(({ c }) => {
        const a = alignCandidate(residMap, c.lines, fit.global);
        return { ...c, params: { ...c.params, cellScale: a.cellScale } };
      });
    if (rest.length && chosen.length < maxPhases) {
      const fixed = [...bgColumns, ...fit.renders.map((r) => r.value)];
      const groups = rest.map((c) => selectionColumns(x, c, fit.global));
      const sel = forwardSelect(fixed, groups, y, w, nEff, minDeltaBic, maxPhases - chosen.length, data.cache);
      sel.lastTried.forEach((d, c) => tried.set(rest[c].index, d));
      if (sel.chosen.length) {
        const added = sel.chosen.map((c) => rest[c]);
        chosen = chosen.concat(added);
        fit = refineFit(data, fit.phases.concat(added.map(toFit)), fit.global, { maxIterations });
      }
    }
    for (;;) {
      if (fit.phases.length === 0) break;
      const deltas = removalDeltaBic(data, fit, nEff);
      // A phase must bring a significant improvement and show at least two lines of its own, unless its whole
      // profile is overwhelming evidence (a phase whose lines all overlap others', e.g. biotite beside muscovite).
      const own = fit.phases.map((_, k) => aloneLines(x, fit, k, phaseProfile(fit, k), y, sigma, processed).length);
      const weak = (k: number) => own[k] < MIN_ALONE_LINES && !(deltas[k] >= Math.max(STRONG_DELTA_BIC, 3 * minDeltaBic) && share(fit, k) >= STRONG_SHARE);
      let worst = -1;
      deltas.forEach((d, k) => {
        if ((d < minDeltaBic || weak(k)) && (worst < 0 || d < deltas[worst])) worst = k;
      });
      if (worst < 0) break;
      tried.set(chosen[worst].index, weak(worst) && deltas[worst] >= minDeltaBic ? NO_OWN_LINES : deltas[worst]);
      chosen = chosen.filter((_, k) => k !== worst);
      fit = refineFit(data, fit.phases.filter((_, k) => k !== worst), fit.global, { maxIterations });
    }
  }

  // Look-alikes: library phases whose strongest lines fall on this phase's lines at one d ratio are refitted in its
  // place. The best fit is kept (with a Gaussian prior of σ = 0.5 % on the cell scale, so that between equal fits
  // the member whose own cell matches wins); those within the ΔBIC threshold are reported as alternatives.
  const alternativesOf = new Map<string, { referenceId: string; mineral: string }[]>();
  for (let k = 0; k < fit.phases.length; k++) {
    const inFit = new Set(fit.phases.map((p) => p.lines.ref.id));
    const self = fit.phases[k];
    // A look-alike is a member of the same series, or looks alike both ways: its strong lines on this phase's, and
    // this phase's on its own.
    const series = seriesOf(self.lines.ref.mineral);
    const members = series
      ? library.flatMap((r, index) => (series.members.includes(r.mineral) && !inFit.has(r.id) && usable(r) ? [index] : []))
      : [];
    const pooled = new Set(alikePool.map((c) => c.index));
    const others = [
      // Members of the same series, from the whole library (the look-up may have missed one whose lines crowd).
      ...alikePool.filter((c) => members.includes(c.index)),
      ...members.filter((i) => !pooled.has(i)).map(candidate),
      ...alikePool.filter(
        (c) => !inFit.has(c.ref.id) && !members.includes(c.index) && sharesLines(c.lines, self.lines, self.params.cellScale) && sharesLines(self.lines, c.lines, 1 / self.params.cellScale),
      ),
    ].slice(0, MAX_LOOKALIKES);
    if (others.length === 0) continue;
    const score = (ev: FitEvaluation, j: number) => nEff * Math.log(Math.max(ev.chi2, 1e-300)) + ((ev.phases[j].params.cellScale - 1) / CELL_PRIOR) ** 2;
    const ownScore = score(fit, k);
    const trials = others.map((c) => {
      const cellScale = self.params.cellScale * (self.lines.d[0] && c.lines.count ? bestRatio(c.lines, self.lines) : 1);
      // Start from this phase's width and from the candidate's own; a look-alike far worse than the phase before
      // refinement is not refined.
      const starts = [self.params.widthFactor, c.ref.broadening ?? 1].map((widthFactor) => {
        const swapped = fit.phases.map((p, j) =>
          j === k ? { lines: c.lines, params: { cellScale: Math.min(1.015, Math.max(0.985, cellScale)), widthFactor, marchR: c.lines.cosAlpha ? (self.params.marchR ?? 1) : null } } : p,
        );
        const ev = evaluateFit(data, swapped, fit.global, undefined, { renders: fit.renders, except: k });
        return { swapped, ev, s: score(ev, k) };
      });
      const start = starts[0].s <= starts[1].s ? starts[0] : starts[1];
      const first = start.ev;
      const swapped = start.swapped;
      if (start.s - ownScore > LOOKALIKE_PRESCREEN * minDeltaBic) return { c, ev: first, s: start.s };
      const ev = refineFit(data, swapped, fit.global, { maxIterations: 8, only: k, frozen: fit });
      return { c, ev, s: score(ev, k) };
    });
    // The analyst's own choice is never swapped; look-alikes are only listed.
    const best = forced ? { c: null, ev: fit, s: ownScore } : trials.reduce<{ c: Candidate | null; ev: FitEvaluation; s: number }>((m, t) => (t.s < m.s ? t : m), { c: null, ev: fit, s: ownScore });
    const bestScore = best.s;
    const alike = [
      ...(best.c ? [{ referenceId: self.lines.ref.id, mineral: self.lines.ref.mineral, s: ownScore }] : []),
      ...trials.filter((t) => t !== best).map((t) => ({ referenceId: t.c.ref.id, mineral: t.c.ref.mineral, s: t.s })),
    ].filter((t) => t.s - bestScore < minDeltaBic);
    if (best.c) {
      tried.set(chosen[k].index, 0);
      chosen = chosen.map((c, j) => (j === k ? best.c! : c));
      fit = best.ev;
    }
    alternativesOf.set(fit.phases[k].lines.ref.id, alike.map(({ referenceId, mineral }) => ({ referenceId, mineral })));
  }

  // 4. Report.
  const parameters = 3 + fit.phases.reduce((s, p) => s + 3 + (p.params.marchR !== null ? 1 : 0), 0) + 2 * BACKGROUND_TERMS;
  const sig = scaleSigmas(data, fit, parameters);
  const deltas = fit.phases.length ? removalDeltaBic(data, fit, nEff) : [];
  const phaseProfiles = fit.renders.map((_, k) => phaseProfile(fit, k));
  // Shares are of the phases' summed profile (the background correction is no phase's).
  let calcTotal = 0;
  for (const prof of phaseProfiles) for (let i = 0; i < n; i++) calcTotal += prof[i];
  const quant: QuantPhase[] = fit.phases.map((p, k) => ({
    scale: fit.scales[k],
    scaleSigma: sig[k],
    cellMass: p.lines.ref.cellMass,
    cellVolume: p.lines.ref.cellVolume,
    absoluteScale: p.lines.ref.absoluteScale,
    rir: p.lines.ref.rir,
  }));
  const hh = hillHoward(quant);
  const rirCheck = rirCrossCheck(fit, processed, phaseProfiles);

  const phases: FittedPhase[] = fit.phases.map((p, k) => {
    const profile = phaseProfiles[k];
    let share = 0;
    for (let i = 0; i < n; i++) share += profile[i];
    const evidence = {
      aloneLines: aloneLines(x, fit, k, profile, y, sigma, processed),
      profileShare: calcTotal > 0 ? share / calcTotal : 0,
      deltaBic: deltas[k],
    };
    return {
      referenceId: p.lines.ref.id,
      mineral: p.lines.ref.mineral,
      formula: p.lines.ref.formula,
      scale: fit.scales[k],
      scaleSigma: sig[k],
      params: { ...p.params },
      wtPercent: hh.wt[k] === null ? null : round(hh.wt[k]!, 1),
      wtSigma: hh.sigma[k] === null ? null : round(hh.sigma[k]!, 1),
      ...(hh.wt[k] === null ? { wtNote: "no structure data (cell mass, volume, intensity scale) or RIR for this phase" } : {}),
      rirWtPercent: rirCheck[k],
      evidence,
      alternatives: [],
      profile,
    };
  });
  // Phases a pattern cannot tell apart from the chosen one.
  const chosenIds = new Set(phases.map((p) => p.referenceId));
  for (const ph of phases) ph.alternatives = (alternativesOf.get(ph.referenceId) ?? []).filter((a) => !chosenIds.has(a.referenceId));
  const notes: string[] = [];
  let amorphous: number | null = null;
  if (options.internalStandard) {
    const si = fit.phases.findIndex((p) => p.lines.ref.id === options.internalStandard!.referenceId);
    const res = si >= 0 ? internalStandard(quant, si, options.internalStandard.wtPercent) : null;
    if (res) {
      amorphous = round(res.amorphous, 1);
      phases.forEach((p, k) => {
        if (k === si) {
          p.wtPercent = null;
          p.wtSigma = null;
          p.wtNote = `internal standard (${options.internalStandard!.wtPercent} wt% added)`;
        } else p.wtPercent = res.wt[k] === null ? null : round(res.wt[k]!, 1);
      });
    } else notes.push(`the declared internal standard (${options.internalStandard.referenceId}) was not found in the fit: fractions normalised to 100 %`);
  }
  const reported = mergeLookalikes(phases, fit, data);

  // The RIR cross-check is normalised to 100 %: compared only with normalised fractions.
  for (const p of amorphous === null ? reported : [])
    if (p.wtPercent !== null && p.rirWtPercent !== null && Math.abs(p.wtPercent - p.rirWtPercent) > 5)
      notes.push(`${p.mineral}: RIR estimate ${p.rirWtPercent} wt% differs from the whole-pattern ${p.wtPercent} wt% by more than 5 wt%`);
  if (hh.basis.some((b) => b === "RIR")) notes.push("some phases lack structure data: fractions from scales divided by RIR (Chung 1974)");

  const calculated = new Float64Array(n);
  const difference = new Float64Array(n);
  let rwpNum = 0;
  let rwpDen = 0;
  for (let i = 0; i < n; i++) {
    calculated[i] = background[i] + fit.calc[i];
    difference[i] = processed.raw[i] - calculated[i];
    rwpNum += w[i] * difference[i] * difference[i];
    rwpDen += w[i] * processed.raw[i] * processed.raw[i];
  }
  const rwp = 100 * Math.sqrt(rwpNum / rwpDen);
  const rexp = 100 * Math.sqrt(Math.max(1, n - parameters) / rwpDen);
  const rejected: RejectedCandidate[] = [...tried.entries()]
    .filter(([idx]) => !chosenIds.has(library[idx].id))
    .map(([idx, d]) => ({ referenceId: library[idx].id, mineral: library[idx].mineral, deltaBic: d === NO_OWN_LINES ? 0 : round(d, 1), reason: d === NO_OWN_LINES ? "no line of its own: it only absorbs misfit of other phases" : d > minDeltaBic ? "a better-fitting phase explains the same lines" : `improves the fit too little (ΔBIC ${round(d, 1)} ≤ ${minDeltaBic})` }))
    .sort((a, b) => b.deltaBic - a.deltaBic);

  return {
    twoTheta: x,
    background,
    observed: processed.raw,
    calculated,
    difference,
    phases: reported,
    rejected,
    global: fit.global,
    stats: { rwp: round(rwp, 2), rexp: round(rexp, 2), gof: round((rwp / rexp) ** 2, 2), points: n, parameters },
    unexplained: unexplainedPeaks(processed, fit.calc, sigma),
    noConfidentMatch: reported.length === 0,
    quantification: {
      method: options.internalStandard && amorphous !== null ? "Hill & Howard (1987) with an internal standard (Chung 1974)" : "Hill & Howard (1987) ZMV, normalised to 100 %",
      semiQuantitative: amorphous === null,
      amorphousWtPercent: amorphous,
      notes,
    },
    elapsedMs: performance.now() - started,
  };
}

function round(v: number, digits: number): number {
  const f = 10 ** digits;
  return Math.round(v * f) / f;
}

/** Lines of phase k that carry ≥ 70 % of the calculated profile at their position and stand ≥ 3σ above background. */
function aloneLines(grid: Float64Array, fit: FitEvaluation, k: number, profile: Float64Array, y: Float64Array, sigma: Float64Array, processed: ProcessedScan): EvidenceLine[] {
  const ph = fit.phases[k];
  const out: EvidenceLine[] = [];
  const peaks = processed.peaks;
  for (let j = 0; j < ph.lines.count; j++) {
    const pos = linePosition(ph.lines.d[j] * ph.params.cellScale, fit.global.wavelength, fit.global).twoTheta;
    if (!(pos >= grid[0] && pos <= grid[grid.length - 1])) continue;
    const i = Math.min(grid.length - 1, lowerBound(grid, pos));
    const total = fit.calc[i];
    if (!(total > 0) || profile[i] < 0.7 * total || y[i] < 3 * sigma[i] || profile[i] < 3 * sigma[i]) continue;
    // …and it must sit on a detected peak that it explains at least half of.
    const h = ph.params.widthFactor * cagliotiFwhm(fit.global.caglioti, (pos / 2) * RAD);
    const tol = Math.max(0.5 * h, 2 * (grid[Math.min(grid.length - 1, i + 1)] - grid[Math.max(0, i - 1)]) / 2);
    const peak = peaks.find((p) => Math.abs(p.twoTheta - pos) <= tol);
    if (!peak || profile[i] < 0.5 * peak.height || profile[i] > 2 * peak.height) continue;
    out.push({
      twoTheta: round(pos, 3),
      d: round(ph.lines.d[j] * ph.params.cellScale, 4),
      hkl: [ph.lines.hkl[3 * j], ph.lines.hkl[3 * j + 1], ph.lines.hkl[3 * j + 2]],
      observed: round(y[i], 1),
      share: round(profile[i] / total, 3),
    });
  }
  return out.sort((a, b) => b.observed - a.observed).slice(0, 12);
}

/**
 * Report selected phases that a pattern cannot tell apart as one phase: unit profiles nearly collinear (weighted
 * cosine ≥ LOOKALIKE_COSINE), or members of one series whose lines fall on each other at one d ratio. The member
 * whose own cell fits best leads, the others become alternatives; fractions and profiles are summed. Where all
 * members belong to a series that a pattern cannot split (biotite, K-feldspar, plagioclase, tremolite–actinolite),
 * the series name is reported.
 */
function mergeLookalikes(phases: FittedPhase[], fit: FitEvaluation, data: FitData): FittedPhase[] {
  const m = phases.length;
  const { G } = gramSystem(fit.renders.map((r) => r.value), data.y, data.w);
  const parent = [...Array(m).keys()];
  const find = (i: number): number => (parent[i] === i ? i : (parent[i] = find(parent[i])));
  for (let i = 0; i < m; i++)
    for (let j = i + 1; j < m; j++) {
      const cos = G[i * m + j] / Math.sqrt(G[i * m + i] * G[j * m + j]);
      const a = fit.phases[i];
      const b = fit.phases[j];
      const series = seriesOf(a.lines.ref.mineral);
      const sameSeries = series !== undefined && series === seriesOf(b.lines.ref.mineral);
      // Same series and lines in the same places at the fitted cells: one phase split in two.
      const coincide = sameSeries && sharesLines(b.lines, a.lines, a.params.cellScale / b.params.cellScale, 0.003);
      if (cos >= LOOKALIKE_COSINE || (sameSeries && (series.report === "always" || series.mergeAlways || coincide))) parent[find(j)] = find(i);
    }
  const groups = new Map<number, number[]>();
  for (let i = 0; i < m; i++) groups.set(find(i), [...(groups.get(find(i)) ?? []), i]);
  const out: FittedPhase[] = [];
  for (const members of groups.values()) {
    // The member whose own cell fits best leads (the cell separates isostructural members); then the larger share.
    members.sort(
      (a, b) =>
        Math.abs(phases[a].params.cellScale - 1) - Math.abs(phases[b].params.cellScale - 1) > 0.002 ? 1
        : Math.abs(phases[b].params.cellScale - 1) - Math.abs(phases[a].params.cellScale - 1) > 0.002 ? -1
        : phases[b].evidence.profileShare - phases[a].evidence.profileShare,
    );
    const lead = { ...phases[members[0]] };
    if (members.length > 1) {
      const rest = members.slice(1).map((i) => phases[i]);
      const sum = (f: (p: FittedPhase) => number | null) => [lead, ...rest].reduce<number | null>((s, p) => (s === null || f(p) === null ? null : s + f(p)!), 0);
      const wt = sum((p) => p.wtPercent);
      lead.wtPercent = wt === null ? null : round(wt, 1);
      const v = sum((p) => (p.wtSigma === null ? null : p.wtSigma * p.wtSigma));
      lead.wtSigma = v === null ? null : round(Math.sqrt(v), 1);
      const rir = sum((p) => p.rirWtPercent);
      lead.rirWtPercent = rir === null ? null : round(rir, 1);
      lead.profile = lead.profile.slice();
      for (const p of rest) for (let i = 0; i < lead.profile.length; i++) lead.profile[i] += p.profile[i];
      lead.evidence = { ...lead.evidence, profileShare: rest.reduce((s, p) => s + p.evidence.profileShare, lead.evidence.profileShare) };
      const seen = new Set([lead.referenceId]);
      lead.alternatives = [...rest.map((p) => ({ referenceId: p.referenceId, mineral: p.mineral })), ...lead.alternatives, ...rest.flatMap((p) => p.alternatives)].filter((a) => !seen.has(a.referenceId) && seen.add(a.referenceId));
    }
    const own = seriesOf(lead.mineral);
    const series = lead.alternatives.length ? commonSeries([lead.mineral, ...lead.alternatives.map((a) => a.mineral)]) : own?.report === "always" ? own : undefined;
    if (series) {
      lead.series = series.name;
      if (series.report !== "member") lead.mineral = series.name;
    }
    out.push(lead);
  }
  return out.sort((a, b) => (b.wtPercent ?? 0) - (a.wtPercent ?? 0));
}

/** The d ratio at which candidate c's strongest lines best fall on phase p's lines (1 when none). */
function bestRatio(c: PhaseLines, p: PhaseLines): number {
  const top = Array.from({ length: c.count }, (_, j) => j)
    .sort((a, b) => c.intensity[b] - c.intensity[a])
    .slice(0, 8);
  let best = 1;
  let bestHit = -1;
  for (const j of top)
    for (let i = 0; i < p.count; i++) {
      const r = p.d[i] / c.d[j];
      if (Math.abs(r - 1) > 0.016 || p.intensity[i] < 3) continue;
      let hit = 0;
      for (const q of top) for (let t = 0; t < p.count; t++) if (Math.abs(p.d[t] / (c.d[q] * r) - 1) <= 0.003) {
        hit += c.intensity[q];
        break;
      }
      if (hit > bestHit) {
        bestHit = hit;
        best = r;
      }
    }
  return best;
}

/**
 * Cheap test before a look-alike fit: do the candidate's strongest lines fall on the phase's lines at one common
 * d ratio (within the ±1.5 % cell freedom, or `ratioLimit`)? At least 70 % of the candidate's strongest-line
 * intensity must match.
 */
function sharesLines(c: PhaseLines, p: PhaseLines, pCell: number, ratioLimit = 0.016): boolean {
  const top = Array.from({ length: c.count }, (_, j) => j)
    .sort((a, b) => c.intensity[b] - c.intensity[a])
    .slice(0, 8);
  const pd: number[] = [];
  for (let j = 0; j < p.count; j++) if (p.intensity[j] >= 3) pd.push(p.d[j] * pCell);
  const total = top.reduce((s, j) => s + c.intensity[j], 0);
  if (!(total > 0) || pd.length === 0) return false;
  const ratios: number[] = [];
  for (const j of top) for (const d of pd) if (Math.abs(d / c.d[j] - 1) <= ratioLimit) ratios.push(d / c.d[j]);
  for (const r of ratios) {
    let hit = 0;
    for (const j of top) if (pd.some((d) => Math.abs(d / (c.d[j] * r) - 1) <= 0.003)) hit += c.intensity[j];
    if (hit >= 0.7 * total) return true;
  }
  return false;
}

/** Share of the phases' summed profile (area) that phase k explains. */
function share(fit: FitEvaluation, k: number): number {
  const area = (j: number) => {
    const r = fit.renders[j];
    let a = 0;
    for (let i = r.span[0]; i <= r.span[1]; i++) a += r.value[i];
    return fit.scales[j] * a;
  };
  const all = fit.renders.reduce((s, _, j) => s + area(j), 0);
  return all > 0 ? area(k) / all : 0;
}

/** Phase k's scaled contribution on the grid. */
function phaseProfile(fit: FitEvaluation, k: number): Float64Array {
  const r = fit.renders[k];
  const v = new Float64Array(r.value.length);
  const s = fit.scales[k];
  for (let i = r.span[0]; i <= r.span[1]; i++) v[i] = s * r.value[i];
  return v;
}

/** Observed peaks the model leaves mostly unexplained (calculated < half the peak height). */
function unexplainedPeaks(processed: ProcessedScan, calc: Float64Array, sigma: Float64Array): UnexplainedPeak[] {
  const x = processed.twoTheta;
  const out: UnexplainedPeak[] = [];
  for (const p of processed.peaks) {
    const i = Math.min(x.length - 1, lowerBound(x, p.twoTheta));
    if (p.height < 4 * sigma[i] || p.intensity < 1) continue;
    if (calc[i] < 0.5 * p.height) out.push({ twoTheta: round(p.twoTheta, 3), d: round(p.d, 4), intensity: round(p.intensity, 1) });
  }
  return out;
}

/**
 * Chung (1974) RIR weight fractions from each phase's strongest stand-alone observed peak: the fitted peak area
 * there divided by the line's relative intensity estimates the phase's I₁₀₀, and W ∝ I₁₀₀/RIR. An independent
 * cross-check of the whole-pattern fractions (it uses the peak list, not the profile fit).
 */
function rirCrossCheck(fit: FitEvaluation, processed: ProcessedScan, profiles: Float64Array[]): (number | null)[] {
  const x = processed.twoTheta;
  const est = fit.phases.map((ph, k) => {
    const rir = ph.lines.ref.rir;
    if (!rir) return null;
    let best: number | null = null;
    let bestI = 0;
    for (let j = 0; j < ph.lines.count; j++) {
      const pos = linePosition(ph.lines.d[j] * ph.params.cellScale, fit.global.wavelength, fit.global).twoTheta;
      if (!(pos >= x[0] && pos <= x[x.length - 1]) || ph.lines.intensity[j] <= bestI) continue;
      const i = Math.min(x.length - 1, lowerBound(x, pos));
      if (!(fit.calc[i] > 0) || profiles[k][i] < 0.8 * fit.calc[i]) continue;
      const h = fit.global.caglioti ? ph.params.widthFactor * cagliotiFwhm(fit.global.caglioti, (pos / 2) * RAD) : 0.1;
      const peak = processed.peaks.find((p) => Math.abs(p.twoTheta - pos) < Math.max(0.5 * h, 0.03));
      if (!peak || !(peak.area > 0)) continue;
      bestI = ph.lines.intensity[j];
      best = (peak.area * 100) / ph.lines.intensity[j] / rir;
    }
    return best;
  });
  const total = est.reduce<number>((s, v) => s + (v ?? 0), 0);
  if (est.some((v) => v === null) || !(total > 0)) return est.map(() => null);
  return est.map((v) => round((100 * v!) / total, 1));
}

