"use client";

import { useRouter } from "next/navigation";
import { useState } from "react";
import { Button } from "@/components/ui/button";
import { ApiError, fetchJson } from "@/lib/client/fetch-json";
import { formatDateTime } from "@/lib/dates";

export interface LabLinkRow {
  id: string;
  sentTo: string;
  expiresAt: string | Date;
  revokedAt: string | Date | null;
  lastUsedAt: string | Date | null;
  state: "active" | "expired" | "revoked";
}

/** The lab links e-mailed for a submission (outside labs without an account) and a button to withdraw the active one. */
export function LabLinkPanel({ projectId, submissionId, links, zone }: { projectId: string; submissionId: string; links: LabLinkRow[]; zone: string | null }) {
  const router = useRouter();
  const [pending, setPending] = useState(false);
  const [error, setError] = useState<string | null>(null);
  const active = links.find((l) => l.state === "active");
  return (
    <div className="space-y-2 text-sm" data-testid="lab-link-panel">
      <h3 className="font-semibold">Lab link (outside lab, no account)</h3>
      {links.length === 0 ? (
        <p className="text-muted">No lab link: the lab&apos;s address belongs to a project member, who signs in with their account.</p>
      ) : (
        <ul className="space-y-1">
          {links.map((l) => (
            <li key={l.id}>
              <span className={l.state === "active" ? "font-medium text-ok" : "text-muted"}>{l.state === "active" ? "Active" : l.state === "revoked" ? "Withdrawn" : "Expired"}</span> · sent to {l.sentTo} · {l.state === "revoked" ? `withdrawn ${formatDateTime(l.revokedAt, zone)}` : `valid until ${formatDateTime(l.expiresAt, zone)}`}
              {l.lastUsedAt ? ` · last opened ${formatDateTime(l.lastUsedAt, zone)}` : " · not opened yet"}
            </li>
          ))}
        </ul>
      )}
      {active && (
        <Button
          type="button"
          variant="secondary"
          disabled={pending}
          onClick={async () => {
            if (!window.confirm("Withdraw the lab link now? The lab will no longer be able to open it; sending the e-mail again issues a new link.")) return;
            setPending(true);
            setError(null);
            try {
              await fetchJson(`/api/projects/${projectId}/submissions/${submissionId}/lab-link`, { method: "DELETE" });
              router.refresh();
            } catch (err) {
              setError(err instanceof ApiError ? err.message : "Could not reach the server.");
            } finally {
              setPending(false);
            }
          }}
        >
          Withdraw the lab link
        </Button>
      )}
      {error && (
        <p role="alert" className="text-danger">
          {error}
        </p>
      )}
    </div>
  );
}
