"use client";

import { useRouter } from "next/navigation";
import { useState } from "react";
import { Button } from "@/components/ui/button";
import { Field, inputClass } from "@/components/ui/field";
import { authClient } from "@/lib/auth-client";
import { ApiError, fetchJson } from "@/lib/client/fetch-json";
import { passwordLengthProblem } from "@/lib/security/password-length";

export function SetPasswordForm({ token, email }: { token: string; email: string }) {
  const router = useRouter();
  const [pending, setPending] = useState(false);
  const [fields, setFields] = useState<Record<string, string[]>>({});
  const [error, setError] = useState<string | null>(null);
  return (
    <form
      className="space-y-3"
      onSubmit={async (e) => {
        e.preventDefault();
        const f = new FormData(e.currentTarget);
        const password = String(f.get("password") ?? "");
        const length = passwordLengthProblem(password);
        if (length) return setFields({ password: [length] });
        if (password !== String(f.get("confirm") ?? "")) return setFields({ confirm: ["The two passwords differ."] });
        setPending(true);
        setError(null);
        setFields({});
        try {
          await fetchJson(`/api/password-links/${encodeURIComponent(token)}`, { method: "POST", json: { password } });
          await authClient.signIn.email({ email, password });
          router.push("/projects");
          router.refresh();
        } catch (err) {
          if (err instanceof ApiError) {
            setError(err.message);
            setFields(err.fields ?? {});
          } else setError("Could not reach the server. Check the connection and try again.");
        } finally {
          setPending(false);
        }
      }}
    >
      <Field label="New password" htmlFor="password" error={fields.password} hint="At least 12 characters; a passphrase of unrelated words works well. Common passwords are refused.">
        <input id="password" name="password" type="password" autoComplete="new-password" minLength={12} required className={inputClass} />
      </Field>
      <Field label="Repeat it" htmlFor="confirm" error={fields.confirm}>
        <input id="confirm" name="confirm" type="password" autoComplete="new-password" required className={inputClass} />
      </Field>
      {error && (
        <p role="alert" className="rounded-md bg-red-50 px-3 py-2 text-sm text-danger">
          {error}
        </p>
      )}
      <Button type="submit" disabled={pending} className="w-full">
        {pending ? "Saving…" : "Set password and sign in"}
      </Button>
    </form>
  );
}
