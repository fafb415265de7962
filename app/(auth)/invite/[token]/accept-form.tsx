"use client";

import { useRouter } from "next/navigation";
import { useState } from "react";
import { Button } from "@/components/ui/button";
import { Field, inputClass } from "@/components/ui/field";
import { authClient } from "@/lib/auth-client";
import { ApiError, fetchJson } from "@/lib/client/fetch-json";

export function AcceptInvitationForm({ token, projectId, projectName, email, roleLabel, existingAccount }: { token: string; projectId: string; projectName: string; email: string; roleLabel: string; existingAccount: boolean }) {
  const router = useRouter();
  const [error, setError] = useState<string | null>(null);
  const [fields, setFields] = useState<Record<string, string[]>>({});
  const [pending, setPending] = useState(false);

  async function onSubmit(e: React.FormEvent<HTMLFormElement>) {
    e.preventDefault();
    const f = new FormData(e.currentTarget);
    const password = String(f.get("password") ?? "");
    if (!existingAccount && password !== String(f.get("confirm") ?? "")) {
      setFields({ confirm: ["The two passwords differ."] });
      return;
    }
    setPending(true);
    setError(null);
    setFields({});
    try {
      await fetchJson(`/api/invitations/${encodeURIComponent(token)}`, { method: "POST", json: existingAccount ? {} : { name: String(f.get("name") ?? ""), password } });
    } catch (err) {
      setPending(false);
      if (err instanceof ApiError) {
        setError(err.message);
        setFields(err.fields ?? {});
      } else setError("Could not reach the server.");
      return;
    }
    const next = `/projects/${projectId}`;
    if (existingAccount) {
      router.push(`/sign-in?next=${encodeURIComponent(next)}`);
      return;
    }
    const { error: signInError } = await authClient.signIn.email({ email, password });
    if (signInError) router.push(`/sign-in?next=${encodeURIComponent(next)}`);
    else {
      router.push(next);
      router.refresh();
    }
  }

  return (
    <form onSubmit={onSubmit} className="space-y-4 rounded-lg border border-line bg-white p-6 shadow-sm" aria-label="Accept invitation">
      <h1 className="text-xl font-semibold">Join {projectName}</h1>
      <p className="text-sm text-muted">
        You are invited as <strong className="text-ink">{roleLabel}</strong> with the e-mail <strong className="text-ink">{email}</strong>.
      </p>
      {existingAccount ? (
        <p className="text-sm">You already have a Lithodex account: accept, then sign in with your usual password.</p>
      ) : (
        <>
          <Field label="Your name" htmlFor="name" error={fields.name}>
            <input id="name" name="name" autoComplete="name" required className={inputClass} />
          </Field>
          <Field label="Password" htmlFor="password" error={fields.password} hint="At least 12 characters; a passphrase of unrelated words works well. Common passwords are refused.">
            <input id="password" name="password" type="password" autoComplete="new-password" minLength={12} required className={inputClass} />
          </Field>
          <Field label="Password again" htmlFor="confirm" error={fields.confirm}>
            <input id="confirm" name="confirm" type="password" autoComplete="new-password" required className={inputClass} />
          </Field>
        </>
      )}
      {error && (
        <p role="alert" className="rounded-md bg-red-50 px-3 py-2 text-sm text-danger">
          {error}
        </p>
      )}
      <Button type="submit" disabled={pending} className="w-full">
        {pending ? "Joining…" : existingAccount ? "Accept invitation" : "Create account and join"}
      </Button>
    </form>
  );
}
