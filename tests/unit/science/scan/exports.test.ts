import { expect, test } from "vitest";
import * as scan from "@/lib/science/scan";
import * as signal from "@/lib/science/signal";

// The public API other modules code against (identification calls parseScan and processScan): an accidental
// removal or rename shows up here in review.
test("scan exports", () => {
  expect(Object.keys(scan).sort()).toEqual(
    ["DEFAULT_MAX_BYTES", "DEFAULT_MAX_POINTS", "DEFAULT_MIN_POINTS", "ScanParseError", "classifyColumnName", "detectFormat", "mapColumns", "parseCsv", "parsePdCif", "parseScan", "parseXy", "writeCsv", "writePdCif", "writeXy"].sort(),
  );
  expect(scan.DEFAULT_MAX_BYTES).toBe(50 * 1024 * 1024);
  expect(scan.DEFAULT_MAX_POINTS).toBe(2_000_000);
});

test("signal exports", () => {
  expect(Object.keys(signal).sort()).toEqual(
    [
      "correctClippingBias",
      "correctTwoTheta",
      "countingVariance",
      "detectKAlpha2",
      "detectPeaks",
      "displacementShift",
      "fitPeaks",
      "fitPeaksInWindow",
      "kAlpha2Separation",
      "kAlpha2SeparationApprox",
      "processScan",
      "pseudoVoigt",
      "pseudoVoigtArea",
      "pseudoVoigtHeight",
      "pseudoVoigtWithGradient",
      "resolveProcessParams",
      "savitzkyGolayNoiseGain",
      "scherrer",
      "smoothSavitzkyGolay",
      "snipBackground",
      "stripKAlpha2",
      "windowForFwhm",
    ].sort(),
  );
});
