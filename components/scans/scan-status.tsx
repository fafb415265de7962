import { Badge } from "@/components/ui/badge";
import type { RunProgress, ScanStatus } from "./types";

const STAGE_LABEL = { reading: "reading file", processing: "processing", identifying: "ranking candidates", fitting: "fitting the whole pattern", saving: "saving" } as const;

export const SCAN_STATUS_LABEL: Record<ScanStatus, string> = {
  uploaded: "Queued",
  processing: "Processing",
  processed: "Awaiting review",
  failed: "Processing failed",
  signed_off: "Signed off",
};

/** Status of a scan with its run's progress ("queued, 2 ahead", "processing: identifying phases"). */
export function ScanStatusBadge({ status, progress }: { status: ScanStatus; progress?: RunProgress | null }) {
  let text: string = SCAN_STATUS_LABEL[status];
  if (progress?.status === "queued") text = progress.ahead ? `Queued (${progress.ahead} ahead)` : "Queued (next)";
  else if (progress?.status === "running") text = progress.stage ? `Processing: ${STAGE_LABEL[progress.stage]}` : "Processing";
  const tone = status === "signed_off" ? "ok" : status === "failed" ? "danger" : status === "processed" ? "oxide" : "brand";
  return (
    <Badge tone={tone}>
      <span data-testid="scan-status">{text}</span>
    </Badge>
  );
}

/** True while the current run is queued or running (pages poll then). */
export const isPending = (status: ScanStatus, progress?: RunProgress | null) =>
  status === "uploaded" || status === "processing" || progress?.status === "queued" || progress?.status === "running";
