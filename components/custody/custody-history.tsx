import { Card } from "@/components/ui/card";
import { CUSTODY_EVENT_LABELS, INTAKE_LABELS, formatInstant } from "@/components/submissions/labels";
import { listSampleCustody } from "@/lib/dal/custody";
import { currentActor } from "@/lib/dal/session";
import type { CustodyEvent } from "@/lib/custody";
import type { IntakeCondition } from "@/lib/vocabulary";
import Link from "next/link";
import { SampleCustodyActions } from "./sample-custody-actions";

/** Chain of custody of one sample (server component): who held it, when, where, with seal and condition. */
export async function CustodyHistory({ projectId, sampleId }: { projectId: string; sampleId: string }) {
  const actor = await currentActor();
  const { sample, events, intakeFlags, actions, timeZone } = await listSampleCustody(actor, projectId, sampleId);
  return (
    <Card>
      <h2 className="mb-2 font-semibold">Chain of custody</h2>
      <SampleCustodyActions projectId={projectId} sampleId={sampleId} code={sample.code} collect={actions.collect} receiveDirectly={actions.receiveDirectly} />
      {intakeFlags.length > 0 && (
        <ul className="mb-2 space-y-1 text-sm">
          {intakeFlags.map((f) => (
            <li key={f.submissionId} className="rounded bg-red-50 px-2 py-1 text-danger">
              {INTAKE_LABELS[f.condition as IntakeCondition] ?? f.condition} at intake of{" "}
              <Link className="underline" href={`/projects/${projectId}/submissions/${f.submissionId}`}>
                {f.submissionCode}
              </Link>
            </li>
          ))}
        </ul>
      )}
      {events.length === 0 ? (
        <p className="text-sm text-muted">No custody events recorded yet.</p>
      ) : (
        <ol className="relative space-y-3 border-l border-line pl-4" aria-label="Custody events, oldest first">
          {events.map((e) => (
            <li key={e.id} className="text-sm">
              <span className="absolute -left-1.5 mt-1.5 h-3 w-3 rounded-full border-2 border-white bg-brand" aria-hidden="true" />
              <p>
                <span className="font-medium">{CUSTODY_EVENT_LABELS[e.event as CustodyEvent]}</span>
                {e.condition && e.condition !== "received" && <span className="text-danger"> · {e.condition}</span>}
                <span className="text-muted"> · {formatInstant(e.occurredAt, timeZone)}</span>
              </p>
              <p className="text-muted">
                {[
                  e.actorName && `by ${e.actorName}`,
                  e.location && `at ${e.location}`,
                  e.handedTo && `to ${e.handedTo}`,
                  e.waybill && `waybill ${e.waybill}`,
                  e.sealNumber && `seal ${e.sealNumber}`,
                  e.weightKg != null && `${e.weightKg} kg`,
                ]
                  .filter(Boolean)
                  .join(" · ")}
                {e.submissionId && e.submissionCode && (
                  <>
                    {" · "}
                    <Link className="text-brand underline underline-offset-2" href={`/projects/${projectId}/submissions/${e.submissionId}`}>
                      {e.submissionCode}
                    </Link>
                  </>
                )}
              </p>
              {e.note && <p className="text-ink/80">{e.note}</p>}
            </li>
          ))}
        </ol>
      )}
    </Card>
  );
}
