/**
 * The processing record of a run (lib/jobs RunParams: `resolved.processing` = the science core's
 * ResolvedProcessParams) as sentences for the report's Methods section, numbers rounded to what the
 * instrument resolves: angles and steps to 0.0001° 2θ (goniometer step resolution of laboratory
 * diffractometers, common practice), wavelengths to 5 decimals (as tabulated by Hölzer et al. 1997),
 * other numbers to 4 significant digits. Pure; reads the record defensively (older runs may lack fields).
 */

type Rec = Record<string, unknown>;
const obj = (v: unknown): Rec | null => (v && typeof v === "object" && !Array.isArray(v) ? (v as Rec) : null);
const num = (v: unknown): number | null => (typeof v === "number" && Number.isFinite(v) ? v : null);

/** Fixed decimals, trailing zeros dropped: 0.019999999999999574 → "0.02". */
export function roundTo(v: number, decimals: number): string {
  const s = v.toFixed(decimals);
  return s.includes(".") ? s.replace(/0+$/, "").replace(/\.$/, "") : s;
}
/** An angle in ° 2θ to the instrument's resolution (0.0001°). */
export const angle = (v: number) => roundTo(v, 4);
/** Other quantities: 4 significant digits, no exponent for ordinary magnitudes. */
export const sig = (v: number) => String(Number(v.toPrecision(4)));

/** Sentences describing one processing record; [] when there is nothing readable. */
export function processingSentences(params: Rec): string[] {
  const resolved = obj(params.resolved);
  const p = obj(resolved?.processing) ?? (obj(params.requested) ? null : params);
  if (!p) return ["Processed with the default settings of this software version (the run did not record its resolved settings)."];
  const out: string[] = [];

  const wl = num(p.wavelength);
  const wl2 = num(p.wavelength2);
  const source = p.wavelengthSource === "file" ? "read from the scan file" : p.wavelengthSource === "params" ? "entered by the analyst" : p.wavelengthSource === "default" ? "assumed (none in the file)" : null;
  if (wl !== null) {
    out.push(`Radiation ${typeof p.anode === "string" ? `${p.anode} ` : ""}Kα1, λ = ${roundTo(wl, 5)} Å${wl2 !== null ? ` (Kα2 ${roundTo(wl2, 5)} Å)` : ""}${source ? `, ${source}` : ""}.`);
  }
  const step = num(p.stepDeg);
  const resampled = num(p.resampledStepDeg);
  if (step !== null) out.push(`Data step ${angle(step)}° 2θ${resampled !== null ? `; uneven steps were resampled to ${angle(resampled)}° for smoothing and background` : ""}.`);

  const sm = obj(p.smoothing);
  if (sm) {
    out.push(
      sm.enabled === false
        ? "No smoothing."
        : `Savitzky–Golay smoothing (Savitzky & Golay 1964)${num(sm.windowSize) !== null ? ` over ${sm.windowSize} points` : ""}${num(sm.polynomial) !== null ? `, polynomial order ${sm.polynomial}` : ""}.`,
    );
  }
  const bg = obj(p.background);
  if (bg) {
    if (bg.enabled === false) out.push("No background subtraction.");
    else {
      const parts = [
        num(bg.halfWidthDeg) !== null ? `clipping half-width ${angle(bg.halfWidthDeg as number)}° 2θ` : null,
        num(bg.iterations) !== null ? `${bg.iterations} iterations` : null,
        bg.lls === true ? "on log-log-square-root scaled counts" : null,
        bg.decreasing === true ? "decreasing window" : null,
      ].filter(Boolean);
      out.push(`Background by SNIP (Ryan et al. 1988; Morháč et al. 1997)${parts.length ? `, ${parts.join(", ")}` : ""}.`);
    }
  }
  const k2 = obj(p.kAlpha2);
  if (k2) {
    const why = k2.decidedBy === "profile" ? "decided from the peak profiles" : k2.decidedBy === "default" ? "assumed present" : k2.decidedBy === "no-wavelength" ? "no Kα2 wavelength known for this radiation" : "as set by the analyst";
    out.push(k2.enabled === true ? `Kα2 stripped (Rachinger 1948)${num(k2.ratio) !== null ? ` with intensity ratio ${sig(k2.ratio as number)}` : ""}, ${why}.` : `Kα2 not stripped (${why}).`);
  }
  const fit = obj(p.fitting);
  if (fit && fit.enabled !== false) {
    out.push(`Peak positions from profile fits (pseudo-Voigt)${typeof fit.baseline === "string" ? ` with a ${fit.baseline} local baseline` : ""}${num(fit.minFwhmDeg) !== null && num(fit.maxFwhmDeg) !== null ? `, FWHM between ${angle(fit.minFwhmDeg as number)}° and ${angle(fit.maxFwhmDeg as number)}° 2θ` : ""}.`);
  }
  const cor = obj(p.correction);
  if (cor && (num(cor.zeroShiftDeg) || num(cor.displacementMm))) {
    out.push(`Angles corrected for ${[num(cor.zeroShiftDeg) ? `a zero shift of ${angle(cor.zeroShiftDeg as number)}° 2θ` : null, num(cor.displacementMm) ? `a specimen displacement of ${sig(cor.displacementMm as number)} mm${num(cor.radiusMm) ? ` (goniometer radius ${sig(cor.radiusMm as number)} mm)` : ""}` : null].filter(Boolean).join(" and ")}.`);
  }
  const sch = obj(p.scherrer);
  if (sch && sch.enabled === true) {
    out.push(`Crystallite sizes by the Scherrer equation (Scherrer 1918; K = ${sig(num(sch.K) ?? 0.9)}${num(sch.instrumentalFwhmDeg) ? `, instrumental FWHM ${angle(sch.instrumentalFwhmDeg as number)}° 2θ removed, ${sch.broadening === "lorentzian" ? "Lorentzian" : "Gaussian"} broadening` : ""}); sizes are estimates.`);
  }
  return out;
}
