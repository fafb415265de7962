/** Advisory safety notes for lab work (our own wording, common practice): they defer to local regulations and accredited practice. */

export const RADIATION_NOTE =
  "Diffractometers are operated under your jurisdiction's radiation-safety regulations and your facility's licence/registration, interlocks and local rules. This application does not control instruments.";
export const SILICA_NOTE =
  "Crushing, milling and sieving rock creates respirable crystalline silica dust (quartz, cristobalite), a recognised human carcinogen and cause of silicosis. Use enclosed or wet methods, local exhaust ventilation and respiratory protection as required by local limits (e.g. US OSHA 50 µg/m³ 8-h TWA).";
export const ASBESTOS_SAMPLE_NOTE =
  "Flagged at collection as suspected asbestos. Handle the bag as potentially hazardous before and during preparation and follow site rules and local regulations. XRD cannot establish asbestiform (fibrous) habit; obtain confirmation by accredited methods (e.g. polarized light microscopy, electron microscopy) before reporting.";

/** Red banner naming the flagged samples; renders nothing when there are none. */
export function AsbestosBanner({ codes }: { codes: string[] }) {
  if (codes.length === 0) return null;
  return (
    <div role="alert" className="rounded-md border border-danger/40 bg-red-50 px-3 py-2 text-sm text-danger">
      <p className="font-semibold">
        Suspected asbestos: {codes.join(", ")}
      </p>
      <p className="mt-1">{ASBESTOS_SAMPLE_NOTE}</p>
    </div>
  );
}

/** The radiation and silica notes, compact, for pages where lab work is recorded. */
export function LabSafetyNotes({ preparation = true }: { preparation?: boolean }) {
  return (
    <aside aria-label="Safety notes" className="space-y-1 rounded-md border border-oxide/30 bg-oxide-light px-3 py-2 text-xs text-ink">
      {preparation && (
        <p>
          <span className="font-semibold">Respirable crystalline silica. </span>
          {SILICA_NOTE}
        </p>
      )}
      <p>
        <span className="font-semibold">X-ray equipment. </span>
        {RADIATION_NOTE}
      </p>
    </aside>
  );
}
