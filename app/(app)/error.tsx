"use client";

import { useEffect } from "react";
import { StatusPage } from "@/components/layout/status-page";

/** Error boundary of the signed-in pages: the header and navigation above stay; the failed part offers a retry. */
export default function AppError({ error, reset }: { error: Error & { digest?: string }; reset: () => void }) {
  useEffect(() => {
    console.error(error);
  }, [error]);
  return (
    <StatusPage
      code="error"
      title="This page could not be shown"
      actions={
        <button type="button" onClick={reset} className="rounded-md bg-brand px-3 py-2 text-sm font-medium text-white hover:bg-brand-dark">
          Try again
        </button>
      }
    >
      <p>Something went wrong while loading it. Nothing you entered was lost: saved records stay saved.</p>
      {error.digest && <p>If it keeps happening, give your administrator this reference: <code className="rounded bg-line/50 px-1">{error.digest}</code></p>}
    </StatusPage>
  );
}
