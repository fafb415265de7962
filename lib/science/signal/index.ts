/** Scan processing: smoothing, background, Kα2 stripping, peak detection and fitting, corrections, Scherrer size. */
export { processScan, resolveProcessParams, type ProcessParams, type ProcessedScan, type ResolvedProcessParams, type ResolvedKAlpha2 } from "./process-scan";
export { smoothSavitzkyGolay, savitzkyGolayNoiseGain, windowForFwhm, type SmoothingOptions } from "./smoothing";
export { snipBackground, correctClippingBias, type SnipOptions, type ClippingBiasOptions } from "./background";
export { stripKAlpha2, kAlpha2Separation, kAlpha2SeparationApprox, type KAlpha2Options } from "./kalpha2";
export { detectKAlpha2, type DetectKAlpha2Options, type KAlpha2Detection, type KAlpha2PeakEvidence } from "./kalpha2-detect";
export { countingVariance, type NoiseOptions, type NoiseEstimate } from "./noise";
export { detectPeaks, type DetectPeaksOptions, type DetectedPeak } from "./detect-peaks";
export { fitPeaks, fitPeaksInWindow, type FitPeaksOptions, type FitPeaksResult, type FittedPeak, type PeakGuess, type DoubletModel, type WindowFit } from "./fit-peaks";
export { pseudoVoigt, pseudoVoigtHeight, pseudoVoigtArea, pseudoVoigtWithGradient } from "./pseudo-voigt";
export { displacementShift, correctTwoTheta, type TwoThetaCorrection } from "./corrections";
export { scherrer, type ScherrerInput, type ScherrerResult } from "./scherrer";
