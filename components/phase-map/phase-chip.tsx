import { phaseSymbol } from "@/lib/phase-map/symbol-scheme";
import { labelColourOn } from "@/lib/phase-map/palette";
import { formatWt } from "@/lib/export/phase-text";

/**
 * A phase as a small chip: confirmed = filled with the group colour, candidate = white with a dashed
 * border in that colour and the word "unconfirmed" for screen readers (confidence never by colour alone).
 * Works in server and client components.
 */
export function PhaseChip({ mineral, group, kind, wtPercent }: { mineral: string; group: string | null; kind: "confirmed" | "candidate"; wtPercent?: number | null }) {
  const s = phaseSymbol(mineral, group);
  const confirmed = kind === "confirmed";
  const wt = formatWt(wtPercent);
  return (
    <span
      title={`${s.mineral}${wt ? ` ${wt} wt%` : ""} — ${confirmed ? "confirmed" : "candidate, not confirmed"}`}
      className="inline-flex items-center gap-1 rounded-full border-2 px-1.5 py-px text-xs font-semibold"
      style={confirmed ? { background: s.colour, borderColor: s.colour, color: labelColourOn(s.colour) } : { background: "#fff", borderColor: s.colour, borderStyle: "dashed", color: "#17313a" }}
    >
      {s.symbol}
      {wt && <span className="font-normal">{wt}%</span>}
      <span className="sr-only">{confirmed ? " confirmed" : " candidate, unconfirmed"}</span>
    </span>
  );
}
