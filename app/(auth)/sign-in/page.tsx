import type { Metadata } from "next";
import { Logo } from "@/components/ui/logo";
import { SignInForm } from "./sign-in-form";

export const metadata: Metadata = { title: "Sign in" };

export default async function SignInPage({ searchParams }: { searchParams: Promise<{ next?: string }> }) {
  const { next } = await searchParams;
  return (
    <div className="w-full max-w-sm space-y-6">
      <div className="flex flex-col items-center gap-2 text-center">
        <Logo />
        <p className="text-sm text-muted">Samples, scans and phases — from outcrop to report.</p>
      </div>
      <SignInForm next={next && next.startsWith("/") && !next.startsWith("//") ? next : "/projects"} />
    </div>
  );
}
