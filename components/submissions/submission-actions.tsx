"use client";

import { useRouter } from "next/navigation";
import { useState } from "react";
import { Button } from "@/components/ui/button";
import { Card } from "@/components/ui/card";
import { Field, inputClass } from "@/components/ui/field";
import { ApiError, fetchJson } from "@/lib/client/fetch-json";
import { SAMPLE_STATUS_LABELS } from "@/lib/format";
import { LAB_STEP_EVENTS, STATUS_POLICIES, type CustodyEvent } from "@/lib/custody";
import { INTAKE_CONDITIONS, type IntakeCondition, type SampleStatus } from "@/lib/vocabulary";
import { CUSTODY_EVENT_LABELS, INTAKE_LABELS } from "./labels";

interface ActionSample {
  id: string;
  code: string;
  status: SampleStatus;
  intakeCondition: string | null;
  suspectedAsbestos: boolean;
}

interface Props {
  projectId: string;
  submission: { id: string; code: string; status: string; /** The viewer recorded the dispatch (may not confirm the receipt). */ viewerSent?: boolean };
  samples: ActionSample[];
  can: { send: boolean; lab: boolean; handOver: boolean };
}

interface MailOutcome {
  sent: boolean;
  to: string[];
  error?: string;
}

/** A datetime-local value (browser's zone) → ISO instant; empty → undefined (the server uses "now"). */
function toIso(v: FormDataEntryValue | null): string | undefined {
  const s = String(v ?? "").trim();
  return s ? new Date(s).toISOString() : undefined;
}
const text = (v: FormDataEntryValue | null) => String(v ?? "").trim() || null;

function useAction(onDone?: (msg: string | null) => void) {
  const router = useRouter();
  const [pending, setPending] = useState(false);
  const [error, setError] = useState<string | null>(null);
  const [fields, setFields] = useState<Record<string, string[]>>({});
  const [notice, setNotice] = useState<string | null>(null);
  async function run(fn: () => Promise<string | null>) {
    setPending(true);
    setError(null);
    setFields({});
    setNotice(null);
    try {
      const msg = await fn();
      setNotice(msg);
      onDone?.(msg);
      router.refresh();
    } catch (err) {
      if (err instanceof ApiError) {
        setError(err.message);
        setFields(err.fields ?? {});
      } else setError("Could not reach the server. Check the connection and try again.");
    } finally {
      setPending(false);
    }
  }
  return { pending, error, fields, notice, run };
}

function Feedback({ error, fields, notice }: { error: string | null; fields: Record<string, string[]>; notice: string | null }) {
  const extra = Object.entries(fields).flatMap(([k, v]) => v.map((m) => `${k === "_" ? "" : `${k}: `}${m}`));
  return (
    <>
      {error && (
        <div role="alert" className="rounded-md bg-red-50 px-3 py-2 text-sm text-danger">
          <p>{error}</p>
          {extra.length > 0 && (
            <ul className="mt-1 list-disc pl-5 text-xs">
              {extra.map((m) => (
                <li key={m}>{m}</li>
              ))}
            </ul>
          )}
        </div>
      )}
      {notice && (
        <p role="status" className="rounded-md bg-green-50 px-3 py-2 text-sm text-ok">
          {notice}
        </p>
      )}
    </>
  );
}

const mailNotice = (what: string, m: MailOutcome) => (m.sent ? `${what} E-mail sent to ${m.to.join(", ")}.` : `${what} The e-mail could not be sent (${m.error ?? "unknown error"}); use “Send the e-mail again”.`);

function SendForm({ projectId, submission, onDone }: Pick<Props, "projectId" | "submission"> & { onDone: (m: string | null) => void }) {
  const a = useAction(onDone);
  const url = `/api/projects/${projectId}/submissions/${submission.id}/send`;
  return (
    <form
      aria-label="Send to the lab"
      className="grid gap-3 sm:grid-cols-2"
      onSubmit={(e) => {
        e.preventDefault();
        const f = new FormData(e.currentTarget);
        void a.run(async () => {
          const r = await fetchJson<{ mail: MailOutcome }>(url, {
            method: "POST",
            json: { waybill: String(f.get("waybill") ?? ""), courier: text(f.get("courier")), sealNumber: text(f.get("sealNumber")), location: text(f.get("location")), occurredAt: toIso(f.get("occurredAt")) },
          });
          return mailNotice("Dispatched.", r.mail);
        });
      }}
    >
      <Field label="Waybill number" htmlFor="waybill" error={a.fields.waybill} hint='The courier consignment number, or "hand-carried".'>
        <input id="waybill" name="waybill" required className={inputClass} />
      </Field>
      <Field label="Courier" htmlFor="courier" error={a.fields.courier}>
        <input id="courier" name="courier" className={inputClass} />
      </Field>
      <Field label="Seal / tamper-tag number" htmlFor="sealNumber" error={a.fields.sealNumber}>
        <input id="sealNumber" name="sealNumber" className={inputClass} />
      </Field>
      <Field label="Dispatched from" htmlFor="location" error={a.fields.location} hint="e.g. Camp store">
        <input id="location" name="location" className={inputClass} />
      </Field>
      <Field label="Handed to the courier at" htmlFor="occurredAt" error={a.fields.occurredAt} hint="Leave empty for now.">
        <input id="occurredAt" name="occurredAt" type="datetime-local" className={inputClass} />
      </Field>
      <div className="flex items-end">
        <Button type="submit" disabled={a.pending} className="w-full">
          {a.pending ? "Sending…" : "Record dispatch and e-mail the lab"}
        </Button>
      </div>
      <div className="sm:col-span-2">
        <Feedback {...a} />
      </div>
    </form>
  );
}

function ResendButton({ projectId, submission }: Pick<Props, "projectId" | "submission">) {
  const a = useAction();
  return (
    <div className="space-y-2">
      <Button
        variant="secondary"
        disabled={a.pending}
        onClick={() =>
          void a.run(async () => {
            const r = await fetchJson<{ mail: MailOutcome }>(`/api/projects/${projectId}/submissions/${submission.id}/send`, { method: "POST", json: { resendEmail: true } });
            return mailNotice("", r.mail).trim();
          })
        }
      >
        Send the e-mail to the lab again
      </Button>
      <Feedback {...a} />
    </div>
  );
}

function IntakeForm({ projectId, submission, samples, onDone }: Pick<Props, "projectId" | "submission" | "samples"> & { onDone: (m: string | null) => void }) {
  const a = useAction(onDone);
  const [conditions, setConditions] = useState<Record<string, IntakeCondition>>(() => Object.fromEntries(samples.map((s) => [s.id, "received" as IntakeCondition])));
  return (
    <form
      aria-label="Lab intake"
      className="space-y-3"
      onSubmit={(e) => {
        e.preventDefault();
        const f = new FormData(e.currentTarget);
        void a.run(async () => {
          const items = samples.map((s) => {
            const w = String(f.get(`weight-${s.id}`) ?? "").replace(",", ".").trim();
            return { sampleId: s.id, condition: conditions[s.id], location: text(f.get(`location-${s.id}`)), note: text(f.get(`note-${s.id}`)), weightKg: w ? Number(w) : null };
          });
          const r = await fetchJson<{ mail: MailOutcome }>(`/api/projects/${projectId}/submissions/${submission.id}/receive`, {
            method: "POST",
            json: { items, location: text(f.get("location")), labReference: text(f.get("labReference")), sealNumber: text(f.get("sealNumber")), note: text(f.get("note")), receivedAt: toIso(f.get("receivedAt")) },
          });
          return mailNotice("Intake recorded.", r.mail);
        });
      }}
    >
      <p className="text-sm text-muted">Check each bag against the manifest. Mark bags that did not arrive as missing, and describe any damage.</p>
      <div className="grid gap-3 sm:grid-cols-2 lg:grid-cols-4">
        <Field label="Lab batch / job number" htmlFor="labReference" error={a.fields.labReference}>
          <input id="labReference" name="labReference" className={inputClass} />
        </Field>
        <Field label="Location (all bags)" htmlFor="intake-location" error={a.fields.location} hint="e.g. Reception, shelf R2">
          <input id="intake-location" name="location" className={inputClass} />
        </Field>
        <Field label="Seal number on arrival" htmlFor="intake-seal" error={a.fields.sealNumber}>
          <input id="intake-seal" name="sealNumber" className={inputClass} />
        </Field>
        <Field label="Received at" htmlFor="receivedAt" error={a.fields.receivedAt} hint="Leave empty for now.">
          <input id="receivedAt" name="receivedAt" type="datetime-local" className={inputClass} />
        </Field>
      </div>
      <div className="overflow-x-auto">
        <table className="w-full min-w-[640px] text-sm">
          <thead className="text-left text-xs uppercase tracking-wide text-muted">
            <tr>
              <th className="py-1 pr-2 font-medium">Bag</th>
              <th className="py-1 pr-2 font-medium">Condition</th>
              <th className="py-1 pr-2 font-medium">Weight (kg)</th>
              <th className="py-1 pr-2 font-medium">Own location</th>
              <th className="py-1 pr-2 font-medium">Note</th>
            </tr>
          </thead>
          <tbody>
            {samples.map((s, i) => (
              <tr key={s.id} className="border-t border-line">
                <td className="py-1 pr-2 font-medium">
                  {s.code}
                  {s.suspectedAsbestos && <span className="ml-1 text-xs text-danger">(suspected asbestos)</span>}
                </td>
                <td className="py-1 pr-2">
                  <select aria-label={`Condition of ${s.code}`} value={conditions[s.id]} onChange={(e) => setConditions((c) => ({ ...c, [s.id]: e.target.value as IntakeCondition }))} className={inputClass}>
                    {INTAKE_CONDITIONS.filter((c) => c !== "extra").map((c) => (
                      <option key={c} value={c}>
                        {INTAKE_LABELS[c]}
                      </option>
                    ))}
                  </select>
                </td>
                <td className="py-1 pr-2">
                  <input name={`weight-${s.id}`} inputMode="decimal" aria-label={`Weight of ${s.code} in kg`} className={inputClass} />
                </td>
                <td className="py-1 pr-2">
                  <input name={`location-${s.id}`} aria-label={`Location of ${s.code}`} className={inputClass} />
                </td>
                <td className="py-1 pr-2">
                  <input name={`note-${s.id}`} aria-label={`Note for ${s.code}`} aria-invalid={!!a.fields[`items.${i}.note`]} required={conditions[s.id] === "damaged"} className={inputClass} />
                </td>
              </tr>
            ))}
          </tbody>
        </table>
      </div>
      <Field label="Note" htmlFor="intake-note" error={a.fields.note}>
        <input id="intake-note" name="note" className={inputClass} />
      </Field>
      <Button type="submit" disabled={a.pending}>
        {a.pending ? "Recording…" : "Record intake"}
      </Button>
      <Feedback {...a} />
    </form>
  );
}

function CustodyForm({ projectId, submission, samples, lab }: Pick<Props, "projectId" | "submission" | "samples"> & { lab: boolean }) {
  const a = useAction();
  const events: CustodyEvent[] = lab ? [...LAB_STEP_EVENTS.filter((e) => e !== "received"), "transferred"] : ["transferred"];
  const [event, setEvent] = useState<CustodyEvent>(events[0]);
  const [selected, setSelected] = useState<string[]>([]);
  const selectable = samples.filter((s) => s.intakeCondition !== "missing");
  const missing = samples.filter((s) => s.intakeCondition === "missing");
  return (
    <form
      aria-label="Record a custody step"
      className="space-y-3"
      onSubmit={(e) => {
        e.preventDefault();
        const form = e.currentTarget;
        const f = new FormData(form);
        void a.run(async () => {
          const w = String(f.get("weightKg") ?? "").replace(",", ".").trim();
          const r = await fetchJson<{ results: { change: string }[] }>(`/api/projects/${projectId}/submissions/${submission.id}/custody`, {
            method: "POST",
            json: {
              sampleIds: selected,
              event,
              occurredAt: toIso(f.get("occurredAt")),
              location: text(f.get("location")),
              sealNumber: text(f.get("sealNumber")),
              handledBy: text(f.get("handledBy")),
              handedTo: text(f.get("handedTo")),
              note: text(f.get("note")),
              weightKg: w ? Number(w) : null,
              statusPolicy: f.get("statusPolicy") ?? "forward",
            },
          });
          setSelected([]);
          form.reset();
          const kept = r.results.filter((x) => x.change === "keep").length;
          return `${CUSTODY_EVENT_LABELS[event]} recorded for ${r.results.length} sample${r.results.length === 1 ? "" : "s"}${kept ? ` (status kept for ${kept})` : ""}.`;
        });
      }}
    >
      <fieldset>
        <legend className="mb-1 text-sm font-medium">Samples</legend>
        <label className="mb-1 flex items-center gap-2 text-sm">
          <input type="checkbox" checked={selected.length === selectable.length && selectable.length > 0} onChange={(e) => setSelected(e.target.checked ? selectable.map((s) => s.id) : [])} />
          All ({selectable.length})
        </label>
        <div className="flex flex-wrap gap-2">
          {selectable.map((s) => (
            <label key={s.id} className="flex items-center gap-1 rounded border border-line px-2 py-1 text-sm">
              <input type="checkbox" checked={selected.includes(s.id)} onChange={() => setSelected((cur) => (cur.includes(s.id) ? cur.filter((x) => x !== s.id) : [...cur, s.id]))} />
              {s.code} <span className="text-xs text-muted">({SAMPLE_STATUS_LABELS[s.status]})</span>
            </label>
          ))}
        </div>
        {a.fields.sampleIds && (
          <ul role="alert" className="mt-1 text-xs font-medium text-danger">
            {a.fields.sampleIds.map((m) => (
              <li key={m}>{m}</li>
            ))}
          </ul>
        )}
      </fieldset>
      {lab && missing.length > 0 && <LateArrival projectId={projectId} submissionId={submission.id} missing={missing} />}
      <div className="grid gap-3 sm:grid-cols-2 lg:grid-cols-4">
        <Field label="Step" htmlFor="event">
          <select id="event" value={event} onChange={(e) => setEvent(e.target.value as CustodyEvent)} className={inputClass}>
            {events.map((ev) => (
              <option key={ev} value={ev}>
                {CUSTODY_EVENT_LABELS[ev]}
              </option>
            ))}
          </select>
        </Field>
        <Field label="When" htmlFor="occurredAt-step" error={a.fields.occurredAt} hint="Leave empty for now.">
          <input id="occurredAt-step" name="occurredAt" type="datetime-local" className={inputClass} />
        </Field>
        <Field label="Where" htmlFor="location-step" error={a.fields.location} hint="Site → building → rack → box">
          <input id="location-step" name="location" className={inputClass} />
        </Field>
        <Field label="Seal / tag number" htmlFor="seal-step" error={a.fields.sealNumber}>
          <input id="seal-step" name="sealNumber" className={inputClass} />
        </Field>
        <Field label="Handled by" htmlFor="handledBy" error={a.fields.handledBy} hint="If not you, e.g. a technician.">
          <input id="handledBy" name="handledBy" className={inputClass} />
        </Field>
        <Field label="Handed to" htmlFor="handedTo" error={a.fields.handedTo}>
          <input id="handedTo" name="handedTo" className={inputClass} />
        </Field>
        <Field label="Weight (kg)" htmlFor="weight-step" error={a.fields.weightKg}>
          <input id="weight-step" name="weightKg" inputMode="decimal" className={inputClass} />
        </Field>
        <Field label="If a sample is further along" htmlFor="statusPolicy" hint="Status never moves back unless you say so.">
          <select id="statusPolicy" name="statusPolicy" defaultValue="forward" className={inputClass}>
            {STATUS_POLICIES.map((p) => (
              <option key={p} value={p}>
                {p === "forward" ? "Refuse (default)" : p === "keep" ? "Record as late entry, keep status" : "Move status back (note required)"}
              </option>
            ))}
          </select>
        </Field>
      </div>
      <Field label="Note" htmlFor="note-step" error={a.fields.note} hint={event === "prepared" ? "e.g. dried ≤ 40 °C (gypsum/clays), crushed, split, micronized." : event === "discarded" ? "Why and how it was disposed of (site rules)." : undefined}>
        <input id="note-step" name="note" required={event === "discarded"} className={inputClass} />
      </Field>
      <Button type="submit" disabled={a.pending || selected.length === 0}>
        {a.pending ? "Recording…" : `Record “${CUSTODY_EVENT_LABELS[event]}” for ${selected.length} sample${selected.length === 1 ? "" : "s"}`}
      </Button>
      <Feedback {...a} />
    </form>
  );
}

function LateArrival({ projectId, submissionId, missing }: { projectId: string; submissionId: string; missing: ActionSample[] }) {
  const a = useAction();
  return (
    <div className="rounded-md border border-danger/30 bg-red-50 p-2 text-sm">
      <p className="text-danger">Missing at intake: {missing.map((m) => m.code).join(", ")}.</p>
      <div className="mt-1 flex flex-wrap gap-2">
        {missing.map((m) => (
          <Button
            key={m.id}
            type="button"
            variant="secondary"
            disabled={a.pending}
            onClick={() =>
              void a.run(async () => {
                await fetchJson(`/api/projects/${projectId}/submissions/${submissionId}/samples/${m.id}/custody`, { method: "POST", json: { event: "received", note: "Arrived after intake" } });
                return `${m.code} recorded as received (late).`;
              })
            }
          >
            {m.code} arrived late
          </Button>
        ))}
      </div>
      <Feedback {...a} />
    </div>
  );
}

/** The actions the viewer's role allows at the submission's stage. */
export function SubmissionActions({ projectId, submission, samples, can }: Props) {
  // Kept here so the outcome of "send" / "intake" stays visible after the page moves to the next stage.
  const [flash, setFlash] = useState<string | null>(null);
  const stage = submission.status;
  const showSend = stage === "draft" && can.send;
  const showIntake = stage === "sent" && can.lab && !submission.viewerSent;
  const senderNote = stage === "sent" && can.lab && submission.viewerSent;
  const showSteps = ["received", "in_progress", "reported"].includes(stage) && (can.lab || can.handOver);
  const showResend = stage !== "draft" && can.send;
  if (!showSend && !showIntake && !showSteps && !showResend && !senderNote && !flash) return null;
  return (
    <Card className="space-y-3">
      {flash && (
        <p role="status" className="rounded-md bg-green-50 px-3 py-2 text-sm text-ok">
          {flash}
        </p>
      )}
      {showSend && (
        <>
          <h2 className="font-semibold">Send to the lab</h2>
          <p className="text-sm text-muted">Records a “dispatched” custody event for every bag and e-mails the lab the manifest link.</p>
          <SendForm projectId={projectId} submission={submission} onDone={setFlash} />
        </>
      )}
      {senderNote && (
        <p className="rounded-md border border-line bg-stone px-3 py-2 text-sm" data-testid="sender-cannot-receive">
          You recorded the dispatch of {submission.code}, so the receipt is recorded by someone at the lab (separation of duties).
        </p>
      )}
      {showIntake && (
        <>
          <h2 className="font-semibold">Lab intake</h2>
          <IntakeForm projectId={projectId} submission={submission} samples={samples} onDone={setFlash} />
        </>
      )}
      {showSteps && (
        <>
          <h2 className="font-semibold">{can.lab ? "Record a lab step" : "Record a hand-over"}</h2>
          <CustodyForm projectId={projectId} submission={submission} samples={samples} lab={can.lab} />
        </>
      )}
      {showResend && stage === "sent" && <ResendButton projectId={projectId} submission={submission} />}
    </Card>
  );
}
