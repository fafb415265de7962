import type { Metadata } from "next";
import { Suspense } from "react";
import { SampleRegister } from "@/components/samples/sample-register";

export const metadata: Metadata = { title: "Samples" };

export default async function SamplesPage({ params }: { params: Promise<{ projectId: string }> }) {
  const { projectId } = await params;
  return (
    <div className="space-y-4">
      <h1 className="text-2xl font-semibold">Sample register</h1>
      <Suspense>
        <SampleRegister projectId={projectId} />
      </Suspense>
    </div>
  );
}
