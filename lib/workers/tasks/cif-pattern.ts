/** Worker task: the calculated pattern of a stored CIF for one wavelength and 2θ range. */
import { computePatternDetailed, parseCif } from "@/lib/science/crystal";

export default function cifPattern(input: { cifText: string; wavelength: number; twoThetaMax: number; minIntensity: number }) {
  const result = computePatternDetailed(parseCif(input.cifText), { wavelength: input.wavelength, twoThetaMax: input.twoThetaMax, minIntensity: input.minIntensity });
  return {
    warnings: result.warnings,
    lines: result.lines.map((l) => ({ h: l.h, k: l.k, l: l.l, d: l.d, twoTheta: l.twoTheta, intensity: l.intensity, multiplicity: l.multiplicity })),
  };
}
