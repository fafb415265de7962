"use client";

import { useRouter } from "next/navigation";
import { useState } from "react";
import { Button } from "@/components/ui/button";
import { Field, inputClass } from "@/components/ui/field";
import { ApiError, fetchJson } from "@/lib/client/fetch-json";

/**
 * Events recorded on one sample outside a submission: the collection of a planned sample, and — when the project's
 * lab is in-house — the lab taking the sample directly (who is the signed-in user; why is required).
 */
export function SampleCustodyActions({ projectId, sampleId, code, collect, receiveDirectly }: { projectId: string; sampleId: string; code: string; collect: boolean; receiveDirectly: boolean }) {
  const router = useRouter();
  const [open, setOpen] = useState(false);
  const [pending, setPending] = useState(false);
  const [error, setError] = useState<string | null>(null);
  const [fields, setFields] = useState<Record<string, string[]>>({});
  if (!collect && !receiveDirectly) return null;
  const url = `/api/projects/${projectId}/samples/${sampleId}/custody`;
  async function post(body: Record<string, unknown>) {
    setPending(true);
    setError(null);
    setFields({});
    try {
      await fetchJson(url, { method: "POST", json: body });
      setOpen(false);
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
  return (
    <div className="mb-3 space-y-2 border-b border-line pb-3">
      <div className="flex flex-wrap gap-2">
        {collect && (
          <Button type="button" variant="secondary" disabled={pending} onClick={() => void post({ event: "collected" })}>
            Record collection of {code}
          </Button>
        )}
        {receiveDirectly && !open && (
          <Button type="button" variant="secondary" onClick={() => setOpen(true)}>
            Received directly by the lab…
          </Button>
        )}
      </div>
      {receiveDirectly && open && (
        <form
          aria-label="Received directly by the lab"
          className="space-y-2 rounded-md border border-line p-3"
          onSubmit={(e) => {
            e.preventDefault();
            const f = new FormData(e.currentTarget);
            void post({ event: "received_directly", note: String(f.get("note") ?? "").trim() || null, location: String(f.get("location") ?? "").trim() || null });
          }}
        >
          <p className="text-sm text-muted">The project&apos;s lab is in-house: record that you took {code} without a submission. Your name and the time are recorded with the reason.</p>
          <Field label="Why without a submission" htmlFor="direct-note" error={fields.note}>
            <input id="direct-note" name="note" required className={inputClass} placeholder="e.g. core offcut brought to the lab by the site geologist" />
          </Field>
          <Field label="Where it is now (optional)" htmlFor="direct-location" error={fields.location}>
            <input id="direct-location" name="location" className={inputClass} />
          </Field>
          <div className="flex gap-2">
            <Button type="submit" disabled={pending}>
              {pending ? "Recording…" : "Record receipt"}
            </Button>
            <Button type="button" variant="ghost" onClick={() => setOpen(false)}>
              Cancel
            </Button>
          </div>
        </form>
      )}
      {error && (
        <p role="alert" className="rounded-md bg-red-50 px-3 py-2 text-sm text-danger">
          {error}
        </p>
      )}
    </div>
  );
}
