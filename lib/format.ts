import type { SampleStatus, SampleType } from "@/lib/vocabulary";

export const SAMPLE_TYPE_LABELS: Record<SampleType, string> = {
  hand_sample: "Hand sample",
  chip: "Outcrop chip",
  channel: "Channel",
  float: "Float",
  core: "Drill core",
  soil: "Soil",
  stream_sediment: "Stream sediment",
  other: "Other",
};

export const SAMPLE_STATUS_LABELS: Record<SampleStatus, string> = {
  planned: "Planned",
  collected: "Collected",
  dispatched: "Dispatched",
  received: "At lab",
  prepared: "Prepared",
  scanned: "Scanned",
  processed: "Candidates ready",
  confirmed: "Phases confirmed",
  reported: "Reported",
  stored: "Stored",
  returned: "Returned",
  discarded: "Discarded",
};

/** "2026-03-14 10:05 (Europe/Madrid)" in the site's zone when known, else UTC. */
export function formatCollected(iso: string | null | undefined, tz?: string | null): string {
  if (!iso) return "—";
  const d = new Date(iso);
  if (Number.isNaN(d.getTime())) return iso;
  const zone = tz || "UTC";
  const parts = new Intl.DateTimeFormat("en-CA", { timeZone: zone, year: "numeric", month: "2-digit", day: "2-digit", hour: "2-digit", minute: "2-digit", hourCycle: "h23" }).formatToParts(d);
  const get = (t: string) => parts.find((p) => p.type === t)?.value ?? "";
  return `${get("year")}-${get("month")}-${get("day")} ${get("hour")}:${get("minute")} (${zone})`;
}

export function formatDate(iso: string | null | undefined): string {
  return iso ? iso.slice(0, 10) : "—";
}

/** Decimal degrees with 6 decimals and hemisphere letters. */
export function formatLatLon(lat: number | null | undefined, lon: number | null | undefined): string {
  if (lat == null || lon == null) return "—";
  return `${Math.abs(lat).toFixed(6)}° ${lat >= 0 ? "N" : "S"}, ${Math.abs(lon).toFixed(6)}° ${lon >= 0 ? "E" : "W"}`;
}
