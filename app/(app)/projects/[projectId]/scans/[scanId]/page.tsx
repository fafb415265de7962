import type { Metadata } from "next";
import { notFound } from "next/navigation";
import { Suspense } from "react";
import { SignOffHistory } from "@/components/review/sign-off-history";
import { ScanReview } from "@/components/scans/scan-review";
import { Skeleton } from "@/components/ui/card";
import { AppError } from "@/lib/dal/errors";
import { assertScanVisible } from "@/lib/dal/scans";
import { recordTitle } from "@/lib/dal/record-titles";
import { currentActor } from "@/lib/dal/session";

/** The record in the title (e.g. "Sample APR-000123 · Lithodex"); a plain title when it is not visible. */
export async function generateMetadata({ params }: { params: Promise<{ projectId: string; scanId: string }> }): Promise<Metadata> {
  const { projectId, scanId } = await params;
  return { title: (await recordTitle(await currentActor(), projectId, "scan", scanId)) ?? "Scan review" };
}

export default async function ScanPage({ params }: { params: Promise<{ projectId: string; scanId: string }> }) {
  const { projectId, scanId } = await params;
  const actor = await currentActor();
  // Check access and existence on the server (404 for other projects' scans); the client component loads the data.
  await assertScanVisible(actor, projectId, scanId).catch((err) => {
    if (err instanceof AppError && err.code === "not_found") notFound();
    throw err;
  });
  return (
    <Suspense fallback={<Skeleton className="h-96 w-full" />}>
      <ScanReview projectId={projectId} scanId={scanId} />
      <div className="mt-4">
        <SignOffHistory projectId={projectId} scanId={scanId} />
      </div>
    </Suspense>
  );
}
