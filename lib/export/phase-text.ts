/** Plain-text forms of a sample's phases for flat formats (CSV, GIS attributes, report tables). Pure. */
import { isAsbestiform } from "./caveats";
import type { ExportPhase, ExportRow } from "./types";

/** wt% as text: one decimal, trailing ".0" dropped ("60", "12.5"). */
export function formatWt(wt: number | null | undefined): string {
  if (wt == null || !Number.isFinite(wt)) return "";
  const r = Math.round(wt * 10) / 10;
  return Number.isInteger(r) ? String(r) : r.toFixed(1);
}

/** "quartz 60; pyrite 20; kaolinite" — mineral names with wt% where estimated, largest first. */
export function phaseNames(phases: readonly ExportPhase[]): string {
  return phases.map((p) => (p.wtPercent != null ? `${p.mineral} ${formatWt(p.wtPercent)}` : p.mineral)).join("; ");
}

/** "Qz 60; Py 20; Kln" — IMA symbols with wt% where estimated. */
export function phaseSymbols(phases: readonly ExportPhase[]): string {
  return phases.map((p) => (p.wtPercent != null ? `${p.symbol} ${formatWt(p.wtPercent)}` : p.symbol)).join("; ");
}

/** "confirmed" when any phase is confirmed, "candidate" when there are only candidates, else "none". */
export function phaseStatus(row: Pick<ExportRow, "confirmed" | "candidates">): "confirmed" | "candidate" | "none" {
  return row.confirmed.length ? "confirmed" : row.candidates.length ? "candidate" : "none";
}

/** Whether any confirmed phase or candidate of the row calls for the asbestos caution. */
export function hasAsbestiformPhase(row: Pick<ExportRow, "confirmed" | "candidates">): boolean {
  return row.confirmed.some(isAsbestiform) || row.candidates.some(isAsbestiform);
}

/** Flat phase attributes shared by the GeoJSON and KML exports (same names, same values). */
export function phaseAttributes(row: ExportRow): Record<string, string | boolean> {
  return {
    phase_status: phaseStatus(row),
    confirmed_phases: phaseNames(row.confirmed),
    confirmed_symbols: phaseSymbols(row.confirmed),
    candidate_phases_unconfirmed: phaseNames(row.candidates),
    asbestiform_phase: hasAsbestiformPhase(row),
  };
}
