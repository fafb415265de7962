import type { Metadata } from "next";
import Link from "next/link";
import { Logo } from "@/components/ui/logo";
import { AppError } from "@/lib/dal/errors";
import { getInvitationByToken } from "@/lib/dal/invitations";
import { AcceptInvitationForm } from "./accept-form";

export const metadata: Metadata = { title: "Invitation" };
export const dynamic = "force-dynamic";

/** Public page behind the e-mailed link: set name and password (new account) or join (existing account). */
export default async function InvitePage({ params }: { params: Promise<{ token: string }> }) {
  const { token } = await params;
  let info: Awaited<ReturnType<typeof getInvitationByToken>> | null = null;
  let problem: string | null = null;
  try {
    info = await getInvitationByToken(token);
  } catch (err) {
    if (err instanceof AppError && (err.code === "not_found" || err.code === "gone")) problem = err.message;
    else throw err;
  }
  return (
    <div className="w-full max-w-sm space-y-6">
      <div className="flex flex-col items-center gap-2 text-center">
        <Logo />
      </div>
      {problem || !info ? (
        <div className="space-y-3 rounded-lg border border-line bg-white p-6 shadow-sm">
          <h1 className="text-xl font-semibold">Invitation not usable</h1>
          <p role="alert" className="text-sm text-danger">
            {problem}
          </p>
          <Link href="/sign-in" className="text-sm text-brand hover:underline">
            Go to sign-in
          </Link>
        </div>
      ) : (
        <AcceptInvitationForm token={token} projectId={info.projectId} projectName={info.projectName} email={info.email} roleLabel={info.roleLabel} existingAccount={info.existingAccount} />
      )}
    </div>
  );
}
