"use client";

import { useId, useState } from "react";
import { Button } from "@/components/ui/button";
import { inputClass } from "@/components/ui/field";
import type { PhaseRow, RunFit, SignOffRecord } from "./types";

const wt = (v: number) => (v < 10 ? v.toFixed(1) : v.toFixed(0));

/**
 * The analyst's note (saved on its own) and the sign-off: only accepted phases become confirmed, and the fit
 * statistics of the run are recorded with them. Give it `key={note}` so a saved note resets the field.
 */
export function SignOffPanel({
  note,
  accepted,
  undecided,
  fit,
  record,
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
  /** Statistics of the current run's whole-pattern fit (null for runs without one). */
  fit: RunFit["stats"] | null;
  /** What the sign-off recorded (after sign-off). */
  record: SignOffRecord | null;
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
        {record ? (
          <>
            <ul className="space-y-0.5" aria-label="Confirmed phases">
              {record.phases.map((p) => (
                <li key={p.phaseResultId} className="tabular-nums">
                  <span className="font-medium capitalize">{p.mineral}</span>
                  {p.wtPercent != null && (
                    <span className="text-muted">
                      {" "}
                      — {wt(p.wtPercent)}
                      {p.wtSigma != null ? ` ± ${wt(p.wtSigma)}` : ""} wt%{record.fit?.semiQuantitative === false ? "" : " (semi-quantitative)"}
                    </span>
                  )}
                  {!p.fitted && <span className="text-muted"> — not in the fit</span>}
                </li>
              ))}
            </ul>
            {record.fit && (
              <p className="text-xs text-muted tabular-nums" data-testid="signed-off-fit">
                Fit recorded at sign-off: Rwp {record.fit.rwp.toFixed(2)} %, Rexp {record.fit.rexp.toFixed(2)} %, χ² {record.fit.gof.toFixed(2)} ({record.fit.chosenBy === "analyst" ? "phases chosen by the analyst" : "phases chosen by the fit"}).
              </p>
            )}
          </>
        ) : (
          <p>
            Confirmed phases: <span className="font-medium capitalize">{accepted.map((a) => a.mineral).join(", ") || "—"}</span>
          </p>
        )}
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
                {undecided > 0 && ` ${undecided} undecided phase${undecided === 1 ? " stays" : "s stay"} unconfirmed.`}
                {fit && ` The fit statistics (Rwp ${fit.rwp.toFixed(2)} %, χ² ${fit.gof.toFixed(2)}) are recorded with them.`}
              </>
            )}
          </p>
          {fit && accepted.some((a) => !a.fitted) && (
            <p className="text-xs text-oxide">
              Accepted but not in the fit (no wt%): <span className="capitalize">{accepted.filter((a) => !a.fitted).map((a) => a.mineral).join(", ")}</span>. Add {accepted.filter((a) => !a.fitted).length === 1 ? "it" : "them"} to the fit to quantify.
            </p>
          )}
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
