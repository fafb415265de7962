import { formatDateTime } from "@/lib/dates";
import type { CustodyEvent } from "@/lib/custody";
import { PRIORITIES, SUBMISSION_STATUSES, type IntakeCondition } from "@/lib/vocabulary";

export const SUBMISSION_STATUS_LABELS: Record<(typeof SUBMISSION_STATUSES)[number], string> = {
  draft: "Draft",
  sent: "Sent to lab",
  received: "Received by lab",
  in_progress: "In preparation / analysis",
  reported: "Results signed off",
  closed: "Closed",
};

export const PRIORITY_LABELS: Record<(typeof PRIORITIES)[number], string> = { routine: "Routine", high: "High", urgent: "Urgent" };

export const INTAKE_LABELS: Record<IntakeCondition, string> = { received: "Received", missing: "Missing", damaged: "Damaged", extra: "Extra (not listed)" };

export const CUSTODY_EVENT_LABELS: Record<CustodyEvent, string> = {
  collected: "Collected",
  dispatched: "Dispatched",
  received: "Received at lab",
  received_directly: "Received directly by the lab (no submission)",
  prepared: "Prepared",
  scanned: "Scanned",
  processed: "Candidates ready",
  confirmed: "Phases signed off",
  reopened: "Sign-off reopened",
  reported: "Submission reported",
  stored: "Stored",
  returned: "Returned",
  discarded: "Discarded",
  transferred: "Handed over",
};

/** "2026-03-20 09:00 CET": an instant in the project's zone (UTC when none), through the app's one formatter (lib/dates.ts). */
export function formatInstant(v: string | Date | null | undefined, zone?: string | null): string {
  return formatDateTime(v, zone);
}
