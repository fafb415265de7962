/**
 * Caution texts shown in exports, reports and shared registers. Our own wording
 * (common practice); it is advisory and defers to local regulations and accredited practice. Pure.
 */

/** Limits of automated identification (common practice: ranked candidates are not an identification). */
export const IDENTIFICATION_CAVEAT =
  "Ranked candidates are suggestions computed from peak positions and intensities. They are not an identification. A qualified analyst must confirm each phase; semi-quantitative percentages are estimates with large uncertainty and are not accredited results.";

/** How this register separates the two (our wording). */
export const CONFIRMED_VS_CANDIDATE =
  "Confirmed phases were accepted by a lab analyst on a signed-off scan. Candidates are listed separately and marked unconfirmed.";

/** Asbestiform minerals (PLM/TEM confirmation: common practice, e.g. US EPA 600/R-93/116). */
export const ASBESTOS_CAVEAT =
  "Possible asbestiform mineral. XRD identifies the mineral species but cannot establish asbestiform (fibrous) habit, and its detection limit (~1 %) may exceed regulatory thresholds. Handle the sample as potentially hazardous and obtain confirmation by accredited methods (e.g. polarized light microscopy, electron microscopy) before reporting.";

/** Respirable crystalline silica (US OSHA 29 CFR 1910.1053, PEL 50 µg/m³ 8-h TWA; IARC Monograph 100C, 2012). */
export const SILICA_CAVEAT =
  "Crushing, milling and sieving rock creates respirable crystalline silica dust (quartz, cristobalite), a recognised human carcinogen and cause of silicosis. Use enclosed or wet methods, local exhaust ventilation and respiratory protection as required by local limits (e.g. US OSHA 50 µg/m³ 8-h TWA).";

/** Species that occur in asbestiform habit (common practice). */
export const ASBESTIFORM_MINERALS = ["chrysotile", "riebeckite", "grunerite", "anthophyllite", "tremolite", "actinolite", "erionite"] as const;

/** Whether a phase calls for the asbestos caution: by the reference's hazard tag or by name. */
export function isAsbestiform(phase: { mineral: string; hazard?: string | null }): boolean {
  if (phase.hazard === "asbestos") return true;
  const base = phase.mineral.trim().toLowerCase().split(/[\s\-_(,]/)[0];
  return (ASBESTIFORM_MINERALS as readonly string[]).includes(base);
}
