"use client";

import { useRouter } from "next/navigation";
import { useState } from "react";
import { Badge } from "@/components/ui/badge";
import { Button } from "@/components/ui/button";
import { Card } from "@/components/ui/card";
import { Field, inputClass } from "@/components/ui/field";
import { ApiError, fetchJson } from "@/lib/client/fetch-json";
import { PROJECT_ROLES, type ProjectRole } from "@/lib/vocabulary";

const ROLE_LABELS: Record<ProjectRole, string> = { lead: "Project lead", field_geologist: "Field geologist", lab_analyst: "Lab analyst", consultant: "Consultant (read-only)" };

interface Member {
  userId: string;
  name: string;
  email: string;
  role: ProjectRole;
  since: string;
}
interface Invitation {
  id: string;
  email: string;
  role: ProjectRole;
  expiresAt: string;
  invitedByName: string | null;
}

/** Team list with invite / role change / remove for leads; read-only for everyone else. */
export function TeamManager({ projectId, selfId, canManage, members, invitations }: { projectId: string; selfId: string; canManage: boolean; members: Member[]; invitations: Invitation[] }) {
  const router = useRouter();
  const [error, setError] = useState<string | null>(null);
  const [fields, setFields] = useState<Record<string, string[]>>({});
  const [notice, setNotice] = useState<string | null>(null);
  const [pending, setPending] = useState(false);

  async function run(fn: () => Promise<string>) {
    setPending(true);
    setError(null);
    setFields({});
    setNotice(null);
    try {
      setNotice(await fn());
      router.refresh();
    } catch (err) {
      if (err instanceof ApiError) {
        setError(err.message);
        setFields(err.fields ?? {});
      } else setError("Could not reach the server.");
    } finally {
      setPending(false);
    }
  }
  const base = `/api/projects/${projectId}/members`;

  return (
    <div className="grid gap-4 lg:grid-cols-3">
      <Card className="lg:col-span-2">
        <h2 className="mb-2 font-semibold">Members ({members.length})</h2>
        <ul className="divide-y divide-line" aria-label="Members">
          {members.map((m) => (
            <li key={m.userId} className="flex flex-wrap items-center gap-2 py-2 text-sm">
              <div className="min-w-0 flex-1">
                <p className="font-medium">
                  {m.name} {m.userId === selfId && <span className="text-muted">(you)</span>}
                </p>
                <p className="truncate text-muted">{m.email}</p>
              </div>
              {canManage ? (
                <>
                  <select
                    aria-label={`Role of ${m.name}`}
                    defaultValue={m.role}
                    disabled={pending}
                    onChange={(e) => {
                      const role = e.target.value;
                      void run(async () => {
                        await fetchJson(`${base}/${m.userId}`, { method: "PATCH", json: { role } });
                        return `${m.name} is now ${ROLE_LABELS[role as ProjectRole]}.`;
                      });
                    }}
                    className="rounded-md border border-line bg-white px-2 py-1 text-sm"
                  >
                    {PROJECT_ROLES.map((r) => (
                      <option key={r} value={r}>
                        {ROLE_LABELS[r]}
                      </option>
                    ))}
                  </select>
                  <Button
                    variant="ghost"
                    disabled={pending}
                    aria-label={`Remove ${m.name}`}
                    onClick={() => {
                      if (!window.confirm(`Remove ${m.name} from the project? Their records stay attributed to them.`)) return;
                      void run(async () => {
                        await fetchJson(`${base}/${m.userId}`, { method: "DELETE" });
                        return `${m.name} was removed.`;
                      });
                    }}
                  >
                    Remove
                  </Button>
                </>
              ) : (
                <Badge tone="brand">{ROLE_LABELS[m.role]}</Badge>
              )}
            </li>
          ))}
        </ul>
      </Card>
      {canManage && (
        <Card className="space-y-3">
          <h2 className="font-semibold">Invite someone</h2>
          <form
            aria-label="Invite a member"
            className="space-y-3"
            onSubmit={(e) => {
              e.preventDefault();
              const form = e.currentTarget;
              const f = new FormData(form);
              void run(async () => {
                const r = await fetchJson<{ mail: { sent: boolean; error?: string } }>(base, { method: "POST", json: { email: f.get("email"), role: f.get("role") } });
                form.reset();
                return r.mail.sent ? `Invitation sent to ${String(f.get("email"))}. The link works once, for 7 days.` : `Invitation saved, but the e-mail failed: ${r.mail.error}`;
              });
            }}
          >
            <Field label="E-mail" htmlFor="invite-email" error={fields.email}>
              <input id="invite-email" name="email" type="email" required className={inputClass} />
            </Field>
            <Field label="Role" htmlFor="invite-role" error={fields.role}>
              <select id="invite-role" name="role" defaultValue="field_geologist" className={inputClass}>
                {PROJECT_ROLES.map((r) => (
                  <option key={r} value={r}>
                    {ROLE_LABELS[r]}
                  </option>
                ))}
              </select>
            </Field>
            <Button type="submit" disabled={pending} className="w-full">
              {pending ? "Sending…" : "Send invitation"}
            </Button>
          </form>
          {invitations.length > 0 && (
            <div>
              <h3 className="text-sm font-medium">Pending invitations</h3>
              <ul className="mt-1 space-y-1 text-sm" aria-label="Pending invitations">
                {invitations.map((i) => (
                  <li key={i.id} className="flex items-center gap-2">
                    <span className="min-w-0 flex-1 truncate">
                      {i.email} · {ROLE_LABELS[i.role]}
                      <span className="block text-xs text-muted">expires {i.expiresAt.slice(0, 10)}</span>
                    </span>
                    <Button
                      variant="ghost"
                      disabled={pending}
                      onClick={() =>
                        void run(async () => {
                          await fetchJson(`${base}/invitations/${i.id}`, { method: "DELETE" });
                          return `Invitation for ${i.email} withdrawn.`;
                        })
                      }
                    >
                      Withdraw
                    </Button>
                  </li>
                ))}
              </ul>
            </div>
          )}
        </Card>
      )}
      <div className="lg:col-span-3">
        {error && (
          <p role="alert" className="rounded-md bg-red-50 px-3 py-2 text-sm text-danger">
            {error}
          </p>
        )}
        {notice && (
          <p role="status" className="rounded-md bg-green-50 px-3 py-2 text-sm text-ok">
            {notice}
          </p>
        )}
      </div>
    </div>
  );
}
