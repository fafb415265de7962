/** The register filter in words, for report headers and read-me sheets. Pure. */
import type { RegisterFilter } from "@/lib/phase-map";

const LABELS: Record<string, string> = {
  q: "search",
  code: "code contains",
  status: "status",
  sampleType: "sample type",
  stationId: "station",
  lithology: "lithology contains",
  alteration: "alteration contains",
  collector: "collector contains",
  from: "collected from",
  to: "collected to",
  bbox: "area (W,S,E,N)",
  mineral: "mineral",
  group: "mineral group",
};

/** e.g. "mineral = pyrite (confirmed); lithology contains gossan" or "all samples". */
export function describeFilter(f: Partial<RegisterFilter>): string {
  const parts: string[] = [];
  for (const [k, label] of Object.entries(LABELS)) {
    const v = (f as Record<string, unknown>)[k];
    if (v === undefined || v === null || v === "") continue;
    parts.push(`${label} = ${String(v)}${k === "mineral" || k === "group" ? ` (${f.phase === "any" ? "confirmed or candidate" : f.phase === "candidate" ? "candidate only" : "confirmed"})` : ""}`);
  }
  if (f.phase && f.phase !== "confirmed" && !f.mineral && !f.group) parts.push(`phases shown: ${f.phase === "any" ? "confirmed and candidates" : "candidates only"}`);
  return parts.length ? parts.join("; ") : "all samples";
}
