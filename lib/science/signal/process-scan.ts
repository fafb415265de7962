import type { Anode, Peak, Scan } from "@/lib/science/types";
import { resolveWavelength } from "@/lib/science/anodes";
import { dFromTwoTheta, dUncertainty } from "@/lib/science/units";
import { correctClippingBias, snipBackground } from "./background";
import { correctTwoTheta } from "./corrections";
import { detectPeaks, type DetectPeaksOptions } from "./detect-peaks";
import { fitPeaks, type FittedPeak } from "./fit-peaks";
import { stripKAlpha2 } from "./kalpha2";
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
    /** Strip Kα2 (Rachinger) and fit Kα1+Kα2 doublets; needs λ2. @default true */
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

/** The parameters actually used, every default filled in and "auto" replaced by the value chosen. */
export interface ResolvedProcessParams
  extends Omit<DeepRequired<ProcessParams>, "anode" | "wavelength" | "wavelength2" | "smoothing" | "background"> {
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
  };
  /** Median 2θ step of the scan, °. */
  stepDeg: number;
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

function medianStep(x: Float64Array): { median: number; ratio: number } {
  const n = x.length;
  const d = new Float64Array(n - 1);
  for (let i = 1; i < n; i++) d[i - 1] = x[i] - x[i - 1];
  const s = d.slice().sort();
  const median = s[s.length >> 1];
  return { median, ratio: s[s.length - 1] / s[0] };
}

/**
 * Resolve processing parameters against a scan: defaults, "auto" choices and the wavelength.
 * @throws RangeError when no wavelength can be decided (`fallbackAnode: null`) or a parameter is invalid
 */
export function resolveProcessParams(scan: Scan, params: ProcessParams = {}): { params: ResolvedProcessParams; warnings: string[]; lambda2: number | null } {
  const warnings: string[] = [];
  const { median: step, ratio } = medianStep(scan.twoTheta);
  if (ratio > 1.5) warnings.push(`2θ steps are uneven (largest/smallest = ${ratio.toFixed(2)}); filters assume a constant step`);
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
  let windowSize = sm.windowSize === undefined || sm.windowSize === "auto" ? windowForFwhm(expectedFwhmDeg / step) : sm.windowSize;
  if (smEnabled && windowSize === 0) {
    smEnabled = false;
    windowSize = 5;
    warnings.push(`expected FWHM ${expectedFwhmDeg}° is under 5 steps of ${step.toPrecision(3)}°: smoothing skipped`);
  }
  const bg = params.background ?? {};
  const halfWidthDeg = bg.halfWidthDeg ?? 0.6;
  const iterations = bg.iterations === undefined || bg.iterations === "auto" ? Math.max(1, Math.round(halfWidthDeg / step)) : bg.iterations;
  const k2 = params.kAlpha2 ?? {};
  let k2Enabled = k2.enabled ?? true;
  const lambda2 = wl.wavelength2 ?? null;
  if (k2Enabled && lambda2 === null) {
    k2Enabled = false;
    warnings.push("no Kα2 wavelength known for this radiation: Kα2 not stripped, single lines fitted");
  }
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
    smoothing: { enabled: smEnabled, windowSize, polynomial: sm.polynomial ?? 2 },
    background: {
      enabled: bg.enabled ?? true,
      iterations,
      halfWidthDeg,
      lls: bg.lls ?? true,
      decreasing: bg.decreasing ?? false,
      biasCorrection: bg.biasCorrection ?? true,
    },
    kAlpha2: { enabled: k2Enabled, ratio: k2.ratio ?? 0.5 },
    noise: { model: params.noise?.model ?? "auto" },
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
  return { params: resolved, warnings, lambda2: k2Enabled ? lambda2 : null };
}

/**
 * Process a scan: Savitzky–Golay smoothing → SNIP background → Rachinger Kα2 stripping → peak detection (k·σ from
 * counting statistics) → pseudo-Voigt fitting of Kα1(+Kα2) in windows → zero/displacement correction → d (Bragg),
 * relative intensity (strongest height = 100) and optional Scherrer size. The raw data are never modified.
 * @param scan - a parsed scan (see `parseScan`)
 * @param params - processing parameters (all optional)
 * @returns curves, peaks and the full parameters actually used
 * @throws RangeError for invalid parameters or when no wavelength can be decided
 */
export function processScan(scan: Scan, params: ProcessParams = {}): ProcessedScan {
  const n = scan.twoTheta.length;
  if (n < 7) throw new RangeError(`scan has ${n} points; at least 7 are needed`);
  const { params: p, warnings, lambda2 } = resolveProcessParams(scan, params);
  const twoTheta = Float64Array.from(scan.twoTheta);
  const raw = Float64Array.from(scan.counts);
  const smoothed = smoothSavitzkyGolay(raw, p.smoothing);
  const snip = snipBackground(smoothed, p.background);
  // Noise: variance of each raw point (counting statistics), and σ at background level after smoothing.
  const noise = countingVariance(raw, smoothed, scan.esd, p.noise);
  const gain = p.smoothing.enabled ? savitzkyGolayNoiseGain(p.smoothing.windowSize, p.smoothing.polynomial) : 1;
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
  const sigmaSmoothed = sigmaBgRaw.map((v) => v * gain);
  const background =
    p.background.enabled && p.background.biasCorrection
      ? correctClippingBias(smoothed, snip, sigmaSmoothed).background
      : snip;
  const stripK2 = p.kAlpha2.enabled && lambda2 !== null;
  const netSmoothed = new Float64Array(n);
  for (let i = 0; i < n; i++) netSmoothed[i] = smoothed[i] - background[i];
  const strippedNet = stripK2
    ? stripKAlpha2(twoTheta, netSmoothed, p.wavelength, lambda2 as number, { ratio: p.kAlpha2.ratio })
    : netSmoothed;
  const stripped = new Float64Array(n);
  for (let i = 0; i < n; i++) stripped[i] = background[i] + strippedNet[i];

  const stripGain = stripK2 ? Math.sqrt(1 + p.kAlpha2.ratio * p.kAlpha2.ratio) : 1;
  // Detection σ: counting noise of the local total intensity (peak tails included), through smoothing and stripping.
  const sigmaDetect = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    const v =
      noise.model === "poisson"
        ? Math.max(smoothed[i], background[i], 1)
        : noise.model === "empirical"
          ? noise.scale * noise.scale * Math.max(smoothed[i], background[i], 1e-12)
          : noise.variance[i];
    sigmaDetect[i] = Math.sqrt(Math.max(v, 1e-12)) * gain * stripGain;
  }
  const detected = detectPeaks(twoTheta, strippedNet, sigmaDetect, p.peaks);

  // Fit on the raw net counts with proper weights; Kα2 modelled as a companion line when stripping is on.
  const fitted = Float64Array.from(background);
  let fittedPeaks: FittedPeak[];
  if (p.fitting.enabled && detected.length > 0) {
    const rawNet = new Float64Array(n);
    for (let i = 0; i < n; i++) rawNet[i] = raw[i] - background[i];
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
    const prev = out[out.length - 1];
    if (prev && f.twoTheta - prev.twoTheta < 0.3 * Math.min(prev.fwhm, f.fwhm)) {
      if (f.height > prev.height) out[out.length - 1] = f;
      continue;
    }
    out.push(f);
  }
  return out;
}
