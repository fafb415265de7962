import type { IntakeCondition } from "@/lib/validation/submission";
import type { CustodyEvent } from "@/lib/validation/custody";
import { PRIORITIES, SUBMISSION_STATUSES } from "@/lib/vocabulary";

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

/** "2026-03-20 08:00 UTC" from an ISO instant or a Date. */
export function formatInstant(v: string | Date | null | undefined): string {
  if (!v) return "—";
  const d = typeof v === "string" ? new Date(v) : v;
  if (Number.isNaN(d.getTime())) return String(v);
  return `${d.toISOString().slice(0, 16).replace("T", " ")} UTC`;
}
