import type { Anode, Peak, Scan } from "@/lib/science/types";
import { resolveWavelength } from "@/lib/science/anodes";
import { dFromTwoTheta, dUncertainty } from "@/lib/science/units";
import { correctClippingBias, snipBackground } from "./background";
import { correctTwoTheta } from "./corrections";
import { detectPeaks, type DetectPeaksOptions } from "./detect-peaks";
import { fitPeaks, type FittedPeak } from "./fit-peaks";
import { stripKAlpha2 } from "./kalpha2";
import { detectKAlpha2 } from "./kalpha2-detect";
import { countingVariance } from "./noise";
import { pseudoVoigtArea } from "./pseudo-voigt";
import { scherrer } from "./scherrer";
import { savitzkyGolayNoiseGain, smoothSavitzkyGolay, windowForFwhm } from "./smoothing";

/** Processing parameters; every field is optional and has a default (see {@link ResolvedProcessParams}). */
export interface ProcessParams {
  /** Tube anode; overrides the file's. */
  anode?: Anode;
  /** Wavelength for Bragg conversions, Å; overrides the file's and the anode's. */
  wavelength?: number;
  /** Kα2 wavelength, Å (for stripping/doublet fitting). */
  wavelength2?: number;
  /**
   * Anode assumed when neither the parameters nor the file give a wavelength (a warning is emitted);
   * `null` makes that case an error.
   * @default "Cu"
   */
  fallbackAnode?: Anode | null;
  /**
   * Typical FWHM of the sample's peaks, ° 2θ; sets the smoothing window (≤ FWHM in points).
   * @default 0.1
   */
  expectedFwhmDeg?: number;
  smoothing?: {
    /** @default true */
    enabled?: boolean;
    /** Odd window ≥ 5 points, or "auto" = largest odd window ≤ expected FWHM in points. @default "auto" */
    windowSize?: number | "auto";
    /** @default 2 */
    polynomial?: number;
  };
  background?: {
    /** @default true */
    enabled?: boolean;
    /** SNIP window m in points, or "auto" = halfWidthDeg / step. @default "auto" */
    iterations?: number | "auto";
    /** Half-width of the broadest real peak, ° 2θ (used when iterations is "auto"). @default 0.6 */
    halfWidthDeg?: number;
    /** @default true */
    lls?: boolean;
    /** @default false */
    decreasing?: boolean;
    /** Raise the SNIP result by its median noise offset (see `correctClippingBias`). @default true */
    biasCorrection?: boolean;
  };
  kAlpha2?: {
    /**
     * Whether the scan carries Kα2: "auto" decides from the profile shape (see `detectKAlpha2`), "yes" / "no" say
     * so. When present, Kα2 is stripped (Rachinger) for detection and Kα1+Kα2 doublets are fitted; needs λ2.
     * @default "auto"
     */
    mode?: "auto" | "yes" | "no";
    /** Older switch: `false` is the same as mode "no". */
    enabled?: boolean;
    /** I(Kα2)/I(Kα1). @default 0.5 */
    ratio?: number;
  };
  noise?: {
    /** See {@link countingVariance}. @default "auto" */
    model?: "auto" | "poisson" | "empirical";
  };
  peaks?: DetectPeaksOptions;
  fitting?: {
    /** Fit pseudo-Voigt profiles; when false detected peaks are reported with estimated areas. @default true */
    enabled?: boolean;
    /** Half-width of each fitting window in FWHMs. @default 4 */
    windowFwhm?: number;
    /** @default 6 */
    maxGroupSize?: number;
    /** @default 60 */
    maxIterations?: number;
    /** @default "linear" */
    baseline?: "linear" | "constant" | "none";
    /** @default "fit" */
    eta?: "fit" | number;
    /** @default 0.005 */
    minFwhmDeg?: number;
    /** @default 3 */
    maxFwhmDeg?: number;
  };
  correction?: {
    /** Zero error (observed − true), ° 2θ. @default 0 */
    zeroShiftDeg?: number;
    /** Specimen displacement, mm. @default 0 */
    displacementMm?: number;
    /** Goniometer radius, mm. @default 240 */
    radiusMm?: number;
  };
  scherrer?: {
    /** Report a Scherrer size per peak. @default false */
    enabled?: boolean;
    /** @default 0.9 */
    K?: number;
    /** Instrumental FWHM, ° 2θ (from a line-broadening standard). @default 0 */
    instrumentalFwhmDeg?: number;
    /** @default "gaussian" */
    broadening?: "gaussian" | "lorentzian";
  };
}

type DeepRequired<T> = { [K in keyof T]-?: T[K] extends object | undefined ? Required<NonNullable<T[K]>> : T[K] };

/** How the Kα2 question was settled. */
export interface ResolvedKAlpha2 {
  /** The mode asked for. */
  mode: "auto" | "yes" | "no";
  /** Kα2 stripped for detection and fitted as doublets (= Kα2 taken as present and λ2 known). */
  enabled: boolean;
  ratio: number;
  /** Kα2 present in the scan: the decision (null when no Kα2 wavelength is known). */
  present: boolean | null;
  /**
   * "mode": set by the caller; "profile": decided by the doublet-versus-singlet test on the peak shapes;
   * "default": the test could not tell and Kα2 was assumed present (usual for a tube without monochromator);
   * "no-wavelength": no Kα2 wavelength known for the radiation.
   */
  decidedBy: "mode" | "profile" | "default" | "no-wavelength";
  /** Evidence of the profile test (mode "auto"): peaks compared, summed ΔBIC (positive favours Kα2) and where. */
  evidence?: { peaks: number; deltaBic: number; twoTheta: number[] };
}

/** The parameters actually used, every default filled in and "auto" replaced by the value chosen. */
export interface ResolvedProcessParams
  extends Omit<DeepRequired<ProcessParams>, "anode" | "wavelength" | "wavelength2" | "smoothing" | "background" | "kAlpha2"> {
  anode: Anode | null;
  wavelength: number;
  wavelength2: number | null;
  /** Where the wavelength came from. */
  wavelengthSource: "params" | "file" | "default";
  smoothing: { enabled: boolean; windowSize: number; polynomial: number };
  background: {
    enabled: boolean;
    iterations: number;
    halfWidthDeg: number;
    lls: boolean;
    decreasing: boolean;
    biasCorrection: boolean;
    /** SNIP ran on block means of this many points (1 = on every point), keeping its cost linear. */
    decimation: number;
  };
  kAlpha2: ResolvedKAlpha2;
  /** Median 2θ step of the scan, °. */
  stepDeg: number;
  /**
   * Even step the smoothing and background were computed on when the scan's own steps are uneven (the results are
   * mapped back to the measured points), else null.
   */
  resampledStepDeg: number | null;
}

/** Output of {@link processScan}. All arrays have the scan's length; intensities in counts. */
export interface ProcessedScan {
  params: ResolvedProcessParams;
  /** Wavelength used for d (Kα1 when the anode is known), Å. */
  wavelength: number;
  twoTheta: Float64Array;
  raw: Float64Array;
  smoothed: Float64Array;
  background: Float64Array;
  /** Background + Kα1-only net signal (smoothed, Rachinger-stripped); equals `smoothed` when stripping is off. */
  stripped: Float64Array;
  /** Background + fitted model (Kα1 + Kα2 lines and local baselines inside fitted windows). */
  fitted: Float64Array;
  peaks: Peak[];
  /** Things the analyst should know (assumed wavelength, smoothing skipped, uneven steps…). */
  warnings: string[];
  /** Scherrer assumptions, when sizes were computed. */
  scherrerAssumptions?: string;
}

/** Largest SNIP window run directly; wider windows run on block means (see `snipLinear`). */
const SNIP_MAX_WINDOW = 40;
/** Largest automatic Savitzky–Golay window, points: past it the filter costs more than it gains. */
const SG_MAX_AUTO_WINDOW = 31;
/** Largest resampling grid, as a multiple of the measured points. */
const MAX_RESAMPLE_FACTOR = 20;

interface StepInfo {
  median: number;
  min: number;
  max: number;
  /** Steps are uneven beyond rounding jitter: points drift more than half a mean step from an even grid. */
  uneven: boolean;
}

function stepInfo(x: Float64Array): StepInfo {
  const n = x.length;
  const d = new Float64Array(n - 1);
  let min = Infinity;
  let max = -Infinity;
  for (let i = 1; i < n; i++) {
    const s = x[i] - x[i - 1];
    d[i - 1] = s;
    if (s < min) min = s;
    if (s > max) max = s;
  }
  // An even step (up to rounding of the written angles) needs no sort: every step is the median to 1e-9.
  const median = max - min <= 1e-9 * max ? d[(n - 1) >> 1] : d.sort()[(n - 1) >> 1];
  const mean = (x[n - 1] - x[0]) / (n - 1);
  let uneven = false;
  for (let i = 1; i < n - 1 && !uneven; i++) if (Math.abs(x[i] - (x[0] + i * mean)) > 0.5 * mean) uneven = true;
  return { median, min, max, uneven };
}

/** Linear interpolation of (x, y) at the even grid x0 + i·step, i < count (x increasing). */
function toGrid(x: Float64Array, y: ArrayLike<number>, x0: number, step: number, count: number): Float64Array {
  const out = new Float64Array(count);
  const n = x.length;
  let j = 0;
  for (let i = 0; i < count; i++) {
    const g = x0 + i * step;
    while (j < n - 2 && x[j + 1] < g) j++;
    const t = (g - x[j]) / (x[j + 1] - x[j]);
    out[i] = y[j] + Math.min(1, Math.max(0, t)) * (y[j + 1] - y[j]);
  }
  return out;
}

/** Linear interpolation of a curve on the even grid x0 + i·step at the points x. */
function fromGrid(g: Float64Array, x0: number, step: number, x: Float64Array): Float64Array {
  const out = new Float64Array(x.length);
  const last = g.length - 1;
  for (let i = 0; i < x.length; i++) {
    const u = (x[i] - x0) / step;
    const k = Math.min(last - 1, Math.max(0, Math.floor(u)));
    const t = Math.min(1, Math.max(0, u - k));
    out[i] = g[k] + t * (g[k + 1] - g[k]);
  }
  return out;
}

/**
 * SNIP with a window of m points in linear time: for m ≤ SNIP_MAX_WINDOW as published (cost n·m); for wider windows
 * on means of `f` consecutive points with the window m/f (the same half-width in °2θ), interpolated back and kept
 * at or below the signal — SNIP's own guarantee. The background varies slowly, so block means lose nothing it
 * needs; the cost stays about n·SNIP_MAX_WINDOW whatever the step.
 */
function snipLinear(y: Float64Array, o: { enabled: boolean; iterations: number; lls: boolean; decreasing: boolean; decimation: number }): Float64Array {
  const f = o.decimation;
  if (!o.enabled || f <= 1) return snipBackground(y, o);
  const n = y.length;
  const nc = Math.ceil(n / f);
  const coarse = new Float64Array(nc);
  for (let c = 0; c < nc; c++) {
    const a = c * f;
    const b = Math.min(n, a + f);
    let s = 0;
    for (let i = a; i < b; i++) s += y[i];
    coarse[c] = s / (b - a);
  }
  const bc = snipBackground(coarse, { ...o, iterations: Math.max(1, Math.round(o.iterations / f)) });
  const out = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    // Block c is centred at index c·f + (f−1)/2.
    const u = (i - (f - 1) / 2) / f;
    const k = Math.min(nc - 2, Math.max(0, Math.floor(u)));
    const t = nc > 1 ? Math.min(1, Math.max(0, u - k)) : 0;
    const v = nc > 1 ? bc[k] + t * (bc[k + 1] - bc[k]) : bc[0];
    out[i] = v < y[i] ? v : y[i];
  }
  return out;
}

/** Even grid the filters run on when the scan's steps are uneven. */
interface WorkGrid {
  x0: number;
  step: number;
  count: number;
}

/**
 * Resolve processing parameters against a scan: defaults, "auto" choices and the wavelength.
 * The Kα2 decision of mode "auto" needs the profiles, so it is left open here (`present: null`) and made by
 * {@link processScan}.
 * @throws RangeError when no wavelength can be decided (`fallbackAnode: null`), a parameter is invalid or the steps
 * are too uneven to resample
 */
export function resolveProcessParams(
  scan: Scan,
  params: ProcessParams = {},
): { params: ResolvedProcessParams; warnings: string[]; lambda2: number | null; grid: WorkGrid | null } {
  const warnings: string[] = [];
  const x = scan.twoTheta;
  const n = x.length;
  const steps = stepInfo(x);
  const step = steps.median;
  let grid: WorkGrid | null = null;
  if (steps.uneven) {
    const count = Math.floor((x[n - 1] - x[0]) / step + 1e-9) + 1;
    if (count > MAX_RESAMPLE_FACTOR * n + 1000) {
      throw new RangeError(
        `2θ steps vary from ${steps.min.toPrecision(3)}° to ${steps.max.toPrecision(3)}°: resampling the scan to an even ${step.toPrecision(3)}° step would need ${count} points, more than ${MAX_RESAMPLE_FACTOR} × the ${n} measured; split the file into its even-step parts`,
      );
    }
    grid = { x0: x[0], step, count };
    warnings.push(
      `2θ steps are uneven (${steps.min.toPrecision(3)}° to ${steps.max.toPrecision(3)}°): smoothing and background computed on an even ${step.toPrecision(3)}° grid and mapped back; peaks fitted on the measured points`,
    );
  }
  const fromParams = params.wavelength !== undefined || params.anode !== undefined;
  const fromFile = !fromParams && (scan.meta.wavelength !== undefined || scan.meta.anode !== undefined);
  const wl = resolveWavelength({
    anode: fromParams ? params.anode : scan.meta.anode,
    wavelength: fromParams ? params.wavelength : scan.meta.wavelength,
    wavelength2: fromParams ? params.wavelength2 : (params.wavelength2 ?? scan.meta.wavelength2),
    fallbackAnode: params.fallbackAnode === undefined ? "Cu" : params.fallbackAnode,
  });
  warnings.push(...wl.notes);
  const expectedFwhmDeg = params.expectedFwhmDeg ?? 0.1;
  if (!(expectedFwhmDeg > 0)) throw new RangeError(`expectedFwhmDeg must be > 0, got ${expectedFwhmDeg}`);
  const sm = params.smoothing ?? {};
  let smEnabled = sm.enabled ?? true;
  let windowSize =
    sm.windowSize === undefined || sm.windowSize === "auto" ? windowForFwhm(Math.min(expectedFwhmDeg / step, SG_MAX_AUTO_WINDOW)) : sm.windowSize;
  if (smEnabled && windowSize === 0) {
    smEnabled = false;
    windowSize = 5;
    warnings.push(`expected FWHM ${expectedFwhmDeg}° is under 5 steps of ${step.toPrecision(3)}°: smoothing skipped`);
  }
  const bg = params.background ?? {};
  const halfWidthDeg = bg.halfWidthDeg ?? 0.6;
  const iterations = bg.iterations === undefined || bg.iterations === "auto" ? Math.max(1, Math.round(halfWidthDeg / step)) : bg.iterations;
  const decimation = iterations > SNIP_MAX_WINDOW ? Math.ceil(iterations / SNIP_MAX_WINDOW) : 1;
  const k2 = params.kAlpha2 ?? {};
  const mode: ResolvedKAlpha2["mode"] = k2.enabled === false ? "no" : (k2.mode ?? "auto");
  if (mode !== "auto" && mode !== "yes" && mode !== "no") throw new RangeError(`kAlpha2.mode must be "auto", "yes" or "no", got ${String(mode)}`);
  const ratio = k2.ratio ?? 0.5;
  const lambda2 = wl.wavelength2 ?? null;
  let kAlpha2: ResolvedKAlpha2;
  if (mode === "no") kAlpha2 = { mode, enabled: false, ratio, present: false, decidedBy: "mode" };
  else if (lambda2 === null) {
    kAlpha2 = { mode, enabled: false, ratio, present: null, decidedBy: "no-wavelength" };
    warnings.push("no Kα2 wavelength known for this radiation: Kα2 not stripped, single lines fitted");
  } else if (mode === "yes") kAlpha2 = { mode, enabled: true, ratio, present: true, decidedBy: "mode" };
  else kAlpha2 = { mode, enabled: true, ratio, present: null, decidedBy: "profile" };
  let noiseModel = params.noise?.model ?? "auto";
  if (noiseModel === "auto" && scan.meta.intensityUnit === "cps" && !scan.esd) noiseModel = "empirical";
  const fit = params.fitting ?? {};
  const sch = params.scherrer ?? {};
  const cor = params.correction ?? {};
  const resolved: ResolvedProcessParams = {
    anode: wl.anode ?? null,
    wavelength: wl.wavelength,
    wavelength2: lambda2,
    wavelengthSource: fromParams ? "params" : fromFile ? "file" : "default",
    fallbackAnode: params.fallbackAnode === undefined ? "Cu" : params.fallbackAnode,
    expectedFwhmDeg,
    stepDeg: step,
    resampledStepDeg: grid ? grid.step : null,
    smoothing: { enabled: smEnabled, windowSize, polynomial: sm.polynomial ?? 2 },
    background: {
      enabled: bg.enabled ?? true,
      iterations,
      halfWidthDeg,
      lls: bg.lls ?? true,
      decreasing: bg.decreasing ?? false,
      biasCorrection: bg.biasCorrection ?? true,
      decimation,
    },
    kAlpha2,
    noise: { model: noiseModel },
    peaks: {
      k: params.peaks?.k ?? 3,
      minProminenceSigma: params.peaks?.minProminenceSigma ?? 3,
      minFwhmPoints: params.peaks?.minFwhmPoints ?? 1.5,
      maxPeaks: params.peaks?.maxPeaks ?? 300,
      maxSearchPoints: params.peaks?.maxSearchPoints ?? 200,
    },
    fitting: {
      enabled: fit.enabled ?? true,
      windowFwhm: fit.windowFwhm ?? 4,
      maxGroupSize: fit.maxGroupSize ?? 6,
      maxIterations: fit.maxIterations ?? 60,
      baseline: fit.baseline ?? "linear",
      eta: fit.eta ?? "fit",
      minFwhmDeg: fit.minFwhmDeg ?? 0.005,
      maxFwhmDeg: fit.maxFwhmDeg ?? 3,
    },
    correction: { zeroShiftDeg: cor.zeroShiftDeg ?? 0, displacementMm: cor.displacementMm ?? 0, radiusMm: cor.radiusMm ?? 240 },
    scherrer: {
      enabled: sch.enabled ?? false,
      K: sch.K ?? 0.9,
      instrumentalFwhmDeg: sch.instrumentalFwhmDeg ?? 0,
      broadening: sch.broadening ?? "gaussian",
    },
  };
  return { params: resolved, warnings, lambda2, grid };
}

/**
 * Process a scan: Savitzky–Golay smoothing → SNIP background → Kα2 present or not (from the peak shapes unless the
 * caller says, see `detectKAlpha2`) → Rachinger Kα2 stripping when present → peak detection (k·σ from counting
 * statistics) → pseudo-Voigt fitting of Kα1(+Kα2) in windows → zero/displacement correction → d (Bragg), relative
 * intensity (strongest height = 100) and optional Scherrer size. Uneven steps: smoothing and SNIP run on an even grid
 * and are mapped back; everything else works on the measured points. Cost is linear in the number of points (SNIP on
 * block means past 40 points, capped automatic smoothing window, peak fits on each peak's own support). The raw data
 * are never modified; the reader's warnings (`scan.meta.warnings`) come first in `warnings`.
 * @param scan - a parsed scan (see `parseScan`)
 * @param params - processing parameters (all optional)
 * @returns curves, peaks and the full parameters actually used (with the Kα2 decision in `params.kAlpha2`)
 * @throws RangeError for invalid parameters, when no wavelength can be decided, or when the steps are too uneven to
 * resample
 */
export function processScan(scan: Scan, params: ProcessParams = {}): ProcessedScan {
  const n = scan.twoTheta.length;
  if (n < 7) throw new RangeError(`scan has ${n} points; at least 7 are needed`);
  const resolvedAll = resolveProcessParams(scan, params);
  const { params: p, lambda2, grid } = resolvedAll;
  const warnings = [...(scan.meta.warnings ?? []), ...resolvedAll.warnings];
  const twoTheta = Float64Array.from(scan.twoTheta);
  const raw = Float64Array.from(scan.counts);
  // Smoothing and SNIP assume an even step: on uneven scans they run on an even grid and are mapped back.
  let smoothed: Float64Array;
  let snip: Float64Array;
  if (grid) {
    const g = toGrid(twoTheta, raw, grid.x0, grid.step, grid.count);
    const gs = smoothSavitzkyGolay(g, p.smoothing);
    const gb = snipLinear(gs, p.background);
    smoothed = fromGrid(gs, grid.x0, grid.step, twoTheta);
    snip = fromGrid(gb, grid.x0, grid.step, twoTheta);
    for (let i = 0; i < n; i++) if (snip[i] > smoothed[i]) snip[i] = smoothed[i];
  } else {
    smoothed = smoothSavitzkyGolay(raw, p.smoothing);
    snip = snipLinear(smoothed, p.background);
  }
  // Noise: variance of each raw point (counting statistics), and σ at background level after smoothing.
  const noise = countingVariance(raw, smoothed, scan.esd, p.noise);
  const gain = p.smoothing.enabled ? savitzkyGolayNoiseGain(p.smoothing.windowSize, p.smoothing.polynomial) : 1;
  // On a resampled scan a coarse stretch has fewer independent points per window than grid points: the smoothing
  // gain there is larger, about gain·√(local step / grid step) (white noise), at most 1.
  const gainAt = (i: number): number => {
    if (!grid || gain >= 1) return gain;
    const a = Math.min(n - 2, i);
    return Math.min(1, gain * Math.sqrt(Math.max(1, (twoTheta[a + 1] - twoTheta[a]) / grid.step)));
  };
  const sigmaBgRaw = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    const v =
      noise.model === "poisson"
        ? Math.max(snip[i], 1)
        : noise.model === "empirical"
          ? noise.scale * noise.scale * Math.max(snip[i], 1e-12)
          : noise.variance[i];
    sigmaBgRaw[i] = Math.sqrt(Math.max(v, 1e-12));
  }
  const sigmaSmoothed = sigmaBgRaw.map((v, i) => v * gainAt(i));
  const background =
    p.background.enabled && p.background.biasCorrection
      ? correctClippingBias(smoothed, snip, sigmaSmoothed).background
      : snip;
  const netSmoothed = new Float64Array(n);
  for (let i = 0; i < n; i++) netSmoothed[i] = smoothed[i] - background[i];
  const rawNet = new Float64Array(n);
  for (let i = 0; i < n; i++) rawNet[i] = raw[i] - background[i];
  // Detection σ: counting noise of the local total intensity (peak tails included), through smoothing (and
  // stripping, which adds the variance of the subtracted Kα2 estimate).
  const sigmaLocal = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    const v =
      noise.model === "poisson"
        ? Math.max(smoothed[i], background[i], 1)
        : noise.model === "empirical"
          ? noise.scale * noise.scale * Math.max(smoothed[i], background[i], 1e-12)
          : noise.variance[i];
    sigmaLocal[i] = Math.sqrt(Math.max(v, 1e-12)) * gainAt(i);
  }

  // Kα2: decided from the peak shapes unless the caller said.
  let unstrippedPeaks: ReturnType<typeof detectPeaks> | null = null;
  if (p.kAlpha2.mode === "auto" && lambda2 !== null) {
    unstrippedPeaks = detectPeaks(twoTheta, netSmoothed, sigmaLocal, p.peaks);
    const det = detectKAlpha2(twoTheta, rawNet, noise.variance, unstrippedPeaks, p.wavelength, lambda2, { ratio: p.kAlpha2.ratio });
    const present = det.present ?? true;
    p.kAlpha2 = {
      ...p.kAlpha2,
      present,
      enabled: present,
      decidedBy: det.present === null ? "default" : "profile",
      evidence: { peaks: det.peaks.length, deltaBic: Math.round(det.deltaBic * 10) / 10, twoTheta: det.peaks.map((q) => Math.round(q.twoTheta * 1000) / 1000) },
    };
    if (det.present === false) {
      warnings.push(
        `no Kα2 in the peak shapes (doublet fits worse than single lines on ${det.peaks.length} peak${det.peaks.length === 1 ? "" : "s"}): treated as a Kα1-only scan, Kα2 not stripped`,
      );
    } else if (det.present === null) {
      warnings.push(
        det.peaks.length === 0
          ? "no isolated peak clear enough to tell whether Kα2 is present: assumed present (a tube without monochromator); set Kα2 to present or absent if known"
          : "the peak shapes do not tell whether Kα2 is present: assumed present (a tube without monochromator); set Kα2 to present or absent if known",
      );
    }
  }
  const stripK2 = p.kAlpha2.enabled && lambda2 !== null;
  const strippedNet = stripK2
    ? stripKAlpha2(twoTheta, netSmoothed, p.wavelength, lambda2 as number, { ratio: p.kAlpha2.ratio })
    : netSmoothed;
  const stripped = new Float64Array(n);
  for (let i = 0; i < n; i++) stripped[i] = background[i] + strippedNet[i];

  let detected: ReturnType<typeof detectPeaks>;
  if (!stripK2 && unstrippedPeaks) detected = unstrippedPeaks;
  else {
    const stripGain = stripK2 ? Math.sqrt(1 + p.kAlpha2.ratio * p.kAlpha2.ratio) : 1;
    const sigmaDetect = stripGain === 1 ? sigmaLocal : sigmaLocal.map((v) => v * stripGain);
    detected = detectPeaks(twoTheta, strippedNet, sigmaDetect, p.peaks);
  }

  // Fit on the raw net counts with proper weights; Kα2 modelled as a companion line when stripping is on.
  const fitted = Float64Array.from(background);
  let fittedPeaks: FittedPeak[];
  if (p.fitting.enabled && detected.length > 0) {
    const res = fitPeaks(
      twoTheta,
      rawNet,
      noise.variance,
      detected.map((d) => ({ twoTheta: d.twoTheta, height: d.height, fwhm: d.fwhm })),
      {
        ...p.fitting,
        doublet: stripK2 ? { lambda1: p.wavelength, lambda2: lambda2 as number, ratio: p.kAlpha2.ratio } : null,
      },
    );
    for (let i = 0; i < n; i++) fitted[i] += res.model[i];
    fittedPeaks = acceptFitted(res.peaks, twoTheta, sigmaBgRaw, p);
  } else {
    fittedPeaks = detected.map((d) => ({
      twoTheta: d.twoTheta,
      twoThetaEsd: NaN,
      area: pseudoVoigtArea(d.height, d.fwhm, 0.5),
      areaEsd: NaN,
      height: d.height,
      fwhm: d.fwhm,
      fwhmEsd: NaN,
      eta: NaN,
      etaEsd: NaN,
      chi2Reduced: NaN,
      group: -1,
      converged: false,
      iterations: 0,
      points: 0,
    }));
  }
  const maxHeight = fittedPeaks.reduce((m, f) => Math.max(m, f.height), 0);
  let scherrerAssumptions: string | undefined;
  const peaks: Peak[] = fittedPeaks.map((f) => {
    const x = correctTwoTheta(f.twoTheta, p.correction);
    const d = dFromTwoTheta(x, p.wavelength);
    const peak: Peak = {
      twoTheta: x,
      d,
      height: f.height,
      area: f.area,
      fwhm: f.fwhm,
      intensity: maxHeight > 0 ? (f.height / maxHeight) * 100 : 0,
    };
    if (Number.isFinite(f.fwhmEsd)) peak.fwhmEsd = f.fwhmEsd;
    if (Number.isFinite(f.eta)) peak.eta = f.eta;
    if (Number.isFinite(f.twoThetaEsd)) {
      peak.twoThetaEsd = f.twoThetaEsd;
      peak.dEsd = dUncertainty(d, x, f.twoThetaEsd);
    }
    if (Number.isFinite(f.areaEsd)) peak.areaEsd = f.areaEsd;
    if (p.scherrer.enabled) {
      const s = scherrer({
        fwhmDeg: f.fwhm,
        twoThetaDeg: x,
        wavelengthA: p.wavelength,
        instrumentalFwhmDeg: p.scherrer.instrumentalFwhmDeg,
        K: p.scherrer.K,
        broadening: p.scherrer.broadening,
      });
      scherrerAssumptions = s.assumptions.replace(/ Peak not broader.*$/, "");
      if (Number.isFinite(s.sizeNm)) peak.crystalliteNm = s.sizeNm;
    }
    return peak;
  });
  return {
    params: p,
    wavelength: p.wavelength,
    twoTheta,
    raw,
    smoothed,
    background,
    stripped,
    fitted,
    peaks,
    warnings,
    ...(scherrerAssumptions ? { scherrerAssumptions } : {}),
  };
}

/** Drop fitted peaks that collapsed (below k·σ, at the width limits) and merge peaks that converged together. */
function acceptFitted(peaks: FittedPeak[], twoTheta: Float64Array, sigma: Float64Array, p: ResolvedProcessParams): FittedPeak[] {
  const out: FittedPeak[] = [];
  for (const f of peaks) {
    if (!(f.area > 0) || !Number.isFinite(f.height) || !Number.isFinite(f.twoTheta)) continue;
    // Collapsed or runaway fits: width at a bound, or area not significant.
    if (f.fwhm >= p.fitting.maxFwhmDeg * 0.999 || f.fwhm <= p.fitting.minFwhmDeg * 1.001) continue;
    if (Number.isFinite(f.areaEsd) && f.area < p.peaks.k * f.areaEsd) continue;
    let lo = 0;
    let hi = twoTheta.length - 1;
    while (hi - lo > 1) {
      const mid = (lo + hi) >> 1;
      if (twoTheta[mid] <= f.twoTheta) lo = mid;
      else hi = mid;
    }
    if (f.height < p.peaks.k * sigma[lo]) continue;
    // Narrower than detection allows (minFwhmPoints local steps): a spike on one or two points, not a resolved peak.
    if (f.fwhm < p.peaks.minFwhmPoints * (twoTheta[Math.min(lo + 1, twoTheta.length - 1)] - twoTheta[lo])) continue;
    const prev = out[out.length - 1];
    if (prev && f.twoTheta - prev.twoTheta < 0.3 * Math.min(prev.fwhm, f.fwhm)) {
      if (f.height > prev.height) out[out.length - 1] = f;
      continue;
    }
    out.push(f);
  }
  return out;
}
