import { withActor } from "@/lib/api/handler";
import { pdfResponse } from "@/lib/api/public";
import { memberManifestPdf } from "@/lib/dal/lab-links";

// GET /api/projects/:projectId/submissions/:submissionId/manifest — the manifest as PDF (any member)
export const GET = withActor<{ projectId: string; submissionId: string }>({ permission: "project.read" }, async ({ params, actor }) => {
  const pdf = await memberManifestPdf(actor, params.projectId, params.submissionId);
  return pdfResponse(pdf.fileName, pdf.bytes);
});
