/**
 * Caution wording, the product's own (advisory, common practice: the application defers to local regulations, site procedures
 * and licensed/accredited practice). Keep these strings verbatim; tests and screens rely on them.
 */
export const ASBESTOS_CAUTION =
  "Possible asbestiform mineral. XRD identifies the mineral species but cannot establish asbestiform (fibrous) habit, and its detection limit (~1 %) may exceed regulatory thresholds. Handle the sample as potentially hazardous and obtain confirmation by accredited methods (e.g. polarized light microscopy, electron microscopy) before reporting.";

export const SILICA_CAUTION =
  "Crushing, milling and sieving rock creates respirable crystalline silica dust (quartz, cristobalite), a recognised human carcinogen and cause of silicosis. Use enclosed or wet methods, local exhaust ventilation and respiratory protection as required by local limits (e.g. US OSHA 50 µg/m³ 8-h TWA).";

export const CANDIDATES_NOTICE =
  "Ranked candidates are suggestions computed from peak positions and intensities. They are not an identification. A qualified analyst must confirm each phase; semi-quantitative percentages are estimates with large uncertainty and are not accredited results.";

export const XRAY_EQUIPMENT_NOTE =
  "Diffractometers are operated under your jurisdiction's radiation-safety regulations and your facility's licence/registration, interlocks and local rules. This application does not control instruments.";

export const OTHER_HAZARD_NOTE: Record<string, string> = {
  radioactive: "Radioactive mineral: follow site handling and storage rules and local radiation-protection requirements; label sacks.",
  "toxic-arsenic": "Arsenic-bearing mineral: follow site handling and storage rules; avoid dust; label sacks.",
  "toxic-lead": "Lead-bearing mineral: follow site handling and storage rules; avoid dust; label sacks.",
  "toxic-mercury": "Mercury-bearing mineral: follow site handling and storage rules; label sacks.",
};
