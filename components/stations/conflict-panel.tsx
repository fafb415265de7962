"use client";

import { Button } from "@/components/ui/button";

export interface ConflictField {
  key: string;
  label: string;
  format?: (v: unknown) => string;
}

const show = (v: unknown) => (v === null || v === undefined || v === "" ? "—" : typeof v === "object" ? JSON.stringify(v) : String(v));
const same = (a: unknown, b: unknown) => show(a) === show(b);

/**
 * "Changed by someone else": their saved values next to what you typed, for the fields that differ.
 * Your values stay where they are until you choose: in the form (`kept="form"`), or in this device's outbox for an
 * edit saved without a connection (`kept="device"`, the sync page).
 */
export function ConflictPanel({
  fields,
  mine,
  theirs,
  onKeepMine,
  onTakeTheirs,
  busy,
  kept = "form",
}: {
  fields: ConflictField[];
  mine: Record<string, unknown>;
  theirs: Record<string, unknown>;
  onKeepMine: () => void;
  onTakeTheirs: () => void;
  busy?: boolean;
  kept?: "form" | "device";
}) {
  const differing = fields.filter((f) => !same(mine[f.key], theirs[f.key]));
  return (
    <div role="alert" className="space-y-3 rounded-md border border-oxide/40 bg-oxide-light p-4" data-testid="conflict-panel">
      <p className="font-semibold text-ink">Changed by someone else</p>
      <p className="text-sm">
        This record was saved by someone else after you opened it. Nothing was saved from your side yet;{" "}
        {kept === "form" ? "what you typed is still in the form." : "your edit is kept on this device until you choose."} Compare the two versions and choose.
      </p>
      {differing.length > 0 ? (
        <div className="overflow-x-auto">
          <table className="w-full text-sm">
            <thead>
              <tr className="text-left text-muted">
                <th className="py-1 pr-3 font-medium">Field</th>
                <th className="py-1 pr-3 font-medium">Their saved value</th>
                <th className="py-1 font-medium">Your value</th>
              </tr>
            </thead>
            <tbody>
              {differing.map((f) => (
                <tr key={f.key} className="border-t border-oxide/20 align-top">
                  <td className="py-1 pr-3 text-muted">{f.label}</td>
                  <td className="py-1 pr-3" data-testid={`theirs-${f.key}`}>
                    {(f.format ?? show)(theirs[f.key])}
                  </td>
                  <td className="py-1 font-medium" data-testid={`mine-${f.key}`}>
                    {(f.format ?? show)(mine[f.key])}
                  </td>
                </tr>
              ))}
            </tbody>
          </table>
        </div>
      ) : (
        <p className="text-sm">Their changes touch fields you did not change here.</p>
      )}
      <div className="flex flex-wrap gap-2">
        <Button type="button" onClick={onKeepMine} disabled={busy}>
          Save my values over theirs
        </Button>
        <Button type="button" variant="secondary" onClick={onTakeTheirs} disabled={busy}>
          Discard mine and load theirs
        </Button>
      </div>
    </div>
  );
}
