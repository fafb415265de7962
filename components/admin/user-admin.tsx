"use client";

import { useRouter } from "next/navigation";
import { useState } from "react";
import { Badge } from "@/components/ui/badge";
import { Button } from "@/components/ui/button";
import { Field, inputClass } from "@/components/ui/field";
import { ApiError, fetchJson } from "@/lib/client/fetch-json";
import { formatDateTime } from "@/lib/dates";

export interface AdminUserRow {
  id: string;
  name: string;
  email: string;
  siteAdmin: boolean;
  disabled: boolean;
  banReason: string | null;
  projects: number;
  sessions: number;
  lastSeen: string | Date | null;
  pendingInvite: boolean;
}

/** The site admin's account list: invite, disable/enable, site-admin role, force sign-out, password reset link. */
export function UserAdmin({ users, me }: { users: AdminUserRow[]; me: string }) {
  const router = useRouter();
  const [busy, setBusy] = useState<string | null>(null);
  const [notice, setNotice] = useState<string | null>(null);
  const [error, setError] = useState<string | null>(null);
  const [fields, setFields] = useState<Record<string, string[]>>({});
  async function act(key: string, fn: () => Promise<string>) {
    setBusy(key);
    setError(null);
    setNotice(null);
    setFields({});
    try {
      setNotice(await fn());
      router.refresh();
    } catch (err) {
      if (err instanceof ApiError) {
        setError(err.message);
        setFields(err.fields ?? {});
      } else setError("Could not reach the server. Check the connection and try again.");
    } finally {
      setBusy(null);
    }
  }
  const mailNote = (m: { sent: boolean; to: string[]; error?: string }) => (m.sent ? `E-mail sent to ${m.to.join(", ")}.` : `The e-mail could not be sent (${m.error ?? "unknown error"}).`);
  return (
    <div className="space-y-4">
      <form
        aria-label="Invite someone"
        className="grid gap-3 rounded-lg border border-line bg-white p-4 shadow-sm sm:grid-cols-[1fr_1fr_auto_auto] sm:items-end"
        onSubmit={(e) => {
          e.preventDefault();
          const form = e.currentTarget;
          const f = new FormData(form);
          void act("invite", async () => {
            const r = await fetchJson<{ mail: { sent: boolean; to: string[]; error?: string } }>("/api/admin/users", {
              method: "POST",
              json: { name: String(f.get("name") ?? ""), email: String(f.get("email") ?? ""), siteAdmin: f.get("siteAdmin") === "on" },
            });
            form.reset();
            return `Account created; a link to set the password was e-mailed. ${mailNote(r.mail)}`;
          });
        }}
      >
        <Field label="Name" htmlFor="invite-name" error={fields.name}>
          <input id="invite-name" name="name" required className={inputClass} />
        </Field>
        <Field label="E-mail" htmlFor="invite-email" error={fields.email}>
          <input id="invite-email" name="email" type="email" required className={inputClass} />
        </Field>
        <label className="flex items-center gap-2 pb-2 text-sm">
          <input type="checkbox" name="siteAdmin" /> Site admin
        </label>
        <Button type="submit" disabled={busy !== null}>
          {busy === "invite" ? "Inviting…" : "Invite"}
        </Button>
      </form>
      <p className="text-xs text-muted">Project roles are given in each project&apos;s Team page; here are the accounts themselves.</p>
      {notice && (
        <p role="status" className="rounded-md bg-green-50 px-3 py-2 text-sm text-ok">
          {notice}
        </p>
      )}
      {error && (
        <p role="alert" className="rounded-md bg-red-50 px-3 py-2 text-sm text-danger">
          {error}
        </p>
      )}
      <div className="overflow-x-auto rounded-lg border border-line bg-white">
        <table className="w-full min-w-[860px] text-sm">
          <thead className="bg-stone text-left text-xs uppercase tracking-wide text-muted">
            <tr>
              <th className="px-3 py-2 font-medium">Person</th>
              <th className="px-3 py-2 font-medium">State</th>
              <th className="px-3 py-2 font-medium">Projects</th>
              <th className="px-3 py-2 font-medium">Last active</th>
              <th className="px-3 py-2 font-medium">Actions</th>
            </tr>
          </thead>
          <tbody>
            {users.map((u) => (
              <tr key={u.id} className="border-t border-line align-top" data-testid="admin-user-row">
                <td className="px-3 py-2">
                  <span className="font-medium">{u.name}</span>
                  {u.id === me && <span className="text-muted"> (you)</span>}
                  <span className="block text-xs text-muted">{u.email}</span>
                </td>
                <td className="space-x-1 px-3 py-2">
                  {u.disabled ? <Badge tone="danger">Disabled</Badge> : <Badge tone="ok">Active</Badge>}
                  {u.siteAdmin && <Badge tone="brand">Site admin</Badge>}
                  {u.pendingInvite && <Badge>Invited</Badge>}
                  {u.disabled && u.banReason && <span className="block text-xs text-muted">{u.banReason}</span>}
                </td>
                <td className="px-3 py-2">{u.projects}</td>
                <td className="px-3 py-2 text-xs">
                  {u.lastSeen ? formatDateTime(u.lastSeen) : "—"}
                  <span className="block text-muted">{u.sessions} open session{u.sessions === 1 ? "" : "s"}</span>
                </td>
                <td className="px-3 py-2">
                  <div className="flex flex-wrap gap-1">
                    <Button
                      type="button"
                      variant="secondary"
                      className="px-2 py-1 text-xs"
                      disabled={busy !== null}
                      onClick={() => {
                        if (!u.disabled && !window.confirm(`Disable ${u.name}? They are signed out everywhere and cannot sign in; their records stay.`)) return;
                        void act(u.id, async () => {
                          await fetchJson(`/api/admin/users/${u.id}`, { method: "PATCH", json: { disabled: !u.disabled } });
                          return `${u.name} ${u.disabled ? "enabled" : "disabled and signed out everywhere"}.`;
                        });
                      }}
                    >
                      {u.disabled ? "Enable" : "Disable"}
                    </Button>
                    <Button
                      type="button"
                      variant="secondary"
                      className="px-2 py-1 text-xs"
                      disabled={busy !== null}
                      onClick={() => {
                        if (!u.siteAdmin && !window.confirm(`Make ${u.name} a site admin? Site admins can manage every account and act as lead in every project.`)) return;
                        void act(u.id, async () => {
                          await fetchJson(`/api/admin/users/${u.id}`, { method: "PATCH", json: { siteAdmin: !u.siteAdmin } });
                          return `${u.name} is ${u.siteAdmin ? "no longer" : "now"} a site admin.`;
                        });
                      }}
                    >
                      {u.siteAdmin ? "Remove site admin" : "Make site admin"}
                    </Button>
                    <Button
                      type="button"
                      variant="secondary"
                      className="px-2 py-1 text-xs"
                      disabled={busy !== null || u.sessions === 0}
                      onClick={() =>
                        void act(u.id, async () => {
                          const r = await fetchJson<{ sessionsEnded: number }>(`/api/admin/users/${u.id}/sign-out`, { method: "POST" });
                          return `${u.name} signed out of ${r.sessionsEnded} session${r.sessionsEnded === 1 ? "" : "s"}.`;
                        })
                      }
                    >
                      Sign out everywhere
                    </Button>
                    <Button
                      type="button"
                      variant="secondary"
                      className="px-2 py-1 text-xs"
                      disabled={busy !== null || u.disabled}
                      onClick={() =>
                        void act(u.id, async () => {
                          const r = await fetchJson<{ mail: { sent: boolean; to: string[]; error?: string } }>(`/api/admin/users/${u.id}/password-reset`, { method: "POST" });
                          return `Password link for ${u.name}: ${mailNote(r.mail)}`;
                        })
                      }
                    >
                      E-mail password reset
                    </Button>
                  </div>
                </td>
              </tr>
            ))}
          </tbody>
        </table>
      </div>
    </div>
  );
}
