import type { Metadata } from "next";
import { AppError } from "@/lib/dal/errors";
import { getPasswordLink } from "@/lib/dal/users";
import { SetPasswordForm } from "./set-password-form";

export const metadata: Metadata = { title: "Set your password", robots: { index: false, follow: false }, referrer: "no-referrer" };

/** Single-use link from an admin's invitation or reset e-mail. */
export default async function SetPasswordPage({ params }: { params: Promise<{ token: string }> }) {
  const { token } = await params;
  const link = await getPasswordLink(token).catch((err: unknown) => {
    if (err instanceof AppError && (err.code === "not_found" || err.code === "gone")) return { problem: err.message };
    throw err;
  });
  if ("problem" in link) {
    return (
      <div className="space-y-2">
        <h1 className="text-xl font-semibold">This link cannot be used</h1>
        <p className="text-sm">{link.problem}</p>
      </div>
    );
  }
  return (
    <div className="space-y-3">
      <h1 className="text-xl font-semibold">{link.purpose === "invite" ? "Welcome to Lithodex" : "Set a new password"}</h1>
      <p className="text-sm text-muted">
        For {link.name} ({link.email}).
      </p>
      <SetPasswordForm token={token} email={link.email} />
    </div>
  );
}
