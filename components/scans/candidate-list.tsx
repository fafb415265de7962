"use client";

import { useState } from "react";
import { Badge } from "@/components/ui/badge";
import { Button } from "@/components/ui/button";
import { cn } from "@/lib/utils";
import type { PhaseRow, RunProfile } from "./types";
import { formatLocalDate } from "@/lib/dates";

export const OVERLAY_COLORS = ["#2563eb", "#c026d3", "#059669", "#d97706", "#dc2626", "#7c3aed", "#0891b2", "#4d7c0f"];

const HAZARD_BADGE = { asbestos: "Asbestos group", crystalline_silica: "Crystalline silica" } as const;

function StatusBadge({ p }: { p: PhaseRow }) {
  if (p.status === "accepted") return <Badge tone="ok">Accepted{p.source === "manual" ? " (added)" : ""}</Badge>;
  if (p.status === "rejected") return <Badge tone="danger">Rejected</Badge>;
  return <Badge>Candidate</Badge>;
}

function MatchTable({ lines }: { lines: NonNullable<PhaseRow["matched"]> }) {
  return (
    <table className="mt-2 w-full text-xs tabular-nums">
      <caption className="sr-only">Matched lines</caption>
      <thead className="text-muted">
        <tr>
          <th scope="col" className="px-1 text-left font-medium">
            hkl
          </th>
          <th scope="col" className="px-1 text-right font-medium">
            2θ obs
          </th>
          <th scope="col" className="px-1 text-right font-medium">
            d obs
          </th>
          <th scope="col" className="px-1 text-right font-medium">
            d ref
          </th>
          <th scope="col" className="px-1 text-right font-medium">
            I obs
          </th>
          <th scope="col" className="px-1 text-right font-medium">
            I ref
          </th>
        </tr>
      </thead>
      <tbody>
        {lines.map((m, i) => (
          <tr key={i} className="border-t border-line/60">
            <td className="px-1">{m.hkl ? m.hkl.join(" ") : "—"}</td>
            <td className="px-1 text-right">{m.twoTheta.toFixed(3)}</td>
            <td className="px-1 text-right">{m.d.toFixed(4)}</td>
            <td className="px-1 text-right">{m.dRef.toFixed(4)}</td>
            <td className="px-1 text-right">{m.intensity.toFixed(1)}</td>
            <td className="px-1 text-right">{m.intensityRef.toFixed(1)}</td>
          </tr>
        ))}
      </tbody>
    </table>
  );
}

export interface CandidateListProps {
  phases: PhaseRow[];
  mixture: RunProfile["mixture"];
  canReview: boolean;
  locked: boolean;
  busyId: string | null;
  overlayIds: string[];
  onToggleOverlay: (p: PhaseRow) => void;
  onDecide: (p: PhaseRow, status: PhaseRow["status"]) => void;
  /** Put a candidate into the whole-pattern fit and refit (absent when the run has no fit or it is full). */
  onAddToFit?: (p: PhaseRow) => void;
  refitting?: boolean;
  /** Colour of a candidate's reference lines when drawn. */
  colorOf?: (referencePhaseId: string) => string;
}

/**
 * The peak-list search's ranked candidates (and phases added by hand) with score, matched lines and the confident
 * flag, plus the analyst's accept / reject buttons, a toggle to draw each candidate's reference lines on the
 * diffractogram and, when the run has a whole-pattern fit, a button to put the candidate into the fit. Runs made
 * before the fit existed show the search's semi-quantitative wt% (RIR).
 */
export function CandidateList({ phases, mixture, canReview, locked, busyId, overlayIds, onToggleOverlay, onDecide, onAddToFit, refitting = false, colorOf }: CandidateListProps) {
  const [open, setOpen] = useState<string | null>(null);
  const [showAll, setShowAll] = useState(false);
  const inMixture = new Set(mixture.map((m) => m.referencePhaseId));
  // Weak, undecided candidates beyond the first five are folded away until asked for.
  const main = phases.filter((p) => p.status !== "candidate" || p.confident || (p.rank ?? 0) <= 5 || overlayIds.includes(p.referencePhaseId));
  const folded = phases.length - main.length;
  const visible = showAll ? phases : main;
  if (phases.length === 0) return <p className="text-sm text-muted">No other candidates: the peaks matched nothing else in the reference library well enough.</p>;
  return (
    <>
      <ol className="space-y-2" data-testid="candidate-list">
        {visible.map((p) => {
          const color = overlayIds.includes(p.referencePhaseId) ? (colorOf?.(p.referencePhaseId) ?? OVERLAY_COLORS[overlayIds.indexOf(p.referencePhaseId) % OVERLAY_COLORS.length]) : undefined;
          return (
            <li
              key={p.id}
              data-testid="candidate"
              data-mineral={p.mineral}
              data-status={p.status}
              className={cn("rounded-md border bg-white p-2.5", p.status === "accepted" ? "border-ok/50" : p.status === "rejected" ? "border-line opacity-70" : "border-line")}
            >
              <div className="flex flex-wrap items-start justify-between gap-2">
                <div className="min-w-0">
                  <p className="font-medium">
                    <span className="mr-1 text-muted tabular-nums">{p.rank != null ? `${p.rank}.` : "+"}</span>
                    <span className="capitalize">{p.mineral}</span> <span className="text-xs font-normal text-muted">{p.formula}</span>
                  </p>
                  <div className="mt-1 flex flex-wrap items-center gap-1.5 text-xs">
                    <StatusBadge p={p} />
                    {p.source === "auto" && (p.confident ? <Badge tone="brand">Strong peak-list match</Badge> : <Badge>Weak peak-list match</Badge>)}
                    {p.hazard && <Badge tone={p.hazard === "asbestos" ? "danger" : "oxide"}>{HAZARD_BADGE[p.hazard]}</Badge>}
                    {p.otherHazards.map((h) => (
                      <Badge key={h} tone="oxide">
                        {h.replace("toxic-", "")}
                      </Badge>
                    ))}
                  </div>
                </div>
                <div className="shrink-0 text-right text-xs tabular-nums">
                  {p.score != null && (
                    <p>
                      Score <span className="font-semibold">{p.score.toFixed(2)}</span>
                    </p>
                  )}
                </div>
              </div>
              {p.wtPercent != null && inMixture.has(p.referencePhaseId) && (
                <p className="mt-1 text-xs" title="Semi-quantitative weight fraction by the RIR method (Chung 1974); assumes no amorphous or unidentified content">
                  ≈ {p.wtPercent.toFixed(0)} wt% <span className="text-muted">(semi-quantitative, RIR)</span>
                </p>
              )}
              <div className="mt-2 flex flex-wrap items-center gap-2">
                <button type="button" className="text-xs font-medium text-brand underline-offset-2 hover:underline" aria-expanded={open === p.id} onClick={() => setOpen(open === p.id ? null : p.id)}>
                  {p.matched?.length ?? 0} matched line{p.matched?.length === 1 ? "" : "s"}
                </button>
                <label className="flex items-center gap-1 text-xs">
                  <input type="checkbox" checked={!!color} onChange={() => onToggleOverlay(p)} />
                  <span className="inline-block h-3 w-1" style={{ background: color ?? "#ddd8cd" }} aria-hidden />
                  Show reference lines
                </label>
                {canReview && !locked && (
                  <span className="ml-auto flex flex-wrap justify-end gap-1">
                    {onAddToFit && (
                      <Button type="button" variant="secondary" className="px-2 py-1 text-xs" disabled={refitting} onClick={() => onAddToFit(p)} aria-label={`Add ${p.mineral} to the fit and refit`}>
                        Add to fit
                      </Button>
                    )}
                    {p.status !== "accepted" && (
                      <Button type="button" variant="secondary" className="px-2 py-1 text-xs" disabled={busyId === p.id} onClick={() => onDecide(p, "accepted")} aria-label={`Accept ${p.mineral}`}>
                        Accept
                      </Button>
                    )}
                    {p.status !== "rejected" && (
                      <Button type="button" variant="secondary" className="px-2 py-1 text-xs" disabled={busyId === p.id} onClick={() => onDecide(p, "rejected")} aria-label={`Reject ${p.mineral}`}>
                        Reject
                      </Button>
                    )}
                    {p.status !== "candidate" && (
                      <Button type="button" variant="ghost" className="px-2 py-1 text-xs" disabled={busyId === p.id} onClick={() => onDecide(p, "candidate")} aria-label={`Undo decision on ${p.mineral}`}>
                        Undo
                      </Button>
                    )}
                  </span>
                )}
              </div>
              {p.decidedByName && p.status !== "candidate" && (
                <p className="mt-1 text-xs text-muted">
                  {p.status === "accepted" ? "Accepted" : "Rejected"} by {p.decidedByName}
                  {p.decidedAt ? ` on ${formatLocalDate(p.decidedAt)}` : ""}
                  {p.note ? ` — ${p.note}` : ""}
                </p>
              )}
              {open === p.id && p.matched && <MatchTable lines={p.matched} />}
            </li>
          );
        })}
      </ol>
      {folded > 0 && (
        <button type="button" className="mt-2 text-sm font-medium text-brand hover:underline" aria-expanded={showAll} onClick={() => setShowAll(!showAll)}>
          {showAll ? "Hide weak candidates" : `Show ${folded} more weak candidate${folded === 1 ? "" : "s"}`}
        </button>
      )}
    </>
  );
}
