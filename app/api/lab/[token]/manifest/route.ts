import { pdfResponse, withToken } from "@/lib/api/public";
import { labManifestPdf, resolveLabToken } from "@/lib/dal/lab-links";

// GET /api/lab/:token/manifest — the submission's manifest as PDF, through the lab link
export const GET = withToken<{ token: string }>({ check: (p) => resolveLabToken(p.token) }, async ({ params }) => {
  const pdf = await labManifestPdf(params.token);
  return pdfResponse(pdf.fileName, pdf.bytes);
});
