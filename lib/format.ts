import { formatDateTime, formatLocalDate } from "@/lib/dates";
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

/** "2026-03-14 10:05 CET" in the collection site's zone when known, else the project's (else UTC): lib/dates.ts. */
export function formatCollected(iso: string | null | undefined, tz?: string | null, projectZone?: string | null): string {
  return formatDateTime(iso, tz || projectZone);
}

/** The local calendar date of an instant (collection site's zone, else the project's, else UTC). */
export function formatDate(iso: string | null | undefined, tz?: string | null): string {
  return formatLocalDate(iso, tz);
}

/** Decimal degrees with 6 decimals and hemisphere letters. */
export function formatLatLon(lat: number | null | undefined, lon: number | null | undefined): string {
  if (lat == null || lon == null) return "—";
  return `${Math.abs(lat).toFixed(6)}° ${lat >= 0 ? "N" : "S"}, ${Math.abs(lon).toFixed(6)}° ${lon >= 0 ? "E" : "W"}`;
}
