"use client";

import { useId, useState } from "react";
import { Button } from "@/components/ui/button";
import { inputClass } from "@/components/ui/field";
import type { PhaseRow } from "./types";

/** The analyst's note (saved on its own) and the sign-off: only accepted phases become confirmed. Give it `key={note}` so a saved note resets the field. */
export function SignOffPanel({
  note,
  accepted,
  undecided,
  canReview,
  locked,
  signedOff,
  busy,
  error,
  onSaveNote,
  onSignOff,
}: {
  note: string | null;
  accepted: PhaseRow[];
  undecided: number;
  canReview: boolean;
  locked: boolean;
  signedOff: { by: string | null; at: string | null } | null;
  busy: boolean;
  error?: string | null;
  onSaveNote: (note: string) => void;
  onSignOff: () => void;
}) {
  const id = useId();
  const [text, setText] = useState(note ?? "");
  const [confirm, setConfirm] = useState(false);
  if (signedOff) {
    return (
      <div className="space-y-2 text-sm" data-testid="signed-off">
        <p className="font-medium text-ok">
          Signed off by {signedOff.by ?? "an analyst"}
          {signedOff.at ? ` on ${new Date(signedOff.at).toLocaleString("en-GB", { dateStyle: "medium", timeStyle: "short" })}` : ""}.
        </p>
        <p>
          Confirmed phases: <span className="font-medium capitalize">{accepted.map((a) => a.mineral).join(", ") || "—"}</span>
        </p>
        {note && <p className="whitespace-pre-wrap text-muted">Note: {note}</p>}
      </div>
    );
  }
  return (
    <div className="space-y-3">
      <div className="space-y-1">
        <label htmlFor={`${id}-note`} className="block text-sm font-medium">
          Analyst&apos;s note
        </label>
        <textarea id={`${id}-note`} className={inputClass} rows={3} value={text} disabled={!canReview || locked} onChange={(e) => setText(e.target.value)} placeholder="Preparation, mount, remarks for the report…" />
        {canReview && !locked && (
          <Button type="button" variant="secondary" className="px-2 py-1 text-xs" disabled={busy || text === (note ?? "")} onClick={() => onSaveNote(text)}>
            Save note
          </Button>
        )}
      </div>
      {canReview && (
        <div className="space-y-2 border-t border-line pt-3">
          <p className="text-sm">
            {accepted.length === 0 ? (
              "Accept at least one phase to sign off."
            ) : (
              <>
                Signing off confirms <span className="font-medium capitalize">{accepted.map((a) => a.mineral).join(", ")}</span> for this sample and locks the scan.
                {undecided > 0 && ` ${undecided} undecided candidate${undecided === 1 ? " stays" : "s stay"} unconfirmed.`}
              </>
            )}
          </p>
          <label className="flex items-start gap-2 text-sm">
            <input type="checkbox" className="mt-1" checked={confirm} onChange={(e) => setConfirm(e.target.checked)} disabled={accepted.length === 0 || locked} />
            <span>I have reviewed the pattern and the accepted phases.</span>
          </label>
          <Button type="button" disabled={!confirm || accepted.length === 0 || busy || locked} onClick={onSignOff}>
            Sign off scan
          </Button>
        </div>
      )}
      {error && (
        <p role="alert" className="text-xs font-medium text-danger">
          {error}
        </p>
      )}
    </div>
  );
}
