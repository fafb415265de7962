"use client";

import { useMutation, useQueries, useQuery, useQueryClient } from "@tanstack/react-query";
import { referenceKeys, scanKeys } from "@/lib/client/query-keys";
import Link from "next/link";
import { usePathname, useRouter, useSearchParams } from "next/navigation";
import { useMemo, useState } from "react";
import { CandidatesNotice, HazardCautions } from "@/components/cautions";
import { Badge } from "@/components/ui/badge";
import { Card, Skeleton } from "@/components/ui/card";
import { ApiError, fetchJson } from "@/lib/client/fetch-json";
import { AddPhase } from "./add-phase";
import { CandidateList, OVERLAY_COLORS } from "./candidate-list";
import { Diffractogram, type Overlay, type PhaseCurve } from "./diffractogram";
import { FitPanel, MAX_FIT_PHASES, PHASE_COLORS, type FitChange } from "./fit-panel";
import { PeakTable } from "./peak-table";
import { processBody, ReprocessForm } from "./reprocess-form";
import { RunList } from "./run-list";
import { isPending, ScanStatusBadge } from "./scan-status";
import { SignOffPanel } from "./sign-off-panel";
import type { PhaseRow, RefitResponse, ScanDetail, SparseCurve } from "./types";

interface RefPattern {
  pattern: { wavelength: number; lines: { twoTheta: number; d: number; intensity: number }[] };
}

const median = (xs: number[]) => {
  if (xs.length === 0) return NaN;
  const s = [...xs].sort((a, b) => a - b);
  return s.length % 2 ? s[s.length >> 1] : (s[s.length / 2 - 1] + s[s.length / 2]) / 2;
};

/** Reference lines of a candidate scaled to the pattern: median observed/reference ratio over its matched lines. */
function scaledOverlay(p: PhaseRow, ref: RefPattern, maxPeakHeight: number, color: string): Overlay {
  const ratios = (p.matched ?? []).filter((m) => m.intensityRef > 0).map((m) => m.intensity / m.intensityRef);
  const k = Number.isFinite(median(ratios)) ? median(ratios) : 1;
  return {
    id: p.referencePhaseId,
    label: `${p.mineral} (calculated lines, scaled ×${k.toFixed(2)})`,
    color,
    lines: ref.pattern.lines.map((l) => ({ twoTheta: l.twoTheta, height: (k * l.intensity * maxPeakHeight) / 100 })),
  };
}

/** A phase's sparse profile drawn on the fit's background; null where the phase contributes nothing. */
function phaseCurve(profile: SparseCurve, background: number[]): (number | null)[] {
  const out = new Array<number | null>(background.length).fill(null);
  for (const [start, vals] of profile) for (let i = 0; i < vals.length && start + i < out.length; i++) out[start + i] = background[start + i] + vals[i];
  return out;
}

function message(err: unknown): string | null {
  if (!err) return null;
  return err instanceof ApiError ? err.message : "Something went wrong; try again.";
}

/**
 * The scan review page: diffractogram with the whole-pattern fit (calculated, difference and phase profiles), the
 * fit's phases with wt% ± σ and evidence, refit controls, the peak-list search's ranked candidates, peaks,
 * decisions, note, sign-off and runs.
 */
export function ScanReview({ projectId, scanId }: { projectId: string; scanId: string }) {
  const search = useSearchParams();
  const router = useRouter();
  const pathname = usePathname();
  const runParam = search.get("run");
  const qc = useQueryClient();
  const key = scanKeys.run(projectId, scanId, runParam);
  const { data, error, isLoading } = useQuery({
    queryKey: key,
    queryFn: () => fetchJson<ScanDetail>(`/api/projects/${projectId}/scans/${scanId}${runParam ? `?run=${encodeURIComponent(runParam)}` : ""}`),
    refetchInterval: (q) => {
      const d = q.state.data;
      return d && (isPending(d.scan.status, d.run?.progress) || d.run?.status === "queued" || d.run?.status === "running") ? 1000 : false;
    },
  });
  const [overlayIds, setOverlayIds] = useState<string[]>([]);
  const [busyId, setBusyId] = useState<string | null>(null);
  const [fitChange, setFitChange] = useState<FitChange | null>(null);
  const invalidate = () => qc.invalidateQueries({ queryKey: scanKeys.detail(projectId, scanId) });
  const base = `/api/projects/${projectId}/scans/${scanId}`;

  const decide = useMutation({
    mutationFn: ({ p, status }: { p: PhaseRow; status: PhaseRow["status"] }) => fetchJson(`${base}/phases/${p.id}`, { method: "PATCH", json: { status } }),
    onMutate: ({ p }) => setBusyId(p.id),
    onSettled: () => {
      setBusyId(null);
      void invalidate();
    },
  });
  const addPhase = useMutation({ mutationFn: (body: { referencePhaseId: string; note: string }) => fetchJson(`${base}/phases`, { method: "POST", json: { referencePhaseId: body.referencePhaseId, ...(body.note && { note: body.note }) } }), onSuccess: invalidate });
  const saveNote = useMutation({ mutationFn: (note: string) => fetchJson(`${base}/note`, { method: "PATCH", json: { note } }), onSuccess: invalidate });
  const signOff = useMutation({ mutationFn: () => fetchJson(`${base}/sign-off`, { method: "POST", json: { confirm: true } }), onSuccess: () => { void invalidate(); router.refresh(); } });
  const reprocess = useMutation({
    mutationFn: (body: ReturnType<typeof processBody>) => fetchJson<{ id: string }>(`${base}/process`, { method: "POST", json: body }),
    onSuccess: () => {
      router.replace(pathname);
      void invalidate();
    },
  });
  const refit = useMutation({
    mutationFn: ({ phaseIds }: { phaseIds: string[]; what: string }) => fetchJson<RefitResponse>(`${base}/refit`, { method: "POST", json: { phaseIds } }),
    onMutate: () => setFitChange(null),
    onSuccess: (r, vars) => {
      const from = data?.run?.profile?.fit?.stats;
      if (from) setFitChange({ from, to: r.stats, what: vars.what, withdrawn: r.withdrawn });
      router.replace(pathname);
      void invalidate();
    },
  });
  const makeCurrent = useMutation({ mutationFn: (runId: string) => fetchJson(base, { method: "PATCH", json: { currentRunId: runId } }), onSuccess: () => { router.replace(pathname); void invalidate(); } });

  const run = data?.run;
  const profile = run?.profile ?? null;
  const phases = useMemo(() => run?.phases ?? [], [run]);
  const lastTwoTheta = profile ? profile.twoTheta[profile.twoTheta.length - 1] : 90;
  const refQueries = useQueries({
    queries: overlayIds.map((id) => ({
      queryKey: referenceKeys.pattern(id, profile?.wavelength, Math.ceil(lastTwoTheta)),
      queryFn: () => fetchJson<RefPattern>(`/api/reference-phases/${id}?wavelength=${profile!.wavelength}&twoThetaMax=${Math.min(160, Math.ceil(lastTwoTheta) + 1)}`),
      enabled: !!profile,
      staleTime: Infinity,
    })),
  });
  const maxPeak = useMemo(() => (run?.peaks ?? []).reduce((m, p) => Math.max(m, p.height), 0), [run]);
  const fit = profile?.fit ?? null;
  // Fitted phases in the fit's order (largest wt% first); every other row is the search's list or added by hand.
  const fittedPhases = useMemo(() => {
    const order = new Map((fit?.phases ?? []).map((p, i) => [p.referencePhaseId, i]));
    return phases.filter((p) => p.fitted).sort((a, b) => (order.get(a.referencePhaseId) ?? 99) - (order.get(b.referencePhaseId) ?? 99));
  }, [phases, fit]);
  const colorOf = useMemo(() => {
    const fitted = new Map((fit?.phases ?? []).map((p, i) => [p.referencePhaseId, PHASE_COLORS[i % PHASE_COLORS.length]]));
    return (id: string) => fitted.get(id) ?? OVERLAY_COLORS[(Math.max(0, overlayIds.indexOf(id)) + 3) % OVERLAY_COLORS.length];
  }, [fit, overlayIds]);
  const phaseCurves: PhaseCurve[] = useMemo(
    () => (fit ? fit.phases.map((p) => ({ id: p.referencePhaseId, label: p.mineral, color: colorOf(p.referencePhaseId), values: phaseCurve(p.profile, fit.background) })) : []),
    [fit, colorOf],
  );
  const overlays: Overlay[] = overlayIds.flatMap((id, i) => {
    const ref = refQueries[i]?.data;
    const p = phases.find((x) => x.referencePhaseId === id);
    return ref && p ? [scaledOverlay(p, ref, maxPeak || 1, colorOf(id))] : [];
  });
  const peakMarks = useMemo(() => (run?.peaks ?? []).map((p) => ({ twoTheta: p.twoTheta, height: p.height })), [run]);

  if (isLoading) return <Skeleton className="h-96 w-full" />;
  if (error || !data) return <p role="alert" className="rounded-md border border-danger/40 bg-red-50 p-4 text-danger">{message(error) ?? "Scan not found."}</p>;

  const { scan, sample } = data;
  const signed = scan.status === "signed_off";
  const viewingCurrent = !run || run.id === scan.currentRunId;
  const locked = signed || !viewingCurrent;
  const accepted = phases.filter((p) => p.status === "accepted");
  // Cautions follow what is accepted, the fit's phases, the search's leading candidate and any strong candidate undecided.
  const cautionPhases = phases.filter((p) => p.status === "accepted" || (p.status === "candidate" && (p.fitted || p.rank === 1 || p.confident)));
  const others = phases.filter((p) => !p.fitted);
  const fitIds = fittedPhases.map((p) => p.referencePhaseId);
  const canRefit = !!fit && data.canReview && !locked;
  const settings = (scan.settingsJson ?? {}) as Record<string, unknown>;
  const notes = [...((settings.notes as string[] | undefined) ?? []), ...(profile?.warnings ?? [])];
  const pending = run && (run.status === "queued" || run.status === "running");

  return (
    <div className="space-y-4">
      <nav className="text-sm text-muted" aria-label="Breadcrumb">
        <Link href={`/projects/${projectId}/scans`} className="hover:underline">
          Scans
        </Link>{" "}
        / {scan.originalName}
      </nav>
      <div className="flex flex-wrap items-center gap-3">
        <h1 className="text-2xl font-semibold">
          <Link href={`/projects/${projectId}/samples/${sample.id}`} className="hover:underline" data-testid="scan-sample-link">
            {sample.code}
          </Link>
          <span className="ml-2 text-base font-normal text-muted">{scan.originalName}</span>
        </h1>
        <ScanStatusBadge status={scan.status} progress={run?.progress} />
        {sample.suspectedAsbestos && <Badge tone="danger">Suspected asbestos flagged at collection</Badge>}
        <a href={`${base}/file`} className="text-sm font-medium text-brand hover:underline">
          Download original file
        </a>
      </div>
      <p className="text-sm text-muted">
        {scan.anode ? `${scan.anode} ` : ""}λ = {scan.wavelengthA} Å · {scan.twoThetaStart}–{scan.twoThetaEnd}° 2θ, step {scan.stepDeg?.toFixed(4)}° · {scan.pointCount} points
        {typeof settings.timePerStep === "number" ? ` · ${settings.timePerStep} s/step` : ""}
        {scan.instrument ? ` · ${scan.instrument}` : ""} · {scan.format.toUpperCase()} · SHA-256 {scan.sha256.slice(0, 12)}…
      </p>
      {!viewingCurrent && run && (
        <p className="rounded-md border border-oxide/40 bg-oxide-light px-3 py-2 text-sm" role="status">
          You are viewing an earlier run. Decisions and sign-off apply to the current run.{" "}
          <Link href={pathname} className="font-medium text-brand hover:underline">
            Back to the current run
          </Link>
        </p>
      )}
      <HazardCautions phases={cautionPhases} />

      {pending && (
        <Card>
          <p className="font-medium" role="status">
            {run!.status === "queued" ? `Waiting in the processing queue${run!.progress?.ahead ? ` (${run!.progress.ahead} scan${run!.progress.ahead === 1 ? "" : "s"} ahead)` : ""}…` : `Processing${run!.progress?.stage ? `: ${run!.progress.stage}` : ""}…`}
          </p>
          <div className="mt-2 h-2 w-full overflow-hidden rounded bg-line" aria-hidden>
            <div className="h-full bg-brand transition-all" style={{ width: `${Math.round((run!.progress?.fraction ?? (run!.status === "queued" ? 0.05 : 0.3)) * 100)}%` }} />
          </div>
          <p className="mt-2 text-xs text-muted">This page updates by itself. You can leave it; processing continues on the server.</p>
        </Card>
      )}
      {run?.status === "failed" && (
        <p role="alert" className="rounded-md border border-danger/40 bg-red-50 px-3 py-2 text-sm text-danger">
          Processing failed: {run.error}
        </p>
      )}

      <div className="grid gap-4 xl:grid-cols-3">
        <div className="space-y-4 xl:col-span-2">
          <Card>
            <div className="mb-2 flex flex-wrap items-baseline justify-between gap-2">
              <h2 className="font-semibold">Diffractogram</h2>
              {fit && (
                <p className="text-sm tabular-nums" data-testid="fit-summary">
                  Whole-pattern fit: Rwp {fit.stats.rwp.toFixed(2)} % · Rexp {fit.stats.rexp.toFixed(2)} % · χ² {fit.stats.gof.toFixed(2)}
                </p>
              )}
            </div>
            {profile ? (
              <Diffractogram
                twoTheta={profile.twoTheta}
                raw={profile.raw}
                background={fit?.background ?? profile.background}
                processed={profile.processed}
                fitted={profile.fitted}
                calculated={fit?.calculated}
                difference={fit?.difference}
                phases={phaseCurves}
                peaks={peakMarks}
                wavelength={profile.wavelength}
                overlays={overlays}
              />
            ) : (
              <Skeleton className="h-80 w-full" />
            )}
            {notes.length > 0 && (
              <ul className="mt-3 list-disc space-y-0.5 pl-5 text-xs text-muted" aria-label="Processing notes">
                {notes.map((n, i) => (
                  <li key={i}>{n}</li>
                ))}
              </ul>
            )}
            {profile && profile.broadFeatures.length > 0 && (
              <p className="mt-2 text-xs text-oxide">
                Broad feature{profile.broadFeatures.length === 1 ? "" : "s"} at {profile.broadFeatures.map((b) => `${b.twoTheta.toFixed(1)}°`).join(", ")} 2θ (FWHM &gt; 1.5°): possibly amorphous material, which search–match cannot identify and which inflates normalised percentages.
              </p>
            )}
          </Card>
          {run && run.status === "done" && profile && (
            <Card>
              <h2 className="mb-1 font-semibold">Phases in the whole-pattern fit</h2>
              {!signed && <CandidatesNotice className="mb-3" />}
              {fit ? (
                <FitPanel
                  fit={fit}
                  phases={fittedPhases}
                  colorOf={colorOf}
                  unexplained={run.unexplained}
                  canReview={data.canReview}
                  locked={locked}
                  refitting={refit.isPending}
                  refitError={message(refit.error)}
                  change={fitChange}
                  busyId={busyId}
                  onRefit={(phaseIds, what) => refit.mutate({ phaseIds, what })}
                  onDecide={(p, status) => decide.mutate({ p, status })}
                />
              ) : (
                <p className="text-sm text-muted">This run was processed before whole-pattern fitting existed; re-process the scan to fit the whole pattern.</p>
              )}
            </Card>
          )}
          {run && run.status === "done" && profile && (
            <Card>
              <h2 className="mb-2 font-semibold">Peaks</h2>
              <PeakTable peaks={run.peaks} unexplained={run.unexplained} wavelength={profile.wavelength} />
            </Card>
          )}
        </div>
        <div className="space-y-4">
          {run && run.status === "done" && (
            <Card>
              <h2 className="mb-1 font-semibold">{fit ? "Other candidates" : "Candidate phases"}</h2>
              <p className="mb-2 text-xs text-muted">
                {fit
                  ? `Ranked by the peak-list search (strong-line look-up and figure of merit); the whole-pattern fit did not keep them.${canRefit ? " Add one to the fit to test it against the whole profile." : ""}`
                  : "Weight % are semi-quantitative (RIR method, Chung 1974): normalised over the phases the search accepted, assuming no amorphous or unidentified content."}
              </p>
              {!fit && !signed && <CandidatesNotice className="mb-3" />}
              {!fit && profile?.noConfidentMatch && <p className="mb-2 text-sm text-oxide">No confident match: amorphous material, a phase not in the library, or too few peaks.</p>}
              <CandidateList
                phases={fit ? others : phases}
                mixture={profile?.mixture ?? []}
                canReview={data.canReview}
                locked={locked}
                busyId={busyId}
                overlayIds={overlayIds}
                colorOf={colorOf}
                onToggleOverlay={(p) => setOverlayIds((ids) => (ids.includes(p.referencePhaseId) ? ids.filter((x) => x !== p.referencePhaseId) : [...ids, p.referencePhaseId]))}
                onDecide={(p, status) => decide.mutate({ p, status })}
                onAddToFit={canRefit && fitIds.length < MAX_FIT_PHASES ? (p) => refit.mutate({ phaseIds: [...fitIds, p.referencePhaseId], what: `Added ${p.mineral}` }) : undefined}
                refitting={refit.isPending}
              />
              {decide.error && (
                <p role="alert" className="mt-2 text-xs font-medium text-danger">
                  {message(decide.error)}
                </p>
              )}
              {data.canReview && !locked && (
                <details className="mt-4 border-t border-line pt-3">
                  <summary className="cursor-pointer text-sm font-medium text-brand">Accept a library phase without fitting it</summary>
                  <div className="mt-2">
                    <AddPhase busy={addPhase.isPending} error={message(addPhase.error)} onAdd={(referencePhaseId, note) => addPhase.mutate({ referencePhaseId, note })} />
                  </div>
                </details>
              )}
            </Card>
          )}
          {run && run.status === "done" && (
            <Card>
              <h2 className="mb-2 font-semibold">Review and sign-off</h2>
              <SignOffPanel
                key={scan.analystNote ?? ""}
                note={scan.analystNote}
                accepted={accepted}
                undecided={phases.filter((p) => p.status === "candidate" && (p.fitted || !fit)).length}
                fit={fit ? fit.stats : null}
                record={scan.signOffJson}
                canReview={data.canReview}
                locked={locked}
                signedOff={signed ? { by: scan.signedOffByName, at: scan.signedOffAt } : null}
                busy={saveNote.isPending || signOff.isPending}
                error={message(saveNote.error) ?? message(signOff.error)}
                onSaveNote={(n) => saveNote.mutate(n)}
                onSignOff={() => signOff.mutate()}
              />
            </Card>
          )}
          <Card>
            <h2 className="mb-2 font-semibold">Runs</h2>
            <RunList
              runs={data.runs}
              selectedId={run?.id ?? null}
              hrefFor={(id) => `${pathname}?run=${id}`}
              canReview={data.canReview}
              locked={signed}
              onMakeCurrent={(id) => makeCurrent.mutate(id)}
            />
            {message(makeCurrent.error) && <p role="alert" className="mt-1 text-xs text-danger">{message(makeCurrent.error)}</p>}
            {data.canProcess && !signed && (
              <details className="mt-3 border-t border-line pt-3">
                <summary className="cursor-pointer text-sm font-medium text-brand">Re-process with other parameters</summary>
                <div className="mt-3">
                  <ReprocessForm
                    busy={reprocess.isPending || !!pending}
                    onSubmit={(body) => reprocess.mutate(body)}
                    fieldErrors={reprocess.error instanceof ApiError ? reprocess.error.fields : undefined}
                    error={message(reprocess.error)}
                  />
                </div>
              </details>
            )}
          </Card>
        </div>
      </div>
    </div>
  );
}
