import { cn } from "@/lib/utils";
import { ASBESTOS_CAUTION, CANDIDATES_NOTICE, OTHER_HAZARD_NOTE, SILICA_CAUTION } from "./caution-texts";

function Box({ tone, title, children, testId, className }: { tone: "danger" | "oxide" | "brand"; title: string; children: React.ReactNode; testId: string; className?: string }) {
  const tones = {
    danger: "border-danger/40 bg-red-50 text-ink",
    oxide: "border-oxide/40 bg-oxide-light text-ink",
    brand: "border-brand/30 bg-brand-light text-ink",
  };
  return (
    <div role="note" data-testid={testId} className={cn("rounded-md border-l-4 border px-3 py-2 text-sm", tones[tone], className)}>
      <p className="font-semibold">{title}</p>
      <p className="mt-0.5">{children}</p>
    </div>
  );
}

/** Asbestos-group caution naming the triggering minerals (PLM/TEM confirmation: common practice, e.g. US EPA 600/R-93/116). */
export function AsbestosCaution({ minerals, className }: { minerals: string[]; className?: string }) {
  return (
    <Box tone="danger" testId="asbestos-caution" title={`Possible asbestiform mineral${minerals.length ? `: ${minerals.join(", ")}` : ""}`} className={className}>
      {ASBESTOS_CAUTION}
    </Box>
  );
}

/** Respirable crystalline silica caution (US OSHA 29 CFR 1910.1053; IARC Monograph 100C, 2012). */
export function SilicaCaution({ minerals, className }: { minerals: string[]; className?: string }) {
  return (
    <Box tone="oxide" testId="silica-caution" title={`Respirable crystalline silica${minerals.length ? `: ${minerals.join(", ")}` : ""}`} className={className}>
      {SILICA_CAUTION}
    </Box>
  );
}

/** "Ranked candidates are suggestions, not an identification" (common practice: limits of automated identification). */
export function CandidatesNotice({ className }: { className?: string }) {
  return (
    <Box tone="brand" testId="candidates-notice" title="Suggestions, not an identification" className={className}>
      {CANDIDATES_NOTICE}
    </Box>
  );
}

export interface HazardPhase {
  mineral: string;
  hazard: "asbestos" | "crystalline_silica" | null;
  otherHazards?: string[];
}

/** The cautions that apply to a set of phases (confirmed ones or leading candidates); nothing when none applies. */
export function HazardCautions({ phases, className }: { phases: HazardPhase[]; className?: string }) {
  const uniq = (xs: string[]) => [...new Set(xs)];
  const asbestos = uniq(phases.filter((p) => p.hazard === "asbestos").map((p) => p.mineral));
  const silica = uniq(phases.filter((p) => p.hazard === "crystalline_silica").map((p) => p.mineral));
  const other = uniq(phases.flatMap((p) => (p.otherHazards ?? []).filter((h) => OTHER_HAZARD_NOTE[h]).map((h) => `${h}|${p.mineral}`)));
  if (!asbestos.length && !silica.length && !other.length) return null;
  return (
    <div className={cn("space-y-2", className)}>
      {asbestos.length > 0 && <AsbestosCaution minerals={asbestos} />}
      {silica.length > 0 && <SilicaCaution minerals={silica} />}
      {other.map((key) => {
        const [h, mineral] = key.split("|");
        return (
          <Box key={key} tone="oxide" testId="other-hazard-caution" title={`Handling: ${mineral}`}>
            {OTHER_HAZARD_NOTE[h]}
          </Box>
        );
      })}
    </div>
  );
}
