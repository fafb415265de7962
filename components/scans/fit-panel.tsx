"use client";

import { useEffect, useRef, useState } from "react";
import { Badge } from "@/components/ui/badge";
import { Button } from "@/components/ui/button";
import { cn } from "@/lib/utils";
import { AddPhase } from "./add-phase";
import type { PhaseRow, RunFit } from "./types";

/** Colours of the phase profiles (the calculated profile is drawn in orange-red, the difference in teal). */
export const PHASE_COLORS = ["#2563eb", "#059669", "#c026d3", "#7c3aed", "#0891b2", "#65a30d", "#db2777", "#475569", "#ca8a04", "#1e3a8a"];

const HAZARD_BADGE = { asbestos: "Asbestos group", crystalline_silica: "Crystalline silica" } as const;

/** Largest number of phases a refit takes (the route's limit). */
export const MAX_FIT_PHASES = 10;

export interface FitChange {
  from: RunFit["stats"];
  to: RunFit["stats"];
  what: string;
  withdrawn: string[];
}

function Stat({ label, value, title, testId }: { label: string; value: string; title: string; testId: string }) {
  return (
    <div className="rounded-md border border-line bg-stone px-2.5 py-1.5" title={title}>
      <dt className="text-xs text-muted">{label}</dt>
      <dd className="text-lg font-semibold tabular-nums" data-testid={testId}>
        {value}
      </dd>
    </div>
  );
}

const pct = (v: number) => `${v.toFixed(2)} %`;
const wt = (v: number) => (v < 10 ? v.toFixed(1) : v.toFixed(0));

function StatusBadge({ p }: { p: PhaseRow }) {
  if (p.status === "accepted") return <Badge tone="ok">Accepted</Badge>;
  if (p.status === "rejected") return <Badge tone="danger">Rejected</Badge>;
  return <Badge>Candidate</Badge>;
}

function EvidenceTable({ lines }: { lines: NonNullable<PhaseRow["fit"]>["evidence"]["aloneLines"] }) {
  return (
    <table className="mt-1 w-full text-xs tabular-nums" data-testid="evidence-lines">
      <caption className="sr-only">Lines that stand alone</caption>
      <thead className="text-muted">
        <tr>
          <th scope="col" className="px-1 text-left font-medium">
            hkl
          </th>
          <th scope="col" className="px-1 text-right font-medium">
            d (Å)
          </th>
          <th scope="col" className="px-1 text-right font-medium">
            2θ (°)
          </th>
          <th scope="col" className="px-1 text-right font-medium">
            Net counts
          </th>
          <th scope="col" className="px-1 text-right font-medium" title="Share of the calculated profile at the line that comes from this phase">
            Own share
          </th>
        </tr>
      </thead>
      <tbody>
        {lines.map((l, i) => (
          <tr key={i} className="border-t border-line/60">
            <td className="px-1">{l.hkl.join(" ")}</td>
            <td className="px-1 text-right">{l.d.toFixed(4)}</td>
            <td className="px-1 text-right">{l.twoTheta.toFixed(2)}</td>
            <td className="px-1 text-right">{Math.round(l.observed).toLocaleString("en")}</td>
            <td className="px-1 text-right">{Math.round(Math.min(1, l.share) * 100)} %</td>
          </tr>
        ))}
      </tbody>
    </table>
  );
}

export interface FitPanelProps {
  fit: RunFit;
  /** The run's fitted phases (rows with `fitted`), in the fit's order. */
  phases: PhaseRow[];
  colorOf: (referencePhaseId: string) => string;
  unexplained: { twoTheta: number; d: number; intensity: number }[];
  canReview: boolean;
  locked: boolean;
  /** A refit is running. */
  refitting: boolean;
  refitError: string | null;
  change: FitChange | null;
  busyId: string | null;
  onRefit: (phaseIds: string[], what: string) => void;
  onDecide: (p: PhaseRow, status: PhaseRow["status"]) => void;
}

/**
 * The whole-pattern fit of a run: Rwp / Rexp / χ², each phase's wt% ± σ (semi-quantitative unless an internal
 * standard was declared), the RIR cross-check where it disagrees, the evidence (stand-alone lines, share of the
 * profile, ΔBIC), look-alike phases, unexplained peaks, and controls to remove or add a phase and refit.
 */
export function FitPanel({ fit, phases, colorOf, unexplained, canReview, locked, refitting, refitError, change, busyId, onRefit, onDecide }: FitPanelProps) {
  const [open, setOpen] = useState<string | null>(null);
  const statsRef = useRef<HTMLDivElement>(null);
  // After a refit, bring the statistics and the change into view (the button pressed may be far down the list).
  useEffect(() => {
    if (change) statsRef.current?.scrollIntoView({ block: "start", behavior: "smooth" });
  }, [change]);
  const ids = phases.map((p) => p.referencePhaseId);
  const q = fit.quantification;
  const editable = canReview && !locked;
  const label = q.semiQuantitative ? "semi-quantitative" : "with an internal standard";
  return (
    <div className="space-y-3" data-testid="fit-panel" aria-busy={refitting}>
      <div className="flex flex-wrap items-center gap-2 text-xs">
        <Badge tone={fit.chosenBy === "fit" ? "brand" : "oxide"}>{fit.chosenBy === "fit" ? "Phases chosen by the fit" : "Phases chosen by the analyst (refit)"}</Badge>
        {refitting && (
          <span role="status" className="font-medium text-brand">
            Refitting…
          </span>
        )}
      </div>
      <div ref={statsRef} className="scroll-mt-4 space-y-3">
        <dl className="grid grid-cols-3 gap-2" aria-label="Fit statistics">
          <Stat label="Rwp" value={pct(fit.stats.rwp)} title="Weighted-profile R factor (Young 1993): how far the calculated profile is from the observed one, weighted by counting statistics" testId="fit-rwp" />
          <Stat label="Rexp" value={pct(fit.stats.rexp)} title="Expected R: the best Rwp the counting statistics allow" testId="fit-rexp" />
          <Stat label="χ² (Rwp/Rexp)²" value={fit.stats.gof.toFixed(2)} title="Goodness of fit: near 1 when the model explains the profile down to the noise" testId="fit-gof" />
        </dl>
        {change && (
          <p className="rounded-md border border-brand/30 bg-brand-light px-2.5 py-1.5 text-xs" role="status" data-testid="fit-change">
            {change.what}: Rwp {pct(change.from.rwp)} → <span className="font-semibold">{pct(change.to.rwp)}</span>, χ² {change.from.gof.toFixed(2)} → <span className="font-semibold">{change.to.gof.toFixed(2)}</span>
            {change.to.rwp > change.from.rwp * 1.05 ? " — the fit got worse." : change.to.rwp < change.from.rwp * 0.95 ? " — the fit improved." : " — about the same fit."}
            {change.withdrawn.length > 0 && ` Acceptance withdrawn from ${change.withdrawn.join(", ")} (no longer in the fit).`}
          </p>
        )}
      </div>
      <p className="text-xs text-muted">
        Weight % from the refined scales by {q.method.replace(/ — .*/, "")}: <span className="font-medium text-ink">{label}</span>
        {q.semiQuantitative ? ", assuming no amorphous or unidentified content" : ""}. ± is one standard uncertainty from counting statistics.
        {q.amorphousWtPercent != null && ` Amorphous and unidentified: ${wt(q.amorphousWtPercent)} wt%.`}
      </p>
      {q.notes.length > 0 && (
        <ul className="list-disc space-y-0.5 pl-5 text-xs text-oxide" aria-label="Quantification notes">
          {q.notes.map((n, i) => (
            <li key={i}>{n}</li>
          ))}
        </ul>
      )}
      {fit.noConfidentMatch && (
        <p className="rounded-md border border-oxide/40 bg-oxide-light px-2.5 py-1.5 text-sm">
          No confident match: no library phase improves the fit by more than noise can. Amorphous material, a mineral outside the library, or too little signal.
        </p>
      )}

      <ol className="space-y-2" data-testid="fit-phases">
        {phases.map((p) => {
          const f = p.fit;
          const color = colorOf(p.referencePhaseId);
          const rir = f?.rirWtPercent ?? null;
          const rirDiffers = rir != null && p.wtPercent != null && Math.abs(rir - p.wtPercent) > 5;
          const alone = f?.evidence.aloneLines ?? [];
          return (
            <li
              key={p.id}
              data-testid="fit-phase"
              data-mineral={p.mineral}
              data-status={p.status}
              className={cn("rounded-md border bg-white p-2.5", p.status === "accepted" ? "border-ok/50" : p.status === "rejected" ? "border-line opacity-70" : "border-line")}
              style={{ borderLeft: `4px solid ${color}` }}
            >
              <div className="flex flex-wrap items-start justify-between gap-2">
                <div className="min-w-0">
                  <p className="font-medium">
                    <span className="capitalize">{p.mineral}</span> <span className="text-xs font-normal text-muted">{p.formula}</span>
                  </p>
                  <div className="mt-1 flex flex-wrap items-center gap-1.5 text-xs">
                    <StatusBadge p={p} />
                    {p.hazard && <Badge tone={p.hazard === "asbestos" ? "danger" : "oxide"}>{HAZARD_BADGE[p.hazard]}</Badge>}
                    {p.otherHazards.map((h) => (
                      <Badge key={h} tone="oxide">
                        {h.replace("toxic-", "")}
                      </Badge>
                    ))}
                    {p.rank != null && <span className="text-muted">also #{p.rank} in the peak-list search</span>}
                  </div>
                </div>
                <div className="shrink-0 text-right tabular-nums">
                  {p.wtPercent != null ? (
                    <p className="text-lg font-semibold" data-testid="fit-wt">
                      {wt(p.wtPercent)}
                      {p.wtSigma != null && <span className="text-sm font-normal"> ± {wt(p.wtSigma)}</span>}
                      <span className="text-sm font-normal"> wt%</span>
                    </p>
                  ) : (
                    <p className="text-sm text-muted">wt% not available</p>
                  )}
                  <p className="text-xs text-muted">{label}</p>
                </div>
              </div>
              {f?.wtNote && <p className="mt-1 text-xs text-muted">{f.wtNote}</p>}
              {rirDiffers && (
                <p className="mt-1 text-xs text-oxide" data-testid="rir-check">
                  RIR cross-check (Chung 1974): ≈ {wt(rir!)} wt% — differs from the fit by more than 5 wt%.
                </p>
              )}
              {f && (
                <p className="mt-1 text-xs" data-testid="fit-evidence">
                  Explains {Math.round(f.evidence.profileShare * 100)} % of the calculated profile · ΔBIC {Math.round(f.evidence.deltaBic).toLocaleString("en")} without it
                  {" · "}
                  <button type="button" className="font-medium text-brand underline-offset-2 hover:underline" aria-expanded={open === p.id} onClick={() => setOpen(open === p.id ? null : p.id)}>
                    {alone.length} line{alone.length === 1 ? "" : "s"} standing alone
                  </button>
                  {alone.length > 0 && open !== p.id && <span className="text-muted"> (d {alone.slice(0, 3).map((l) => `${l.d.toFixed(3)} Å ${l.hkl.join("")}`).join(", ")})</span>}
                </p>
              )}
              {open === p.id && alone.length > 0 && <EvidenceTable lines={alone} />}
              {open === p.id && alone.length === 0 && <p className="mt-1 text-xs text-oxide">No line of this phase stands alone: every one overlaps another phase, so the pattern supports it only weakly.</p>}
              {f && f.alternatives.length > 0 && (
                <p className="mt-1 text-xs text-oxide" data-testid="look-alikes">
                  A pattern alone cannot tell these apart: <span className="capitalize">{p.mineral}</span>, {f.alternatives.map((a) => a.mineral).join(", ")}. Chemistry or optics decide.
                </p>
              )}
              {editable && (
                <div className="mt-2 flex flex-wrap justify-end gap-1">
                  {p.status !== "accepted" && (
                    <Button type="button" variant="secondary" className="px-2 py-1 text-xs" disabled={busyId === p.id || refitting} onClick={() => onDecide(p, "accepted")} aria-label={`Accept ${p.mineral}`}>
                      Accept
                    </Button>
                  )}
                  {p.status !== "rejected" && (
                    <Button type="button" variant="secondary" className="px-2 py-1 text-xs" disabled={busyId === p.id || refitting} onClick={() => onDecide(p, "rejected")} aria-label={`Reject ${p.mineral}`}>
                      Reject
                    </Button>
                  )}
                  {p.status !== "candidate" && (
                    <Button type="button" variant="ghost" className="px-2 py-1 text-xs" disabled={busyId === p.id || refitting} onClick={() => onDecide(p, "candidate")} aria-label={`Undo decision on ${p.mineral}`}>
                      Undo
                    </Button>
                  )}
                  <Button
                    type="button"
                    variant="secondary"
                    className="px-2 py-1 text-xs"
                    disabled={refitting || ids.length <= 1}
                    title={ids.length <= 1 ? "A fit needs at least one phase" : undefined}
                    onClick={() => onRefit(ids.filter((x) => x !== p.referencePhaseId), `Removed ${p.mineral}`)}
                    aria-label={`Remove ${p.mineral} and refit`}
                  >
                    Remove and refit
                  </Button>
                </div>
              )}
            </li>
          );
        })}
      </ol>
      {refitError && (
        <p role="alert" className="text-xs font-medium text-danger">
          {refitError}
        </p>
      )}

      <div className="border-t border-line pt-2">
        <h3 className="text-sm font-medium">Peaks the fit does not explain</h3>
        {unexplained.length === 0 ? (
          <p className="text-xs text-muted">None above the noise.</p>
        ) : (
          <ul className="mt-1 flex flex-wrap gap-1.5 text-xs tabular-nums" data-testid="unexplained-peaks">
            {unexplained.map((u, i) => (
              <li key={i} className="rounded border border-oxide/40 bg-oxide-light px-1.5 py-0.5" title={`2θ ${u.twoTheta.toFixed(2)}°, relative intensity ${u.intensity.toFixed(0)}`}>
                d {u.d.toFixed(3)} Å <span className="text-muted">({u.twoTheta.toFixed(2)}°, I {u.intensity.toFixed(0)})</span>
              </li>
            ))}
          </ul>
        )}
      </div>

      {fit.rejected.length > 0 && (
        <details className="text-xs">
          <summary className="cursor-pointer font-medium text-brand">Tried and left out ({fit.rejected.length})</summary>
          <ul className="mt-1 space-y-0.5 text-muted">
            {fit.rejected.map((r) => (
              <li key={r.referenceId}>
                <span className="capitalize text-ink">{r.mineral}</span>: {r.reason}
                {editable && ids.length < MAX_FIT_PHASES && !ids.includes(r.referenceId) && (
                  <button type="button" className="ml-2 font-medium text-brand hover:underline disabled:text-muted" disabled={refitting} onClick={() => onRefit([...ids, r.referenceId], `Added ${r.mineral}`)}>
                    Add and refit
                  </button>
                )}
              </li>
            ))}
          </ul>
        </details>
      )}

      {editable && (
        <div className="border-t border-line pt-3">
          {ids.length < MAX_FIT_PHASES ? (
            <AddPhase
              label="Add a phase from the library to the fit"
              busy={refitting}
              exclude={ids}
              actionLabel={(m) => `Add ${m} and refit`}
              onAdd={(id, _note, mineral) => onRefit([...ids, id], `Added ${mineral}`)}
            />
          ) : (
            <p className="text-xs text-muted">The fit holds {MAX_FIT_PHASES} phases, the most a refit takes; remove one to add another.</p>
          )}
        </div>
      )}
    </div>
  );
}
